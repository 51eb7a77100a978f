package render

import (
	"html"
	"image"
	"image/color"
	"math"
	"slices"
	"strconv"
	"strings"

	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/vg"
)

// svgCanvas is a vg.Canvas that writes compact SVG elements for an inline
// chart, appending them, numbers and path data included, straight to one
// buffer. Colours that the chart palette knows become CSS classes, so the
// page's stylesheet sets them (light, dark, print); text uses the page's
// font stack, chosen to match the metrics gonum/plot lays text out with.
type svgCanvas struct {
	w, h vg.Length
	buf  []byte
	// nonFinite is set when a coordinate was NaN or infinite.
	nonFinite bool
	stack     []canvasState
	classes   map[color.RGBA]string
	// points is room for a line's points, reused from line to line.
	points []vg.Point
}

type canvasState struct {
	m     [6]float64 // affine matrix a b c d e f: x' = a x + c y + e, y' = b x + d y + f
	width vg.Length
	// dashes is never changed in place, so that pushed states share it.
	dashes []vg.Length
	offset vg.Length
	color  color.RGBA
}

// newSVGCanvas returns a canvas of the given size that appends to buf.
func newSVGCanvas(w, h vg.Length, classes map[color.RGBA]string, buf []byte) *svgCanvas {
	// vg draws with y up from the bottom left; SVG has y down.
	c := &svgCanvas{w: w, h: h, classes: classes, buf: buf}
	c.stack = []canvasState{{m: [6]float64{1, 0, 0, -1, 0, float64(h)}, width: 1, color: color.RGBA{A: 255}}}
	return c
}

func (c *svgCanvas) top() *canvasState { return &c.stack[len(c.stack)-1] }

// Size implements vg.CanvasSizer.
func (c *svgCanvas) Size() (vg.Length, vg.Length) { return c.w, c.h }

func (c *svgCanvas) SetLineWidth(w vg.Length) { c.top().width = w }

func (c *svgCanvas) SetLineDash(pattern []vg.Length, offset vg.Length) {
	st := c.top()
	if !slices.Equal(st.dashes, pattern) {
		st.dashes = slices.Clone(pattern)
	}
	st.offset = offset
}

func (c *svgCanvas) SetColor(clr color.Color) {
	if clr == nil {
		clr = color.Black
	}
	if rgba, ok := clr.(color.RGBA); ok {
		c.top().color = rgba
		return
	}
	c.top().color = color.RGBAModel.Convert(clr).(color.RGBA)
}

func (c *svgCanvas) apply(a, b, cc, d, e, f float64) {
	m := &c.top().m
	*m = [6]float64{
		m[0]*a + m[2]*b, m[1]*a + m[3]*b,
		m[0]*cc + m[2]*d, m[1]*cc + m[3]*d,
		m[0]*e + m[2]*f + m[4], m[1]*e + m[3]*f + m[5],
	}
}

func (c *svgCanvas) Rotate(rad float64) {
	s, co := math.Sincos(rad)
	c.apply(co, s, -s, co, 0, 0)
}

func (c *svgCanvas) Translate(pt vg.Point) { c.apply(1, 0, 0, 1, float64(pt.X), float64(pt.Y)) }

func (c *svgCanvas) Scale(x, y float64) { c.apply(x, 0, 0, y, 0, 0) }

func (c *svgCanvas) Push() { c.stack = append(c.stack, *c.top()) }

func (c *svgCanvas) Pop() {
	if len(c.stack) > 1 {
		c.stack = c.stack[:len(c.stack)-1]
	}
}

// point maps a canvas point to SVG coordinates.
func (c *svgCanvas) point(p vg.Point) (float64, float64) {
	m := &c.top().m
	x, y := float64(p.X), float64(p.Y)
	return m[0]*x + m[2]*y + m[4], m[1]*x + m[3]*y + m[5]
}

// num appends a coordinate and notes one that is not a finite number,
// which data spanning too narrow or too wide a range for float64
// arithmetic produces, so that the chart is refused rather than written.
func (c *svgCanvas) num(v float64) {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		c.nonFinite = true
	}
	c.buf = appendNum(c.buf, v)
}

