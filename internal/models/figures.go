package models

import "github.com/millrace-workshop/specgen/internal/calc"

// figuresKind has no model: its inputs are whatever the block names, and
// its [derive] table computes from them and from any block of the site.
var figuresKind = calc.Kind{
	Name:       "figures",
	Summary:    "no model: named values and [derive] expressions over them and over any block's results, for totals, margins and ratios",
	Doc:        figuresDoc,
	FreeInputs: true,
	Evaluate: func(*calc.Inputs) (*calc.Outcome, error) {
		return &calc.Outcome{}, nil
	},
}

const figuresDoc = `The figures kind computes nothing itself. Its keys other than id, kind and
title are values the page needs in its arithmetic, each a quantity string
("1.5 kW", "8 bar", "20 degC") or a plain number, or a quote of another
block's value ("=lp.shaft_power"); its [derive] table computes from them
and from any block of the site:

  id = "totals"
  kind = "figures"
  motor_rating = "1.5 kW"
  [derive]
  total_power = "lp.shaft_power + hp.shaft_power"
  motor_load = "total_power / motor_rating"
  [expect]
  motor_load = "< 0.6"

Every block, of any kind, may carry a [derive] table: name = "expression"
over its own inputs and results (bare names) and other blocks' values
(id.name), with + - * / ^ (and × · ÷ −), parentheses, sqrt abs min max ln
exp log10 sin cos tan, pi, and gauge(p), a pressure less the block's
ambient. Derived results are results: claims, [show], inline values,
quotes by other blocks, results.json and the calculation diff carry them,
and the results table shows each with its working.

Dimensions are checked: + and - need values of one kind; a product or
quotient takes the dimension its units make (a power over a flow is an
energy per volume, shown in kJ/m3). Absolute pressures and temperatures are
points on a scale: point - point is a difference (bar(d), psid; K or degR),
point + difference a point; adding points, or scaling one by a plain number
("2 × 20 °C", "1.1 × set pressure"), is refused: write gauge(p) or a
difference. A point times or over a quantity with units (p·V) uses its
absolute value; a point over a point of its kind is a plain ratio (kelvin,
absolute pressures). In a figures block, a temperature written in K or degR
is an interval; degC and degF are points.

A derived value shows in the usual unit of its dimension (bar, MPa, degC,
rpm, kJ/m3, else SI; customary blocks in customary units) unless [show]
names another.`
