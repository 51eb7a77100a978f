package preview

import (
	"fmt"
	"net"
	"net/url"
	"os"
	"strings"
	"sync"

	"github.com/millrace-workshop/specgen/internal/inputerr"
)

// hosts decides which Host (and Origin) a request may name. A page on
// another site can point its own name at 127.0.0.1 (DNS rebinding) and read
// the preview with the visitor's browser; its requests then carry that name,
// so the preview answers only to names that are its own.
type hosts struct {
	port   string          // the port listened on
	listen net.IP          // the address listened on, nil for a name such as localhost
	names  map[string]bool // -allow-host names, answered on any port
	public bool            // the machine's own addresses and name are answered too

	mu  sync.Mutex
	own map[string]bool // the machine's addresses and host name, when public
}

// newHosts is the Host check of a preview listening on listen (host:port).
func newHosts(listen string, names []string, public bool) *hosts {
	host, port, _ := net.SplitHostPort(listen)
	h := &hosts{port: port, listen: net.ParseIP(host), names: map[string]bool{}, public: public}
	for _, n := range names {
		h.names[normalName(n)] = true
	}
	if public {
		h.own = ownNames()
	}
	return h
}

// allowsHost reports whether a request's Host header names the preview.
// Without a port, the Host means port 80 (plain http).
func (h *hosts) allowsHost(hostport string) bool {
	name, port := splitHost(hostport, "80")
	return h.allows(name, port)
}

// allowsOrigin reports whether an Origin header names a page of the
// preview itself. "null" (a sandboxed or file: page) is not one.
func (h *hosts) allowsOrigin(origin string) bool {
	u, err := url.Parse(origin)
	if err != nil || u.Host == "" || u.User != nil || (u.Path != "" && u.Path != "/") {
		return false
	}
	def := map[string]string{"http": "80", "https": "443"}[u.Scheme]
	if def == "" {
		return false
	}
	name, port := splitHost(u.Host, def)
	return h.allows(name, port)
}

func (h *hosts) allows(name, port string) bool {
	if name == "" {
		return false
	}
	if h.names[name] {
		return true
	}
	if port != h.port {
		return false
	}
	ip := net.ParseIP(name)
	switch {
	case name == "localhost", ip != nil && ip.IsLoopback():
		return true
	case ip != nil && h.listen != nil && ip.Equal(h.listen):
		return true
	case !h.public:
		return false
	}
	h.mu.Lock()
	defer h.mu.Unlock()
	if h.own[name] {
		return true
	}
	// The machine may have been given an address since the last look.
	h.own = ownNames()
	return h.own[name]
}

// splitHost splits host[:port] into a normalised name and the port, def
// when there is none.
func splitHost(hostport, def string) (name, port string) {
	name, port, err := net.SplitHostPort(hostport)
	if err != nil {
		name, port = hostport, def
	}
	return normalName(name), port
}

// normalName is a host name as compared: lower case, without the brackets
// of an IPv6 address or a final dot; an IP address in its canonical form.
func normalName(name string) string {
	name = strings.TrimSuffix(strings.ToLower(strings.Trim(name, "[]")), ".")
	if ip := net.ParseIP(name); ip != nil {
		return ip.String()
	}
	return name
}

// ownNames is the machine's addresses and its host name.
func ownNames() map[string]bool {
	own := map[string]bool{}
	if name, err := os.Hostname(); err == nil {
		own[normalName(name)] = true
	}
	for _, ip := range ownAddresses() {
		own[ip.String()] = true
	}
	return own
}

// ownAddresses is the addresses of the machine's network interfaces.
func ownAddresses() []net.IP {
	addrs, err := net.InterfaceAddrs()
	if err != nil {
		return nil
	}
	var ips []net.IP
	for _, a := range addrs {
		if n, ok := a.(*net.IPNet); ok {
			ips = append(ips, n.IP)
		}
	}
	return ips
}

// NetworkURLs tells whether other machines can reach a preview listening
// on listen (host:port), and where: the machine's addresses for an address
// of every interface (0.0.0.0, ::), the address itself for one of the
// machine's own. A loopback address is reachable from this machine only.
func NetworkURLs(listen string) (urls []string, reachable bool) {
	host, port, err := net.SplitHostPort(listen)
	if err != nil {
		return nil, false
	}
	ip := net.ParseIP(host)
	switch {
	case host == "localhost", ip == nil, ip.IsLoopback():
		return nil, false
	case !ip.IsUnspecified():
		return []string{"http://" + net.JoinHostPort(ip.String(), port) + "/"}, true
	}
	for _, a := range ownAddresses() {
		// Link-local addresses need a zone to be used; they are left out.
		if a.IsLoopback() || a.IsLinkLocalUnicast() || (ip.To4() != nil && a.To4() == nil) {
			continue
		}
		urls = append(urls, "http://"+net.JoinHostPort(a.String(), port)+"/")
	}
	return urls, true
}

// CheckHostName refuses an -allow-host value that is not a host name or an
// IP address.
func CheckHostName(name string) error {
	bad := func(why string) error {
		return &inputerr.Error{Msg: fmt.Sprintf("-allow-host %q: %s; give a host name or address, such as docs.example or 192.168.1.20", name, why)}
	}
	switch {
	case strings.TrimSpace(name) == "":
		return bad("empty")
	case strings.Contains(name, "://"):
		return bad("a URL, not a name (leave out the scheme and path)")
	}
	if ip := net.ParseIP(strings.Trim(name, "[]")); ip != nil {
		return nil
	}
	if _, _, err := net.SplitHostPort(name); err == nil {
		return bad("has a port; leave it out: an allowed name is answered on any port")
	}
	n := strings.TrimSuffix(name, ".")
	if len(n) > 253 {
		return bad("longer than the 253 characters a host name may have")
	}
	for _, label := range strings.Split(n, ".") {
		if !validLabel(label) {
			return bad("not a host name: each dot-separated part is 1 to 63 letters, digits, hyphens or underscores, not starting or ending with a hyphen")
		}
	}
	return nil
}

// validLabel reports whether s is one label of a host name (RFC 1123, with
// the underscores some private networks use).
func validLabel(s string) bool {
	if len(s) == 0 || len(s) > 63 || s[0] == '-' || s[len(s)-1] == '-' {
		return false
	}
	for _, c := range s {
		if !(c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '-' || c == '_') {
			return false
		}
	}
	return true
}
