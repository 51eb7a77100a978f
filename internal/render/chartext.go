package render

import (
	"sync"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
)

// memoText is gonum/plot's plain text handler with its measurements
// remembered: laying out a chart measures the same tick labels many times,
// and measuring dominated the cost of a chart. Measurements depend only on
// the text and the font, so sharing them between charts is safe.
type memoText struct {
	text.Handler
	extents sync.Map // font.Font → font.Extents
	boxes   sync.Map // boxKey → [3]vg.Length
}

type boxKey struct {
	txt string
	fnt font.Font
}

var chartText = &memoText{Handler: plot.DefaultTextHandler}

func (m *memoText) Extents(fnt font.Font) font.Extents {
	if e, ok := m.extents.Load(fnt); ok {
		return e.(font.Extents)
	}
	e := m.Handler.Extents(fnt)
	m.extents.Store(fnt, e)
	return e
}

func (m *memoText) Box(txt string, fnt font.Font) (width, height, depth vg.Length) {
	key := boxKey{txt, fnt}
	if b, ok := m.boxes.Load(key); ok {
		v := b.([3]vg.Length)
		return v[0], v[1], v[2]
	}
	width, height, depth = m.Handler.Box(txt, fnt)
	m.boxes.Store(key, [3]vg.Length{width, height, depth})
	return width, height, depth
}

// useMemoText points every text style of a plot at the memoising handler.
func useMemoText(p *plot.Plot) {
	p.TextHandler = chartText
	p.Title.TextStyle.Handler = chartText
	p.Legend.TextStyle.Handler = chartText
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		a.Label.TextStyle.Handler = chartText
		a.Tick.Label.Handler = chartText
	}
}
