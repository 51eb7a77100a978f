package main

import (
	"bytes"
	"context"
	"io"
	"net/http"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"
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

// TestPreview serves a new site, follows an edit and a broken edit. The
// bounds are generous (the targets are 2 s to serve and 1 s to reflect an
// edit); the measured times are logged.
func TestPreview(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "site")
	var out, errb syncBuffer
	if code := run([]string{"init", dir}, &out, &errb); code != exitOK {
		t.Fatal("init failed")
	}
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
	tmp := t.TempDir()
	dir := filepath.Join(tmp, "site")
	var out, errb syncBuffer
	if code := run([]string{"init", dir}, &out, &errb); code != exitOK {
		t.Fatal("init failed")
	}
	ctx, cancel := context.WithCancel(context.Background())
	ready := make(chan string, 1)
	done := make(chan int)
	go func() { done <- servePreview(ctx, dir, "127.0.0.1:0", &out, &errb, ready) }()
	defer func() { cancel(); <-done }()
	base := "http://" + <-ready + "/"
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
