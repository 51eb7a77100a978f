package site

import (
	"bytes"
	"errors"
	"fmt"
	"html/template"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"sync"
	"testing"

	"github.com/alecthomas/chroma/v2"
	chromahtml "github.com/alecthomas/chroma/v2/formatters/html"
	"github.com/alecthomas/chroma/v2/lexers"
	"github.com/alecthomas/chroma/v2/styles"
	"github.com/yuin/goldmark"
	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/extension"
	"github.com/yuin/goldmark/parser"
	"github.com/yuin/goldmark/renderer"
	"github.com/yuin/goldmark/util"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// Generated site kinds, as $SPECGEN_BENCH_KIND names them.
const (
	docSiteKind   = "docs"   // WriteBenchSite
	chartSiteKind = "charts" // WriteChartBenchSite
)

// writeBenchSite writes the generated site of that kind.
func writeBenchSite(tb testing.TB, kind, root string, n int) {
	tb.Helper()
	switch kind {
	case docSiteKind:
		WriteBenchSite(tb, root, n)
	case chartSiteKind:
		WriteChartBenchSite(tb, root, n)
	default:
		tb.Fatalf("site kind %q: want %q or %q", kind, docSiteKind, chartSiteKind)
	}
}

// WriteBenchSite writes a site of n pages shaped like real documentation:
// parts of ten sections of twenty pages, each page with headings, lists, a
// table, links, code in several languages and, on four pages in five, a
// calculation block with claims and inline values; one page in twenty
// draws a chart.
func WriteBenchSite(tb testing.TB, root string, n int) {
	tb.Helper()
	writeBenchPages(tb, root, n, docBenchPage)
}

// WriteChartBenchSite writes a site of n pages laid out as WriteBenchSite's
// where every page is a stage's write-up of about 4 kB, like the demo's
// pages (2–14 kB): prose with inline values, one compressor block with
// claims, shown results and two charts, tables of parts, fasteners and
// running in, lists of assembly steps and two code samples.
func WriteChartBenchSite(tb testing.TB, root string, n int) {
	tb.Helper()
	writeBenchPages(tb, root, n, chartBenchPage)
}

// benchPageName is the file of page i within its section: the first page
// of a section is its index.md.
func benchPageName(i int) string {
	if i%20 == 0 {
		return "index.md"
	}
	return fmt.Sprintf("page-%03d.md", i%20)
}

// writeBenchPages writes pages 0..n-1 of a generated site, page(i, n)
// giving each one's Markdown, in parts of ten sections of twenty pages,
// with an index page for every part and for the site.
func writeBenchPages(tb testing.TB, root string, n int, page func(i, n int) string) {
	tb.Helper()
	for i := 0; i < n; i++ {
		dir := filepath.Join(root, "content", fmt.Sprintf("part-%02d", i/200), fmt.Sprintf("section-%02d", i/20%10))
		if err := os.MkdirAll(dir, 0o755); err != nil {
			tb.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(dir, benchPageName(i)), []byte(page(i, n)), 0o644); err != nil {
			tb.Fatal(err)
		}
	}
	for part := 0; part*200 < n; part++ {
		index := filepath.Join(root, "content", fmt.Sprintf("part-%02d", part), "index.md")
		if err := os.WriteFile(index, []byte(fmt.Sprintf("# Part %d\n\nTen sections of the build.\n", part)), 0o644); err != nil {
			tb.Fatal(err)
		}
	}
	if err := os.WriteFile(filepath.Join(root, "content", "index.md"), []byte("# Bench site\n"), 0o644); err != nil {
		tb.Fatal(err)
	}
}

// benchCode is the code sample of page i, in one of four languages.
func benchCode(i int) string {
	langs := []struct{ lang, code string }{
		{"python", "import time\n\ndef log(p):\n    print(f\"{time.time():.0f} {p:.2f}\")\n"},
		{"go", "package main\n\nfunc main() {\n\tfor i := 0; i < 3; i++ {\n\t\tprintln(i)\n\t}\n}\n"},
		{"sh", "set -e\nfor f in *.csv; do wc -l \"$f\"; done\n"},
		{"toml", "[switch]\ncut_in = \"6 bar\"\ncut_out = \"8 bar\"\n"},
	}
	l := langs[i%len(langs)]
	return fmt.Sprintf("```%s\n%s```\n\n", l.lang, l.code)
}

// docBenchPage is page i of WriteBenchSite, n pages.
func docBenchPage(i, n int) string {
	var b strings.Builder
	fmt.Fprintf(&b, "+++\ntitle = \"Page %d\"\norder = %d\ndescription = \"Generated page %d.\"\n+++\n\n", i, i%20, i)
	id := fmt.Sprintf("stage-%04d", i)
	withBlock := i%5 != 4
	// The page before; a section's first page links to its last.
	prev := benchPageName(i + 19)
	if last := i - i%20 + 19; i%20 == 0 && last >= n {
		prev = "index.md" // the site ends within this section
	}
	for s := 0; s < 4; s++ {
		fmt.Fprintf(&b, "## Step %d of the build\n\nFit the part, check the clearance with a feeler gauge and note it in the log. "+
			"See [the previous page](%s) and the [section start](index.md).", s, prev)
		if withBlock && s == 1 {
			fmt.Fprintf(&b, " The stage sweeps =[%s.swept_volume cm3] and delivers =[%s.free_air_delivery L/min].", id, id)
		}
		b.WriteString("\n\n- clean the bore\n- oil the rings\n  - top ring first\n- fit the head\n\n")
		b.WriteString("| item | qty | note |\n|---|---:|---|\n| bolt | 4 | M6 |\n| washer | 4 | steel |\n\n")
	}
	b.WriteString(benchCode(i))
	if withBlock {
		bore := 25 + i%30
		charts := ""
		if i%20 == 3 {
			charts = "charts = [\"pv\"]\n"
		}
		fmt.Fprintf(&b, "```calc\nid = %q\nkind = \"compressor\"\ntitle = \"Stage %d\"\nbore = \"%d mm\"\nstroke = \"30 mm\"\n"+
			"rod_length = \"75 mm\"\nclearance_ratio = 0.05\nspeed = \"900 rpm\"\ndischarge_pressure = \"6 bar\"\n\n"+
			"[expect]\nswept_volume = \">= 1 cm3\"\nfree_air_delivery = \">= 1 L/min\"\n\n[show]\noutputs = [\"swept_volume cm3\", \"free_air_delivery L/min\"]\n%s```\n",
			id, i, bore, charts)
	}
	return b.String()
}

// chartPairs are the pairs of compressor charts the chart-heavy pages
// draw in turn, every chart the kind offers among them.
var chartPairs = [][2]string{{"pv", "torque"}, {"pv", "temperature"}, {"delivery", "torque"}, {"kinematics", "pv"}, {"temperature", "delivery"}}

// chartBenchPage is page i of WriteChartBenchSite, n pages.
func chartBenchPage(i, n int) string {
	var b strings.Builder
	id := fmt.Sprintf("stage-%04d", i)
	// The page before, or for a section's first the one after: the site
	// may end within any section.
	neighbour := benchPageName(i - 1)
	if i%20 == 0 {
		neighbour = "index.md"
		if i+1 < n {
			neighbour = benchPageName(i + 1)
		}
	}
	fmt.Fprintf(&b, "+++\ntitle = \"Stage %d\"\norder = %d\ndescription = \"Cylinder, crank and ratings of stage %d.\"\n+++\n\n", i, i%20, i)
	fmt.Fprintf(&b, "The stage is a single-acting cylinder on the bench crankcase. Fit the part, check the clearance with a feeler gauge "+
		"and note it in the log. See [the stage beside it](%s) and the [section start](index.md).\n\n", neighbour)
	bore, stroke := 25+i%30, 24+4*(i%4)
	rod, rpm := 2*stroke+20+5*(i%3), 600+100*(i%7)
	pressure, ratio := 4+i%5, 0.04+0.01*float64(i%3)
	pair := chartPairs[i%len(chartPairs)]
	b.WriteString("## Cylinder and crank\n\n")
	fmt.Fprintf(&b, "The bore is %d mm and the stroke %d mm, so one stroke sweeps =[%s.swept_volume cm3]. At %d rpm the piston "+
		"averages =[%s.mean_piston_speed], well inside what cast-iron rings tolerate, and the stage delivers "+
		"=[%s.free_air_delivery L/min] of free air against %d bar.\n\n", bore, stroke, id, rpm, id, id, pressure)
	fmt.Fprintf(&b, "```calc\nid = %q\nkind = \"compressor\"\ntitle = \"Stage %d\"\nbore = \"%d mm\"\nstroke = \"%d mm\"\n"+
		"rod_length = \"%d mm\"\nclearance_ratio = %.2f\nspeed = \"%d rpm\"\ndischarge_pressure = \"%d bar\"\npolytropic_index = 1.3\n\n"+
		"[expect]\nswept_volume = \">= 1 cm3\"\nfree_air_delivery = \">= 1 L/min\"\n\n"+
		"[show]\noutputs = [\"swept_volume cm3\", \"free_air_delivery L/min\", \"discharge_temperature degC\", \"shaft_power W\"]\n"+
		"charts = [%q, %q]\n```\n\n", id, i, bore, stroke, rod, ratio, rpm, pressure, pair[0], pair[1])
	fmt.Fprintf(&b, "## Reading the charts\n\nThe %s and %s charts above come from the same block. The air leaves the cylinder at "+
		"=[%s.discharge_temperature degC]; keep the delivery line clear of oil, and let the head cool before touching it. "+
		"The drive must supply =[%s.shaft_power W] at the crank.\n\n", pair[0], pair[1], id, id)
	b.WriteString("## Parts\n\n| part | qty | material | note |\n|---|---:|---|---|\n| piston | 1 | aluminium | two rings |\n" +
		"| connecting rod | 1 | steel | bronze small-end bush |\n| head bolt | 4 | steel | M6, torque in sequence |\n| reed valve | 2 | spring steel | inlet and delivery |\n\n")
	b.WriteString("## Assembly\n\n1. Clean the bore and oil the rings.\n2. Fit the piston with the ring gaps staggered.\n" +
		"   - top ring first\n   - gaps 120° apart\n3. Fit the head and tighten the bolts in a cross pattern.\n4. Turn the crank by hand through two revolutions.\n\n")
	for s, step := range []string{"the crankcase", "the cylinder", "the head and valves"} {
		fmt.Fprintf(&b, "### Step %d: %s\n\nWipe the faces, fit the part and check the clearance with a feeler gauge; note it in the "+
			"build log with the date. A clearance outside the drawing's limits means a part is wrong: stop and measure it "+
			"again rather than forcing it home.\n\n- clean the faces\n- oil the bearing surfaces\n  - thin oil only\n- fit and tighten\n\n"+
			"| fastener | qty | torque |\n|---|---:|---:|\n| M6 bolt | 4 | %d N m |\n| M5 screw | 6 | 5 N m |\n\n", s+1, step, 8+s)
	}
	b.WriteString("## Running in\n\nRun the stage unloaded for the first hour, then at half pressure for two hours, and check the " +
		"head bolts when it has cooled. Change the oil after the first ten hours: the running-in wear is in it. Listen for a " +
		"knock at top dead centre, which means too little clearance, and feel the delivery pipe, which should be hot but not " +
		"discoloured.\n\n| hours | load | check |\n|---:|---|---|\n| 0–1 | none | oil level, leaks |\n| 1–3 | half pressure | head bolts, valve noise |\n" +
		"| 10 | full | oil change |\n| 50 | full | valves, rings |\n\n")
	b.WriteString(benchCode(i))
	b.WriteString("The log the test rig writes:\n\n")
	b.WriteString(benchCode(i + 1))
	return b.String()
}

// benchEnvPages is $SPECGEN_BENCH_PAGES, or def when it is not set.
func benchEnvPages(tb testing.TB, def int) int {
	tb.Helper()
	s := os.Getenv("SPECGEN_BENCH_PAGES")
	if s == "" {
		return def
	}
	var n int
	if _, err := fmt.Sscan(s, &n); err != nil || n < 1 {
		tb.Fatalf("SPECGEN_BENCH_PAGES=%q: want a number of pages, 1 or more", s)
	}
	return n
}

// TestWriteBenchSite writes the benchmark site into $SPECGEN_BENCH_SITE
// (with $SPECGEN_BENCH_PAGES pages, default 1000, of the kind
// $SPECGEN_BENCH_KIND, "docs" or "charts", default "docs"), for
// .ci/bench.sh; it does nothing otherwise.
func TestWriteBenchSite(t *testing.T) {
	dir := os.Getenv("SPECGEN_BENCH_SITE")
	if dir == "" {
		t.Skip("set SPECGEN_BENCH_SITE to write the benchmark site")
	}
	kind := os.Getenv("SPECGEN_BENCH_KIND")
	if kind == "" {
		kind = docSiteKind
	}
	writeBenchSite(t, kind, dir, benchEnvPages(t, 1000))
}

// TestBenchFloor renders the site at $SPECGEN_FLOOR_SITE the floor's way
// into $SPECGEN_FLOOR_OUT, once, so that .ci/bench.sh can time the floor
// as a process beside specgen's; it does nothing otherwise.
func TestBenchFloor(t *testing.T) {
	root, out := os.Getenv("SPECGEN_FLOOR_SITE"), os.Getenv("SPECGEN_FLOOR_OUT")
	if root == "" || out == "" {
		t.Skip("set SPECGEN_FLOOR_SITE and SPECGEN_FLOOR_OUT to render a site the floor's way")
	}
	f, err := newFloor(root)
	if err != nil {
		t.Fatal(err)
	}
	if err := f.render(out); err != nil {
		t.Fatal(err)
	}
}

// TestBenchSiteBuilds keeps the benchmark sites valid as the checks grow:
// a generated site of each kind builds with no problem, the floor writes
// a page for each of its pages, and every page of the chart-heavy one
// draws its two charts.
func TestBenchSiteBuilds(t *testing.T) {
	for _, c := range []struct {
		kind  string
		pages int
	}{{docSiteKind, 230}, {chartSiteKind, 12}} {
		t.Run(c.kind, func(t *testing.T) {
			root := t.TempDir()
			writeBenchSite(t, c.kind, root, c.pages)
			s, err := Load(root)
			if err != nil {
				t.Fatal(err)
			}
			if _, err := s.Write(Options{}); err != nil {
				t.Fatal(err)
			}
			f, err := newFloor(root)
			if err != nil {
				t.Fatal(err)
			}
			out := t.TempDir()
			if err := f.render(out); err != nil {
				t.Fatal(err)
			}
			for _, rel := range f.rels {
				if _, err := os.Stat(filepath.Join(out, strings.TrimSuffix(rel, ".md")+".html")); err != nil {
					t.Errorf("the floor wrote no page for %s: %v", rel, err)
				}
			}
			if c.kind != chartSiteKind {
				return
			}
			for i := 0; i < c.pages; i++ {
				page := filepath.Join(root, DefaultOut, "part-00", fmt.Sprintf("section-%02d", i/20), strings.TrimSuffix(benchPageName(i), ".md")+".html")
				html, err := os.ReadFile(page)
				if err != nil {
					t.Fatal(err)
				}
				if got := strings.Count(string(html), `class="sg-chart"`); got != 2 {
					t.Errorf("%s: %d charts, want 2", page, got)
				}
			}
		})
	}
}

func benchBuild(b *testing.B, kind string) {
	root := b.TempDir()
	pages := benchEnvPages(b, 1000)
	writeBenchSite(b, kind, root, pages)
	b.ReportAllocs()
	for b.Loop() {
		// Load and Write: a cold build, never the cache's shortcut.
		s, err := Load(root)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := s.Write(Options{}); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(pages+1), "ns/page")
}

// BenchmarkBuild builds the generated documentation site
// ($SPECGEN_BENCH_PAGES pages, default 1,000); see ns/page.
func BenchmarkBuild(b *testing.B) { benchBuild(b, docSiteKind) }

// BenchmarkBuildCharts builds the generated chart-heavy site, every page a
// compressor block with two charts.
func BenchmarkBuildCharts(b *testing.B) { benchBuild(b, chartSiteKind) }

func benchFloor(b *testing.B, kind string) {
	root := b.TempDir()
	pages := benchEnvPages(b, 1000)
	writeBenchSite(b, kind, root, pages)
	f, err := newFloor(root)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		// A fresh folder each time: the floor creates its files, as a cold
		// build does.
		if err := f.render(b.TempDir()); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(pages+1), "ns/page")
}

