package render

import (
	"fmt"
	"testing"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgsvg"
)

// TestAlignPlotsAsGonum checks alignPlots against plot.Align, which it
// stands in for, canvas for canvas, to the bit.
func TestAlignPlotsAsGonum(t *testing.T) {
	newPlot := func(k int) *plot.Plot {
		p := plot.New()
		p.X.Label.Text = fmt.Sprintf("crank angle %d", k)
		p.Y.Label.Text = "pressure (bar(a))"
		pts := make(plotter.XYs, 50)
		for i := range pts {
			pts[i].X, pts[i].Y = float64(i)*0.37, float64(k+1)*float64(i*i)*1.3e3
		}
		line, err := plotter.NewLine(pts)
		if err != nil {
			t.Fatal(err)
		}
		p.Add(line)
		return p
	}
	for _, shape := range []struct{ rows, cols int }{{1, 1}, {2, 1}, {3, 1}, {2, 2}} {
		for _, tiles := range []draw.Tiles{
			{PadY: 12, PadTop: 8, PadBottom: 4, PadLeft: 4, PadRight: 12},
			{PadX: 7, PadY: 3.5, PadTop: 21.25, PadBottom: 0, PadLeft: 0, PadRight: 2},
		} {
			tiles.Rows, tiles.Cols = shape.rows, shape.cols
			build := func() [][]*plot.Plot {
				plots := make([][]*plot.Plot, shape.rows)
				for j := range plots {
					plots[j] = make([]*plot.Plot, shape.cols)
					for i := range plots[j] {
						if (i+j)%3 != 2 { // some tiles empty
							plots[j][i] = newPlot(j*shape.cols + i)
						}
					}
				}
				return plots
			}
			dc := draw.New(vgsvg.New(vg.Length(640), vg.Length(360)))
			want := plot.Align(build(), tiles, dc)
			got := alignPlots(build(), tiles, dc)
			for j := range want {
				for i := range want[j] {
					if got[j][i].Rectangle != want[j][i].Rectangle {
						t.Errorf("%dx%d %+v: tile %d,%d: %+v, plot.Align gives %+v", shape.rows, shape.cols, tiles, j, i, got[j][i].Rectangle, want[j][i].Rectangle)
					}
				}
			}
		}
	}
}