// pair appends a point's SVG coordinates, "x y".
func (c *svgCanvas) pair(p vg.Point) {
	x, y := c.point(p)
	c.num(x)
	c.buf = append(c.buf, ' ')
	c.num(y)
}

// maxTenths bounds the coordinates appendNum writes as whole tenths: below
// it a float64 holds every tenth exactly enough to print as one.
const maxTenths = 1e15

// appendNum appends a coordinate to a tenth of a point: plenty for a
// chart, and the same bytes on every machine. The bytes are those of
// strconv.FormatFloat(math.Round(v*10)/10, 'f', -1, 64), written from the
// whole number of tenths.
func appendNum(b []byte, v float64) []byte {
	r := math.Round(v * 10)
	if !(math.Abs(r) < maxTenths) {
		v = r / 10
		if v == 0 {
			v = 0 // no "-0"
		}
		return strconv.AppendFloat(b, v, 'f', -1, 64)
	}
	tenths := int64(r)
	if tenths < 0 {
		b = append(b, '-')
		tenths = -tenths
	}
	// Most coordinates are under 1000 points.
	switch whole := tenths / 10; {
	case whole < 10:
		b = append(b, byte('0'+whole))
	case whole < 100:
		b = append(b, digitPairs[2*whole], digitPairs[2*whole+1])
	case whole < 1000:
		pair := whole % 100
		b = append(b, byte('0'+whole/100), digitPairs[2*pair], digitPairs[2*pair+1])
	default:
		b = strconv.AppendInt(b, whole, 10)
	}
	if d := tenths % 10; d != 0 {
		b = append(b, '.', byte('0'+d))
	}
	return b
}

// pathData appends a path's SVG path data.
func (c *svgCanvas) pathData(p vg.Path) {
	for _, comp := range p {
		switch comp.Type {
		case vg.MoveComp:
			c.buf = append(c.buf, 'M')
			c.pair(comp.Pos)
		case vg.LineComp:
			c.buf = append(c.buf, 'L')
			c.pair(comp.Pos)
		case vg.ArcComp:
			c.arc(comp)
		case vg.CurveComp:
			if len(comp.Control) == 1 {
				c.buf = append(c.buf, 'Q')
			} else {
				c.buf = append(c.buf, 'C')
			}
			for _, pt := range comp.Control {
				c.pair(pt)
				c.buf = append(c.buf, ' ')
			}
			c.pair(comp.Pos)
		case vg.CloseComp:
			c.buf = append(c.buf, 'Z')
		}
	}
}

// arc appends an arc as SVG arc commands, in halves when it is a full turn.
func (c *svgCanvas) arc(comp vg.PathComp) {
	r := float64(comp.Radius) * math.Hypot(c.top().m[0], c.top().m[1])
	at := func(angle float64) vg.Point {
		return vg.Point{
			X: comp.Pos.X + comp.Radius*vg.Length(math.Cos(angle)),
			Y: comp.Pos.Y + comp.Radius*vg.Length(math.Sin(angle)),
		}
	}
	c.buf = append(c.buf, 'L')
	c.pair(at(comp.Start))
	parts := 1
	if math.Abs(comp.Angle) > math.Pi {
		parts = 2
	}
	// The y flip turns counter-clockwise into clockwise.
	sweep := " 0 0 0 "
	if comp.Angle < 0 {
		sweep = " 0 0 1 "
	}
	for i := 1; i <= parts; i++ {
		c.buf = append(c.buf, 'A')
		c.num(r)
		c.buf = append(c.buf, ' ')
		c.num(r)
		c.buf = append(c.buf, sweep...)
		c.pair(at(comp.Start + comp.Angle*float64(i)/float64(parts)))
	}
}

