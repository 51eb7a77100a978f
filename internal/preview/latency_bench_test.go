package preview

import (
	"bufio"
	"context"
	"fmt"
	"io"
	"log"
	"net/http"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// writeLatencySite writes a site of n pages shaped like documentation: in
// folders of twenty, each page with headings, a list, a table and code, on
// four pages in five a compressor block with claims and inline values, on
// one in twenty a chart.
func writeLatencySite(tb testing.TB, root string, n int) {
	tb.Helper()
	for i := 0; i < n; i++ {
		dir := filepath.Join(root, "content", fmt.Sprintf("section-%02d", i/20))
		if err := os.MkdirAll(dir, 0o755); err != nil {
			tb.Fatal(err)
		}
		var b strings.Builder
		fmt.Fprintf(&b, "+++\ntitle = \"Page %d\"\norder = %d\n+++\n\n", i, i%20)
		id := fmt.Sprintf("stage-%04d", i)
		for s := 0; s < 3; s++ {
			fmt.Fprintf(&b, "## Step %d\n\nFit the part, check the clearance with a feeler gauge and note it in the log.", s)
			if i%5 != 4 && s == 1 {
				fmt.Fprintf(&b, " The stage sweeps =[%s.swept_volume cm3].", id)
			}
			b.WriteString("\n\n- clean the bore\n- oil the rings\n\n| item | qty |\n|---|---:|\n| bolt | 4 |\n\n```sh\nmake check\n```\n\n")
		}
		if i%5 != 4 {
			charts := ""
			if i%20 == 3 {
				charts = "charts = [\"pv\"]\n"
			}
			fmt.Fprintf(&b, "```calc\nid = %q\nkind = \"compressor\"\nbore = \"%d mm\"\nstroke = \"30 mm\"\nrod_length = \"75 mm\"\n"+
				"clearance_ratio = 0.05\nspeed = \"900 rpm\"\ndischarge_pressure = \"6 bar\"\n\n[expect]\nswept_volume = \">= 1 cm3\"\n\n"+
				"[show]\noutputs = [\"swept_volume cm3\", \"free_air_delivery L/min\"]\n%s```\n", id, 25+i%30, charts)
		}
		if err := os.WriteFile(filepath.Join(dir, fmt.Sprintf("page-%03d.md", i)), []byte(b.String()), 0o644); err != nil {
			tb.Fatal(err)
		}
	}
	if err := os.WriteFile(filepath.Join(root, "content", "index.md"), []byte("# Latency site\n"), 0o644); err != nil {
		tb.Fatal(err)
	}
}

// BenchmarkEditLatency measures, on a 300-page site, the time from saving
// an edit of one page's prose to the browser holding the page with it: the
// preview notices the save, waits out the debounce, rebuilds, sends
// "reload", and the page is fetched again. Target: 300 ms (ms/edit).
func BenchmarkEditLatency(b *testing.B) {
	root := b.TempDir()
	writeLatencySite(b, root, 300)
	page := filepath.Join(root, "content", "section-07", "page-141.md")
	src, err := os.ReadFile(page)
	if err != nil {
		b.Fatal(err)
	}
	p := New(root, log.New(io.Discard, "", 0))
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	ready := make(chan string, 1)
	go func() { _ = p.Serve(ctx, "127.0.0.1:0", ready) }()
	go func() { _ = p.Watch(ctx, Debounce) }()
	base := "http://" + <-ready
	events := listen(b, ctx, base)
	// The watcher is ready once a first edit reaches the browser.
	edit := func(n int) string {
		mark := fmt.Sprintf("Edit number %d of the log.", n)
		if err := os.WriteFile(page, append(append([]byte{}, src...), "\n"+mark+"\n"...), 0o644); err != nil {
			b.Fatal(err)
		}
		return mark
	}
	// wait waits for the page with mark, saving it again after patience
	// (the watcher may not be watching yet) until a minute has passed.
	wait := func(mark string, patience time.Duration) {
		deadline := time.Now().Add(time.Minute)
		for time.Now().Before(deadline) {
			select {
			case ev := <-events:
				if ev != "reload" {
					continue
				}
			case <-time.After(patience):
				if err := os.Chtimes(page, time.Now(), time.Now()); err != nil {
					b.Fatal(err)
				}
				continue
			}
			if strings.Contains(fetch(b, base+"/section-07/page-141.html"), mark) {
				return
			}
		}
		b.Fatal("the edit did not reach the page within a minute")
	}
	wait(edit(0), time.Second)
	var total time.Duration
	n := 0
	for b.Loop() {
		n++
		start := time.Now()
		wait(edit(n), time.Minute)
		total += time.Since(start)
	}
	b.ReportMetric(float64(total.Milliseconds())/float64(n), "ms/edit")
}

// listen reads the preview's event stream and sends each event's name.
func listen(tb testing.TB, ctx context.Context, base string) <-chan string {
	tb.Helper()
	req, err := http.NewRequestWithContext(ctx, http.MethodGet, base+eventsPath, nil)
	if err != nil {
		tb.Fatal(err)
	}
	resp, err := http.DefaultClient.Do(req)
	if err != nil {
		tb.Fatal(err)
	}
	events := make(chan string, 16)
	go func() {
		defer resp.Body.Close()
		sc := bufio.NewScanner(resp.Body)
		for sc.Scan() {
			if name, ok := strings.CutPrefix(sc.Text(), "event: "); ok {
				events <- name
			}
		}
	}()
	return events
}

// fetch gets a page as the browser would after "reload".
func fetch(tb testing.TB, url string) string {
	tb.Helper()
	resp, err := http.Get(url)
	if err != nil {
		tb.Fatal(err)
	}
	defer resp.Body.Close()
	body, err := io.ReadAll(resp.Body)
	if err != nil {
		tb.Fatal(err)
	}
	return string(body)
}
