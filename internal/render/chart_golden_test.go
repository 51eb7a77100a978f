package render

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/BurntSushi/toml"

	"github.com/millrace-workshop/specgen/internal/calc"
)

var update = flag.Bool("update", false, "rewrite the golden SVGs and CSV in testdata/charts")

// chartCase is one file of testdata/charts: blocks, and the chart of one
// of them to draw.
type chartCase struct {
	Name   string
	Block  string   `toml:"block"`
	Chart  string   `toml:"chart"`
	Blocks []string `toml:"blocks"`
}

func chartCases(t testing.TB) []chartCase {
	files, _ := filepath.Glob(filepath.Join("..", "..", "testdata", "charts", "*.toml"))
	if len(files) == 0 {
		t.Fatal("no chart cases")
	}
	var cases []chartCase
	for _, f := range files {
		var c chartCase
		if _, err := toml.DecodeFile(f, &c); err != nil {
			t.Fatal(err)
		}
		c.Name = strings.TrimSuffix(filepath.Base(f), ".toml")
		cases = append(cases, c)
	}
	return cases
}

func (c chartCase) draw(t testing.TB) *DrawnChart {
	d, err := DrawChart(c.chart(t), "chart-"+c.Name, c.Name+".csv")
	if err != nil {
		t.Fatal(err)
	}
	return d
}

// chart evaluates the case's blocks and returns the chart it draws.
func (c chartCase) chart(t testing.TB) *calc.Chart {
	var blocks []*calc.Block
	for i, src := range c.Blocks {
		b, err := testCatalog(t).ParseBlock("testdata/charts/"+c.Name+".toml", 100*i, src)
		if err != nil {
			t.Fatal(err)
		}
		blocks = append(blocks, b)
	}
	set, err := testCatalog(t).Evaluate(blocks, calc.Options{SigFigs: 3})
	if err != nil {
		t.Fatal(err)
	}
	e, _ := set.Lookup(c.Block)
	ch, err := e.Chart(c.Chart)
	if err != nil {
		t.Fatal(err)
	}
	return ch
}

// TestGoldenCharts draws one chart of each type and compares the SVGs
// and the CSV with testdata/charts/*.svg.html and *.csv byte for byte;
// -update accepts new output (look at it in a browser before you commit
// it).
func TestGoldenCharts(t *testing.T) {
	kinds := map[string]bool{}
	for _, c := range chartCases(t) {
		t.Run(c.Name, func(t *testing.T) {
			d := c.draw(t)
			base := filepath.Join("..", "..", "testdata", "charts", c.Name)
			compareGolden(t, base+".svg.html", []byte(d.HTML))
			compareGolden(t, base+".csv", d.CSV)
			if again := c.draw(t); again.HTML != d.HTML || !bytes.Equal(again.CSV, d.CSV) {
				t.Error("two drawings of one chart differ")
			}
		})
		kinds[c.Name[:strings.IndexByte(c.Name, '-')]] = true
	}
	cat := testCatalog(t)
	for _, name := range cat.KindNames() {
		k, _ := cat.Kind(name)
		if len(k.Charts) > 0 && !kinds[name] {
			t.Errorf("kind %s draws charts but has no golden chart", name)
		}
	}
}

// compareGolden compares got with the golden file, or rewrites the file
// with -update.
func compareGolden(t *testing.T, golden string, got []byte) {
	t.Helper()
	if *update {
		if err := os.WriteFile(golden, got, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(golden)
	if err != nil {
		t.Fatalf("%v (run with -update to write it)", err)
	}
	if !bytes.Equal(got, want) {
		t.Errorf("output differs from %s (run go test ./internal/render -run GoldenCharts -update to accept)", golden)
	}
}

// BenchmarkChartTypes draws one chart of each type; each should cost
// under 2 ms.
func BenchmarkChartTypes(b *testing.B) {
	for _, c := range chartCases(b) {
		ch := c.chart(b)
		b.Run(c.Name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := DrawChart(ch, "chart", "x.csv"); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
