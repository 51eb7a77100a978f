package render

import (
	"bytes"
	"errors"
	"fmt"
	"image/color"
	"math"
	"strconv"
	"strings"
	"sync"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// The chart palette. The canvas writes these colours as CSS classes
// (s0..s3, mk, ink), so the stylesheet decides the hues for light, dark and
// print; the values only have to be distinct.
var (
	seriesColors = []color.RGBA{{R: 1, A: 255}, {R: 2, A: 255}, {R: 3, A: 255}, {R: 4, A: 255}}
	inkColor     = color.RGBA{R: 5, A: 255}
	markColor    = color.RGBA{R: 6, A: 255}
	gridColor    = color.RGBA{R: 7, A: 255}
	colorClasses = map[color.RGBA]string{
		seriesColors[0]: "0", seriesColors[1]: "1", seriesColors[2]: "2", seriesColors[3]: "3",
		inkColor: "ink", markColor: "mk", gridColor: "grid",
	}
)

// chartLayout is the geometry of one drawing of a chart, in points. Text
// sizes are what gonum/plot measures with Liberation Sans; the page shows
// the text in a metric-compatible face.
type chartLayout struct {
	class               string // the drawing's CSS class
	width, panelHeight  float64
	axisFont, labelFont vg.Length
	ticks               int // the most labelled ticks on an axis
}

// Each chart is drawn twice: wide, for a column of text; and narrow, with
// larger text and fewer ticks, which the stylesheet shows where the chart
// has less than about 32rem (a phone, two charts side by side, print).
// At 290 points across a 375 px phone's column (some 294 px), 12-point
// text is 12 px.
var (
	wideChart   = chartLayout{class: "sg-chart-wide", width: 480, panelHeight: 190, axisFont: 10, labelFont: 9.5, ticks: 8}
	narrowChart = chartLayout{class: "sg-chart-narrow", width: 290, panelHeight: 210, axisFont: 12.5, labelFont: 12, ticks: 5}
)

// dashes gives each line style its pattern; the widths differ too, so
// series differ in greyscale and without colour.
func dashes(s calc.LineStyle) []vg.Length {
	switch s {
	case calc.Dashed:
		return []vg.Length{6, 3}
	case calc.Dotted:
		return []vg.Length{1.5, 2.5}
	case calc.DashDot:
		return []vg.Length{7, 2.5, 1.5, 2.5}
	}
	return nil
}

// DrawnChart is a chart as HTML (an inline SVG in a figure) with its data
// as CSV.
type DrawnChart struct {
	Name string
	HTML string
	CSV  []byte
}

// DrawChart draws a chart, wide and narrow; its errors do not name the
// chart, which the caller does. id makes the SVGs' element ids unique in
// the page; csvHref is the link to the chart's data.
func DrawChart(c *calc.Chart, id, csvHref string) (*DrawnChart, error) {
	sc := chartScratches.Get().(*chartScratch)
	defer chartScratches.Put(sc)
	sc.buf = append(sc.buf[:0], `<figure class="sg-chart" id="`...)
	sc.buf = appendEscaped(sc.buf, id)
	sc.buf = append(sc.buf, "\">\n"...)
	series := convertSeries(c)
	for _, l := range []chartLayout{wideChart, narrowChart} {
		if err := appendSVG(sc, c, series, l, id+strings.TrimPrefix(l.class, "sg-chart")); err != nil {
			return nil, err
		}
	}
	out := sc.buf
	out = append(out, `<figcaption><span class="sg-chart-title">`...)
	out = appendEscaped(out, c.Title)
	out = append(out, `</span><span class="sg-chart-key">`...)
	for _, panel := range c.Panels {
		for j, s := range panel.Series {
			out = append(out, `<span class="sg-key"><svg width="30" height="10" aria-hidden="true"><path class="s`...)
			out = strconv.AppendInt(out, int64(j%len(seriesColors)), 10)
			out = append(out, `" stroke-width="2"`...)
			out = appendDashAttr(out, s.Style)
			out = append(out, ` d="M1 5H29"/></svg>`...)
			out = appendEscaped(out, s.Name)
			out = append(out, `</span>`...)
		}
	}
	out = append(out, `</span>`...)
	if csvHref != "" {
		// The hidden words tell a list of the page's links which chart's data it is.
		out = append(out, ` <a class="sg-chart-data" href="`...)
		out = appendEscaped(out, csvHref)
		out = append(out, `">data (CSV)<span class="sg-sr"> of `...)
		out = appendEscaped(out, c.Title)
		out = append(out, `</span></a>`...)
	}
	out = append(out, "</figcaption>\n</figure>\n"...)
	sc.buf = out
	d := &DrawnChart{Name: c.Name, HTML: string(out)}
	// The CSV is written in the same buffer and copied out at its size.
	out, err := appendChartCSV(out[:0], c)
	if err != nil {
		return nil, err
	}
	sc.buf = out
	d.CSV = bytes.Clone(out)
	return d, nil
}

// chartScratch is the room a chart is drawn in, reused from chart to
// chart: its HTML and CSV are some tens of kilobytes each, and growing
// fresh buffers to that size for every chart was a good part of the bytes
// a build allocated.
type chartScratch struct {
	buf    []byte     // the HTML, then the CSV
	points []vg.Point // a line's points on the canvas
}

var chartScratches = sync.Pool{New: func() any {
	return &chartScratch{buf: make([]byte, 0, 64<<10), points: make([]vg.Point, 0, maxPoints+1)}
}}

// seriesPoints is one series of a chart as it is drawn: in display units,
// log10 taken on a log panel, thinned, with the range of all its points.
// err is the problem its data has, reported where the drawing reaches it.
type seriesPoints struct {
	pts                    plotter.XYs
	xMin, xMax, yMin, yMax float64
	err                    error
}

// convertSeries converts every series of a chart once for both drawings.
func convertSeries(c *calc.Chart) [][]seriesPoints {
	out := make([][]seriesPoints, len(c.Panels))
	for i, panel := range c.Panels {
		out[i] = make([]seriesPoints, len(panel.Series))
		for j, s := range panel.Series {
			out[i][j] = convertOne(s, c.X, panel.Y, c.Ambient)
		}
	}
	return out
}

func convertOne(s calc.Series, xAxis, yAxis calc.Axis, ambient float64) seriesPoints {
	sp := seriesPoints{xMin: math.Inf(1), xMax: math.Inf(-1), yMin: math.Inf(1), yMax: math.Inf(-1)}
	xConv, err := unitConversion(xAxis, ambient)
	if err == nil {
		err = checkFinite(s.X, xAxis, xConv)
	}
	if err != nil {
		sp.err = err
		return sp
	}
	yConv, err := unitConversion(yAxis, ambient)
	if err == nil {
		err = checkFinite(s.Y, yAxis, yConv)
	}
	if err != nil {
		sp.err = err
		return sp
	}
	n := len(s.X)
	if n != len(s.Y) || n < 2 {
		sp.err = fmt.Errorf("series %q has %d x and %d y values", s.Name, n, len(s.Y))
		return sp
	}
	step := thinStep(n)
	pts := make(plotter.XYs, 0, (n-1)/step+2)
	var last plotter.XY
	for k := range n {
		x, y := xConv.apply(s.X[k]), yConv.apply(s.Y[k])
		if yAxis.Log {
			if y <= 0 {
				sp.err = fmt.Errorf("series %q has a value at or below zero on a log scale", s.Name)
				return sp
			}
			y = math.Log10(y)
		}
		last = plotter.XY{X: x, Y: y}
		if k%step == 0 {
			pts = append(pts, last)
		}
		// On finite values the built-in min and max agree with math.Min
		// and math.Max, -0 included. Only an axis without a unit passes
		// on values that are not; the drawing refuses them.
		sp.xMin, sp.xMax = min(sp.xMin, x), max(sp.xMax, x)
		sp.yMin, sp.yMax = min(sp.yMin, y), max(sp.yMax, y)
	}
	if pts[len(pts)-1] != last {
		pts = append(pts, last)
	}
	// What plotter.NewLine refuses.
	for _, pt := range pts {
		if err := plotter.CheckFloats(pt.X, pt.Y); err != nil {
			sp.err = err
			return sp
		}
	}
	sp.pts = pts
	return sp
}

// appendSVG draws a chart in one layout as an inline SVG named by its
// title and description, appended to sc.buf; id makes its element ids
// unique in the page.
func appendSVG(sc *chartScratch, c *calc.Chart, series [][]seriesPoints, l chartLayout, id string) error {
	out := sc.buf
	noteRoom := 0.0
	if c.EdgeNote != "" {
		noteRoom = float64(l.labelFont) + 4
	}
	height := l.panelHeight*float64(len(c.Panels)) + 40 + noteRoom
	tid, did := id+"-title", id+"-desc"
	out = append(out, `<svg class="sg-chart-svg `...)
	out = append(out, l.class...)
	out = append(out, `" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 `...)
	out = strconv.AppendFloat(out, l.width, 'f', -1, 64)
	out = append(out, ' ')
	out = strconv.AppendFloat(out, height, 'f', -1, 64)
	out = append(out, `" role="img" aria-labelledby="`...)
	out = appendEscaped(out, tid)
	out = append(out, ' ')
	out = appendEscaped(out, did)
	out = append(out, "\">\n<title id=\""...)
	out = appendEscaped(out, tid)
	out = append(out, `">`...)
	out = appendEscaped(out, c.Title)
	out = append(out, "</title>\n<desc id=\""...)
	out = appendEscaped(out, did)
	out = append(out, `">`...)
	out = appendEscaped(out, c.Desc)
	out = append(out, "</desc>\n"...)
	canvas := newSVGCanvas(vg.Length(l.width), vg.Length(height), colorClasses, out)
	canvas.points = sc.points
	defer func() { sc.buf, sc.points = canvas.buf, canvas.points }()
	plots := make([][]*plot.Plot, len(c.Panels))
	xMin, xMax := math.Inf(1), math.Inf(-1)
	for i, panel := range c.Panels {
		p := plot.New()
		useMeasuredText(p)
		p.BackgroundColor = nil
		styleAxis(&p.X, l)
		styleAxis(&p.Y, l)
		p.Y.Label.Text = axisLabel(panel.Y)
		var xTicks plot.Ticker = niceTicks{most: l.ticks}
		if c.X.Unit == "deg" {
			xTicks = degreeTicks{}
		}
		if i == len(c.Panels)-1 {
			p.X.Label.Text = axisLabel(c.X)
			p.X.Tick.Marker = &onceTicks{Ticker: xTicks}
		} else {
			p.X.Tick.Marker = &onceTicks{Ticker: unlabelled{xTicks}}
		}
		var yTicks plot.Ticker = niceTicks{most: l.ticks}
		// A log panel plots log10 of its values on a linear axis, ticked
		// as decades: gonum's log scale places the axis title's box at
		// the log of the arithmetic middle and left a blank band above
		// the plot.
		if panel.Y.Log {
			yTicks = exponentTicks{most: l.ticks}
		}
		p.Y.Tick.Marker = &onceTicks{Ticker: yTicks}
		grid := plotter.NewGrid()
		grid.Vertical.Color, grid.Horizontal.Color = gridColor, gridColor
		grid.Vertical.Width, grid.Horizontal.Width = 0.5, 0.5
		p.Add(chartGrid{grid})
		words := &labelLayer{}
		yMin, yMax := math.Inf(1), math.Inf(-1)
		for j, s := range panel.Series {
			sp := series[i][j]
			if sp.err != nil {
				return sp.err
			}
			xMin, xMax = math.Min(xMin, sp.xMin), math.Max(xMax, sp.xMax)
			yMin, yMax = math.Min(yMin, sp.yMin), math.Max(yMax, sp.yMax)
			line := &plotter.Line{XYs: sp.pts, LineStyle: plotter.DefaultLineStyle}
			line.Color = seriesColors[j%len(seriesColors)]
			line.Width = 1.8
			line.Dashes = dashes(s.Style)
			p.Add(newPlainLine(line))
			if err := addLabels(words, s.Labels, c, panel, l); err != nil {
				return err
			}
		}
		// Magnitudes start from zero, so that slopes are not exaggerated.
		if !panel.Y.Log && yMin > 0 {
			yMin = 0
			p.Y.Min = 0
		}
		for _, m := range panel.Marks {
			if err := addMark(p, words, m, c, panel, yMin, yMax, l); err != nil {
				return err
			}
		}
		if len(words.sets) > 0 {
			p.Add(words)
		}
		plots[i] = []*plot.Plot{p}
	}
	for _, row := range plots {
		row[0].X.Min, row[0].X.Max = xMin, xMax
	}
	tiles := draw.Tiles{Rows: len(c.Panels), Cols: 1, PadY: 12, PadTop: 8 + vg.Length(noteRoom), PadBottom: 4, PadLeft: 4, PadRight: 12}
	dc := draw.New(canvas)
	canvases := alignPlots(plots, tiles, dc)
	for i, row := range plots {
		row[0].Draw(canvases[i][0])
	}
	if c.EdgeNote != "" {
		// Above the top right corner, where the x axis runs on.
		style := text.Style{Color: markColor, Font: font.From(plot.DefaultFont, l.labelFont), XAlign: draw.XRight, YAlign: draw.YTop, Handler: chartText}
		dc.FillText(style, vg.Point{X: vg.Length(l.width) - tiles.PadRight, Y: vg.Length(height) - 4}, c.EdgeNote)
	}
	if canvas.nonFinite {
		return errors.New("its values span too narrow or too wide a range to draw; check the block's inputs for a size or speed far from any real machine's")
	}
	canvas.buf = append(canvas.buf, "</svg>\n"...)
	return nil
}

// appendDashAttr appends the stroke-dasharray attribute of a line style,
// or nothing for a solid line.
func appendDashAttr(b []byte, s calc.LineStyle) []byte {
	d := dashes(s)
	if len(d) == 0 {
		return b
	}
	b = append(b, ` stroke-dasharray="`...)
	for i, v := range d {
		if i > 0 {
			b = append(b, ' ')
		}
		b = appendNum(b, float64(v))
	}
	return append(b, '"')
}

func styleAxis(a *plot.Axis, l chartLayout) {
	a.Color = inkColor
	a.Label.TextStyle.Color = inkColor
	a.Label.TextStyle.Font.Size = l.axisFont
	a.Tick.Color = inkColor
	a.Tick.Label.Color = inkColor
	a.Tick.Label.Font.Size = l.labelFont
	a.Width = 0.8
	a.Padding = 2
}

// axisLabel is "Label (unit)"; a pressure unit's gauge or absolute mark
// goes into the words: "Cylinder pressure, absolute (bar)".
func axisLabel(a calc.Axis) string {
	if a.Unit == "" {
		return a.Label
	}
	unit := units.Pretty(a.Unit)
	if u, ok := units.Known(a.Unit); ok && u.Dim == units.Pressure {
		base := strings.TrimSuffix(strings.TrimSuffix(unit, "(a)"), "(g)")
		switch u.Ref {
		case units.Absolute:
			if base != unit {
				return a.Label + ", absolute (" + base + ")"
			}
		default:
			return a.Label + ", gauge (" + base + ")"
		}
	}
	return a.Label + " (" + unit + ")"
}

// niceTicks marks a linear axis every 1, 2 or 5 × 10^k, the finest step
// that labels at most most ticks, with minor ticks between and labels
// with no more decimals than the step needs.
type niceTicks struct{ most int }

func (n niceTicks) Ticks(lo, hi float64) []plot.Tick {
	span := hi - lo
	if !(span > 0) || math.IsInf(span, 0) {
		return []plot.Tick{{Value: lo, Label: strconv.FormatFloat(lo, 'g', 4, 64)}}
	}
	labelled := func(step float64) int {
		return int(math.Floor(hi/step+1e-9)-math.Ceil(lo/step-1e-9)) + 1
	}
	mag := math.Pow(10, math.Floor(math.Log10(span/float64(n.most))))
	step := 10 * mag
	for _, m := range []float64{1, 2, 5} {
		if labelled(m*mag) <= n.most {
			step = m * mag
			break
		}
	}
	minor := step / 5
	if step/mag == 2 {
		minor = step / 4
	}
	decimals := max(0, -int(math.Floor(math.Log10(step)+1e-9)))
	var ticks []plot.Tick
	first := math.Ceil(lo/minor-1e-9) * minor
	for i := 0; ; i++ {
		v := first + float64(i)*minor
		if v > hi+minor*1e-6 {
			break
		}
		t := plot.Tick{Value: v}
		if k := v / step; math.Abs(k-math.Round(k)) < 1e-6 {
			if math.Abs(v) < step*1e-9 {
				v = 0
			}
			t.Label = display.Minus(groupDigits(strconv.FormatFloat(v, 'f', decimals, 64)))
		}
		ticks = append(ticks, t)
	}
	return ticks
}

// decadeTicks marks a log axis at each power of ten, with minor ticks at 2
// to 9 times it. Each decade is math.Pow10 itself: gonum's log ticker
// multiplies its way down and printed 9.999999999999999e-06. Past a
// thousandth or ten thousand the labels are powers (10⁻⁶), and beyond
// most decades every other one (every third, ...) is labelled, so that
// they stay apart.
type decadeTicks struct{ most int }

func (d decadeTicks) Ticks(lo, hi float64) []plot.Tick {
	if !(lo > 0) || !(hi >= lo) || math.IsInf(hi, 0) {
		return nil
	}
	kLo := int(math.Floor(math.Log10(lo) + 1e-9))
	kHi := int(math.Ceil(math.Log10(hi) - 1e-9))
	// The decades drawn, which carry the labels.
	first := int(math.Ceil(math.Log10(lo) - 1e-9))
	last := int(math.Floor(math.Log10(hi) + 1e-9))
	every := 1 + (last-first)/d.most
	powers := first < -3 || last > 4
	var ticks []plot.Tick
	for k := kLo; k <= kHi; k++ {
		for m := 1; m <= 9; m++ {
			v := float64(m) * math.Pow10(k)
			if v < lo*(1-1e-9) || v > hi*(1+1e-9) {
				continue
			}
			t := plot.Tick{Value: v}
			switch {
			case m != 1:
			case (k-first)%every != 0:
				t.Label = " " // a major tick, unlabelled
			default:
				t.Label = decadeLabel(k, powers)
			}
			ticks = append(ticks, t)
		}
	}
	// Less than a decade and a half: one labelled decade gives no scale, so
	// 2, 3 and 5 times each decade are labelled too.
	if last <= first {
		for i, t := range ticks {
			k := int(math.Floor(math.Log10(t.Value) + 1e-9))
			m := t.Value / math.Pow10(k)
			if r := math.Round(m); math.Abs(m-r) < 1e-9 && (r == 2 || r == 3 || r == 5) {
				ticks[i].Label = groupDigits(strconv.FormatFloat(t.Value, 'f', max(0, -k), 64))
			}
		}
	}
	return ticks
}

// exponentTicks marks an axis of log10 values as decadeTicks marks the
// values themselves.
type exponentTicks struct{ most int }

func (e exponentTicks) Ticks(lo, hi float64) []plot.Tick {
	ticks := decadeTicks(e).Ticks(math.Pow(10, lo), math.Pow(10, hi))
	for i := range ticks {
		ticks[i].Value = math.Log10(ticks[i].Value)
	}
	return ticks
}

// decadeLabel writes 10^k as "0.001" or "1000", or with powers as "10⁻⁶";
// 1 and 10 stay plain either way.
func decadeLabel(k int, powers bool) string {
	if !powers || k == 0 || k == 1 {
		return groupDigits(strconv.FormatFloat(math.Pow10(k), 'f', -1, 64))
	}
	const sup = "⁰¹²³⁴⁵⁶⁷⁸⁹"
	digits := []rune(sup)
	var b strings.Builder
	b.WriteString("10")
	if k < 0 {
		b.WriteString("⁻")
		k = -k
	}
	for _, d := range strconv.Itoa(k) {
		b.WriteRune(digits[d-'0'])
	}
	return b.String()
}

// groupDigits splits a whole number of five or more digits into groups
// of three with no-break spaces (ISO 80000-1), so that 8000000 reads as
// 8 000 000. Four digits stay together, as the standard allows.
func groupDigits(s string) string {
	sign := ""
	if strings.HasPrefix(s, "-") {
		sign, s = "-", s[1:]
	}
	if len(s) < 5 || strings.ContainsAny(s, ".e") {
		return sign + s
	}
	var b strings.Builder
	for i, d := range s {
		if i > 0 && (len(s)-i)%3 == 0 {
			b.WriteRune('\u00a0')
		}
		b.WriteRune(d)
	}
	return sign + b.String()
}

// degreeTicks marks crank angles every 90° with minor ticks every 30°.
type degreeTicks struct{}

func (degreeTicks) Ticks(min, max float64) []plot.Tick {
	var ticks []plot.Tick
	for v := math.Ceil(min/30) * 30; v <= max+1e-9; v += 30 {
		t := plot.Tick{Value: v}
		if math.Mod(v, 90) == 0 {
			t.Label = strconv.FormatFloat(v, 'f', -1, 64)
		}
		ticks = append(ticks, t)
	}
	return ticks
}

// toUnit converts SI values to an axis's display unit.
func toUnit(si []float64, a calc.Axis, ambient float64) ([]float64, error) {
	conv, err := unitConversion(a, ambient)
	if err != nil {
		return nil, err
	}
	out := make([]float64, len(si))
	if conv.identity {
		copy(out, si)
		return out, nil
	}
	for i, v := range si {
		out[i] = conv.apply(v)
		if math.IsNaN(out[i]) || math.IsInf(out[i], 0) {
			return nil, nonFiniteError(a)
		}
	}
	return out, nil
}

// affine converts SI values to a display unit. Every unit specgen knows is
// an affine function of SI (a factor, and an offset for degC, degF and
// gauge pressures), so two conversions fix it for all values. An axis
// without a unit shows its values as they are.
type affine struct {
	at0, slope float64
	identity   bool
}

func (f affine) apply(v float64) float64 {
	if f.identity {
		return v
	}
	return f.at0 + f.slope*v
}

// unitConversion returns the conversion to an axis's display unit.
func unitConversion(a calc.Axis, ambient float64) (affine, error) {
	if a.Unit == "" {
		return affine{identity: true}, nil
	}
	at0, err := units.FromSI(0, a.Dim, a.Unit, ambient)
	if err != nil {
		return affine{}, fmt.Errorf("axis %q: %w", a.Label, err)
	}
	at1, err := units.FromSI(1, a.Dim, a.Unit, ambient)
	if err != nil {
		return affine{}, fmt.Errorf("axis %q: %w", a.Label, err)
	}
	return affine{at0: at0, slope: at1 - at0}, nil
}

func nonFiniteError(a calc.Axis) error {
	return fmt.Errorf("axis %q: a value is not a finite number", a.Label)
}

// maxPoints is the most points a drawn line keeps: more are invisible at
// chart size and cost time and bytes. The CSV keeps them all.
const maxPoints = 361

// thinStep is the k of a line of n points that keeps every k-th point,
// and its last, to draw at most maxPoints.
func thinStep(n int) int {
	if n <= maxPoints {
		return 1
	}
	return (n + maxPoints - 2) / (maxPoints - 1)
}

func addLabels(words *labelLayer, labels []calc.PointLabel, c *calc.Chart, panel calc.Panel, l chartLayout) error {
	if len(labels) == 0 {
		return nil
	}
	xy := plotter.XYLabels{XYs: make(plotter.XYs, len(labels)), Labels: make([]string, len(labels))}
	for i, l := range labels {
		x, err := toUnit([]float64{l.X}, c.X, c.Ambient)
		if err != nil {
			return err
		}
		y, err := toUnit([]float64{l.Y}, panel.Y, c.Ambient)
		if err != nil {
			return err
		}
		if panel.Y.Log {
			y[0] = math.Log10(y[0])
		}
		xy.XYs[i] = plotter.XY{X: x[0], Y: y[0]}
		xy.Labels[i] = l.Text
	}
	// One Labels plotter per placement: the offset is per plotter.
	for _, below := range []bool{false, true} {
		var part plotter.XYLabels
		for i, l := range labels {
			if l.Below == below {
				part.XYs = append(part.XYs, xy.XYs[i])
				part.Labels = append(part.Labels, xy.Labels[i])
			}
		}
		if len(part.XYs) == 0 {
			continue
		}
		lab, err := plotter.NewLabels(part)
		if err != nil {
			return err
		}
		for i := range lab.TextStyle {
			lab.TextStyle[i].Color = inkColor
			lab.TextStyle[i].Font.Size = l.labelFont
			lab.TextStyle[i].Handler = chartText
		}
		lab.Offset = vg.Point{X: 4, Y: 4}
		if below {
			lab.Offset = vg.Point{X: 4, Y: -l.labelFont - 4}
		}
		words.sets = append(words.sets, lab)
	}
	return nil
}

// addMark draws a reference line with its label.
func addMark(p *plot.Plot, words *labelLayer, m calc.Mark, c *calc.Chart, panel calc.Panel, yMin, yMax float64, l chartLayout) error {
	var pts plotter.XYs
	var at plotter.XY
	if m.Vertical {
		x, err := toUnit([]float64{m.Value}, c.X, c.Ambient)
		if err != nil {
			return err
		}
		pts = plotter.XYs{{X: x[0], Y: yMin}, {X: x[0], Y: yMax}}
		at = plotter.XY{X: x[0], Y: yMax}
	} else {
		y, err := toUnit([]float64{m.Value}, panel.Y, c.Ambient)
		if err != nil {
			return err
		}
		if panel.Y.Log {
			y[0] = math.Log10(y[0])
		}
		lo, hi := p.X.Min, p.X.Max
		if math.IsInf(lo, 0) || lo == hi {
			lo, hi = 0, 1
		}
		pts = plotter.XYs{{X: lo, Y: y[0]}, {X: hi, Y: y[0]}}
		at = plotter.XY{X: lo, Y: y[0]}
	}
	line, err := plotter.NewLine(pts)
	if err != nil {
		return err
	}
	line.Color, line.Width, line.Dashes = markColor, 1, []vg.Length{2, 2}
	p.Add(&markLine{plainLine: newPlainLine(line)})
	if m.Label == "" {
		return nil
	}
	lab, err := plotter.NewLabels(plotter.XYLabels{XYs: plotter.XYs{at}, Labels: []string{m.Label}})
	if err != nil {
		return err
	}
	lab.TextStyle[0].Color = markColor
	lab.TextStyle[0].Font.Size = l.labelFont
	lab.TextStyle[0].Handler = chartText
	lab.Offset = vg.Point{X: 3, Y: 3}
	words.sets = append(words.sets, lab)
	return nil
}

// onceTicks remembers the ticks of an axis: gonum/plot asks an axis for
// its ticks a dozen times while it lays out and draws a chart, always for
// the same range once the range is set. The ticks it returns are only
// read.
type onceTicks struct {
	plot.Ticker
	lo, hi float64
	ticks  []plot.Tick
	done   bool
}

func (o *onceTicks) Ticks(lo, hi float64) []plot.Tick {
	if !o.done || lo != o.lo || hi != o.hi {
		o.ticks, o.lo, o.hi, o.done = o.Ticker.Ticks(lo, hi), lo, hi, true
	}
	return o.ticks
}

// unlabelled keeps a ticker's ticks and blanks their labels, for the x
// axes of upper panels. A blank, not an empty, label keeps a tick major,
// so the grid still draws its line.
type unlabelled struct{ plot.Ticker }

func (u unlabelled) Ticks(min, max float64) []plot.Tick {
	ticks := u.Ticker.Ticks(min, max)
	for i := range ticks {
		if ticks[i].Label != "" {
			ticks[i].Label = " "
		}
	}
	return ticks
}

// labelLayer draws a panel's words (process names, mark labels) after its
// lines, moving a word that would overlap one already drawn a line
// towards the middle of the panel: close stages, or two limits at one
// temperature, printed over each other.
type labelLayer struct {
	sets  []*plotter.Labels
	boxes boxMemo
}

func (l *labelLayer) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	mid := (c.Min.Y + c.Max.Y) / 2
	var placed []vg.Rectangle
	for _, set := range l.sets {
		for i, word := range set.Labels {
			pt := vg.Point{X: trX(set.XYs[i].X), Y: trY(set.XYs[i].Y)}
			if !c.Contains(pt) {
				continue
			}
			pt = pt.Add(set.Offset)
			box := set.TextStyle[i].Rectangle(word)
			// The halo round each word (3 px of the paper's colour) must
			// not cover its neighbour either.
			box.Min.X, box.Max.X = box.Min.X-wordGap, box.Max.X+wordGap
			step := box.Max.Y - box.Min.Y + 1
			if pt.Y > mid {
				step = -step
			}
			at := pt
			for _, k := range []vg.Length{0, 1, 2, 3, 4, -1, -2} {
				try := vg.Point{X: pt.X, Y: pt.Y + k*step}
				if !overlapsAny(box.Add(try), placed) {
					at = try
					break
				}
			}
			placed = append(placed, box.Add(at))
			c.FillText(set.TextStyle[i], at, word)
		}
	}
}

// wordGap is the room, in points, kept either side of a word on a chart.
const wordGap = 2.5

func overlapsAny(r vg.Rectangle, rs []vg.Rectangle) bool {
	for _, o := range rs {
		if r.Min.X < o.Max.X && o.Min.X < r.Max.X && r.Min.Y < o.Max.Y && o.Min.Y < r.Max.Y {
			return true
		}
	}
	return false
}

func (l *labelLayer) DataRange() (xmin, xmax, ymin, ymax float64) {
	xmin, ymin = math.Inf(1), math.Inf(1)
	xmax, ymax = math.Inf(-1), math.Inf(-1)
	for _, set := range l.sets {
		a, b, c, d := set.DataRange()
		xmin, xmax = math.Min(xmin, a), math.Max(xmax, b)
		ymin, ymax = math.Min(ymin, c), math.Max(ymax, d)
	}
	return xmin, xmax, ymin, ymax
}

func (l *labelLayer) GlyphBoxes(p *plot.Plot) []plot.GlyphBox {
	return l.boxes.get(p, func() []plot.GlyphBox {
		var out []plot.GlyphBox
		for _, set := range l.sets {
			out = append(out, set.GlyphBoxes(p)...)
		}
		return out
	})
}
