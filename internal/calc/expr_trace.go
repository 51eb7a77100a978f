package calc

import (
	"math"
	"strings"

	"specgen/internal/units"
)

// exprFigures is the number of significant figures of an expression's
// working, as in the models' traces.
const exprFigures = 4

// cancelFigures is how many figures the terms of a sum need so that the
// sum, when they nearly cancel, still comes out to exprFigures when a
// reviewer works it by hand: one more for each factor of ten by which a
// term exceeds the sum.
func cancelFigures(term, sum float64) int {
	ratio := math.Abs(term / sum)
	if !(ratio > 1) || math.IsInf(ratio, 0) {
		return exprFigures
	}
	// A term rounded to exprFigures is off by up to 5e-4 of itself.
	extra := int(math.Ceil(math.Log10(0.7 * ratio)))
	return exprFigures + min(max(extra, 0), 8)
}

// trace writes node n with every name replaced by its value and unit. abs
// says the value is used multiplicatively, so that a temperature shows on
// the absolute scale it is computed on.
func (e *exprEval) trace(n *exprNode, abs bool) string {
	switch n.kind {
	case nameNode:
		s := e.show(e.vals[n.id], e.units[n.id], abs, e.figures)
		if strings.HasPrefix(s, "-") {
			return "(" + s + ")"
		}
		return s
	case parenNode:
		return "(" + e.trace(n.args[0], abs) + ")"
	case negNode:
		return n.text + e.trace(n.args[0], abs)
	case binaryNode:
		// A difference reads the same on any scale; a point is shown on
		// the absolute one when the sum is used multiplicatively.
		inner := true
		if n.op == '+' || n.op == '-' {
			inner = abs && e.vals[n.id].point()
		}
		return e.trace(n.args[0], inner) + " " + n.text + " " + e.trace(n.args[1], inner)
	case callNode:
		inner := true
		if n.text == "min" || n.text == "max" || n.text == "abs" {
			inner = abs
		}
		args := make([]string, len(n.args))
		for i, a := range n.args {
			args[i] = e.trace(a, inner)
		}
		return n.text + "(" + strings.Join(args, ", ") + ")"
	}
	return n.text // a number or pi, as written
}

// show writes v to sig significant figures in the unit the working shows
// it in: unit (from lookup) or the display unit of its dimension, in the
// block's unit system; a pressure absolute, a pressure difference with its
// mark, a temperature interval in K or °R, and a temperature in K or °R
// when abs.
func (e *exprEval) show(v exprVal, unit string, abs bool, sig int) string {
	if !v.named {
		return trimZeros(units.Format(v.si, sig)) + " " + v.exp.String()
	}
	switch {
	case unit == "":
		unit = units.DisplayUnit(v.dim, e.customary)
	case e.customary:
		unit = units.CustomaryFor(unit)
	}
	switch v.dim {
	case units.Pressure:
		unit = absoluteUnit(unit)
	case units.PressureDifference:
		unit = units.DifferenceUnit(unit)
	case units.Temperature:
		if abs {
			unit = units.DisplayUnit(units.TemperatureDifference, e.customary)
		}
	case units.TemperatureDifference:
		if u, err := units.LookupUnit(unit); err == nil && u.Offset != 0 {
			unit = units.DisplayUnit(units.TemperatureDifference, units.SystemOf(u.Symbol) == units.Customary)
		}
	}
	x, err := units.FromSI(v.si, v.dim, unit, e.ambient)
	if err != nil { // a unit that cannot show v: its SI unit, absolute for a pressure
		unit, x = units.DefaultUnit(v.dim), v.si
		if v.dim == units.Pressure {
			unit = "Pa(a)"
		}
	}
	s := trimZeros(units.Format(x, sig))
	pretty := ""
	if u, err := units.LookupUnit(unit); err == nil {
		pretty = units.Pretty(u.Symbol)
	}
	switch pretty {
	case "":
		return s
	case "°":
		return s + "°"
	}
	return s + " " + pretty
}

// trimZeros drops trailing zeros after a decimal point ("28.00" → "28"),
// as the working of the models writes its numbers.
func trimZeros(s string) string {
	if strings.Contains(s, ".") && !strings.Contains(s, "e") {
		s = strings.TrimSuffix(strings.TrimRight(s, "0"), ".")
	}
	return s
}
