package render

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"math"
	"math/rand/v2"
	"strconv"
	"sync"
	"testing"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// The chart writers take shortcuts past the standard library and
// gonum/plot; these tests hold each shortcut to the bytes and lengths of
// the code it stands in for.

// TestAppendNumAsFormatFloat: a coordinate reads as strconv writes it
// rounded to a tenth, for every magnitude and at every rounding edge.
func TestAppendNumAsFormatFloat(t *testing.T) {
	want := func(v float64) string {
		v = math.Round(v*10) / 10
		if v == 0 {
			v = 0
		}
		return strconv.FormatFloat(v, 'f', -1, 64)
	}
	values := []float64{0, math.Copysign(0, -1), 0.04, -0.04, 0.05, -0.05, 0.95, -0.95, 9.95, 1e14 - 0.05, 1e14 + 0.05,
		123456789012.34, 1e15, -1e15, 1e16 + 1, 1e300, -1e-300, math.MaxFloat64,
		math.NaN(), math.Inf(1), math.Inf(-1)}
	rng := rand.New(rand.NewPCG(1, 2))
	for range 50000 {
		mag := math.Pow(10, rng.Float64()*20-4)
		v := (rng.Float64()*2 - 1) * mag
		values = append(values, v, math.Round(v*10)/10+0.05, float64(int64(v*10))/10)
	}
	for _, v := range values {
		if got := string(appendNum(nil, v)); got != want(v) {
			t.Fatalf("appendNum(%v) = %q, want %q", v, got, want(v))
		}
	}
}

// TestCSVNumberAsStrconv: a CSV value reads as strconv writes it to 8
// figures: random values of every magnitude, values a hair either side
// of a rounding half and of a power of ten, whole numbers, and the edges
// of the shortcut's range.
func TestCSVNumberAsStrconv(t *testing.T) {
	values := []float64{0, math.Copysign(0, -1), 1, -1, 0.1, 1e-14, 1e-15, 9.9999999e-15, 1e15, 999999999999999.9, 1e14,
		99999999.5, 99999999.49999999, 12345678.5, 1.23456785, 0.000123456785, 100000000, 1e8 - 0.5, 7, 1200, 12, 1.2e8,
		0.0001, 0.00001, 123456.78, 5e-324, math.MaxFloat64, math.NaN(), math.Inf(1), math.Inf(-1)}
	rng := rand.New(rand.NewPCG(3, 4))
	for range 150000 {
		e := rng.IntN(34) - 17
		v := (rng.Float64()*9 + 1) * math.Pow(10, float64(e))
		if rng.IntN(2) == 0 {
			v = -v
		}
		// A value whose eighth figure is followed by a 5, and its
		// neighbours.
		half := (math.Floor(rng.Float64()*9e7+1e7) + 0.5) * math.Pow(10, float64(e-7))
		ten := math.Pow(10, float64(e))
		values = append(values, v, half, math.Nextafter(half, 0), math.Nextafter(half, math.Inf(1)),
			math.Nextafter(ten, 0), math.Nextafter(ten, math.Inf(1)), float64(rng.IntN(1e9)), math.Float64frombits(rng.Uint64()))
	}
	for _, v := range values {
		want := strconv.FormatFloat(v, 'g', 8, 64)
		if got := string(appendCSVNumber(nil, v)); got != want {
			t.Fatalf("appendCSVNumber(%v) = %q, want %q", v, got, want)
		}
	}
}

// TestCSVFieldsAsEncodingCSV: a record's fields are quoted as
// encoding/csv quotes them.
func TestCSVFieldsAsEncodingCSV(t *testing.T) {
	fields := []string{"", "plain", "indicator cycle", "a,b", `say "hi"`, "two\nlines", "cr\rhere", " leading", "\tleading",
		"\u00a0no-break first", "\u2003em space first", `\.`, `\..`, "trailing ", "Cylinder pressure, absolute (bar)", "°C", "m³"}
	for _, f := range fields {
		var want bytes.Buffer
		w := csv.NewWriter(&want)
		_ = w.Write([]string{f})
		w.Flush()
		got := append(appendCSVField(nil, f), '\n')
		if !bytes.Equal(got, want.Bytes()) {
			t.Errorf("field %q: %q, want %q", f, got, want.Bytes())
		}
	}
}

// TestMeasuredTextAsPlain: the measuring handler gives gonum's plain text
// handler's extents and boxes to the bit, and draws text at the same
// points.
func TestMeasuredTextAsPlain(t *testing.T) {
	plain := plot.DefaultTextHandler
	words := []string{"", "0", "12.5", "−40", "1 000 000", "Cylinder volume (cm³)", "AVAWAY To", "re-expansion", "10⁻⁶", "two\nlines", "end\n"}
	for _, size := range []vg.Length{9.5, 10, 12, 12.5, 7.3} {
		for _, f := range []font.Font{font.From(plot.DefaultFont, size), {Typeface: "Liberation", Variant: "Serif", Size: size}} {
			if got, want := chartText.Extents(f), plain.Extents(f); got != want {
				t.Errorf("%v: extents %v, want %v", f, got, want)
			}
			for _, w := range words {
				gw, gh, gd := chartText.Box(w, f)
				ww, wh, wd := plain.Box(w, f)
				if gw != ww || gh != wh || gd != wd {
					t.Errorf("%v %q: box %v %v %v, want %v %v %v", f, w, gw, gh, gd, ww, wh, wd)
				}
				for _, rot := range []float64{0, math.Pi / 2} {
					sty := text.Style{Font: f, Rotation: rot, XAlign: text.XCenter, YAlign: text.YTop, Handler: chartText}
					got := &textRecorder{svgCanvas: newSVGCanvas(300, 200, colorClasses, nil)}
					chartText.Draw(got, w, sty, vg.Point{X: 40, Y: 50})
					sty.Handler = plain
					want := &textRecorder{svgCanvas: newSVGCanvas(300, 200, colorClasses, nil)}
					plain.Draw(want, w, sty, vg.Point{X: 40, Y: 50})
					if got.calls != want.calls {
						t.Errorf("%v %q rotated %g: drew\n%s\nwant\n%s", f, w, rot, got.calls, want.calls)
					}
				}
			}
		}
	}
}

// textRecorder notes every string drawn with its font, point and the
// canvas's transform, exactly.
type textRecorder struct {
	*svgCanvas
	calls string
}

func (r *textRecorder) FillString(f font.Face, pt vg.Point, txt string) {
	r.calls += fmt.Sprintf("%v %v %v %q\n", f.Font, pt, r.top().m, txt)
}

// TestChartsConcurrently: pages draw their charts in parallel, sharing the
// measured widths and the pooled buffers; every drawing is the one drawn
// alone.
func TestChartsConcurrently(t *testing.T) {
	cases := chartCases(t)
	charts := make([]*calc.Chart, len(cases))
	want := make([]*DrawnChart, len(cases))
	for i, c := range cases {
		charts[i] = c.chart(t)
		want[i] = c.draw(t)
	}
	var wg sync.WaitGroup
	errs := make(chan string, 4*len(cases))
	for g := range 4 {
		wg.Go(func() {
			for k := range cases {
				i := (k + g*5) % len(cases)
				d, err := DrawChart(charts[i], "chart-"+cases[i].Name, cases[i].Name+".csv")
				if err != nil || d.HTML != want[i].HTML || !bytes.Equal(d.CSV, want[i].CSV) {
					errs <- cases[i].Name
				}
			}
		})
	}
	wg.Wait()
	close(errs)
	for name := range errs {
		t.Errorf("%s: drawn alongside others, the chart differs", name)
	}
}
