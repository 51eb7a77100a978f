package site

import (
	"bytes"
	"fmt"
	"html/template"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/yuin/goldmark"
	"github.com/yuin/goldmark/extension"
	"github.com/yuin/goldmark/parser"
	"github.com/yuin/goldmark/renderer"
	"github.com/yuin/goldmark/util"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// writeChartSite writes a site of n chart-heavy pages: each page holds
// one compressor block that draws two charts, an inline value and some
// prose, in folders of fifty pages. Unlike writeChartedSite's, every block
// has inputs of its own, so that the outcome store holds n outcomes.
func writeChartSite(tb testing.TB, root string, n int) {
	tb.Helper()
	for i := 0; i < n; i++ {
		dir := filepath.Join(root, ContentDir, fmt.Sprintf("bank-%02d", i/50))
		if err := os.MkdirAll(dir, 0o755); err != nil {
			tb.Fatal(err)
		}
		var b strings.Builder
		fmt.Fprintf(&b, "+++\ntitle = \"Stage %d\"\norder = %d\n+++\n\n## Fitting the cylinder\n\n"+
			"Fit the liner, check the clearance with a feeler gauge and log it. The stage delivers =[stage-%04d.free_air_delivery L/min].\n\n"+
			"- clean the bore\n- oil the rings\n- fit the head\n\n", i, i%50, i)
		fmt.Fprintf(&b, "```calc\nid = \"stage-%04d\"\nkind = \"compressor\"\ntitle = \"Stage %d\"\nbore = \"%.2f mm\"\nstroke = \"30 mm\"\n"+
			"rod_length = \"75 mm\"\nclearance_ratio = 0.05\nspeed = \"900 rpm\"\ndischarge_pressure = \"6 bar\"\n\n"+
			"[show]\noutputs = [\"swept_volume cm3\", \"free_air_delivery L/min\"]\ncharts = [\"pv\", \"torque\"]\n```\n", i, i, 20+0.02*float64(i))
		if err := os.WriteFile(filepath.Join(dir, fmt.Sprintf("stage-%04d.md", i)), []byte(b.String()), 0o644); err != nil {
			tb.Fatal(err)
		}
	}
	if err := os.WriteFile(filepath.Join(root, ContentDir, "index.md"), []byte("# Chart site\n"), 0o644); err != nil {
		tb.Fatal(err)
	}
}

// TestWriteChartSite writes the chart-heavy site into
// $SPECGEN_CHART_SITE ($SPECGEN_BENCH_PAGES pages, default 1000), to time
// the command by hand; it does nothing otherwise.
func TestWriteChartSite(t *testing.T) {
	dir := os.Getenv("SPECGEN_CHART_SITE")
	if dir == "" {
		t.Skip("set SPECGEN_CHART_SITE to write the chart-heavy site")
	}
	n := 1000
	if s := os.Getenv("SPECGEN_BENCH_PAGES"); s != "" {
		if _, err := fmt.Sscan(s, &n); err != nil {
			t.Fatal(err)
		}
	}
	writeChartSite(t, dir, n)
}

// chartSitePages is the size of the benchmarks' chart-heavy site.
const chartSitePages = 1000

// timed runs f and returns how long it took.
func timed(tb testing.TB, f func() error) time.Duration {
	tb.Helper()
	start := time.Now()
	if err := f(); err != nil {
		tb.Fatal(err)
	}
	return time.Since(start)
}

// editPage appends text to the source of page i of the chart-heavy site.
func editPage(tb testing.TB, root string, i int, old, new string) {
	tb.Helper()
	p := filepath.Join(root, ContentDir, fmt.Sprintf("bank-%02d", i/50), fmt.Sprintf("stage-%04d.md", i))
	src, err := os.ReadFile(p)
	if err != nil {
		tb.Fatal(err)
	}
	if !bytes.Contains(src, []byte(old)) {
		tb.Fatalf("%s does not hold %q", p, old)
	}
	if err := os.WriteFile(p, bytes.Replace(src, []byte(old), []byte(new), 1), 0o644); err != nil {
		tb.Fatal(err)
	}
}

// BenchmarkIncremental builds the 1,000-page chart-heavy site cold, again
// unchanged, after an edit of one page's prose and after an edit of one
// block's input, and does the plain-Markdown floor's build of the same
// pages. Targets: unchanged/floor <= 0.1, edit/cold <= 0.2.
func BenchmarkIncremental(b *testing.B) {
	root := b.TempDir()
	writeChartSite(b, root, chartSitePages)
	floorOut := b.TempDir()
	var cold, unchanged, prose, block, floor time.Duration
	build := func() error {
		_, err := Build(root, Options{})
		return err
	}
	i := 0
	for b.Loop() {
		if err := os.RemoveAll(filepath.Join(root, CacheDir)); err != nil {
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
		i++
		editPage(b, root, 317, "log it", fmt.Sprintf("log it, again (%d)", i))
		prose += timed(b, build)
		editPage(b, root, 318, "stroke = \"30 mm\"", "stroke = \"31 mm\"")
		block += timed(b, build)
		editPage(b, root, 318, "stroke = \"31 mm\"", "stroke = \"30 mm\"")
		floor += timed(b, func() error { return floorBuild(root, floorOut) })
	}
	n := float64(b.N)
	b.ReportMetric(float64(cold.Nanoseconds())/n, "cold-ns")
	b.ReportMetric(float64(unchanged.Nanoseconds())/n, "unchanged-ns")
	b.ReportMetric(float64(prose.Nanoseconds())/n, "edit-prose-ns")
	b.ReportMetric(float64(block.Nanoseconds())/n, "edit-block-ns")
	b.ReportMetric(float64(floor.Nanoseconds())/n, "floor-ns")
	b.ReportMetric(unchanged.Seconds()/floor.Seconds(), "unchanged/floor")
	b.ReportMetric(prose.Seconds()/cold.Seconds(), "edit-prose/cold")
	b.ReportMetric(block.Seconds()/cold.Seconds(), "edit-block/cold")
}

// floorBuild does the least any generator must do with the site's
// Markdown (as BenchmarkFloor): goldmark with GFM, footnotes and heading
// ids, chroma highlighting, one html/template layout, the files written.
func floorBuild(root, out string) error {
	rels, err := findPages(root)
	if err != nil {
		return err
	}
	md := goldmark.New(
		goldmark.WithExtensions(extension.GFM, extension.Footnote),
		goldmark.WithParserOptions(parser.WithAutoHeadingID()),
		goldmark.WithRendererOptions(renderer.WithNodeRenderers(util.Prioritized(floorCode{}, 100))),
	)
	layout := template.Must(template.New("page").Parse(`<!DOCTYPE html><html><head><title>{{.Title}}</title></head><body><nav>{{range .Nav}}<a href="{{.}}">{{.}}</a>{{end}}</nav><main>{{.Body}}</main></body></html>`))
	nav := []string{"index.html", "bank-00/index.html", "bank-01/index.html"}
	errs := make([]error, len(rels))
	calc.Parallel(len(rels), func(i int) {
		src, err := os.ReadFile(filepath.Join(root, ContentDir, rels[i]))
		if err != nil {
			errs[i] = err
			return
		}
		var body, page bytes.Buffer
		if err := md.Convert(src, &body); err != nil {
			errs[i] = err
			return
		}
		if err := layout.Execute(&page, map[string]any{"Title": rels[i], "Nav": nav, "Body": template.HTML(body.String())}); err != nil {
			errs[i] = err
			return
		}
		p := filepath.Join(out, strings.TrimSuffix(rels[i], ".md")+".html")
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			errs[i] = err
			return
		}
		errs[i] = os.WriteFile(p, page.Bytes(), 0o644)
	})
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	return nil
}
