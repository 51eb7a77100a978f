package calc

import (
	"strings"

	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// trace writes node n with every name replaced by its value and unit. abs
// says the value is used multiplicatively, so that a temperature shows on
// the absolute scale it is computed on.
func (e *exprEval) trace(n *exprNode, abs bool) string {
	switch n.kind {
	case nameNode:
		s := e.show(e.vals[n.id], e.shownIn[n.id], abs, e.figures)
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
		return display.NumberSig(v.si, v.exp.String(), sig)
	}
	switch {
	case unit == "":
		unit = display.UnitFor(v.dim, e.customary)
	case e.customary:
		unit = units.CustomaryFor(unit)
	}
	switch v.dim {
	case units.Pressure:
		unit = display.AbsoluteUnit(unit)
	case units.PressureDifference:
		unit = display.DifferenceUnit(unit)
	case units.Temperature:
		if abs {
			unit = display.UnitFor(units.TemperatureDifference, e.customary)
		}
	case units.TemperatureDifference:
		if u, ok := units.Known(unit); ok && u.Offset != 0 {
			unit = display.UnitFor(units.TemperatureDifference, units.SystemOf(u.Symbol) == units.Customary)
		}
	}
	x, err := units.FromSI(v.si, v.dim, unit, e.ambient)
	if err != nil { // a unit that cannot show v: its SI unit, absolute for a pressure
		unit, x = units.DefaultUnit(v.dim), v.si
		if v.dim == units.Pressure {
			unit = "Pa(a)"
		}
	}
	pretty := ""
	if u, ok := units.Known(unit); ok {
		pretty = units.Pretty(u.Symbol)
	}
	if pretty == "°" {
		return display.NumberSig(x, "", sig) + "°"
	}
	return display.NumberSig(x, pretty, sig)
}