// BenchmarkFloor renders the documentation site the floor's way (see
// floor); specgen's build is measured against it (BenchmarkBuild /
// BenchmarkFloor).
func BenchmarkFloor(b *testing.B) { benchFloor(b, docSiteKind) }

// BenchmarkFloorCharts renders the chart-heavy site the floor's way.
func BenchmarkFloorCharts(b *testing.B) { benchFloor(b, chartSiteKind) }

// benchEditedPage is the page of a generated site of n pages that the
// edit benchmarks change: one near the middle that is not a section's
// index and holds a block (on both kinds of site), as .ci/bench.sh picks.
func benchEditedPage(root string, n int) string {
	i := n / 2
	for i%20 == 0 || i%5 == 4 {
		i++
	}
	return filepath.Join(root, ContentDir, fmt.Sprintf("part-%02d", i/200), fmt.Sprintf("section-%02d", i/20%10), benchPageName(i))
}

// boreLine is the bore input of a generated page's block.
var boreLine = regexp.MustCompile(`(?m)^bore = "[0-9.]+ mm"$`)

// BenchmarkRebuildEdit builds the chart-heavy site again after one page
// changed: a sentence of its prose, or its block's bore. The target is a
// fifth of BenchmarkBuildCharts or less.
func BenchmarkRebuildEdit(b *testing.B) {
	edits := []struct {
		name string
		edit func(src string, i int) string
	}{
		{"prose", func(src string, i int) string {
			return strings.Replace(src, "Fit the part", fmt.Sprintf("Fit the part (revision %d)", i), 1)
		}},
		// A bore of a decimal millimetre differs from the generated whole
		// ones, and each edit from the last.
		{"input", func(src string, i int) string {
			return boreLine.ReplaceAllString(src, fmt.Sprintf(`bore = "%d.5 mm"`, 40+i%20))
		}},
	}
	for _, e := range edits {
		b.Run(e.name, func(b *testing.B) {
			root := b.TempDir()
			pages := benchEnvPages(b, 1000)
			WriteChartBenchSite(b, root, pages)
			if _, err := Build(root, Options{}); err != nil {
				b.Fatal(err)
			}
			page := benchEditedPage(root, pages)
			src, err := os.ReadFile(page)
			if err != nil {
				b.Fatal(err)
			}
			edited := 0
			b.ReportAllocs()
			for b.Loop() {
				edited++
				text := e.edit(string(src), edited)
				if text == string(src) {
					b.Fatalf("%s: the %s edit changed nothing", page, e.name)
				}
				if err := os.WriteFile(page, []byte(text), 0o644); err != nil {
					b.Fatal(err)
				}
				sum, err := Build(root, Options{})
				if err != nil {
					b.Fatal(err)
				}
				if sum.UpToDate {
					b.Fatalf("%s: the build after the %s edit was skipped", page, e.name)
				}
			}
		})
	}
}

