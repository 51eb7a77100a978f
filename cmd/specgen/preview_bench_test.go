package main

import (
	"bufio"
	"bytes"
	"context"
	"fmt"
	"io"
	"io/fs"
	"net/http"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"
)

// BenchmarkPreviewEdit measures what a writer waits for in preview: from
// saving one page's prose to the preview serving the page with the edit,
// through the watcher's debounce, the rebuild, the announcement on the
// event stream and the page's fetch, as the open page's reload script
// does. It reports the median in ms/edit and the slowest in max-ms/edit.
//
// The site is $SPECGEN_BENCH_SITE (.ci/bench.sh writes a generated one
// there), or else the one init writes; the edited page is the middle one
// of those that are not a folder's index.
func BenchmarkPreviewEdit(b *testing.B) {
	dir := os.Getenv("SPECGEN_BENCH_SITE")
	if dir == "" {
		dir = filepath.Join(b.TempDir(), "site")
		var out, errb bytes.Buffer
		if code := run([]string{"init", dir}, &out, &errb); code != exitOK {
			b.Fatalf("init: %s", errb.String())
		}
	}
	rel := editedPage(b, dir)
	page := filepath.Join(dir, "content", filepath.FromSlash(rel))
	src, err := os.ReadFile(page)
	if err != nil {
		b.Fatal(err)
	}
	b.Cleanup(func() { _ = os.WriteFile(page, src, 0o644) })

	ctx, cancel := context.WithCancel(context.Background())
	ready := make(chan string, 1)
	done := make(chan int)
	var out, errb syncBuffer
	go func() { done <- servePreview(ctx, dir, "127.0.0.1:0", &out, &errb, ready) }()
	b.Cleanup(func() { cancel(); <-done })
	var addr string
	select {
	case addr = <-ready:
	case <-time.After(5 * time.Minute):
		b.Fatalf("the preview did not start: %s", errb.String())
	}
	url := "http://" + addr + "/" + strings.TrimSuffix(rel, ".md") + ".html"
	if body, status := fetch(b, url); status != http.StatusOK || !strings.Contains(body, "</html>") {
		b.Fatalf("%s: status %d before any edit:\n%.300s", url, status, body)
	}
	events := subscribe(ctx, b, "http://"+addr+"/_specgen/events")
	// Let the watcher settle on its folders before the first save.
	time.Sleep(200 * time.Millisecond)

	var delays []time.Duration
	for b.Loop() {
		marker := fmt.Sprintf("Preview edit %d of the benchmark.", len(delays)+1)
		start := time.Now()
		save(b, page, append(bytes.TrimRight(src, "\n"), "\n\n"+marker+"\n"...))
		for {
			select {
			case ev := <-events:
				if ev.name == "failed" {
					b.Fatalf("the build after edit %d failed:\n%s", len(delays)+1, ev.data)
				}
			case <-time.After(time.Minute):
				b.Fatalf("no build announced within a minute of edit %d: %s", len(delays)+1, errb.String())
			}
			// Any announcement may be the edit's (a save can make more
			// than one build); the page itself says.
			if body, _ := fetch(b, url); strings.Contains(body, marker) {
				break
			}
		}
		delays = append(delays, time.Since(start))
	}
	slices.Sort(delays)
	b.ReportMetric(float64(delays[len(delays)/2].Microseconds())/1000, "ms/edit")
	b.ReportMetric(float64(delays[len(delays)-1].Microseconds())/1000, "max-ms/edit")
}

// editedPage is the page BenchmarkPreviewEdit edits, relative to content/.
func editedPage(b *testing.B, dir string) string {
	b.Helper()
	var pages []string
	content := filepath.Join(dir, "content")
	err := filepath.WalkDir(content, func(p string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() && strings.HasSuffix(p, ".md") && d.Name() != "index.md" {
			rel, _ := filepath.Rel(content, p)
			pages = append(pages, filepath.ToSlash(rel))
		}
		return err
	})
	if err != nil || len(pages) == 0 {
		b.Fatalf("no page to edit in %s: %v", content, err)
	}
	return pages[len(pages)/2]
}

// save writes a page whole and renames it over the old one, as editors do.
func save(b *testing.B, page string, text []byte) {
	b.Helper()
	next := page + ".next"
	if err := os.WriteFile(next, text, 0o644); err != nil {
		b.Fatal(err)
	}
	if err := os.Rename(next, page); err != nil {
		b.Fatal(err)
	}
}

// fetch gets url and returns its body and status.
func fetch(b *testing.B, url string) (string, int) {
	b.Helper()
	resp, err := http.Get(url)
	if err != nil {
		b.Fatal(err)
	}
	defer resp.Body.Close()
	body, err := io.ReadAll(resp.Body)
	if err != nil {
		b.Fatal(err)
	}
	return string(body), resp.StatusCode
}

// serverEvent is one event of the preview's event stream.
type serverEvent struct{ name, data string }

// subscribe follows the preview's event stream until ctx ends, passing on
// every event after the greeting the stream opens with.
func subscribe(ctx context.Context, b *testing.B, url string) <-chan serverEvent {
	b.Helper()
	req, err := http.NewRequestWithContext(ctx, http.MethodGet, url, nil)
	if err != nil {
		b.Fatal(err)
	}
	resp, err := http.DefaultClient.Do(req)
	if err != nil {
		b.Fatal(err)
	}
	if resp.StatusCode != http.StatusOK {
		b.Fatalf("%s: status %d", url, resp.StatusCode)
	}
	events := make(chan serverEvent, 16)
	greeted := make(chan struct{})
	go func() {
		defer resp.Body.Close()
		var ev serverEvent
		lines := bufio.NewScanner(resp.Body)
		for lines.Scan() {
			line := lines.Text()
			switch {
			case strings.HasPrefix(line, "event: "):
				ev.name = strings.TrimPrefix(line, "event: ")
			case strings.HasPrefix(line, "data: "):
				ev.data += strings.TrimPrefix(line, "data: ") + "\n"
			case line == "" && ev.name == "hello":
				close(greeted)
				ev = serverEvent{}
			case line == "" && ev.name != "":
				select {
				case events <- ev:
				case <-ctx.Done():
					return
				}
				ev = serverEvent{}
			}
		}
	}()
	select {
	case <-greeted:
	case <-time.After(time.Minute):
		b.Fatal("the event stream sent no greeting")
	}
	return events
}
