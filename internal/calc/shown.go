package calc

import (
	"fmt"
	"strings"

	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// How a block's values are shown: which unit each takes, chosen from what
// its writer wrote; the display package does the formatting.

// DisplayUnit is the unit a result shows in: the block's [show] choice,
// else the kind's default, in US customary units when the block is written
// in them.
func (e *Evaluated) DisplayUnit(name string) string {
	for _, o := range e.Block.Show.Outputs {
		if o.Name == name && o.Unit != "" {
			return o.Unit
		}
	}
	if spec, ok := e.Block.Kind.result(name); ok {
		if spec.Dim == units.Time {
			if r, found := e.Result(name); found {
				return display.DurationUnit(r.Value)
			}
		}
		if e.customary {
			return units.CustomaryFor(spec.Unit)
		}
		return spec.Unit
	}
	if r, ok := e.Result(name); ok { // a derived result
		if r.Dim == units.Time {
			return display.DurationUnit(r.Value)
		}
		return display.UnitFor(r.Dim, e.customary)
	}
	return ""
}

// Meaning says what a result is, for its row of the table: the kind's
// words, or for a derived result its expression.
func (e *Evaluated) Meaning(name string) string {
	if spec, ok := e.Block.Kind.result(name); ok {
		return spec.Meaning
	}
	if d, ok := e.Block.derivation(name); ok {
		return "derived: " + d.Source
	}
	return ""
}

// Format shows a result in a unit ("" for its display unit) with the
// site's significant figures: "19.7 cm3".
func (e *Evaluated) Format(name, unit string) (string, error) {
	si, dim, shown, ok := e.Quantity(name)
	if !ok {
		return "", fmt.Errorf("block %s has no result or input %q", e.Block.ID, name)
	}
	if unit == "" {
		unit = shown
	}
	if r, ok := e.Result(name); ok {
		var err error
		if si, err = e.siIn(r, unit); err != nil {
			return "", fmt.Errorf("block %s: %s: %w", e.Block.ID, name, err)
		}
	}
	return display.Value(si, dim, unit, e.Ambient, e.sigFigs)
}

// siIn is r's SI value as unit reads it: a volume flow shown in a unit of
// standard or normal air (SCFM, Nl/min) is first taken by mass from the
// state it is measured at to free air at the block's ambient, which the
// unit then reads by mass at its reference state; a flow with no such
// state (a swept volume) cannot be.
func (e *Evaluated) siIn(r Result, unit string) (float64, error) {
	u, err := units.LookupUnit(unit)
	if err != nil || !u.Standard() || r.Dim != units.VolumeFlow {
		return r.Value, nil
	}
	if r.Gas == (units.GasState{}) {
		return 0, fmt.Errorf("the model gives %s no pressure and temperature its volume is measured at (a swept volume has none), and %s takes air by mass to its reference state; show it in L/min or m3/h", r.Name, unit)
	}
	return units.AsFreeAir(r.Value, r.Gas, e.Ambient), nil
}

// Quantity returns a result, or else a quantity input, of the block: its
// SI value, dimension and the unit it is shown in (the display unit of a
// result, the unit an input was written in). Prose and other blocks may
// quote both.
func (e *Evaluated) Quantity(name string) (si float64, dim units.Dimension, unit string, ok bool) {
	if r, found := e.Result(name); found {
		return r.Value, r.Dim, e.DisplayUnit(name), true
	}
	for _, in := range e.Inputs {
		if in.Name == name && in.Type == Quantity && in.Values == nil {
			unit := ""
			if q, err := units.Parse(in.Text, in.Dim); err == nil {
				unit = q.Unit.Symbol
			} else if in.From != "" {
				unit = unitFromShown(in.Text)
			}
			return in.Value, in.Dim, unit, true
		}
	}
	return 0, 0, "", false
}

// unitFromShown is the unit of a formatted value such as "19.7 cm³".
func unitFromShown(text string) string {
	_, unit, _ := strings.Cut(text, " ")
	if u, ok := units.Known(unit); ok {
		return u.Symbol
	}
	return ""
}

// Show formats a value the block does not itself report (a limit, a
// threshold, another block's figure) in the unit its writer uses for that
// dimension (see WriterUnit), else in fallback.
func (e *Evaluated) Show(si float64, dim units.Dimension, fallback string) string {
	s, err := display.Value(si, dim, e.WriterUnit(dim, fallback), e.Ambient, e.sigFigs)
	if err != nil {
		return units.Format(si, e.sigFigs)
	}
	return s
}

// WriterUnit is the unit of dimension dim that the block's writer chose: of a
// [show] output, else of an input written in the block, else fallback (its
// customary counterpart in a customary block, which may leave a temperature
// at its default). A block written in psi and degF gets its cautions in psi
// and degF.
func (e *Evaluated) WriterUnit(dim units.Dimension, fallback string) string {
	for _, o := range e.Block.Show.Outputs {
		if spec, ok := e.Block.Kind.ResultSpec(o.Name); ok && o.Unit != "" && spec.Dim == dim {
			return o.Unit
		}
	}
	for _, in := range e.Inputs {
		if in.Default || in.From != "" || in.Dim != dim {
			continue
		}
		if q, err := units.Parse(in.Text, dim); err == nil && q.Unit.Symbol != "" {
			return q.Unit.Symbol
		}
	}
	if e.customary {
		return units.CustomaryFor(fallback)
	}
	return fallback
}
