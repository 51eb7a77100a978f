package models

import (
	"fmt"
	"math"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// plateKind models a flat plate or lid under a uniform pressure difference:
// circular plates by the classical closed forms, rectangular simply
// supported plates by Navier's double series.
var plateKind = calc.Kind{
	Name:    "plate",
	Summary: "a flat plate or lid under uniform pressure (circular, simply supported or clamped; rectangular simply supported): largest bending stress, deflection, safety factor",
	Doc:     plateDoc,
	Roles:   calc.HoldsPressure | calc.Wall,
	Inputs: []calc.InputSpec{
		{Name: "shape", Type: calc.Name, Choices: func(any) []string { return []string{"circular", "rectangular"} }, Meaning: "circular (give diameter) or rectangular (give length and width)"},
		{Name: "diameter", Dim: units.Length, Optional: true, Range: calc.Between(minPartSize, 100), Meaning: "diameter of a circular plate at its support or clamping"},
		{Name: "length", Dim: units.Length, Optional: true, Range: calc.Between(minPartSize, 100), Meaning: "span of a rectangular plate between its supports, one way"},
		{Name: "width", Dim: units.Length, Optional: true, Range: calc.Between(minPartSize, 100), Meaning: "span of a rectangular plate between its supports, the other way"},
		{Name: "edge", Type: calc.Name, Default: "simply_supported", Choices: func(any) []string { return []string{"clamped", "simply_supported"} },
			Meaning: "simply_supported: the edge rests on its support and may turn; clamped: held rigidly (circular plates only); default simply_supported, the larger stress and deflection"},
		{Name: "thickness", Dim: units.Length, Range: calc.Between(minTubeWall, 1), Meaning: "plate thickness, 1 µm to 1 m"},
		{Name: "material", Type: calc.Name, Choices: materialChoices, Resolve: resolveMaterial, Label: materialLabel, Meaning: "material of the plate (specgen explain lists the materials)"},
		{Name: "pressure_difference", Dim: units.Stress, Range: positiveUpTo(1e9), Meaning: "pressure difference across the plate, spread evenly over it: for a lid on a vacuum vessel, ambient less the pressure inside"},
	},
	Results: []calc.ResultSpec{
		{Name: "max_stress", Dim: units.Stress, Unit: "MPa", Meaning: "largest bending stress in the plate, at a face"},
		{Name: "max_deflection", Dim: units.Length, Unit: "mm", Meaning: "largest deflection, at the centre"},
		{Name: "safety_factor", Dim: units.Dimensionless, Unit: "", Factor: true, FactorMaterial: "material",
			Meaning: "design strength (yield, or tensile strength without a yield point) over the largest bending stress"},
	},
	Evaluate: evaluatePlate,
}

const plateDoc = `The plate kind models a flat plate of thickness t, modulus E and Poisson's
ratio ν under a uniform pressure difference q (pressure_difference): a lid
or window on a vacuum vessel, the top of a vacuum clamping table, a cover
under pressure. D = E·t³/(12·(1 − ν²)) is its flexural rigidity.

Assumptions
- Small deflections (Kirchhoff plate theory): the deflection stays below
  about half the thickness. Beyond that the plate also stretches like a
  membrane, and the real stress and deflection are lower than these; the
  deflection's trace carries a NOTE.
- Linear elastic, homogeneous, isotropic; the load spread evenly over the
  whole plate; holes, bosses and the fixing screws' stress concentrations
  left out.
- simply_supported: the edge rests on its support, free to turn (and a
  rectangle's corners held down); clamped: the edge is held rigidly, which
  a bolted flange only partly does. Where in doubt, simply supported gives
  the larger stress and deflection.

Circular plate of radius a (W. C. Young and R. G. Budynas, Roark's Formulas
for Stress and Strain, 7th ed., Table 11.2 cases 10a and 10b; S. Timoshenko
and S. Woinowsky-Krieger, Theory of Plates and Shells, 2nd ed., §15-16;
from memory)
  simply supported: σ_max = 3·(3 + ν)·q·a²/(8·t²) at the centre
                    w_max = (5 + ν)·q·a⁴/(64·D·(1 + ν))
  clamped:          σ_max = 3·q·a²/(4·t²) at the edge (radial)
                    w_max = q·a⁴/(64·D)

Rectangular plate, simply supported, spans a and b (Navier's solution;
Timoshenko and Woinowsky-Krieger §30, from memory); at the centre, with
m, n odd and s = (−1)^((m + n)/2 − 1):
  w = 16·q/(π⁶·D) · Σ s / (m·n·(m²/a² + n²/b²)²)
  M_x = 16·q/π⁴ · Σ s·(m²/a² + ν·n²/b²) / (m·n·(m²/a² + n²/b²)²)
  M_y = 16·q/π⁴ · Σ s·(ν·m²/a² + n²/b²) / (m·n·(m²/a² + n²/b²)²)
  σ_max = 6·max(M_x, M_y)/t², the largest bending stress in such a plate.
  The sums run over m, n up to a bound that doubles until the results
  change by less than 1e-8 (their error falls about eightfold with each
  doubling); the trace gives the bound.

Safety factor
  n = S/σ_max, with S the yield strength, or the tensile strength of a
  material without one (glass, acrylic, cast iron). The largest principal
  stress is taken: conservative against von Mises for the two-way bending
  stresses of a plate. Glass and acrylic lids on a vacuum vessel also
  raise the implosion caution: shield them.`

// plateInput is a plate block's inputs in SI.
type plateInput struct {
	circular, clamped bool
	a, b              float64 // radius of a circle; spans of a rectangle
	t, q              float64
	material          Material
}

// readPlateInput applies the checks that single-input ranges cannot.
func readPlateInput(in *calc.Inputs) (plateInput, error) {
	p := plateInput{circular: in.NameOf("shape") == "circular", clamped: in.NameOf("edge") == "clamped",
		t: in.Value("thickness"), q: in.Value("pressure_difference")}
	if p.circular {
		for _, key := range []string{"length", "width"} {
			if in.Has(key) {
				return p, &calc.InputError{Key: key, Message: "a circular plate takes its diameter, not " + key + "; for a rectangle write shape = \"rectangular\""}
			}
		}
		if !in.Has("diameter") {
			return p, &calc.InputError{Key: "diameter", Message: "missing: a circular plate needs its diameter at the support, e.g. \"200 mm\""}
		}
		p.a = in.Value("diameter") / 2
	} else {
		if in.Has("diameter") {
			return p, &calc.InputError{Key: "diameter", Message: "a rectangular plate takes length and width, not a diameter; for a disc write shape = \"circular\""}
		}
		for _, key := range []string{"length", "width"} {
			if !in.Has(key) {
				return p, &calc.InputError{Key: key, Message: "missing: a rectangular plate needs its length and width between the supports, e.g. \"300 mm\""}
			}
		}
		if p.clamped {
			return p, &calc.InputError{Key: "edge", Message: "clamped is for circular plates only; a rectangular plate is computed simply supported (Navier's series), which gives the larger stress and deflection: write edge = \"simply_supported\""}
		}
		p.a, p.b = in.Value("length"), in.Value("width")
	}
	m, err := envOf(in).Materials.Lookup(in.NameOf("material"))
	if err != nil {
		return p, &calc.InputError{Key: "material", Message: err.Error()}
	}
	if m.PoissonRatio == 0 {
		return p, &calc.InputError{Key: "material", Message: fmt.Sprintf(
			"%s has no Poisson's ratio, which the plate formulas need: add poisson_ratio under [materials.%s] in specgen.toml", m.Label, m.Name)}
	}
	p.material = m
	return p, nil
}

// navierLimit is the largest bound on m and n the series is summed to; it
// converges long before (tested).
const navierLimit = 3327

// navierTolerance is the relative change of the sums at which doubling the
// bound stops. The moments' error falls about eightfold with each doubling,
// so the sums are then within about 1e-9 of their limits.
const navierTolerance = 1e-8

// navierCentre sums Navier's series at the centre of a simply supported
// a × b plate under unit load with unit rigidity: w·D/q and the moments
// M_x/q, M_y/q, for Poisson's ratio nu. It doubles the bound on m and n
// until the sums change by less than navierTolerance, and returns the
// bound.
func navierCentre(a, b, nu float64) (w, mx, my float64, bound int) {
	sum := func(k int) (w, mx, my float64) {
		for m := 1; m <= k; m += 2 {
			for n := 1; n <= k; n += 2 {
				s := 1.0
				if ((m+n)/2-1)%2 != 0 {
					s = -1
				}
				am, bn := float64(m*m)/(a*a), float64(n*n)/(b*b)
				den := float64(m*n) * (am + bn) * (am + bn)
				w += s / den
				mx += s * (am + nu*bn) / den
				my += s * (nu*am + bn) / den
			}
		}
		return 16 / math.Pow(math.Pi, 6) * w, 16 / math.Pow(math.Pi, 4) * mx, 16 / math.Pow(math.Pi, 4) * my
	}
	bound = 25
	w, mx, my = sum(bound)
	for bound < navierLimit {
		next := 2*bound + 1
		w2, mx2, my2 := sum(next)
		done := math.Abs(w2-w) <= navierTolerance*math.Abs(w2) && math.Abs(mx2-mx) <= navierTolerance*math.Abs(mx2) &&
			math.Abs(my2-my) <= navierTolerance*math.Abs(my2)
		w, mx, my, bound = w2, mx2, my2, next
		if done {
			break
		}
	}
	return w, mx, my, bound
}

func evaluatePlate(in *calc.Inputs) (*calc.Outcome, error) {
	p, err := readPlateInput(in)
	if err != nil {
		return nil, err
	}
	m := p.material
	nu := m.PoissonRatio
	rigidity := m.ElasticModulus * p.t * p.t * p.t / (12 * (1 - nu*nu))
	cust := in.Customary()
	mm, bar, gpa := display.TraceIn(cust, "mm"), display.TraceIn(cust, "bar"), display.TraceIn(cust, "GPa")
	num := func(v float64) string { return display.Number(v, "") }
	dTrace := fmt.Sprintf("D = E·t³/(12·(1 − ν²)) = %s · (%s)³/(12 · (1 − %s²))", gpa(m.ElasticModulus), mm(p.t), num(nu))

	var stress, deflection float64
	var sTrace, wTrace calc.Trace
	switch {
	case p.circular && p.clamped:
		stress = 3 * p.q * p.a * p.a / (4 * p.t * p.t)
		deflection = p.q * math.Pow(p.a, 4) / (64 * rigidity)
		sTrace = calc.Trace{Formula: "σ_max = 3·q·a²/(4·t²), radial, at the clamped edge (Roark's Formulas for Stress and Strain, 7th ed., Table 11.2 case 10b)",
			Substituted: fmt.Sprintf("= 3 · %s · (%s)²/(4 · (%s)²)", bar(p.q), mm(p.a), mm(p.t))}
		wTrace = calc.Trace{Formula: "w_max = q·a⁴/(64·D), " + dTrace,
			Substituted: fmt.Sprintf("= %s · (%s)⁴/(64 · %s)", bar(p.q), mm(p.a), display.Number(rigidity, "N m"))}
	case p.circular:
		stress = 3 * (3 + nu) * p.q * p.a * p.a / (8 * p.t * p.t)
		deflection = (5 + nu) * p.q * math.Pow(p.a, 4) / (64 * rigidity * (1 + nu))
		sTrace = calc.Trace{Formula: "σ_max = 3·(3 + ν)·q·a²/(8·t²), at the centre (Roark's Formulas for Stress and Strain, 7th ed., Table 11.2 case 10a)",
			Substituted: fmt.Sprintf("= 3 · (3 + %s) · %s · (%s)²/(8 · (%s)²)", num(nu), bar(p.q), mm(p.a), mm(p.t))}
		wTrace = calc.Trace{Formula: "w_max = (5 + ν)·q·a⁴/(64·D·(1 + ν)), " + dTrace,
			Substituted: fmt.Sprintf("= (5 + %s) · %s · (%s)⁴/(64 · %s · (1 + %s))", num(nu), bar(p.q), mm(p.a), display.Number(rigidity, "N m"), num(nu))}
	default:
		w, mx, my, bound := navierCentre(p.a, p.b, nu)
		moment := math.Max(mx, my)
		stress = 6 * moment * p.q / (p.t * p.t)
		deflection = w * p.q / rigidity
		sums := fmt.Sprintf("m, n odd up to %d", bound)
		sTrace = calc.Trace{Formula: "σ_max = 6·max(M_x, M_y)/t², M_x = 16·q/π⁴·Σ s·(m²/a² + ν·n²/b²)/(m·n·(m²/a² + n²/b²)²), M_y likewise, at the centre (Navier's series, simply supported)",
			Substituted: fmt.Sprintf("= 6 · %s · %s · (%s)²/(%s)² (M_x/(q·a²) = %s, M_y/(q·a²) = %s with a = %s, b = %s; %s)",
				display.NumberSig(moment/(p.a*p.a), "", 6), bar(p.q), mm(p.a), mm(p.t), display.NumberSig(mx/(p.a*p.a), "", 6), display.NumberSig(my/(p.a*p.a), "", 6), mm(p.a), mm(p.b), sums)}
		wTrace = calc.Trace{Formula: "w_max = 16·q/(π⁶·D)·Σ s/(m·n·(m²/a² + n²/b²)²), at the centre (Navier's series), " + dTrace,
			Substituted: fmt.Sprintf("= %s · %s · (%s)⁴/%s (w·D/(q·a⁴) from the series; %s)", display.NumberSig(w/math.Pow(p.a, 4), "", 6), bar(p.q), mm(p.a),
				display.Number(rigidity, "N m"), sums)}
	}
	if deflection > p.t/2 {
		wTrace.Substituted += fmt.Sprintf(" (NOTE: more than half the thickness %s: the plate also stretches as a membrane, and the real stress and deflection are lower than these small-deflection figures)", mm(p.t))
	}
	strength, strengthName := m.DesignStrength()
	res := []calc.Result{
		{Name: "max_stress", Value: stress, Dim: units.Stress, Trace: sTrace},
		{Name: "max_deflection", Value: deflection, Dim: units.Length, Trace: wTrace},
		{Name: "safety_factor", Value: strength / stress, Dim: units.Dimensionless, Trace: calc.Trace{Formula: "n = S / σ_max",
			Substituted: fmt.Sprintf("= %s / %s (%s, %s)", display.TraceIn(cust, "MPa")(strength), display.TraceIn(cust, "MPa")(stress), strengthName, m.Label)}},
	}
	return &calc.Outcome{Results: res}, nil
}
