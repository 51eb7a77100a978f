package render

import (
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// alignPlots returns the canvases of tiled plots as plot.Align does, by the
// same arithmetic in the same order, so that the charts come out the
// same to the last bit. plot.Align works out each plot's data canvas
// three times, twice for the same canvas; here each plot's is worked out
// once for each distinct canvas, which halves the layout of a chart.
func alignPlots(plots [][]*plot.Plot, t draw.Tiles, dc draw.Canvas) [][]draw.Canvas {
	type dataCanvas struct {
		on   vg.Rectangle
		data draw.Canvas
	}
	memo := map[*plot.Plot][]dataCanvas{}
	dataOf := func(p *plot.Plot, c draw.Canvas) draw.Canvas {
		for _, d := range memo[p] {
			if d.on == c.Rectangle {
				return d.data
			}
		}
		d := p.DataCanvas(c)
		memo[p] = append(memo[p], dataCanvas{on: c.Rectangle, data: d})
		return d
	}

	o := make([][]draw.Canvas, len(plots))
	for j := range t.Rows {
		o[j] = make([]draw.Canvas, len(plots[j]))
		for i := range t.Cols {
			o[j][i] = t.At(dc, i, j)
		}
	}
	type posNeg struct{ p, n float64 }
	xSpacing := make([]posNeg, t.Cols)
	ySpacing := make([]posNeg, t.Rows)
	for j, row := range plots {
		for i, p := range row {
			if p == nil {
				continue
			}
			c := o[j][i]
			dataC := dataOf(p, o[j][i])
			xSpacing[i].n = math.Max(float64(dataC.Min.X-c.Min.X), xSpacing[i].n)
			xSpacing[i].p = math.Max(float64(c.Max.X-dataC.Max.X), xSpacing[i].p)
			ySpacing[j].n = math.Max(float64(dataC.Min.Y-c.Min.Y), ySpacing[j].n)
			ySpacing[j].p = math.Max(float64(c.Max.Y-dataC.Max.Y), ySpacing[j].p)
		}
	}
	var xTotalSpace float64
	for _, s := range xSpacing {
		xTotalSpace += s.n + s.p
	}
	xTotalSpace += float64(t.PadX)*float64(len(xSpacing)-1) + float64(t.PadLeft+t.PadRight)
	var yTotalSpace float64
	for _, s := range ySpacing {
		yTotalSpace += s.n + s.p
	}
	yTotalSpace += float64(t.PadY)*float64(len(ySpacing)-1) + float64(t.PadTop+t.PadBottom)
	avgWidth := vg.Length((float64(dc.Max.X-dc.Min.X) - xTotalSpace) / float64(t.Cols))
	avgHeight := vg.Length((float64(dc.Max.Y-dc.Min.Y) - yTotalSpace) / float64(t.Rows))

	moveVertical := make([]vg.Length, t.Cols)
	for j := t.Rows - 1; j >= 0; j-- {
		row := plots[j]
		var moveHorizontal vg.Length
		for i, p := range row {
			c := o[j][i]
			if p != nil {
				dataC := dataOf(p, c)
				c = draw.Crop(c,
					vg.Length(xSpacing[i].n)-(dataC.Min.X-c.Min.X),
					c.Max.X-dataC.Max.X-vg.Length(xSpacing[i].p),
					vg.Length(ySpacing[j].n)-(dataC.Min.Y-c.Min.Y),
					c.Max.Y-dataC.Max.Y-vg.Length(ySpacing[j].p),
				)
			}
			var width, height vg.Length
			if p == nil {
				width = c.Max.X - c.Min.X - vg.Length(xSpacing[i].p+xSpacing[i].n)
				height = c.Max.Y - c.Min.Y - vg.Length(ySpacing[j].p+ySpacing[j].n)
			} else {
				dataC := dataOf(p, c)
				width = dataC.Max.X - dataC.Min.X
				height = dataC.Max.Y - dataC.Min.Y
			}
			o[j][i] = draw.Crop(c,
				moveHorizontal,
				moveHorizontal+avgWidth-width,
				moveVertical[i],
				moveVertical[i]+avgHeight-height,
			)
			moveHorizontal += avgWidth - width
			moveVertical[i] += avgHeight - height
		}
	}
	return o
}
