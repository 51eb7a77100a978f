package main

import (
	"bytes"
	"context"
	"io"
	"net"
	"net/http"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/millrace-workshop/specgen/internal/preview"
)

// syncBuffer is a bytes.Buffer safe for the preview's goroutines.
type syncBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (s *syncBuffer) Write(p []byte) (int, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.Write(p)
}

func (s *syncBuffer) String() string {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.String()
}

func get(t *testing.T, url string) string {
	t.Helper()
	resp, err := http.Get(url)
	if err != nil {
		t.Fatal(err)
	}
	defer resp.Body.Close()
	b, _ := io.ReadAll(resp.Body)
	return string(b)
}

// waitFor polls url until its body contains want, and returns how long
// that took.
func waitFor(t *testing.T, url, want string, limit time.Duration) time.Duration {
	t.Helper()
	start := time.Now()
	for time.Since(start) < limit {
		if strings.Contains(get(t, url), want) {
			return time.Since(start)
		}
		time.Sleep(20 * time.Millisecond)
	}
	t.Fatalf("%s did not show %q within %v", url, want, limit)
	return 0
}

// starterSite writes the site that init writes into a temporary folder.
func starterSite(t *testing.T) string {
	t.Helper()
	dir := filepath.Join(t.TempDir(), "site")
	var out, errb bytes.Buffer
	if code := run([]string{"init", dir}, &out, &errb); code != exitOK {
		t.Fatalf("init failed: %s", errb.String())
	}
	return dir
}

// startPreview serves dir on a free port of 127.0.0.1 until the test ends;
// it returns the address and the preview's log.
func startPreview(t *testing.T, dir string, opts ...preview.Option) (string, *syncBuffer) {
	t.Helper()
	ctx, cancel := context.WithCancel(context.Background())
	ready := make(chan string, 1)
	done := make(chan int)
	var out, errb syncBuffer
	go func() { done <- servePreview(ctx, dir, "127.0.0.1:0", &out, &errb, ready, opts...) }()
	t.Cleanup(func() { cancel(); <-done })
	select {
	case addr := <-ready:
		return addr, &errb
	case <-time.After(20 * time.Second):
		t.Fatal("preview did not start")
	}
	return "", nil
}

// TestPreview serves a new site, follows an edit and a broken edit. The
// bounds are generous (the targets are 2 s to serve and 1 s to reflect an
// edit); the measured times are logged.
func TestPreview(t *testing.T) {
	dir := starterSite(t)
	var out, errb syncBuffer
	ctx, cancel := context.WithCancel(context.Background())
	done := make(chan int)
	ready := make(chan string, 1)
	start := time.Now()
	go func() { done <- servePreview(ctx, dir, "127.0.0.1:0", &out, &errb, ready) }()
	var addr string
	select {
	case addr = <-ready:
	case <-time.After(10 * time.Second):
		t.Fatal("preview did not start")
	}
	base := "http://" + addr + "/"
	home := get(t, base)
	t.Logf("serving after %v", time.Since(start).Round(time.Millisecond))
	if !strings.Contains(home, "/_specgen/reload.js") || !strings.Contains(home, "Our machine notes") {
		t.Fatalf("home page lacks the reload script or its text:\n%s", home)
	}
	if js := get(t, base+"_specgen/reload.js"); !strings.Contains(js, "EventSource") {
		t.Fatal("no reload script")
	}

	page := filepath.Join(dir, "content", "index.md")
	src, _ := os.ReadFile(page)
	time.Sleep(50 * time.Millisecond) // let the watcher settle on slow machines
	if err := os.WriteFile(page, bytes.Replace(src, []byte("These pages document"), []byte("Edited: these pages document"), 1), 0o644); err != nil {
		t.Fatal(err)
	}
	t.Logf("edit shown after %v", waitFor(t, base, "Edited: these pages", 5*time.Second).Round(time.Millisecond))

	bad := "+++\ntitel = \"oops\"\n+++\n"
	if err := os.WriteFile(filepath.Join(dir, "content", "broken.md"), []byte(bad), 0o644); err != nil {
		t.Fatal(err)
	}
	waitFor(t, base, "sg-preview-error", 5*time.Second)
	body := get(t, base)
	if !strings.Contains(body, "content/broken.md:2:") || !strings.Contains(body, "Edited: these pages") {
		t.Errorf("overlay lacks file:line or the last good page is gone:\n%s", body)
	}
	cancel()
	select {
	case <-done:
	case <-time.After(5 * time.Second):
		t.Fatal("preview did not stop")
	}
}

