package models

import (
	"fmt"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// balanceKind sizes the crank counterweight of a single-cylinder machine
// and gives the shaking forces it leaves.
var balanceKind = calc.Kind{
	Name:    "balance",
	Summary: "counterweight and shaking forces of a single-cylinder crank: primary and secondary forces, residual primary force along and across the cylinder",
	Doc:     balanceDoc,
	Inputs: []calc.InputSpec{
		{Name: "source", Type: calc.Link, LinkRoles: calc.Crank, Meaning: "id of the single-cylinder compressor or air motor block whose crank, rod and speed are balanced"},
		{Name: "reciprocating_mass", Dim: units.Mass, Optional: true, Range: positiveUpTo(1e3),
			Meaning: "piston, pin, rings and the small-end share of the rod; default: the source's reciprocating_mass"},
		{Name: "rotating_mass", Dim: units.Mass, Default: "0 kg", Range: calc.Between(0, 1e3),
			Meaning: "crank pin, web and the big-end share of the rod, referred to the crank radius"},
		{Name: "balance_fraction", Dim: units.Dimensionless, Range: calc.Between(0, 1),
			Meaning: "share of the reciprocating mass the counterweight balances, 0 to 1 (one half is common practice for single cylinders)"},
		{Name: "counterweight_radius", Dim: units.Length, Range: calc.Between(minPartSize, 10), Meaning: "radius of the counterweight's centre of mass from the crank axis"},
	},
	Results: []calc.ResultSpec{
		{Name: "counterweight_mass", Dim: units.Mass, Unit: "g", Meaning: "counterweight, opposite the crank pin at counterweight_radius"},
		{Name: "primary_force", Dim: units.Force, Unit: "N", Meaning: "amplitude of the reciprocating mass's primary inertia force, before balancing (at crank speed)"},
		{Name: "secondary_force", Dim: units.Force, Unit: "N", Meaning: "amplitude of its secondary inertia force (at twice crank speed); a counterweight cannot balance it"},
		{Name: "residual_primary_axial", Dim: units.Force, Unit: "N", Meaning: "amplitude of the primary force left along the cylinder axis after balancing"},
		{Name: "residual_primary_transverse", Dim: units.Force, Unit: "N", Meaning: "amplitude of the force the counterweight adds across the cylinder axis"},
	},
	Evaluate: evaluateBalance,
}

const balanceDoc = `The balance kind sizes the counterweight of a single-cylinder crank and gives
the shaking forces left on the frame. The crank radius R (half the stroke),
rod length L and speed ω come from the compressor or motor block named in source.

Assumptions
- The moving parts are two point masses: m_rec reciprocating with the piston
  (piston, pin, rings, small-end share of the rod) and m_rot rotating with
  the crank pin at radius R (pin, webs, big-end share of the rod).
- Constant crank speed. Gravity and gas forces are left out: gas forces act
  on the piston and the cylinder head alike and do not shake the frame.
- One cylinder. Several cylinders on one crank cancel or add their forces
  by their arrangement, which the source block does not give: a source
  with cylinders above 1 is refused. Two stages on opposed throws of one
  crank take one balance block each.

Forces (the slider-crank acceleration to second order in R/L; e.g.
J. E. Shigley and J. J. Uicker, Theory of Machines and Mechanisms, balancing;
S. S. Rattan, Theory of Machines, balancing of reciprocating masses)
  F_rec(θ) ≈ m_rec·R·ω²·(cos θ + (R/L)·cos 2θ) along the cylinder axis
  primary_force   = m_rec·R·ω²
  secondary_force = m_rec·R·ω²·(R/L)
  The exact second harmonic is m_rec·R·ω²·(λ + λ³/4 + ...), λ = R/L; above
  λ = 0.45 (rods shorter than 2.2 cranks) the trace carries a NOTE.
The counterweight, opposite the crank pin at radius r_cw, balances all of
the rotating mass and the fraction f of the reciprocating mass:
  m_cw = (m_rot + f·m_rec)·R / r_cw
It turns the fraction f of the primary force from the cylinder axis into a
force across it, so the primary force left is
  along the axis:  (1 − f)·m_rec·R·ω²·cos θ     residual_primary_axial
  across the axis: f·m_rec·R·ω²·sin θ           residual_primary_transverse
f = 1/2 gives the smallest greatest residual, half the primary force in
every direction; f = 0 leaves all of it along the axis. The secondary force
stays whatever f is.`

func evaluateBalance(in *calc.Inputs) (*calc.Outcome, error) {
	src := in.LinkOf("source")
	if src == nil {
		return nil, &calc.InputError{Key: "source", Message: "missing: name the compressor or motor block to balance, e.g. source = \"low\""}
	}
	if z := src.Inputs["cylinders"]; z > 1 {
		return nil, &calc.InputError{Key: "source", Message: fmt.Sprintf(
			"block %s has %s cylinders; balance models a single-cylinder crank (the forces of several cylinders depend on their arrangement)",
			src.ID, display.Number(z, ""))}
	}
	r := src.Inputs["crank_radius"]
	if s, ok := src.Inputs["stroke"]; ok {
		r = s / 2
	}
	rod, omega := src.Inputs["rod_length"], src.Inputs["speed"]
	if !(r > 0 && rod > r && omega > 0) {
		return nil, &calc.InputError{Key: "source", Message: fmt.Sprintf("block %s gives no usable crank radius, rod length and speed", src.ID)}
	}
	mRec := in.Value("reciprocating_mass")
	if !in.Has("reciprocating_mass") {
		m, ok := src.Inputs["reciprocating_mass"]
		if !ok {
			// Of the source kinds, only a compressor block carries the mass.
			where := " here"
			if src.Kind == compressorKind.Name {
				where += " or on block " + src.ID
			}
			return nil, &calc.InputError{Key: "reciprocating_mass", Message: fmt.Sprintf(
				"missing: give reciprocating_mass (a mass, e.g. \"120 g\")%s", where)}
		}
		mRec = m
	}
	var (
		mRot   = in.Value("rotating_mass")
		frac   = in.Value("balance_fraction")
		rcw    = in.Value("counterweight_radius")
		prim   = mRec * r * omega * omega
		cust   = in.Customary()
		kg     = display.TraceIn(cust, "kg")
		mm     = display.TraceIn(cust, "mm")
		num    = func(v float64) string { return display.Number(v, "") }
		force  = display.TraceIn(cust, "N")
		rads   = display.Number(omega, "rad/s")
		primed = kg(mRec) + " · " + mm(r) + " · (" + rads + ")²"
	)
	res := []calc.Result{
		{Name: "counterweight_mass", Value: (mRot + frac*mRec) * r / rcw, Dim: units.Mass, Trace: calc.Trace{Formula: "m_cw = (m_rot + f·m_rec) · R / r_cw", Substituted: "= (" + kg(mRot) + " + " + num(frac) + " · " + kg(mRec) + ") · " + mm(r) + " / " + mm(rcw)}},
		{Name: "primary_force", Value: prim, Dim: units.Force, Trace: calc.Trace{Formula: "F1 = m_rec · R · ω²", Substituted: "= " + primed}},
		{Name: "secondary_force", Value: prim * r / rod, Dim: units.Force, Trace: calc.Trace{Formula: "F2 = m_rec · R · ω² · R/L", Substituted: "= " + force(prim) + " · " + mm(r) + " / " + mm(rod) + shortRodNote(r/rod)}},
		{Name: "residual_primary_axial", Value: (1 - frac) * prim, Dim: units.Force, Trace: calc.Trace{Formula: "F_ax = (1 − f) · m_rec · R · ω²", Substituted: "= (1 − " + num(frac) + ") · " + force(prim)}},
		{Name: "residual_primary_transverse", Value: frac * prim, Dim: units.Force, Trace: calc.Trace{Formula: "F_tr = f · m_rec · R · ω²", Substituted: "= " + num(frac) + " · " + force(prim)}},
	}
	return &calc.Outcome{Results: res}, nil
}

// shortRodLimit is the crank-to-rod ratio λ = R/L above which the series
// to second order, F2 = m·R·ω²·λ, understates the exact second harmonic,
// m·R·ω²·(λ + λ³/4 + ...), by more than λ²/4 = 5 %.
const shortRodLimit = 0.45

// shortRodNote warns, in the secondary force's trace, that a short rod
// makes the second-order series poor.
func shortRodNote(lambda float64) string {
	if lambda <= shortRodLimit {
		return ""
	}
	return fmt.Sprintf(" (NOTE: R/L = %s: for so short a rod this second-order figure is about %s %% below the exact secondary force, "+
		"and the fourth and higher harmonics, left out, grow too)", display.Number(lambda, ""), display.Number(100*lambda*lambda/4, ""))
}
