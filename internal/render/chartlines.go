package render

import (
	"math"
	"slices"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// plainLine is a line without glyph boxes: gonum/plot asks a line for a
// box around every point, many times while it lays out the axes, and that
// was most of a chart's cost. A line needs no room beyond its data range,
// which it keeps rather than work out through gonum's interfaces each time.
type plainLine struct {
	line                   *plotter.Line
	xMin, xMax, yMin, yMax float64
}

func newPlainLine(line *plotter.Line) plainLine {
	l := plainLine{line: line, xMin: math.Inf(1), xMax: math.Inf(-1), yMin: math.Inf(1), yMax: math.Inf(-1)}
	// A line's points are finite (plotter.NewLine and convertOne refuse
	// others), where the built-in min and max agree with plotter.Range's
	// math.Min and math.Max, -0 included.
	for _, xy := range line.XYs {
		l.xMin, l.xMax = min(l.xMin, xy.X), max(l.xMax, xy.X)
		l.yMin, l.yMax = min(l.yMin, xy.Y), max(l.yMax, xy.Y)
	}
	return l
}

func (l plainLine) DataRange() (xmin, xmax, ymin, ymax float64) {
	return l.xMin, l.xMax, l.yMin, l.yMax
}

// Plot draws the line as plotter.Line draws a line without fill or steps,
// and, on an svgCanvas when every point lies within the plot, as one
// polyline written straight to the canvas: clipping would leave it as it
// is, and no vg.Path need be built.
func (l plainLine) Plot(c draw.Canvas, p *plot.Plot) {
	svg, ok := svgUnder(c.Canvas)
	m, linear := newLinearMap(p, c)
	if !ok || !linear || l.line.FillColor != nil || l.line.StepStyle != plotter.NoStep {
		l.line.Plot(c, p)
		return
	}
	pts := slices.Grow(svg.points[:0], len(l.line.XYs))
	for _, xy := range l.line.XYs {
		pt := vg.Point{X: m.x(xy.X), Y: m.y(xy.Y)}
		if !c.Contains(pt) {
			l.line.Plot(c, p)
			return
		}
		pts = append(pts, pt)
	}
	svg.points = pts
	if l.line.LineStyle.Width == 0 || len(pts) < 2 {
		return
	}
	c.SetLineStyle(l.line.LineStyle)
	svg.strokePolyline(pts)
}

// markLine is a reference line: unlike a series, it keeps the glyph boxes
// of its two ends, which the axes make room for.
type markLine struct {
	plainLine
	boxes boxMemo
}

func (m *markLine) GlyphBoxes(p *plot.Plot) []plot.GlyphBox {
	return m.boxes.get(p, func() []plot.GlyphBox { return m.line.GlyphBoxes(p) })
}

// boxMemo keeps a plotter's glyph boxes, which gonum/plot asks for each
// time it pads an axis, for as long as the plot's ranges stay as they
// were. Callers copy the boxes; they never change them.
type boxMemo struct {
	ranges [4]float64
	boxes  []plot.GlyphBox
	done   bool
}

func (m *boxMemo) get(p *plot.Plot, boxes func() []plot.GlyphBox) []plot.GlyphBox {
	ranges := [4]float64{p.X.Min, p.X.Max, p.Y.Min, p.Y.Max}
	if !m.done || ranges != m.ranges {
		m.boxes, m.ranges, m.done = boxes(), ranges, true
	}
	return m.boxes
}

// chartGrid draws a plotter.Grid's lines as it does, straight to an
// svgCanvas.
type chartGrid struct{ *plotter.Grid }

func (g chartGrid) Plot(c draw.Canvas, p *plot.Plot) {
	svg, ok := svgUnder(c.Canvas)
	m, linear := newLinearMap(p, c)
	if !ok || !linear || g.Vertical.Color == nil || g.Horizontal.Color == nil {
		g.Grid.Plot(c, p)
		return
	}
	for _, tk := range p.X.Tick.Marker.Ticks(p.X.Min, p.X.Max) {
		x := m.x(tk.Value)
		if tk.IsMinor() || x > c.Max.X || x < c.Min.X {
			continue
		}
		c.SetLineStyle(g.Vertical)
		svg.strokePolyline([]vg.Point{{X: x, Y: c.Min.Y}, {X: x, Y: c.Max.Y}})
	}
	for _, tk := range p.Y.Tick.Marker.Ticks(p.Y.Min, p.Y.Max) {
		y := m.y(tk.Value)
		if tk.IsMinor() || y > c.Max.Y || y < c.Min.Y {
			continue
		}
		c.SetLineStyle(g.Horizontal)
		svg.strokePolyline([]vg.Point{{X: c.Min.X, Y: y}, {X: c.Max.X, Y: y}})
	}
}

// linearMap maps data to canvas points with the arithmetic of
// plot.Transforms on linear axes, without its closures and its copies
// of the axes.
type linearMap struct {
	xMin, xSpan, yMin, ySpan float64
	c                        vg.Rectangle
}

// newLinearMap returns the map of a plot on c, or false when an axis is
// not linear.
func newLinearMap(p *plot.Plot, c draw.Canvas) (linearMap, bool) {
	_, xLinear := p.X.Scale.(plot.LinearScale)
	_, yLinear := p.Y.Scale.(plot.LinearScale)
	return linearMap{xMin: p.X.Min, xSpan: p.X.Max - p.X.Min, yMin: p.Y.Min, ySpan: p.Y.Max - p.Y.Min, c: c.Rectangle},
		xLinear && yLinear
}

func (m linearMap) x(v float64) vg.Length {
	return vg.Length((v-m.xMin)/m.xSpan)*(m.c.Max.X-m.c.Min.X) + m.c.Min.X
}

func (m linearMap) y(v float64) vg.Length {
	return vg.Length((v-m.yMin)/m.ySpan)*(m.c.Max.Y-m.c.Min.Y) + m.c.Min.Y
}

// svgUnder finds the svgCanvas a draw.Canvas draws on: gonum/plot wraps
// a plot's canvas in draw.Canvases, which pass every call on unchanged.
func svgUnder(c vg.Canvas) (*svgCanvas, bool) {
	for {
		switch v := c.(type) {
		case *svgCanvas:
			return v, true
		case draw.Canvas:
			c = v.Canvas
		default:
			return nil, false
		}
	}
}
