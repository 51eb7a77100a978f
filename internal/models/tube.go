package models

import (
	"fmt"
	"math"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// tubeKind models a cylinder wall under a pressure difference: Lamé's
// thick-wall stresses at the bore, the thin-wall hoop stress for
// comparison and a safety factor; under internal pressure Barlow's burst
// pressure and the code figure, under outside pressure (a vacuum vessel)
// the elastic collapse pressure.
var tubeKind = calc.Kind{
	Name:            "tube",
	Summary:         "a cylinder wall under inside or outside pressure: Lamé thick-wall and thin-wall stresses, Barlow burst pressure and allowable pressure, or collapse pressure under vacuum, safety factors",
	Doc:             tubeDoc,
	Roles:           calc.HoldsPressure | calc.PressurePart | calc.Wall,
	WorkingPressure: calc.WorkingPressure{Key: "pressure", Name: "working pressure"},
	Inputs: []calc.InputSpec{
		{Name: "inner_diameter", Dim: units.Length, Range: calc.Between(1e-4, 10), Meaning: "bore of the tube or cylinder, 0.1 mm to 10 m"},
		{Name: "outer_diameter", Dim: units.Length, Optional: true, Range: calc.Between(1e-4, 20), Meaning: "outside diameter; give outer_diameter or wall_thickness"},
		{Name: "wall_thickness", Dim: units.Length, Optional: true, Range: calc.Between(minTubeWall, 5), Meaning: "wall thickness, 1 µm or more and less than the inner radius; give wall_thickness or outer_diameter"},
		{Name: "pressure", Dim: units.Pressure, Range: calc.Between(0, maxTubePressure), Meaning: "pressure inside, up to 1 GPa; the outside is at ambient. Below ambient (a vacuum vessel, e.g. \"-0.9 bar(g)\" or \"20 mbar(a)\") the atmosphere presses the wall in"},
		{Name: "length", Dim: units.Length, Optional: true, Range: calc.Between(minPartSize, 100), Meaning: "length between the end caps or stiffening rings that hold the tube round, for the collapse pressure of a short tube under outside pressure; default: a long tube"},
		{Name: "material", Type: calc.Name, Choices: materialChoices, Resolve: resolveMaterial, Label: materialLabel, Suggest: suggestMaterial, Meaning: "material of the wall (specgen explain lists the materials)"},
		{Name: "closed_ends", Type: calc.Name, Default: "true", Choices: func(any) []string { return []string{"false", "true"} },
			Meaning: "true when the tube's own wall carries the end load (capped cylinder); false when tie rods or the frame carry it"},
		vesselInputs[0], vesselInputs[1], vesselInputs[2],
		{Name: "volume", Dim: units.Volume, Optional: true, Range: calc.Between(minVesselVolume, 1e3), Meaning: "volume the wall holds, up to 1000 m3: gives the pneumatic-test figures (test_energy, tnt_equivalent, test_distance)"},
		testInputs[0],
	},
	Results: append([]calc.ResultSpec{
		{Name: "hoop_stress", Dim: units.Stress, Unit: "MPa", Meaning: "circumferential stress at the bore, Lamé (thick wall): the largest stress in the wall"},
		{Name: "hoop_stress_thin", Dim: units.Stress, Unit: "MPa", Meaning: "circumferential stress by the thin-wall formula p·Di/2t, for comparison"},
		{Name: "axial_stress", Dim: units.Stress, Unit: "MPa", Meaning: "longitudinal stress from the end load (0 for open ends)"},
		{Name: "radial_stress", Dim: units.Stress, Unit: "MPa", Meaning: "radial stress at the bore: minus the gauge pressure inside (0 under outside pressure)"},
		{Name: "burst_pressure", Dim: units.Pressure, Unit: "bar", Meaning: "pressure at which the wall bursts, Barlow's formula on the outside diameter and tensile strength (under internal pressure)"},
		{Name: "allowable_pressure", Dim: units.Pressure, Unit: "bar", Meaning: "burst pressure over the site's minimum safety factor for the material (under internal pressure)"},
		{Name: "code_allowable_pressure", Dim: units.Pressure, Unit: "bar", Meaning: "the least pressure of the thin-shell formulas of ASME VIII-1 (UG-27) with the joint efficiency, in the corroded condition (metals only, under internal pressure)"},
		{Name: "safety_factor", Dim: units.Dimensionless, Unit: "", Factor: true, FactorMaterial: "material",
			Meaning: "design strength over the equivalent stress at the bore (von Mises against yield; the largest principal stress against tensile strength when the material has no yield point)"},
		{Name: "collapse_pressure", Dim: units.Stress, Unit: "bar", Meaning: "outside-over-inside pressure difference at which the wall buckles elastically (under outside pressure)"},
		{Name: "external_safety_factor", Dim: units.Dimensionless, Unit: "", Factor: true, FactorMaterial: "material",
			Meaning: "collapse pressure over the pressure difference across the wall, checked against the site's minimum for buckling (under outside pressure)"},
	}, testResults...),
	Evaluate: evaluateTube,
}

const (
	// maxTubePressure bounds the pressure input (absolute), as for the
	// compressor's discharge pressure.
	maxTubePressure = 1e9 // Pa
	// minTubeWall is the thinnest wall taken (a foil); it keeps the
	// thin-wall stress finite at the largest pressure.
	minTubeWall = 1e-6 // m
	// thinWallLimit is the wall thickness over bore beyond which the thin
	// formula p·Di/2t falls more than about 5 % below the Lamé bore stress
	// (Di/t ≥ 20, the ri/t ≥ 10 rule of strength-of-materials texts).
	thinWallLimit = 0.05
)

const tubeDoc = `The tube kind models a straight cylinder wall of bore Di = 2·ri and outside
diameter Do = 2·ro (wall t = ro − ri) with a pressure inside and ambient
pressure outside. Give the wall as outer_diameter or wall_thickness. With
the inside above ambient the wall carries internal pressure p (gauge); with
it below ambient (a vacuum vessel) the atmosphere presses the wall in with
q = p_a − p_inside.

Assumptions
- Linear elastic, homogeneous, isotropic wall; far from ends, ports and
  welds, where stresses concentrate.
- closed_ends = true: the wall carries the end load of its caps. false: the
  end load goes elsewhere (tie rods, a frame) and the axial stress is 0.
- The wall is thinner than the bore radius (t < ri, so ro/ri < 2).

Stresses at the bore, where they are largest (Lamé; W. C. Young and R. G.
Budynas, Roark's Formulas for Stress and Strain, 7th ed., Table 13.5 cases
1a to 1d, from memory)
  internal pressure p:
  σ_θ = p·(ro² + ri²)/(ro² − ri²)     hoop_stress
  σ_r = −p                            radial_stress
  σ_a = p·Di²/(Do² − Di²)             axial_stress, closed ends (else 0)
  outside pressure q (stresses negative: compression):
  σ_θ = −q·2·ro²/(ro² − ri²)   σ_r = 0   σ_a = −q·Do²/(Do² − Di²)
Thin-wall hoop stress, for comparison
  σ_θ,thin = p·Di/(2·t), or −q·Do/(2·t) under outside pressure
  σ_θ/σ_θ,thin = 1 + (x + x²)/(2 + x) with x = t/ri, so the thin formula is
  about 1 % low at t/Di = 0.01 and 5 % low at t/Di = 0.05 (ri/t = 10).
  Above t/Di = 0.05 its trace carries a NOTE; use hoop_stress.

Burst and allowable pressure (internal pressure only)
  p_burst = 2·S_u·t/Do               Barlow's formula on the outside diameter
  with S_u the tensile strength and k = ro/ri. Since (k − 1)/k lies below
  both (k² − 1)/(k² + 1) and ln k for k > 1, it is below the pressure that
  brings the Lamé bore stress to S_u (brittle fracture),
  S_u·(k² − 1)/(k² + 1), and below the von Mises collapse pressure of a
  fully plastic wall, (2/√3)·S_u·ln k: conservative for thin and
  moderately thick walls. Measured bursts of ductile tubes with a low
  yield-to-tensile ratio can fall below it; test a part before trusting it.
  p_allow = p_burst/n_min, n_min the site's minimum factor for the material
  (2.5 for ductile metals and 4 for plastics and brittle materials unless
  specgen.toml says otherwise). Both are reported as gauge in tables and as
  absolute pascals in results.json. This allowable rests on tensile
  strength; pressure-vessel and piping codes set design stresses from
  both yield and tensile strength with their own factors and usually allow
  less. Where a code applies, its allowable governs.

Code figure (metals)
  code_allowable_pressure is the lesser of the thin-shell formulas of the
  common pressure-vessel rules (ASME Section VIII Division 1, UG-27, from
  memory), with the joint efficiency E (joint_efficiency, default 1.0 for
  a seamless tube; double-welded butt joints take 1.0 fully radiographed,
  0.85 spot-radiographed, 0.70 not radiographed, Table UW-12) in the
  corroded condition: t the wall less corrosion_allowance, R the inside
  radius plus it.
    circumferential  P = S·E·t/(R + 0.6·t)    up to t = R/2 (P = 0.385·S·E)
    longitudinal     P = 2·S·E·t/(R − 0.4·t)  up to t = R/2 (P = 1.25·S·E),
                     only with closed_ends
  Beyond its limit a thin formula does not apply; the thick-wall figure of
  Appendix 1-2 stands in for it, P = S·E·(Z − 1)/(Z + 1) and P = S·E·(Z − 1)
  with Z = ((R + t)/R)², Lamé's pressures for a bore stress of S.
  The allowable stress S is the material row's own (allowable_stress), or
  the lesser of S_u/3.5 and 2/3·S_y on the specified minimum strengths, the
  basis of those rules at ordinary temperatures (UG-23, from memory).
  No code figure is given, with the reason in allowable_pressure's
  working, for plastics (the rules cover metals; fibre-reinforced plastic
  vessels have rules of their own, unreinforced ones none), and above a
  material's allowable_stress_temperature (aluminium and copper alloys
  lose strength from about 100 °C) or its service temperature.
  design_temperature defaults to 20 °C. The rules compare the working
  pressure, and a compressor's dead-head pressure, with the lower of
  allowable_pressure and code_allowable_pressure.

Pneumatic test (with volume)
  With the volume the wall holds, the tube reports test_energy,
  tnt_equivalent and test_distance as the tank kind does (specgen explain
  tank): ASME PCC-2 Article 501 at test_pressure, by default 1.1 ×
  code_allowable_pressure. Both are for internal pressure: a wall under
  vacuum takes neither (the pressure-vessel rules have their own chart
  method for outside pressure, which this kind does not follow).

Collapse under outside pressure (elastic buckling; Roark's Formulas for
Stress and Strain, 7th ed., Table 15.2, thin tube under uniform lateral
external pressure, cases 19a and 19b, from memory), with E and ν the
material's modulus and Poisson's ratio, mean diameter D_m = Di + t and mean
radius r = D_m/2:
  long tube (case 19a)   p_cr = 2·E/(1 − ν²)·(t/D_m)³
  short tube, ends held round, length L between caps or stiffening rings
  (case 19b, approximate)
                         p_cr = 0.807·E·t²/(L·r)·((1/(1 − ν²))³·t²/r²)^(1/4)
  The short-tube formula applies below the critical length L_c, where the
  two give the same pressure: L_c = 3.228·(1 − ν²)^(1/4)·r·sqrt(r/t),
  about 1.11·D_m·sqrt(D_m/t). Without length the tube is taken as long.
  n_ext = p_cr/q, external_safety_factor, against the site's minimum for
  buckling (3 unless specgen.toml sets safety.minimum_factor_buckling;
  common practice: real tubes are out of round and buckle below the
  elastic figure). The formulas are for thin walls (r/t > 10); a thicker
  wall yields before it buckles, which safety_factor covers, and the
  collapse trace notes it when the hoop stress at p_cr passes the yield
  strength.

Safety factor
  With a yield strength S_y (ductile): n = S_y/σ_vM, von Mises at the bore,
    σ_vM = sqrt(((σ_θ − σ_a)² + (σ_a − σ_r)² + (σ_r − σ_θ)²)/2).
  Without one (cast iron, PMMA, PLA): n = S_u/σ_1, the largest principal
    stress magnitude, which is |σ_θ| at the bore (maximum normal stress;
    conservative in compression, where brittle materials are stronger).
  The safety factor is against yield or fracture at the working pressure;
  the allowable pressure is against bursting. The caution rules compare the
  factors with the site's minimums, and a compressor's dead-head pressure
  with the allowable pressure.`

// Short-tube collapse, Roark's Table 15.2 case 19b (from memory).
const (
	shortTubeCoefficient = 0.807
	// criticalLengthCoefficient is 4·0.807: the short-tube formula meets
	// the long-tube one at L_c = 3.228·(1 − ν²)^(1/4)·r·sqrt(r/t).
	criticalLengthCoefficient = 4 * shortTubeCoefficient
	// thinTubeRatio is the r/t above which the collapse formulas hold.
	thinTubeRatio = 10
)

// tubeInput is a tube block's inputs in SI, pressure gauge: negative under
// outside pressure.
type tubeInput struct {
	ri, ro, t  float64
	p, ambient float64
	length     float64 // 0 without length: a long tube
	closed     bool
	material   Material
	minFactor  float64
}

// readTubeInput applies the checks that single-input ranges cannot.
func readTubeInput(in *calc.Inputs) (tubeInput, error) {
	c := tubeInput{ri: in.Value("inner_diameter") / 2, ambient: in.Ambient,
		p: in.Value("pressure") - in.Ambient, length: in.Value("length"), closed: in.NameOf("closed_ends") != "false"}
	mm := display.TraceIn(in.Customary(), "mm")
	wallKey := "wall_thickness"
	switch {
	case in.Has("outer_diameter") && in.Has("wall_thickness"):
		return c, &calc.InputError{Key: "wall_thickness", Message: "give either outer_diameter or wall_thickness, not both (outer diameter = inner diameter + 2 × wall thickness)"}
	case in.Has("outer_diameter"):
		wallKey = "outer_diameter"
		c.ro = in.Value("outer_diameter") / 2
		c.t = c.ro - c.ri
		if c.t < minTubeWall {
			return c, &calc.InputError{Key: "outer_diameter", Message: fmt.Sprintf(
				"outer diameter %s must exceed the inner diameter %s by at least 2 µm (a wall of 1 µm)", mm(2*c.ro), mm(2*c.ri))}
		}
	case in.Has("wall_thickness"):
		c.t = in.Value("wall_thickness")
		c.ro = c.ri + c.t
	default:
		return c, &calc.InputError{Key: "wall_thickness", Message: "missing: give wall_thickness or outer_diameter (a length, e.g. \"3 mm\")"}
	}
	if c.t >= c.ri {
		return c, &calc.InputError{Key: wallKey, Message: fmt.Sprintf(
			"wall thickness %s must be less than the inner radius %s (half the inner diameter %s); the burst formula does not hold for such thick walls",
			mm(c.t), mm(c.ri), mm(2*c.ri))}
	}
	if c.p == 0 {
		return c, &calc.InputError{Key: "pressure", Message: fmt.Sprintf(
			"%s is ambient: the wall carries no pressure difference; give the pressure inside, above ambient or below it (a vacuum)",
			display.Gauge(c.p, in.Customary()))}
	}
	if in.Has("length") && c.p > 0 {
		return c, &calc.InputError{Key: "length", Message: fmt.Sprintf(
			"length is for the collapse of a tube under outside pressure; the inside is at %s, above ambient: leave length out",
			display.GaugeAndAbsolute(c.p+c.ambient, c.ambient, in.Customary()))}
	}
	if c.p < 0 {
		for _, key := range []string{"volume", "test_pressure"} {
			if in.Has(key) {
				return c, &calc.InputError{Key: key, Message: fmt.Sprintf(
					"is for the pneumatic test of a wall under internal pressure; the inside is at %s, below ambient: leave %s out",
					display.GaugeAndAbsolute(c.p+c.ambient, c.ambient, in.Customary()), key)}
			}
		}
	}
	name := in.NameOf("material")
	if name == "" {
		return c, &calc.InputError{Key: "material", Message: "missing: name the wall's material, e.g. \"s235\" (specgen explain lists them)"}
	}
	m, err := envOf(in).Materials.Lookup(name)
	if err != nil {
		return c, &calc.InputError{Key: "material", Message: err.Error()}
	}
	c.material, c.minFactor = m, envOf(in).Safety.MinimumFor(m)
	return c, nil
}

func evaluateTube(in *calc.Inputs) (*calc.Outcome, error) {
	c, err := readTubeInput(in)
	if err != nil {
		return nil, err
	}
	if c.p < 0 {
		return evaluateTubeOutside(in, c), nil
	}
	code, err := readVesselCode(in, c, ordinaryTemperature)
	if err != nil {
		return nil, err
	}
	out := tubeOutcome(in, c, code)
	if in.Has("volume") {
		hasCode := len(code.figures) > 0
		test, err := pneumaticTestResults(in, in.Value("volume"), c.p, out.ResultValue("code_allowable_pressure")-c.ambient, hasCode)
		if err != nil {
			return nil, err
		}
		out.Results = append(out.Results, test...)
	} else if in.Has("test_pressure") {
		return nil, &calc.InputError{Key: "test_pressure", Message: "is given but volume is missing: the pneumatic-test figures need the volume the wall holds"}
	}
	return out, nil
}

// readVesselCode reads a wall's code inputs and works out its shell
// figures, at a design temperature of fallback unless one is given.
func readVesselCode(in *calc.Inputs, c tubeInput, fallback float64) (vesselCode, error) {
	w, noFigure, err := readCodeWall(in, c, fallback)
	if err != nil {
		return vesselCode{}, err
	}
	code := vesselCode{wall: w, noFigure: noFigure}
	if noFigure == "" {
		code.figures = w.shell()
	}
	return code, nil
}

// tubeOutcome is the wall's stresses, burst and allowable pressures, its
// code figure and its safety factor.
func tubeOutcome(in *calc.Inputs, c tubeInput, code vesselCode) *calc.Outcome {
	var (
		di, do   = 2 * c.ri, 2 * c.ro
		ri2, ro2 = c.ri * c.ri, c.ro * c.ro
		// ro² − ri² = t·(ro + ri), without the cancellation of thin walls.
		hoop   = c.p * (ro2 + ri2) / (c.t * (c.ro + c.ri))
		thin   = c.p * di / (2 * c.t)
		radial = -c.p
		axial  = 0.0
		burst  = 2 * c.material.TensileStrength * c.t / do
		allow  = burst / c.minFactor
	)
	if c.closed {
		axial = c.p * ri2 / (c.t * (c.ro + c.ri))
	}

	cust := in.Customary()
	mm, mpa, bar := display.TraceIn(cust, "mm"), display.TraceIn(cust, "MPa"), display.TraceIn(cust, "bar")
	// ro² − ri² of a thin wall is a small difference: its diameters and
	// radii get the figures it needs to work out by hand.
	dm := display.TraceInSig(cust, "mm", display.FiguresFor(c.ro, c.t))
	num := func(v float64) string { return display.Number(v, "") }

	thinTrace := calc.Trace{Formula: "σ_θ,thin = p · Di / (2 · t)", Substituted: "= " + bar(c.p) + " · " + mm(di) + " / (2 · " + mm(c.t) + ")"}
	thinTrace.Substituted += thickWallNote(c, thin, hoop)
	axialTrace := calc.Trace{Formula: "σ_a = p · Di² / (Do² − Di²) (closed ends)", Substituted: "= " + bar(c.p) + " · (" + dm(di) + ")² / ((" + dm(do) + ")² − (" + dm(di) + ")²)"}
	if !c.closed {
		axialTrace = openEndsTrace
	}
	strength, strengthName := c.material.DesignStrength()
	factor, factorTrace := tubeFactor(hoop, axial, radial, strength, strengthName, c.material.YieldStrength > 0, mpa)

	res := []calc.Result{
		{Name: "hoop_stress", Value: hoop, Dim: units.Stress, Trace: calc.Trace{Formula: "σ_θ = p · (ro² + ri²) / (ro² − ri²) (Lamé, at the bore)", Substituted: "= " + bar(c.p) + " · ((" + dm(c.ro) + ")² + (" + dm(c.ri) + ")²) / ((" + dm(c.ro) + ")² − (" + dm(c.ri) + ")²)"}},
		{Name: "hoop_stress_thin", Value: thin, Dim: units.Stress, Trace: thinTrace},
		{Name: "axial_stress", Value: axial, Dim: units.Stress, Trace: axialTrace},
		{Name: "radial_stress", Value: radial, Dim: units.Stress, Trace: calc.Trace{Formula: "σ_r = −p (at the bore)", Substituted: "= −" + bar(c.p)}},
		{Name: "burst_pressure", Value: burst + c.ambient, Dim: units.Pressure, Trace: calc.Trace{Formula: "p_burst = 2 · S_u · t / Do (Barlow, outside diameter, tensile strength)", Substituted: "= 2 · " + mpa(c.material.TensileStrength) + " · " + mm(c.t) + " / " + mm(do) + " (" + c.material.Label + ")"}},
		{Name: "allowable_pressure", Value: allow + c.ambient, Dim: units.Pressure, Trace: calc.Trace{Formula: "p_allow = p_burst / n_min", Substituted: "= " + bar(burst) + " / " + num(c.minFactor) + " (site minimum for " + c.material.Label + ")"}},
	}
	if len(code.figures) > 0 {
		res = append(res, codeAllowableResult(code.wall, code.figures, c.ambient))
	} else {
		res[len(res)-1].Trace.Substituted += "; " + code.noFigure
	}
	res = append(res, calc.Result{Name: "safety_factor", Value: factor, Dim: units.Dimensionless, Trace: factorTrace})
	return &calc.Outcome{Results: res}
}

// openEndsTrace is the axial stress of a tube whose ends carry no load.
var openEndsTrace = calc.Trace{Formula: "σ_a = 0 (open ends: the end load is carried elsewhere)", Substituted: "= 0 MPa"}

// thickWallNote is the note the thin-wall trace carries when the wall is
// too thick for it, or "".
func thickWallNote(c tubeInput, thin, hoop float64) string {
	ratio := c.t / (2 * c.ri)
	if ratio <= thinWallLimit {
		return ""
	}
	return fmt.Sprintf(" (NOTE: t/Di = %s > %s, a thick wall: this is %s %% below the Lamé bore stress; use hoop_stress)",
		display.Number(ratio, ""), display.Number(thinWallLimit, ""), display.Number(100*(1-thin/hoop), ""))
}

// evaluateTubeOutside evaluates a tube whose inside is below ambient: the
// atmosphere presses the wall in, in compression, and can buckle it.
func evaluateTubeOutside(in *calc.Inputs, c tubeInput) *calc.Outcome {
	var (
		q        = -c.p
		di, do   = 2 * c.ri, 2 * c.ro
		ro2      = c.ro * c.ro
		wallArea = c.t * (c.ro + c.ri) // ro² − ri², without cancellation
		hoop     = -q * 2 * ro2 / wallArea
		thin     = -q * do / (2 * c.t)
		axial    = 0.0
		m        = c.material
		dMean    = di + c.t
		r        = dMean / 2
		stiff    = m.ElasticModulus / (1 - m.PoissonRatio*m.PoissonRatio)
		long     = 2 * stiff * math.Pow(c.t/dMean, 3)
		critical = criticalLengthCoefficient * math.Pow(1-m.PoissonRatio*m.PoissonRatio, 0.25) * r * math.Sqrt(r/c.t)
		collapse = long
	)
	if c.closed {
		axial = -q * ro2 / wallArea
	}
	cust := in.Customary()
	mm, mpa, bar := display.TraceIn(cust, "mm"), display.TraceIn(cust, "MPa"), display.TraceIn(cust, "bar")
	dm := display.TraceInSig(cust, "mm", display.FiguresFor(c.ro, c.t))
	gpa, num := display.TraceIn(cust, "GPa"), func(v float64) string { return display.Number(v, "") }
	nu := num(m.PoissonRatio)

	collapseTrace := calc.Trace{Formula: "p_cr = 2 · E/(1 − ν²) · (t/D_m)³, D_m = Di + t (long tube: Roark's Formulas for Stress and Strain, 7th ed., Table 15.2 case 19a)",
		Substituted: fmt.Sprintf("= 2 · %s/(1 − %s²) · (%s / %s)³", gpa(m.ElasticModulus), nu, mm(c.t), mm(dMean))}
	switch {
	case c.length > 0 && c.length < critical:
		collapse = shortTubeCoefficient * m.ElasticModulus * c.t * c.t / (c.length * r) *
			math.Pow(math.Pow(1/(1-m.PoissonRatio*m.PoissonRatio), 3)*c.t*c.t/(r*r), 0.25)
		collapseTrace = calc.Trace{Formula: "p_cr = 0.807 · E·t²/(L·r) · ((1/(1 − ν²))³ · t²/r²)^(1/4), r = D_m/2 (short tube, ends held round: Roark's Formulas for Stress and Strain, 7th ed., Table 15.2 case 19b)",
			Substituted: fmt.Sprintf("= 0.807 · %s · (%s)²/(%s · %s) · ((1/(1 − %s²))³ · (%s / %s)²)^(1/4) (L below the critical length %s)",
				gpa(m.ElasticModulus), mm(c.t), mm(c.length), mm(r), nu, mm(c.t), mm(r), mm(critical))}
	case c.length > 0:
		collapseTrace.Substituted += fmt.Sprintf(" (L = %s, at least the critical length %s: long)", mm(c.length), mm(critical))
	}
	if m.PoissonRatio == 0 {
		collapseTrace.Substituted += " (" + m.Label + " has no Poisson's ratio: ν = 0, which gives the lowest p_cr)"
	}
	if r/c.t < thinTubeRatio {
		collapseTrace.Substituted += fmt.Sprintf(" (NOTE: r/t = %s, below %d: a thick wall, for which the buckling formulas overstate the collapse pressure; safety_factor covers yielding)", num(r/c.t), thinTubeRatio)
	} else if y := m.YieldStrength; y > 0 && collapse*r/c.t > y {
		collapseTrace.Substituted += fmt.Sprintf(" (NOTE: at this pressure the hoop stress p·r/t = %s passes the yield strength %s: the wall yields first, at about %s)", mpa(collapse*r/c.t), mpa(y), bar(y*c.t/r))
	}

	axialTrace := calc.Trace{Formula: "σ_a = −q · Do² / (Do² − Di²) (closed ends, outside pressure q = p_a − p)", Substituted: "= −" + bar(q) + " · (" + dm(do) + ")² / ((" + dm(do) + ")² − (" + dm(di) + ")²)"}
	if !c.closed {
		axialTrace = openEndsTrace
	}
	strength, strengthName := m.DesignStrength()
	factor, factorTrace := tubeFactor(hoop, axial, 0, strength, strengthName, m.YieldStrength > 0, mpa)
	qTrace := display.TraceInSig(cust, "bar", display.FiguresFor(c.ambient, q))
	res := []calc.Result{
		{Name: "hoop_stress", Value: hoop, Dim: units.Stress, Trace: calc.Trace{Formula: "σ_θ = −q · 2·ro² / (ro² − ri²) (Lamé, at the bore, outside pressure q = p_a − p)", Substituted: "= −" + bar(q) + " · 2·(" + dm(c.ro) + ")² / ((" + dm(c.ro) + ")² − (" + dm(c.ri) + ")²)"}},
		{Name: "hoop_stress_thin", Value: thin, Dim: units.Stress, Trace: calc.Trace{Formula: "σ_θ,thin = −q · Do / (2 · t)", Substituted: "= −" + bar(q) + " · " + mm(do) + " / (2 · " + mm(c.t) + ")" + thickWallNote(c, thin, hoop)}},
		{Name: "axial_stress", Value: axial, Dim: units.Stress, Trace: axialTrace},
		{Name: "radial_stress", Value: 0, Dim: units.Stress, Trace: calc.Trace{Formula: "σ_r = 0 (at the bore, the side at the lower pressure)", Substituted: "= 0 MPa"}},
		{Name: "safety_factor", Value: factor, Dim: units.Dimensionless, Trace: factorTrace},
		{Name: "collapse_pressure", Value: collapse, Dim: units.Stress, Trace: collapseTrace},
		{Name: "external_safety_factor", Value: collapse / q, Dim: units.Dimensionless, Trace: calc.Trace{Formula: "n_ext = p_cr / (p_a − p)",
			Substituted: fmt.Sprintf("= %s / %s (%s outside, %s inside)", bar(collapse), qTrace(q), display.TraceIn(cust, "mbar(a)")(c.ambient), display.TraceIn(cust, "mbar(a)")(c.p+c.ambient))}},
	}
	return &calc.Outcome{Results: res}
}

// tubeFactor returns the safety factor at the bore and its trace: the
// strength over the von Mises stress when the strength is a yield
// strength, else over the largest principal stress magnitude.
func tubeFactor(hoop, axial, radial, strength float64, strengthName string, ductile bool, mpa func(float64) string) (float64, calc.Trace) {
	if ductile {
		vm := math.Sqrt(((hoop-axial)*(hoop-axial) + (axial-radial)*(axial-radial) + (radial-hoop)*(radial-hoop)) / 2)
		return strength / vm, calc.Trace{Formula: "n = S_y / σ_vM, σ_vM = sqrt(((σ_θ − σ_a)² + (σ_a − σ_r)² + (σ_r − σ_θ)²) / 2)", Substituted: "= " + mpa(strength) + " / " + mpa(vm) + " (" + strengthName + "; σ_θ " + mpa(hoop) + ", σ_a " + mpa(axial) + ", σ_r " + mpa(radial) + ")"}

	}
	largest := math.Max(math.Abs(hoop), math.Max(math.Abs(axial), math.Abs(radial)))
	return strength / largest, calc.Trace{Formula: "n = S_u / max(|σ_θ|, |σ_a|, |σ_r|) (no yield point: largest principal stress)", Substituted: "= " + mpa(strength) + " / " + mpa(largest) + " (" + strengthName + ")"}

}