func TestPreviewRefusesPublicAddress(t *testing.T) {
	var out, errb bytes.Buffer
	code := run([]string{"preview", "-addr", "0.0.0.0:8080"}, &out, &errb)
	if code != exitBadInput || !strings.Contains(errb.String(), "-public") {
		t.Errorf("exit %d: %s", code, errb.String())
	}
}

// TestPreviewNeverServesHalfPages rewrites a page over and over while the
// preview rebuilds and pages are fetched: every page served is whole.
func TestPreviewNeverServesHalfPages(t *testing.T) {
	dir := starterSite(t)
	tmp := filepath.Dir(dir)
	addr, _ := startPreview(t, dir)
	base := "http://" + addr + "/"
	page := filepath.Join(dir, "content", "first-stage.md")
	src, _ := os.ReadFile(page)
	stop := make(chan struct{})
	writer := make(chan struct{})
	go func() {
		defer close(writer)
		for i := 0; ; i++ {
			select {
			case <-stop:
				return
			default:
			}
			// Written whole, then renamed over the page, as editors save:
			// an in-place write would let the preview read a truncated
			// file, which it rightly builds into a whole (short) page.
			text := strings.Replace(string(src), "# First stage", "# First stage, edit "+strconv.Itoa(i), 1)
			next := filepath.Join(tmp, "next.md")
			_ = os.WriteFile(next, []byte(text), 0o644)
			_ = os.Rename(next, page)
			time.Sleep(15 * time.Millisecond)
		}
	}()
	deadline := time.Now().Add(2 * time.Second)
	fetched := 0
	for time.Now().Before(deadline) {
		body := get(t, base+"first-stage.html")
		fetched++
		if !strings.HasSuffix(strings.TrimSpace(body), "</html>") || !strings.Contains(body, `<section class="sg-calc`) {
			close(stop)
			<-writer
			t.Fatalf("fetch %d: a partial page:\n%.300s", fetched, body)
		}
	}
	close(stop)
	<-writer
	t.Logf("%d whole pages fetched while the page changed", fetched)
}

// TestPreviewRootMissing: preview of a folder that does not exist stops
// with exit 2 and says so, instead of serving an error page forever.
func TestPreviewRootMissing(t *testing.T) {
	missing := filepath.Join(t.TempDir(), "docs")
	code, _, stderr := runWithin(t, time.Minute, "preview", "-C", missing, "-addr", "127.0.0.1:0")
	if code != exitBadInput || !strings.Contains(stderr, "site root "+missing+": no such folder") {
		t.Errorf("exit %d, stderr %q; want exit 2 and the missing folder named", code, stderr)
	}
}

