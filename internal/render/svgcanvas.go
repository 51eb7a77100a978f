package render

import (
	"bytes"
	"image"
	"image/color"
	"math"
	"strconv"

	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/vg"
)

// svgCanvas is a vg.Canvas that writes compact SVG elements for an inline
// chart. Colours that the chart palette knows become CSS classes, so the
// page's stylesheet sets them (light, dark, print); text uses the page's
// font stack, chosen to match the metrics gonum/plot lays text out with.
type svgCanvas struct {
	w, h vg.Length
	buf  bytes.Buffer
	// nonFinite is set when a coordinate was NaN or infinite.
	nonFinite bool
	stack     []canvasState
	classes   map[color.RGBA]string
}

type canvasState struct {
	m      [6]float64 // affine matrix a b c d e f: x' = a x + c y + e, y' = b x + d y + f
	width  vg.Length
	dashes []vg.Length
	offset vg.Length
	color  color.RGBA
}

func newSVGCanvas(w, h vg.Length, classes map[color.RGBA]string) *svgCanvas {
	// vg draws with y up from the bottom left; SVG has y down.
	c := &svgCanvas{w: w, h: h, classes: classes}
	c.stack = []canvasState{{m: [6]float64{1, 0, 0, -1, 0, float64(h)}, width: 1, color: color.RGBA{A: 255}}}
	return c
}

func (c *svgCanvas) top() *canvasState { return &c.stack[len(c.stack)-1] }

// Size implements vg.CanvasSizer.
func (c *svgCanvas) Size() (vg.Length, vg.Length) { return c.w, c.h }

func (c *svgCanvas) SetLineWidth(w vg.Length) { c.top().width = w }

func (c *svgCanvas) SetLineDash(pattern []vg.Length, offset vg.Length) {
	c.top().dashes = append([]vg.Length(nil), pattern...)
	c.top().offset = offset
}

