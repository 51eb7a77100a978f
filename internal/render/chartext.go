package render

import (
	"math"
	"strings"
	"sync"
	"sync/atomic"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
)

// measuredText is gonum/plot's plain text handler with its measurements
// kept: laying out a chart measures the same tick labels many times, and
// gonum walks a string's glyphs and kerning pairs through the font's
// tables every time. A string's width in font units does not depend on
// the size, so one table per face serves every size; the sizes are
// scaled with gonum's own arithmetic, so every length is the same to the
// last bit and so is the drawing.
type measuredText struct {
	text.Plain
	mu    sync.Mutex                     // held to add a face
	faces atomic.Pointer[[]*faceMetrics] // read without a lock
}

// faceMetrics are one face's measurements in font units.
type faceMetrics struct {
	font                    font.Font // as asked for, Size 0
	face                    font.Face // as the font cache gives it, Size upem
	upem                    vg.Length
	ascent, descent, height vg.Length
	widths                  sync.Map // string → vg.Length; read without a shared write
}

var chartText = &measuredText{Plain: plot.DefaultTextHandler.(text.Plain)}

// metrics returns the measurements of fnt's face, whatever its size.
func (m *measuredText) metrics(fnt font.Font) *faceMetrics {
	fnt.Size = 0
	if faces := m.faces.Load(); faces != nil {
		for _, f := range *faces {
			if f.font == fnt {
				return f
			}
		}
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	var faces []*faceMetrics
	if old := m.faces.Load(); old != nil {
		faces = *old
	}
	for _, f := range faces {
		if f.font == fnt {
			return f
		}
	}
	// At a size of as many points as the font has units per em, gonum's
	// scale factor is exactly 1 and its lengths are font units.
	probe := m.Fonts.Lookup(fnt, 0)
	upem := vg.Length(float64(probe.Face.UnitsPerEm()))
	face := m.Fonts.Lookup(fnt, upem)
	e := face.Extents()
	f := &faceMetrics{font: fnt, face: face, upem: upem, ascent: e.Ascent, descent: e.Descent, height: e.Height}
	grown := append(append(make([]*faceMetrics, 0, len(faces)+1), faces...), f)
	m.faces.Store(&grown)
	return f
}

// scale is gonum's factor from font units to points at size.
func (f *faceMetrics) scale(size vg.Length) vg.Length { return size / f.upem }

// width returns the width of a line of text at size.
func (f *faceMetrics) width(txt string, size vg.Length) vg.Length {
	if w, ok := f.widths.Load(txt); ok {
		return w.(vg.Length) * f.scale(size)
	}
	w := f.face.Width(txt)
	f.widths.Store(txt, w)
	return w * f.scale(size)
}

func (m *measuredText) Extents(fnt font.Font) font.Extents {
	f := m.metrics(fnt)
	s := f.scale(fnt.Size)
	return font.Extents{Ascent: f.ascent * s, Descent: f.descent * s, Height: f.height * s}
}

func (m *measuredText) Box(txt string, fnt font.Font) (width, height, depth vg.Length) {
	f := m.metrics(fnt)
	s := f.scale(fnt.Size)
	return f.width(txt, fnt.Size), f.ascent * s, f.descent * s
}

// Lines splits text into lines as text.Plain does; the one line of a
// chart's words needs no search for line breaks.
func (m *measuredText) Lines(txt string) []string {
	if strings.IndexByte(txt, '\n') < 0 {
		return []string{txt}
	}
	return m.Plain.Lines(txt)
}

// Draw places text as text.Plain does, with the widths it has measured.
func (m *measuredText) Draw(c vg.Canvas, txt string, sty text.Style, pt vg.Point) {
	txt = strings.TrimRight(txt, "\n")
	if len(txt) == 0 {
		return
	}
	f := m.metrics(sty.Font)
	face := f.face
	face.Font.Size = sty.Font.Size
	c.SetColor(sty.Color)
	if sty.Rotation != 0 {
		c.Push()
		c.Rotate(sty.Rotation)
	}
	sin64, cos64 := math.Sincos(sty.Rotation)
	cos, sin := vg.Length(cos64), vg.Length(sin64)
	pt.X, pt.Y = pt.Y*sin+pt.X*cos, pt.Y*cos-pt.X*sin
	lines := m.Lines(txt)
	pt.Y += sty.Height(txt)*vg.Length(sty.YAlign) - f.ascent*f.scale(sty.Font.Size)
	for i, line := range lines {
		xoffs := vg.Length(sty.XAlign) * f.width(line, sty.Font.Size)
		n := vg.Length(len(lines) - i)
		c.FillString(face, pt.Add(vg.Point{X: xoffs, Y: n * sty.Font.Size}), line)
	}
	if sty.Rotation != 0 {
		c.Pop()
	}
}

// useMeasuredText points every text style of a plot at the measuring handler.
func useMeasuredText(p *plot.Plot) {
	p.TextHandler = chartText
	p.Title.TextStyle.Handler = chartText
	p.Legend.TextStyle.Handler = chartText
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		a.Label.TextStyle.Handler = chartText
		a.Tick.Label.Handler = chartText
	}
}
