package render

import (
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"

	"strings"
	"testing"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/vg"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/units"
)

// TestDrawCompressorCharts draws every chart of a compressor block and
// checks what every chart must have.
func TestDrawCompressorCharts(t *testing.T) {
	e := evaluated(t, stageBlock)
	for _, name := range e.Block.Kind.Charts {
		c, err := e.Chart(name)
		if err != nil {
			t.Fatal(err)
		}
		d, err := DrawChart(c, "chart-low-"+name, "x.low."+name+".csv")
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		for _, want := range []string{`role="img"`, "<title id=", "<desc id=", `aria-labelledby="chart-low-` + name + `-title`} {
			if !strings.Contains(d.HTML, want) {
				t.Errorf("%s: lacks %s", name, want)
			}
		}
		if strings.Contains(d.HTML, "<?xml") || strings.Contains(d.HTML, "NaN") || strings.Contains(d.HTML, "Inf") {
			t.Errorf("%s: prolog or non-number in SVG", name)
		}
		if len(d.CSV) == 0 {
			t.Errorf("%s: no CSV", name)
		}
		if dir := os.Getenv("SPECGEN_CHART_DIR"); dir != "" {
			page := "<!DOCTYPE html><html><head><meta charset=utf-8><link rel=stylesheet href=specgen.css></head><body><main class=sg-body style='max-width:50rem;margin:2rem'>" + d.HTML + "</main></body></html>"
			_ = os.WriteFile(filepath.Join(dir, name+".html"), []byte(page), 0o644)
		}
	}
}

// TestDrawChartRefusesDegenerateRanges checks that data whose span float64
// arithmetic cannot scale to a canvas gives an error, not NaN in the SVG.
func TestDrawChartRefusesDegenerateRanges(t *testing.T) {
	for _, ys := range [][]float64{
		{0, 1e-320, 2e-320}, // subnormal span: the scale overflows
		{-1e308, 1e308, 0},  // the span itself overflows
	} {
		c := &calc.Chart{Name: "speeds", Title: "Speeds",
			X: calc.Axis{Label: "Crank angle", Dim: units.Dimensionless, Unit: ""},
			Panels: []calc.Panel{{Y: calc.Axis{Label: "Speed", Dim: units.Dimensionless, Unit: ""},
				Series: []calc.Series{{Name: "piston", X: []float64{0, 1, 2}, Y: ys}}}}}
		d, err := DrawChart(c, "chart-x", "")
		if err == nil {
			t.Errorf("y %v: drew %d bytes, want an error", ys, len(d.HTML))
			continue
		}
		if !strings.Contains(err.Error(), "range to draw") {
			t.Errorf("y %v: error %q does not say why", ys, err)
		}
	}
}

// Every chart's tick and point labels read as plain figures: no
// scientific notation, no float noise such as 9.999999999999999e-06, no
// long runs of digits such as 8000000.
func TestChartLabelsReadable(t *testing.T) {
	text := regexp.MustCompile(`<text[^>]*>([^<]*)</text>`)
	bad := regexp.MustCompile(`\de[-+]?\d|99999|00001|\d{5}`)
	for _, c := range chartCases(t) {
		html := c.draw(t).HTML
		for _, m := range text.FindAllStringSubmatch(html, -1) {
			if bad.MatchString(m[1]) {
				t.Errorf("%s: label %q", c.Name, m[1])
			}
		}
	}
}

func TestDecadeTicks(t *testing.T) {
	labels := func(lo, hi float64) []string {
		var out []string
		for _, tk := range (decadeTicks{}).Ticks(lo, hi) {
			if tk.Label != "" {
				out = append(out, tk.Label)
			}
		}
		return out
	}
	for _, c := range []struct {
		lo, hi float64
		want   string
	}{
		{0.5, 1200, "1 10 100 1000"},
		{300, 1013, "300 500 1000"},
		{0.12, 0.9, "0.2 0.3 0.5"},
		{2e-4, 900, "0.001 0.01 0.1 1 10 100"},
		{1.6e-7, 14.7, "10⁻⁶ 10⁻⁵ 10⁻⁴ 10⁻³ 10⁻² 10⁻¹ 1 10"},
		{3e-12, 2000, "10⁻¹¹   10⁻⁹   10⁻⁷   10⁻⁵   10⁻³   10⁻¹   10   10³"},
	} {
		if got := strings.Join(labels(c.lo, c.hi), " "); got != c.want {
			t.Errorf("%g to %g: %q, want %q", c.lo, c.hi, got, c.want)
		}
	}
}

// No two words of a chart overlap: tick labels, axis titles, process
// names and mark labels, measured as gonum/plot lays them out.
func TestChartWordsApart(t *testing.T) {
	text := regexp.MustCompile(`<text x="([^"]+)" y="([^"]+)" font-size="([^"]+)">([^<]*)</text>`)
	type box struct {
		word                   string
		minX, maxX, minY, maxY float64
	}
	for _, c := range chartCases(t) {
		var boxes []box
		for _, m := range text.FindAllStringSubmatch(c.draw(t).HTML, -1) {
			x, _ := strconv.ParseFloat(m[1], 64)
			y, _ := strconv.ParseFloat(m[2], 64)
			size, _ := strconv.ParseFloat(m[3], 64)
			w, h, d := chartText.Box(m[4], font.From(plot.DefaultFont, vg.Length(size)))
			b := box{m[4], x, x + float64(w), y - float64(h-d), y + float64(d)}
			for _, o := range boxes {
				if b.minX < o.maxX && o.minX < b.maxX && b.minY < o.maxY && o.minY < b.maxY {
					t.Errorf("%s: %q overlaps %q", c.Name, b.word, o.word)
				}
			}
			boxes = append(boxes, b)
		}
	}
}

func TestGroupDigits(t *testing.T) {
	for in, want := range map[string]string{
		"0": "0", "2500": "2500", "10000": "10\u00a0000", "-1500000": "-1\u00a0500\u00a0000",
		"123456": "123\u00a0456", "0.0015": "0.0015",
	} {
		if got := groupDigits(in); got != want {
			t.Errorf("groupDigits(%q) = %q, want %q", in, got, want)
		}
	}
}

// The data link names its chart for a list of the page's links.
func TestChartDataLinkNamed(t *testing.T) {
	for _, c := range chartCases(t)[:1] {
		ch := c.chart(t)
		d, err := DrawChart(ch, "c", "x.csv")
		if err != nil {
			t.Fatal(err)
		}
		if want := `data (CSV)<span class="sg-sr"> of ` + ch.Title + `</span></a>`; !strings.Contains(d.HTML, want) {
			t.Errorf("%s: no %q", c.Name, want)
		}
	}
}

// A chart uses its height: the words over the top panel (a mark's label)
// sit at its top edge, with no blank band above them. A log axis left
// one a fifth of the chart high.
func TestChartNoBlankTop(t *testing.T) {
	text := regexp.MustCompile(`<text x="[^"]+" y="([^"]+)"`)
	for _, c := range chartCases(t) {
		top := math.Inf(1)
		for _, m := range text.FindAllStringSubmatch(c.draw(t).HTML, -1) {
			y, _ := strconv.ParseFloat(m[1], 64)
			top = math.Min(top, y)
		}
		if top > 30 {
			t.Errorf("%s: the first word is %g below the top of the chart", c.Name, top)
		}
	}
}