// paint appends the class attribute, or a plain colour for a colour the
// palette does not know; kind is 's' for a stroke, 'f' for a fill.
func (c *svgCanvas) paint(kind byte) {
	col := c.top().color
	if cls, ok := c.classes[col]; ok {
		c.buf = append(c.buf, ` class="`...)
		c.buf = append(c.buf, kind)
		c.buf = append(c.buf, cls...)
		c.buf = append(c.buf, '"')
		return
	}
	hex := strconv.FormatInt(int64(col.R)<<16|int64(col.G)<<8|int64(col.B), 16)
	if kind == 's' {
		c.buf = append(c.buf, ` fill="none" stroke="#`...)
	} else {
		c.buf = append(c.buf, ` fill="#`...)
	}
	for range 6 - len(hex) {
		c.buf = append(c.buf, '0')
	}
	c.buf = append(c.buf, hex...)
	c.buf = append(c.buf, '"')
}

// strokeOpen appends a stroked path's element up to its path data, or
// returns false when the current line draws nothing.
func (c *svgCanvas) strokeOpen() bool {
	st := c.top()
	if st.width <= 0 {
		return false
	}
	c.buf = append(c.buf, `<path`...)
	c.paint('s')
	c.buf = append(c.buf, ` stroke-width="`...)
	c.num(float64(st.width))
	c.buf = append(c.buf, '"')
	if len(st.dashes) > 0 {
		c.buf = append(c.buf, ` stroke-dasharray="`...)
		for i, d := range st.dashes {
			if i > 0 {
				c.buf = append(c.buf, ' ')
			}
			c.num(float64(d))
		}
		c.buf = append(c.buf, '"')
	}
	c.buf = append(c.buf, ` d="`...)
	return true
}

func (c *svgCanvas) Stroke(p vg.Path) {
	if len(p) == 0 || !c.strokeOpen() {
		return
	}
	c.pathData(p)
	c.buf = append(c.buf, "\"/>\n"...)
}

// strokePolyline strokes the lines joining pts, the same path as Stroke
// of a move to the first point and lines to the others, without building
// the path.
func (c *svgCanvas) strokePolyline(pts []vg.Point) {
	if len(pts) == 0 || !c.strokeOpen() {
		return
	}
	for i, pt := range pts {
		if i == 0 {
			c.buf = append(c.buf, 'M')
		} else {
			c.buf = append(c.buf, 'L')
		}
		c.pair(pt)
	}
	c.buf = append(c.buf, "\"/>\n"...)
}

func (c *svgCanvas) Fill(p vg.Path) {
	if len(p) == 0 {
		return
	}
	c.buf = append(c.buf, `<path`...)
	c.paint('f')
	c.buf = append(c.buf, ` d="`...)
	c.pathData(p)
	c.buf = append(c.buf, "\"/>\n"...)
}

func (c *svgCanvas) FillString(f font.Face, pt vg.Point, text string) {
	if f.Font.Size <= 0 || text == "" {
		return
	}
	x, y := c.point(pt)
	m := c.top().m
	angle := math.Atan2(-m[1], m[0]) * 180 / math.Pi // y is flipped
	c.buf = append(c.buf, `<text x="`...)
	c.num(x)
	c.buf = append(c.buf, `" y="`...)
	c.num(y)
	c.buf = append(c.buf, `" font-size="`...)
	c.num(float64(f.Font.Size))
	c.buf = append(c.buf, '"')
	if math.Abs(angle) > 0.01 {
		c.buf = append(c.buf, ` transform="rotate(`...)
		c.num(-angle)
		c.buf = append(c.buf, ' ')
		c.num(x)
		c.buf = append(c.buf, ' ')
		c.num(y)
		c.buf = append(c.buf, `)"`...)
	}
	c.buf = append(c.buf, '>')
	c.buf = appendEscaped(c.buf, text)
	c.buf = append(c.buf, "</text>\n"...)
}

// DrawImage is never used by specgen's charts; it draws nothing.
func (c *svgCanvas) DrawImage(vg.Rectangle, image.Image) {}

// appendEscaped appends s escaped as html.EscapeString escapes it.
func appendEscaped(b []byte, s string) []byte {
	if !strings.ContainsAny(s, `<>&'"`) {
		return append(b, s...)
	}
	return append(b, html.EscapeString(s)...)
}