func (c *svgCanvas) SetColor(clr color.Color) {
	if clr == nil {
		clr = color.Black
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

func (c *svgCanvas) Push() {
	s := *c.top()
	s.dashes = append([]vg.Length(nil), s.dashes...)
	c.stack = append(c.stack, s)
}

func (c *svgCanvas) Pop() {
	if len(c.stack) > 1 {
		c.stack = c.stack[:len(c.stack)-1]
	}
}

// point maps a canvas point to SVG coordinates.
func (c *svgCanvas) point(p vg.Point) (float64, float64) {
	m := c.top().m
	x, y := float64(p.X), float64(p.Y)
	return m[0]*x + m[2]*y + m[4], m[1]*x + m[3]*y + m[5]
}

// num writes a coordinate and notes one that is not a finite number, which
// data spanning too narrow or too wide a range for float64 arithmetic
// produces, so that the chart is refused rather than written.
func (c *svgCanvas) num(b *bytes.Buffer, v float64) {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		c.nonFinite = true
	}
	writeNum(b, v)
}

// writeNum writes a coordinate to a tenth of a point: plenty for a chart,
// and the same bytes on every machine.
func writeNum(b *bytes.Buffer, v float64) {
	v = math.Round(v*10) / 10
	if v == 0 {
		v = 0 // no "-0"
	}
	b.WriteString(strconv.FormatFloat(v, 'f', -1, 64))
}

func (c *svgCanvas) pathData(p vg.Path) string {
	var b bytes.Buffer
	for _, comp := range p {
		switch comp.Type {
		case vg.MoveComp, vg.LineComp:
			if comp.Type == vg.MoveComp {
				b.WriteByte('M')
			} else {
				b.WriteByte('L')
			}
			x, y := c.point(comp.Pos)
			c.num(&b, x)
			b.WriteByte(' ')
			c.num(&b, y)
		case vg.ArcComp:
			c.arc(&b, comp)
		case vg.CurveComp:
			if len(comp.Control) == 1 {
				b.WriteByte('Q')
			} else {
				b.WriteByte('C')
			}
			for i, pt := range append(append([]vg.Point{}, comp.Control...), comp.Pos) {
				if i > 0 {
					b.WriteByte(' ')
				}
				x, y := c.point(pt)
				c.num(&b, x)
				b.WriteByte(' ')
				c.num(&b, y)
			}
		case vg.CloseComp:
			b.WriteByte('Z')
		}
	}
	return b.String()
}

// arc writes an arc as SVG arc commands, in halves when it is a full turn.
func (c *svgCanvas) arc(b *bytes.Buffer, comp vg.PathComp) {
	r := float64(comp.Radius) * math.Hypot(c.top().m[0], c.top().m[1])
	at := func(angle float64) (float64, float64) {
		return c.point(vg.Point{
			X: comp.Pos.X + comp.Radius*vg.Length(math.Cos(angle)),
			Y: comp.Pos.Y + comp.Radius*vg.Length(math.Sin(angle)),
		})
	}
	x, y := at(comp.Start)
	b.WriteByte('L')
	c.num(b, x)
	b.WriteByte(' ')
	c.num(b, y)
	parts := 1
	if math.Abs(comp.Angle) > math.Pi {
		parts = 2
	}
	// The y flip turns counter-clockwise into clockwise.
	sweep := "0"
	if comp.Angle < 0 {
		sweep = "1"
	}
	for i := 1; i <= parts; i++ {
		x, y := at(comp.Start + comp.Angle*float64(i)/float64(parts))
		b.WriteString("A")
		c.num(b, r)
		b.WriteByte(' ')
		c.num(b, r)
		b.WriteString(" 0 0 " + sweep + " ")
		c.num(b, x)
		b.WriteByte(' ')
		c.num(b, y)
	}
}

// paint returns the class attribute, or a plain colour for a colour the
// palette does not know.
func (c *svgCanvas) paint(kind string) string {
	col := c.top().color
	if cls, ok := c.classes[col]; ok {
		return ` class="` + kind + cls + `"`
	}
	hex := "#" + strconv.FormatInt(int64(col.R)<<16|int64(col.G)<<8|int64(col.B), 16)
	for len(hex) < 7 {
		hex = "#0" + hex[1:]
	}
	if kind == "s" {
		return ` fill="none" stroke="` + hex + `"`
	}
	return ` fill="` + hex + `"`
}

func (c *svgCanvas) Stroke(p vg.Path) {
	st := c.top()
	if st.width <= 0 || len(p) == 0 {
		return
	}
	c.buf.WriteString(`<path` + c.paint("s") + ` stroke-width="`)
	c.num(&c.buf, float64(st.width))
	c.buf.WriteByte('"')
	if len(st.dashes) > 0 {
		c.buf.WriteString(` stroke-dasharray="`)
		for i, d := range st.dashes {
			if i > 0 {
				c.buf.WriteByte(' ')
			}
			c.num(&c.buf, float64(d))
		}
		c.buf.WriteByte('"')
	}
	c.buf.WriteString(` d="` + c.pathData(p) + `"/>` + "\n")
}

func (c *svgCanvas) Fill(p vg.Path) {
	if len(p) == 0 {
		return
	}
	c.buf.WriteString(`<path` + c.paint("f") + ` d="` + c.pathData(p) + `"/>` + "\n")
}

func (c *svgCanvas) FillString(f font.Face, pt vg.Point, text string) {
	if f.Font.Size <= 0 || text == "" {
		return
	}
	x, y := c.point(pt)
	m := c.top().m
	angle := math.Atan2(-m[1], m[0]) * 180 / math.Pi // y is flipped
	c.buf.WriteString(`<text x="`)
	c.num(&c.buf, x)
	c.buf.WriteString(`" y="`)
	c.num(&c.buf, y)
	c.buf.WriteString(`" font-size="`)
	c.num(&c.buf, float64(f.Font.Size))
	c.buf.WriteByte('"')
	if math.Abs(angle) > 0.01 {
		c.buf.WriteString(` transform="rotate(`)
		c.num(&c.buf, -angle)
		c.buf.WriteByte(' ')
		c.num(&c.buf, x)
		c.buf.WriteByte(' ')
		c.num(&c.buf, y)
		c.buf.WriteString(`)"`)
	}
	c.buf.WriteString(`>` + esc(text) + "</text>\n")
}

// DrawImage is never used by specgen's charts; it draws nothing.
func (c *svgCanvas) DrawImage(vg.Rectangle, image.Image) {}
