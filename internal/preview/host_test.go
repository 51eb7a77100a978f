package preview

import (
	"strings"
	"testing"
)

// TestHostCheck: which Host headers a preview on 127.0.0.1:8080 answers,
// with docs.example allowed.
func TestHostCheck(t *testing.T) {
	h := newHosts("127.0.0.1:8080", []string{"Docs.Example", "10.1.2.3"}, false)
	for _, c := range []struct {
		host string
		want bool
	}{
		{"127.0.0.1:8080", true},
		{"localhost:8080", true},
		{"LOCALHOST:8080", true},
		{"localhost.:8080", true},
		{"[::1]:8080", true},
		{"127.0.0.2:8080", true}, // all of 127/8 is loopback
		{"docs.example", true},   // an allowed name, on any port
		{"docs.example:443", true},
		{"DOCS.EXAMPLE.:8080", true},
		{"10.1.2.3:9000", true},
		{"evil.example:8080", false},
		{"evil.example", false},
		{"localhost:8081", false}, // another port is another server
		{"localhost", false},      // no port: 80
		{"127.0.0.1", false},
		{"docs.example.evil.example:8080", false},
		{"192.168.1.20:8080", false}, // the machine's own address, without -public
		{"", false},
		{":8080", false},
	} {
		if got := h.allowsHost(c.host); got != c.want {
			t.Errorf("Host %q: allowed %v, want %v", c.host, got, c.want)
		}
	}
}

// TestHostCheckListenAddress: a preview listening on a name-less address
// of the machine answers to that address.
func TestHostCheckListenAddress(t *testing.T) {
	h := newHosts("[::]:8080", nil, true)
	if !h.allowsHost("[0:0::0]:8080") || h.allowsHost("evil.example:8080") {
		t.Error("the unspecified listen address (in another spelling) should be answered, a foreign name not")
	}
	h.own = map[string]bool{"192.168.1.20": true, "workshop": true}
	for _, host := range []string{"192.168.1.20:8080", "workshop:8080", "WORKSHOP:8080"} {
		if !h.allowsHost(host) {
			t.Errorf("-public: the machine's own %q refused", host)
		}
	}
	if h.allowsHost("192.168.1.20:9090") {
		t.Error("-public: the machine's address on another port answered")
	}
}

func TestOriginCheck(t *testing.T) {
	h := newHosts("127.0.0.1:8080", []string{"docs.example"}, false)
	for _, c := range []struct {
		origin string
		want   bool
	}{
		{"http://127.0.0.1:8080", true},
		{"http://localhost:8080", true},
		{"https://docs.example", true},
		{"http://evil.example:8080", false},
		{"http://evil.example", false},
		{"http://localhost:3000", false}, // another local server is another site
		{"null", false},
		{"file://", false},
		{"chrome-extension://abc", false},
		{"http://user@localhost:8080", false},
		{"", false},
	} {
		if got := h.allowsOrigin(c.origin); got != c.want {
			t.Errorf("Origin %q: allowed %v, want %v", c.origin, got, c.want)
		}
	}
}

func TestCheckHostName(t *testing.T) {
	for _, ok := range []string{"docs.example", "localhost", "my_proxy", "a-b.c-d.example.", "192.168.1.20", "::1", "[fe80::1]", "x"} {
		if err := CheckHostName(ok); err != nil {
			t.Errorf("%q refused: %v", ok, err)
		}
	}
	for _, c := range []struct{ name, want string }{
		{"", "empty"},
		{"  ", "empty"},
		{"http://docs.example/", "a URL"},
		{"docs.example:8080", "has a port"},
		{"docs example", "not a host name"},
		{"-docs.example", "not a host name"},
		{"docs..example", "not a host name"},
		{"*.example", "not a host name"},
		{strings.Repeat("a", 64) + ".example", "not a host name"},
		{strings.Repeat("abcdefgh.", 30) + "example", "253 characters"},
	} {
		err := CheckHostName(c.name)
		if err == nil || !strings.Contains(err.Error(), c.want) || !strings.Contains(err.Error(), "-allow-host") {
			t.Errorf("%q: %v; want an error saying %q", c.name, err, c.want)
		}
	}
}

func TestNetworkURLs(t *testing.T) {
	for _, loop := range []string{"127.0.0.1:8080", "localhost:8080", "[::1]:8080"} {
		if urls, reachable := NetworkURLs(loop); reachable || urls != nil {
			t.Errorf("%s: %v, reachable %v; a loopback address is not", loop, urls, reachable)
		}
	}
	if urls, reachable := NetworkURLs("192.168.1.20:8080"); !reachable || len(urls) != 1 || urls[0] != "http://192.168.1.20:8080/" {
		t.Errorf("192.168.1.20:8080: %v, %v", urls, reachable)
	}
	urls, reachable := NetworkURLs("0.0.0.0:8080")
	if !reachable {
		t.Error("0.0.0.0 is reachable from the network")
	}
	for _, u := range urls {
		if !strings.HasSuffix(u, ":8080/") || strings.Contains(u, "127.0.0.1") || strings.Contains(u, "[") {
			t.Errorf("0.0.0.0:8080: %q is not one of the machine's IPv4 addresses with the port", u)
		}
	}
}
