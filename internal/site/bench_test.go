package site

import (
	"bytes"
	"fmt"
	"html/template"
	"os"
	"path/filepath"
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

// WriteBenchSite writes a site of n pages shaped like real documentation:
// parts of ten sections of twenty pages, each page with headings, lists, a
// table, links, code in several languages and, on four pages in five, a
// calculation block with claims and inline values; one page in twenty
// draws a chart.
func WriteBenchSite(tb testing.TB, root string, n int) {
	tb.Helper()
	langs := []struct{ lang, code string }{
		{"python", "import time\n\ndef log(p):\n    print(f\"{time.time():.0f} {p:.2f}\")\n"},
		{"go", "package main\n\nfunc main() {\n\tfor i := 0; i < 3; i++ {\n\t\tprintln(i)\n\t}\n}\n"},
		{"sh", "set -e\nfor f in *.csv; do wc -l \"$f\"; done\n"},
		{"toml", "[switch]\ncut_in = \"6 bar\"\ncut_out = \"8 bar\"\n"},
	}
	for i := 0; i < n; i++ {
		dir := filepath.Join(root, "content", fmt.Sprintf("part-%02d", i/200), fmt.Sprintf("section-%02d", i/20%10))
		if err := os.MkdirAll(dir, 0o755); err != nil {
			tb.Fatal(err)
		}
		name := fmt.Sprintf("page-%03d.md", i%20)
		if i%20 == 0 {
			name = "index.md"
		}
		var b strings.Builder
		fmt.Fprintf(&b, "+++\ntitle = \"Page %d\"\norder = %d\ndescription = \"Generated page %d.\"\n+++\n\n", i, i%20, i)
		id := fmt.Sprintf("stage-%04d", i)
		withBlock := i%5 != 4
		// The first page of a section is its index.md.
		prev := fmt.Sprintf("page-%03d.md", (i+19)%20)
		if (i+19)%20 == 0 {
			prev = "index.md"
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
		l := langs[i%len(langs)]
		fmt.Fprintf(&b, "```%s\n%s```\n\n", l.lang, l.code)
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
		if err := os.WriteFile(filepath.Join(dir, name), []byte(b.String()), 0o644); err != nil {
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

// TestWriteBenchSite writes the benchmark site into $SPECGEN_BENCH_SITE
// (with $SPECGEN_BENCH_PAGES pages, default 1000), for .ci/bench.sh; it
// does nothing otherwise.
func TestWriteBenchSite(t *testing.T) {
	dir := os.Getenv("SPECGEN_BENCH_SITE")
	if dir == "" {
		t.Skip("set SPECGEN_BENCH_SITE to write the benchmark site")
	}
	n := 1000
	if s := os.Getenv("SPECGEN_BENCH_PAGES"); s != "" {
		if _, err := fmt.Sscan(s, &n); err != nil {
			t.Fatal(err)
		}
	}
	WriteBenchSite(t, dir, n)
}

// TestBenchSiteBuilds keeps the benchmark site valid as the checks grow: a
// site of two parts builds with no problem.
func TestBenchSiteBuilds(t *testing.T) {
	root := t.TempDir()
	WriteBenchSite(t, root, 240)
	s, err := Load(root)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := s.Write(Options{}); err != nil {
		t.Fatal(err)
	}
}

func benchBuild(b *testing.B, pages int) {
	root := b.TempDir()
	WriteBenchSite(b, root, pages)
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

// BenchmarkBuild builds the generated 1,000-page site; see ns/page.
func BenchmarkBuild(b *testing.B) { benchBuild(b, 1000) }

// BenchmarkFloor does the least any generator must do with the same
// Markdown: goldmark with GFM, footnotes and heading ids, chroma
// highlighting, one html/template layout, the files written. specgen's
// build is measured against it (BenchmarkBuild / BenchmarkFloor).
func BenchmarkFloor(b *testing.B) {
	root := b.TempDir()
	const pages = 1000
	WriteBenchSite(b, root, pages)
	rels, err := findPages(root)
	if err != nil {
		b.Fatal(err)
	}
	md := goldmark.New(
		goldmark.WithExtensions(extension.GFM, extension.Footnote),
		goldmark.WithParserOptions(parser.WithAutoHeadingID()),
		goldmark.WithRendererOptions(renderer.WithNodeRenderers(util.Prioritized(floorCode{}, 100))),
	)
	layout := template.Must(template.New("page").Parse(`<!DOCTYPE html><html><head><title>{{.Title}}</title></head><body><nav>{{range .Nav}}<a href="{{.}}">{{.}}</a>{{end}}</nav><main>{{.Body}}</main></body></html>`))
	nav := []string{"index.html", "section-00/index.html", "section-01/index.html"}
	out := b.TempDir()
	b.ReportAllocs()
	for b.Loop() {
		calc.Parallel(len(rels), func(i int) {
			src, err := os.ReadFile(filepath.Join(root, ContentDir, rels[i]))
			if err != nil {
				b.Error(err)
				return
			}
			var body, page bytes.Buffer
			if err := md.Convert(src, &body); err != nil {
				b.Error(err)
				return
			}
			_ = layout.Execute(&page, map[string]any{"Title": rels[i], "Nav": nav, "Body": template.HTML(body.String())})
			p := filepath.Join(out, strings.TrimSuffix(rels[i], ".md")+".html")
			_ = os.MkdirAll(filepath.Dir(p), 0o755)
			if err := os.WriteFile(p, page.Bytes(), 0o644); err != nil {
				b.Error(err)
			}
		})
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(pages+1), "ns/page")
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
