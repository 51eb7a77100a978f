package calc

import (
	"fmt"

	"github.com/millrace-workshop/specgen/internal/units"
)

// Chart is the data of one chart a block can show, in SI units; render
// draws it. Panels share the x axis and stack from top to bottom.
type Chart struct {
	Name    string // as asked for in [show] charts: "pv"
	Title   string
	Desc    string // what the chart shows, in words, for readers who cannot see it
	Ambient float64
	X       Axis
	Panels  []Panel
	// EdgeNote is a word at the far end of the x axis for what lies beyond
	// it: "dead-head 69.5 bar(g) →".
	EdgeNote string
}

// Axis is one axis: what it measures and the unit it is shown in.
type Axis struct {
	Label string // "Cylinder volume"
	Dim   units.Dimension
	Unit  string // display unit: "cm3"
	Log   bool
}

// Panel is one plot area of a chart with its own y axis.
type Panel struct {
	Y      Axis
	Series []Series
	Marks  []Mark
}

// LineStyle tells series apart without relying on colour.
type LineStyle int

// The line styles, in the order series use them.
const (
	Solid LineStyle = iota
	Dashed
	Dotted
	DashDot
)

// Series is one line of a panel.
type Series struct {
	Name   string
	X, Y   []float64
	Style  LineStyle
	Labels []PointLabel // words placed on the line, such as process names
}

// PointLabel is a word placed at a point of a panel, above it or, when
// Below, under it.
type PointLabel struct {
	X, Y  float64
	Text  string
	Below bool
}

// Mark is a reference line across a panel: horizontal at a y value (a
// mean, a limit) or, when Vertical, at an x value (the design point).
type Mark struct {
	Value    float64
	Vertical bool
	Label    string
}

// ChartFunc draws one named chart of a kind from a block's inputs and
// outcome.
type ChartFunc func(name string, in *Inputs, out *Outcome) (*Chart, error)

// Chart returns the data of one of the charts the block's kind draws.
func (e *Evaluated) Chart(name string) (*Chart, error) {
	k := e.Block.Kind
	if k.Chart == nil || !contains(k.Charts, name) {
		return nil, fmt.Errorf("kind %s draws no chart %q", k.Name, name)
	}
	if e.in == nil {
		return nil, fmt.Errorf("block %s: its chart data was released", e.Block.ID)
	}
	curves, err := e.chartCurves(name)
	if err != nil {
		return nil, err
	}
	c, err := k.Chart(name, e.in, &Outcome{Results: e.Results, Curves: curves, Cautions: e.Cautions,
		FullRange: e.Block.Show.FullRange, ID: e.Block.ID, Set: e.set})
	if err != nil {
		return nil, fmt.Errorf("block %s: chart %s: %w", e.Block.ID, name, err)
	}
	c.Name, c.Ambient = name, e.Ambient
	if e.customary {
		c.X.Unit = units.CustomaryFor(c.X.Unit)
		for i := range c.Panels {
			c.Panels[i].Y.Unit = units.CustomaryFor(c.Panels[i].Y.Unit)
		}
	}
	return c, nil
}

// chartCurves returns the block's curves for chart name, sampled again
// when they were not kept: the model runs again on the same inputs, so they
// come out as they would have been kept, and they are kept for the block's
// other charts until DropCurves.
func (e *Evaluated) chartCurves(name string) ([]Curve, error) {
	e.curvesMu.Lock()
	defer e.curvesMu.Unlock()
	if !e.resample {
		return e.Curves, nil
	}
	out, err := e.Block.Kind.Evaluate(e.in.sampling())
	if err != nil {
		return nil, fmt.Errorf("block %s: chart %s: %w", e.Block.ID, name, err)
	}
	if bad := nonFinite(out); bad != "" {
		return nil, fmt.Errorf("block %s: chart %s: %s is not a finite number with the inputs %s; check that they describe a real machine", e.Block.ID, name, bad, givenInputs(e.Inputs))
	}
	e.Curves, e.resample = out.Curves, false
	return e.Curves, nil
}

// Curve returns the outcome's curve named name.
func (o *Outcome) Curve(name string) (Curve, bool) {
	for _, c := range o.Curves {
		if c.Name == name {
			return c, true
		}
	}
	return Curve{}, false
}

// ResultValue returns the outcome's result named name (0 when absent).
func (o *Outcome) ResultValue(name string) float64 {
	for _, r := range o.Results {
		if r.Name == name {
			return r.Value
		}
	}
	return 0
}

// Table is a small table of values a kind computes beside its results,
// such as a tank's fill time at each whole bar: X and Y in SI, shown in
// the axes' units.
type Table struct {
	Title  string
	X, Y   Axis
	XS, YS []float64
}