// floor does the least any generator must do with a site's Markdown:
// goldmark with GFM, footnotes and heading ids, chroma highlighting of
// every fence (calc blocks too, as code), one html/template layout, and
// one HTML file written per page.
type floor struct {
	root   string
	rels   []string
	md     goldmark.Markdown
	layout *template.Template
}

func newFloor(root string) (*floor, error) {
	rels, err := findPages(root)
	if err != nil {
		return nil, err
	}
	return &floor{
		root: root,
		rels: rels,
		md: goldmark.New(
			goldmark.WithExtensions(extension.GFM, extension.Footnote),
			goldmark.WithParserOptions(parser.WithAutoHeadingID()),
			goldmark.WithRendererOptions(renderer.WithNodeRenderers(util.Prioritized(floorCode{}, 100))),
		),
		layout: template.Must(template.New("page").Parse(`<!DOCTYPE html><html><head><title>{{.Title}}</title></head><body><nav>{{range .Nav}}<a href="{{.}}">{{.}}</a>{{end}}</nav><main>{{.Body}}</main></body></html>`)),
	}, nil
}

// render writes every page into out, in parallel.
func (f *floor) render(out string) error {
	nav := []string{"index.html", "section-00/index.html", "section-01/index.html"}
	errs := make([]error, len(f.rels))
	calc.Parallel(len(f.rels), func(i int) {
		src, err := os.ReadFile(filepath.Join(f.root, ContentDir, f.rels[i]))
		if err != nil {
			errs[i] = err
			return
		}
		var body, page bytes.Buffer
		if err := f.md.Convert(src, &body); err != nil {
			errs[i] = err
			return
		}
		if err := f.layout.Execute(&page, map[string]any{"Title": f.rels[i], "Nav": nav, "Body": template.HTML(body.String())}); err != nil {
			errs[i] = err
			return
		}
		p := filepath.Join(out, strings.TrimSuffix(f.rels[i], ".md")+".html")
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			errs[i] = err
			return
		}
		errs[i] = os.WriteFile(p, page.Bytes(), 0o644)
	})
	return errors.Join(errs...)
}

