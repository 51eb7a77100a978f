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
		for _, want := range []string{`role="img"`, "<title id=", "<desc id=", `aria-labelledby="chart-low-` + name + `-wide-title`, `aria-labelledby="chart-low-` + name + `-narrow-title`} {
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
		for _, tk := range (decadeTicks{most: 8}).Ticks(lo, hi) {
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

// No two words of a chart overlap, nor their halos: tick labels, axis
// titles, process names and mark labels, measured as gonum/plot lays them
// out.
func TestChartWordsApart(t *testing.T) {
	text := regexp.MustCompile(`<text x="([^"]+)" y="([^"]+)" font-size="([^"]+)">([^<]*)</text>`)
	type box struct {
		word                   string
		minX, maxX, minY, maxY float64
	}
	for _, c := range chartCases(t) {
		for _, svg := range drawings(c.draw(t).HTML) {
			var boxes []box
			for _, m := range text.FindAllStringSubmatch(svg, -1) {
				x, _ := strconv.ParseFloat(m[1], 64)
				y, _ := strconv.ParseFloat(m[2], 64)
				size, _ := strconv.ParseFloat(m[3], 64)
				w, h, d := chartText.Box(m[4], font.From(plot.DefaultFont, vg.Length(size)))
				// The words' halos, 1.5 points either side, must not touch.
				b := box{m[4], x - 1.5, x + float64(w) + 1.5, y - float64(h-d), y + float64(d)}
				for _, o := range boxes {
					if b.minX < o.maxX && o.minX < b.maxX && b.minY < o.maxY && o.minY < b.maxY {
						t.Errorf("%s: %q overlaps %q", c.Name, b.word, o.word)
					}
				}
				boxes = append(boxes, b)
			}
		}
	}
}

// drawings splits a drawn chart into its SVGs, wide and narrow.
func drawings(html string) []string {
	parts := strings.Split(html, `<svg class="sg-chart-svg `)[1:]
	for i, p := range parts {
		parts[i], _, _ = strings.Cut(p, "</svg>")
	}
	return parts
}

// TestChartDrawings: a chart comes wide and narrow, each named by the
// chart's title and description, the narrow one no wider than a phone's
// column (290 points) with text of 12 points or more.
func TestChartDrawings(t *testing.T) {
	size := regexp.MustCompile(`font-size="([^"]+)"`)
	for _, c := range chartCases(t) {
		d := c.draw(t)
		svgs := drawings(d.HTML)
		if len(svgs) != 2 || !strings.HasPrefix(svgs[0], "sg-chart-wide") || !strings.HasPrefix(svgs[1], "sg-chart-narrow") {
			t.Fatalf("%s: want a wide and a narrow drawing", c.Name)
		}
		for _, svg := range svgs {
			if !strings.Contains(svg, `role="img"`) || !strings.Contains(svg, "<title id=") || !strings.Contains(svg, "<desc id=") {
				t.Errorf("%s: a drawing without its name", c.Name)
			}
		}
		if !strings.Contains(svgs[1], `viewBox="0 0 290 `) {
			t.Errorf("%s: the narrow drawing is not 290 points wide", c.Name)
		}
		for _, m := range size.FindAllStringSubmatch(svgs[1], -1) {
			if v, _ := strconv.ParseFloat(m[1], 64); v < 12 {
				t.Errorf("%s: narrow drawing has %s-point text", c.Name, m[1])
			}
		}
	}
}

// TestNiceTicksAtMost: however a span falls, a linear axis carries no
// more labelled ticks than its layout allows, and at least two.
func TestNiceTicksAtMost(t *testing.T) {
	for _, most := range []int{wideChart.ticks, narrowChart.ticks} {
		for _, span := range []float64{0.7, 1, 3.3, 6, 9.9, 12, 49, 69.5, 101, 228, 999, 1510000} {
			for _, lo := range []float64{0, -span / 3, 1} {
				n := 0
				for _, tk := range (niceTicks{most: most}).Ticks(lo, lo+span) {
					if tk.Label != "" {
						n++
					}
				}
				if n > most || n < 2 {
					t.Errorf("span %g from %g: %d labelled ticks, want 2 to %d", span, lo, n, most)
				}
			}
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

// A chart uses its height: its top panel, or the words over it (a mark's
// label), sit at its top edge, with no blank band above them. A log axis
// left one a fifth of the chart high.
func TestChartNoBlankTop(t *testing.T) {
	text := regexp.MustCompile(`<text x="[^"]+" y="([^"]+)"|d="M[-0-9.]+ ([-0-9.]+)`)
	for _, c := range chartCases(t) {
		for _, svg := range drawings(c.draw(t).HTML) {
			top := math.Inf(1)
			for _, m := range text.FindAllStringSubmatch(svg, -1) {
				y, _ := strconv.ParseFloat(m[1]+m[2], 64)
				top = math.Min(top, y)
			}
			if top > 30 {
				t.Errorf("%s: the first word is %g below the top of the chart", c.Name, top)
			}
		}
	}
}
