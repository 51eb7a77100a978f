package site

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// timed runs f and returns how long it took.
func timed(tb testing.TB, f func() error) time.Duration {
	tb.Helper()
	start := time.Now()
	if err := f(); err != nil {
		tb.Fatal(err)
	}
	return time.Since(start)
}

// BenchmarkIncremental puts the targets of incremental builds side by side
// in one run, so that a busy machine slows all of them alike: on the
// chart-heavy site (WriteChartBenchSite, 1,000 pages) a cold build, an
// unchanged rebuild, a rebuild after one page's prose changed and after
// its block's bore changed, and the floor's build of the same pages.
// Targets: unchanged/floor <= 0.1, edit-prose/cold and edit-input/cold
// <= 0.2.
func BenchmarkIncremental(b *testing.B) {
	root := b.TempDir()
	pages := benchEnvPages(b, 1000)
	WriteChartBenchSite(b, root, pages)
	page := benchEditedPage(root, pages)
	src, err := os.ReadFile(page)
	if err != nil {
		b.Fatal(err)
	}
	f, err := newFloor(root)
	if err != nil {
		b.Fatal(err)
	}
	floorOut := b.TempDir()
	build := func() error {
		_, err := Build(root, Options{})
		return err
	}
	edit := func(text string) func() error {
		return func() error {
			if err := os.WriteFile(page, []byte(text), 0o644); err != nil {
				return err
			}
			return build()
		}
	}
	var cold, unchanged, prose, input, floor time.Duration
	n := 0
	for b.Loop() {
		n++
		if err := os.RemoveAll(filepath.Join(root, CacheDir)); err != nil {
			b.Fatal(err)
		}
		if err := os.WriteFile(page, src, 0o644); err != nil {
			b.Fatal(err)
		}
		cold += timed(b, build)
		unchanged += timed(b, func() error {
			sum, err := Build(root, Options{})
			if err == nil && !sum.UpToDate {
				err = fmt.Errorf("an unchanged rebuild was not up to date")
			}
			return err
		})
		edited := string(src)
		for _, e := range []struct {
			total *time.Duration
			text  string
		}{
			{&prose, replaceOnce(b, edited, "Fit the part", fmt.Sprintf("Fit the part (revision %d)", n))},
			{&input, boreLine.ReplaceAllString(edited, fmt.Sprintf(`bore = "%d.5 mm"`, 40+n%20))},
		} {
			*e.total += timed(b, edit(e.text))
		}
		floor += timed(b, func() error { return f.render(floorOut) })
	}
	per := func(d time.Duration) float64 { return float64(d.Nanoseconds()) / float64(n) }
	b.ReportMetric(per(cold), "cold-ns")
	b.ReportMetric(per(unchanged), "unchanged-ns")
	b.ReportMetric(per(prose), "edit-prose-ns")
	b.ReportMetric(per(input), "edit-input-ns")
	b.ReportMetric(per(floor), "floor-ns")
	b.ReportMetric(unchanged.Seconds()/floor.Seconds(), "unchanged/floor")
	b.ReportMetric(prose.Seconds()/cold.Seconds(), "edit-prose/cold")
	b.ReportMetric(input.Seconds()/cold.Seconds(), "edit-input/cold")
}

// replaceOnce replaces the first old in s, which must hold it.
func replaceOnce(tb testing.TB, s, old, new string) string {
	tb.Helper()
	if !strings.Contains(s, old) {
		tb.Fatalf("the page does not hold %q", old)
	}
	return strings.Replace(s, old, new, 1)
}