// floorLexer looks lexers up once per language, as any generator that
// highlights a thousand pages must.
func floorLexer(lang string) chroma.Lexer {
	floorLexers.mu.Lock()
	defer floorLexers.mu.Unlock()
	if l, ok := floorLexers.m[lang]; ok {
		return l
	}
	l := lexers.Get(lang)
	if l == nil {
		l = lexers.Fallback
	}
	floorLexers.m[lang] = l
	return l
}

var floorLexers = struct {
	mu sync.Mutex
	m  map[string]chroma.Lexer
}{m: map[string]chroma.Lexer{}}

// floorCode highlights fenced code with chroma, as any generator would.
type floorCode struct{}

func (floorCode) RegisterFuncs(reg renderer.NodeRendererFuncRegisterer) {
	reg.Register(ast.KindFencedCodeBlock, func(w util.BufWriter, src []byte, n ast.Node, entering bool) (ast.WalkStatus, error) {
		if !entering {
			return ast.WalkContinue, nil
		}
		f := n.(*ast.FencedCodeBlock)
		var code bytes.Buffer
		for i := 0; i < f.Lines().Len(); i++ {
			seg := f.Lines().At(i)
			code.Write(seg.Value(src))
		}
		lexer := floorLexer(string(f.Language(src)))
		it, err := chroma.Coalesce(lexer).Tokenise(nil, code.String())
		if err == nil {
			_ = chromahtml.New(chromahtml.WithClasses(true)).Format(w, styles.Fallback, it)
		}
		return ast.WalkSkipChildren, nil
	})
}