// TestPreviewAnswersOnlyItsOwnHost: a page elsewhere that points its own
// name at 127.0.0.1 gets 421 for pages, results.json and the event stream;
// an -allow-host name and localhost get 200; a page of another site is
// refused the event stream. Every answer forbids sniffing and carries the
// content policy.
func TestPreviewAnswersOnlyItsOwnHost(t *testing.T) {
	addr, errb := startPreview(t, starterSite(t), preview.AllowHosts("docs.example"))
	_, port, _ := net.SplitHostPort(addr)

	// status requests path from the preview with the given Host and Origin
	// and returns the status and the first line of the body; the event
	// stream is left once its headers have come.
	status := func(path, host, origin string) (int, string) {
		t.Helper()
		rctx, stop := context.WithTimeout(context.Background(), 5*time.Second)
		defer stop()
		req, _ := http.NewRequestWithContext(rctx, "GET", "http://"+addr+path, nil)
		req.Host = host
		if origin != "" {
			req.Header.Set("Origin", origin)
		}
		resp, err := http.DefaultClient.Do(req)
		if err != nil {
			t.Fatal(err)
		}
		defer resp.Body.Close()
		if resp.Header.Get("X-Content-Type-Options") != "nosniff" || !strings.Contains(resp.Header.Get("Content-Security-Policy"), "default-src 'self'") {
			t.Errorf("%s (Host %s): headers %v lack nosniff or the content policy", path, host, resp.Header)
		}
		line := ""
		if resp.Header.Get("Content-Type") != "text/event-stream" {
			b, _ := io.ReadAll(resp.Body)
			line, _, _ = strings.Cut(string(b), "\n")
		}
		return resp.StatusCode, line
	}

	for _, path := range []string{"/", "/first-stage.html", "/results.json", "/_specgen/events", "/_specgen/reload.js"} {
		if code, msg := status(path, "evil.example:"+port, ""); code != http.StatusMisdirectedRequest || !strings.Contains(msg, "-allow-host") {
			t.Errorf("%s for Host evil.example: %d %q, want 421 with a one-line explanation", path, code, msg)
		}
		for _, host := range []string{addr, "localhost:" + port, "docs.example", "docs.example:443"} {
			if code, _ := status(path, host, ""); code != http.StatusOK {
				t.Errorf("%s for Host %s: %d, want 200", path, host, code)
			}
		}
	}
	if code, _ := status("/_specgen/events", addr, "http://evil.example:"+port); code != http.StatusForbidden {
		t.Errorf("event stream for a page of another site: %d, want 403", code)
	}
	if code, _ := status("/_specgen/events", addr, "http://localhost:"+port); code != http.StatusOK {
		t.Errorf("event stream for the preview's own page: %d, want 200", code)
	}
	// Nothing changes state; a request that would is refused, a
	// cross-site one before anything else.
	for origin, want := range map[string]int{"": http.StatusMethodNotAllowed, "http://evil.example:" + port: http.StatusForbidden} {
		req, _ := http.NewRequest("POST", "http://"+addr+"/", strings.NewReader("x"))
		if origin != "" {
			req.Header.Set("Origin", origin)
		}
		resp, err := http.DefaultClient.Do(req)
		if err != nil {
			t.Fatal(err)
		}
		resp.Body.Close()
		if resp.StatusCode != want {
			t.Errorf("POST with Origin %q: %d, want %d", origin, resp.StatusCode, want)
		}
	}
	if !strings.Contains(errb.String(), `refused requests for host "evil.example:`+port+`"`) {
		t.Errorf("the refusal is not logged:\n%s", errb.String())
	}
}

// TestPreviewAllowHostBadName: an -allow-host that is not a host name
// stops preview with exit 2 and says what is wrong.
func TestPreviewAllowHostBadName(t *testing.T) {
	for _, c := range []struct{ name, want string }{
		{"", `-allow-host "": empty`},
		{"http://docs.example/", "a URL, not a name"},
		{"docs.example:8080", "has a port"},
		{"docs example", "not a host name"},
	} {
		var out, errb bytes.Buffer
		code := run([]string{"preview", "-C", t.TempDir(), "-allow-host", "localhost", "-allow-host", c.name}, &out, &errb)
		if code != exitBadInput || !strings.Contains(errb.String(), c.want) || strings.Count(strings.TrimSpace(errb.String()), "\n") != 0 {
			t.Errorf("-allow-host %q: exit %d, stderr %q; want exit 2 and one line saying %q", c.name, code, errb.String(), c.want)
		}
	}
}
