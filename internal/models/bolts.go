package models

import (
	"fmt"
	"math"
	"strings"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// boltsKind models the bolts that hold a cylinder head (or any cover)
// against the pressure inside: the head load shared by the bolts, the
// stress in each bolt against its property class, and the stripping of
// the thread in the nut or tapped hole.
var boltsKind = calc.Kind{
	Name:    "bolts",
	Summary: "the bolts that hold a head against pressure: head load, load per bolt, bolt stress against the property class, thread stripping",
	Doc:     boltsDoc,
	Roles:   calc.HoldsPressure,
	Inputs: []calc.InputSpec{
		{Name: "thread", Type: calc.Name, Meaning: "ISO metric thread, M2 to M24: coarse as \"M8\", fine as \"M8x1\" (the table is under Threads above)"},
		{Name: "count", Dim: units.Dimensionless, Range: calc.Between(1, maxBolts), Meaning: "number of bolts sharing the head load, a whole number from 1 to 1000"},
		{Name: "property_class", Type: calc.Name, Choices: propertyClassChoices, Meaning: "ISO 898-1 property class of the bolts: " + strings.Join(propertyClassChoices(nil), ", ") + " (8.8 or \"8.8\")"},
		{Name: "pressure", Dim: units.Pressure, Range: positiveUpTo(1e9), Meaning: "pressure under the head, gauge unless marked absolute; must be above ambient"},
		{Name: "pressure_diameter", Dim: units.Length, Range: calc.Between(minPartSize, 10), Meaning: "diameter the pressure acts over: the gasket's mean diameter, or its outer diameter to be safe; up to 10 m"},
		{Name: "nut_material", Type: calc.Name, Default: defaultNutMaterial, Choices: materialChoices, Resolve: resolveMaterial, Label: materialLabel, Meaning: "material the bolts thread into: the nut, or the head or cylinder for a tapped hole; give engagement_length with it"},
		{Name: "engagement_length", Dim: units.Length, Optional: true, Range: calc.Between(minPartSize, 1), Meaning: "length of full thread engaged in the nut or tapped hole, at least one pitch; default 0.8 × the nominal diameter for the default nut, required when nut_material is given"},
	},
	Results: []calc.ResultSpec{
		{Name: "head_load", Dim: units.Force, Unit: "N", Meaning: "force of the gauge pressure on the head over the pressure diameter"},
		{Name: "load_per_bolt", Dim: units.Force, Unit: "N", Meaning: "head load shared equally by the bolts"},
		{Name: "tensile_stress_area", Dim: units.Area, Unit: "mm2", Meaning: "tensile stress area of one bolt's thread (ISO 898-1)"},
		{Name: "bolt_stress", Dim: units.Stress, Unit: "MPa", Meaning: "tensile stress in one bolt from the pressure load, preload not included"},
		{Name: "safety_factor", Dim: units.Dimensionless, Unit: "", Meaning: "proof strength of the property class over the bolt stress", Factor: true},
		{Name: "strip_safety_factor", Dim: units.Dimensionless, Unit: "", Meaning: "shear strength of the internal thread over the load per bolt", Factor: true, FactorMaterial: "nut_material"},
	},
	Evaluate: evaluateBolts,
}

const (
	// maxBolts bounds the count; more is not a bolted head.
	maxBolts = 1000
	// defaultNutMaterial is the nut assumed when none is named: mild steel,
	// weaker than the matching ISO 898-2 nut, so on the safe side.
	defaultNutMaterial = "s235"
	// defaultNutHeight is the engaged length of the default nut over the
	// nominal diameter: ISO 4032 hexagon nuts are at least about 0.8·d
	// high (from memory: m_min 6.44 mm for M8, 8.04 mm for M10).
	defaultNutHeight = 0.8
	// shearOverTensile is the shear strength of the thread material over
	// its tensile strength (common practice for ductile metals: 0.6, near
	// the 0.577 of the von Mises criterion).
	shearOverTensile = 0.6
)

// propertyClass is one ISO 898-1 property class with its proof strength,
// Pa. Class 8.8 is stronger above 16 mm: big holds it for d > bigFromDia.
// Class 9.8 exists only up to 16 mm: maxDia.
type propertyClass struct {
	name       string
	proof      float64 // proof strength S_p,nom
	big        *propertyClass
	bigFromDia float64 // m
	maxDia     float64 // m; 0 when the class has no upper size
}

// propertyClasses are the proof strengths of ISO 898-1:2013, Table 3
// (from memory).
var propertyClasses = []propertyClass{
	{name: "4.6", proof: 225e6},
	{name: "4.8", proof: 310e6},
	{name: "5.6", proof: 280e6},
	{name: "5.8", proof: 380e6},
	{name: "6.8", proof: 440e6},
	{name: "8.8", proof: 580e6, bigFromDia: 16e-3, big: &propertyClass{name: "8.8", proof: 600e6}},
	{name: "9.8", proof: 650e6, maxDia: 16e-3},
	{name: "10.9", proof: 830e6},
	{name: "12.9", proof: 970e6},
}

// lookupClass returns the strengths of class name for a bolt of nominal
// diameter d, and the diameter range they hold for ("" when all). A bolt
// above the class's largest size is found too: readBoltsInput refuses it.
func lookupClass(name string, d float64) (propertyClass, string, bool) {
	for _, c := range propertyClasses {
		if c.name != name {
			continue
		}
		switch {
		case c.maxDia > 0:
			return c, "d ≤ " + display.Number(c.maxDia*1e3, "mm"), true
		case c.big == nil:
			return c, "", true
		case d > c.bigFromDia*(1+1e-9):
			return *c.big, "d > " + display.Number(c.bigFromDia*1e3, "mm"), true
		default:
			return c, "d ≤ " + display.Number(c.bigFromDia*1e3, "mm"), true
		}
	}
	return propertyClass{}, "", false
}

// classesFor lists the property classes made in nominal diameter d.
func classesFor(d float64) []string {
	var names []string
	for _, c := range propertyClasses {
		if c.maxDia == 0 || d <= c.maxDia*(1+1e-9) {
			names = append(names, c.name)
		}
	}
	return names
}

// propertyClassChoices lists the property classes, for the Name input.
func propertyClassChoices(any) []string {
	names := make([]string, len(propertyClasses))
	for i, c := range propertyClasses {
		names[i] = c.name
	}
	return names
}

const boltsDoc = `The bolts kind checks the z bolts that hold a cylinder head, cover or end
cap against the gauge pressure p_g inside it, acting over the pressure
diameter D_p (the gasket's mean diameter, or its outer diameter to be safe).

What it leaves out
- It checks the external pressure load only. Preload (tightening torque),
  gasket seating loads and gasket factors, the stiffness of the joint and the
  share of the load it takes off the bolts, bending from an eccentric load,
  and fatigue under pulsing pressure are all outside the model. A properly
  preloaded joint sees less than the full load change in its bolts, but the
  preload itself stresses them; size tightening with a joint method (e.g.
  VDI 2230) and treat these results as a minimum check.
- The bolts share the load equally (a stiff head, evenly spaced bolts).

Load
  F = p_g · π/4 · D_p²      F_b = F / z

Bolt (ISO 898-1)
  The basic profile of ISO 68-1 has a fundamental triangle of height
  H = √3/2 · P. The pitch diameter lies 3/8 H inside the major diameter on
  each side, the minor diameter 5/8 H, and ISO 898-1 takes its stress
  diameter a further H/6 inside the minor diameter:
  d2 = d − 0.649519 · P    d3 = d − 1.226869 · P
  A_s = π/4 · ((d2 + d3)/2)²    σ = F_b / A_s
  safety_factor = S_p / σ, with S_p the proof strength of the property class
  (ISO 898-1 Table 3, from memory; MPa):
    class   4.6  4.8  5.6  5.8  6.8  8.8 (d ≤ 16 mm)  8.8 (d > 16 mm)  9.8  10.9  12.9
    S_p     225  310  280  380  440  580              600              650  830   970
    R_m,min 400  420  500  520  600  800              830              900  1040  1220
  Class 9.8 is made only up to 16 mm and is refused above.
  The proof strength is the stress a bolt carries without lasting set; the
  factor is on it, not on the ultimate strength.

Thread stripping (the nut or tapped hole)
  The internal thread strips along the cylinder at the bolt's major
  diameter. Its shear area over the engaged length L_e is the internal-thread
  formula of Machinery's Handbook ("Strength of screw threads"), taken at
  basic size (D_s = d, E_n = d2) with n = 1/P threads per unit length:
  A_t = π · n · L_e · d · (1/(2n) + 0.57735 · (d − d2))
      = π · d · L_e · (1/2 + 0.57735 · (d − d2)/P)     (= 0.875 · π · d · L_e)
  The material shears at τ = 0.6 · R_m (common practice), R_m the tensile
  strength of nut_material:
  strip_safety_factor = τ · A_t / F_b
  Real threads are made to tolerances (6H/6g) that leave less material than
  basic size; the site's minimum factor has to cover that. The load is not
  shared evenly along the engagement: the first threads carry the most, so
  engagement beyond about 1.5 · d for steel, or 2 · d for aluminium, adds
  little real strength (common practice). Stripping of the bolt's own
  (external) thread is not checked: it needs a nut material stronger than
  the bolt.
  Without nut_material the bolts are taken to go into a mild-steel (s235)
  nut of height 0.8 · d; a nut of the matching ISO 898-2 class is stronger.
  For a tapped hole, name the head or cylinder material and give the depth
  of full thread as engagement_length.

Threads
  Coarse (ISO 261, pitch in mm, from memory): M2 0.4, M2.5 0.45, M3 0.5,
  M4 0.7, M5 0.8, M6 1, M8 1.25, M10 1.5, M12 1.75, M14 2, M16 2, M18 2.5,
  M20 2.5, M22 2.5, M24 3. Fine: M8x1, M10x1.25, M10x1, M12x1.5, M12x1.25,
  M14x1.5, M16x1.5, M18x1.5, M20x1.5, M22x1.5, M24x2. Other pitches are not
  in the table and are refused: check the designation against the drawing.
  Sizes are plain decimals ("M8.0" is M8, "M8x1.0" is M8x1); exponents,
  signs and leading zeros ("M1e1", "M+8", "M08") are refused.`

// boltsInput is a bolts block's inputs in SI.
type boltsInput struct {
	thread     Thread
	class      propertyClass
	classRange string
	count      int
	gauge      float64 // Pa
	diameter   float64 // pressure diameter
	nut        Material
	engagement float64
	defaultLe  bool // engagement is the default nut height
}

// readBoltsInput applies the checks that single-input ranges cannot.
func readBoltsInput(in *calc.Inputs) (boltsInput, error) {
	var b boltsInput
	t, err := LookupThread(in.NameOf("thread"))
	if err != nil {
		return b, &calc.InputError{Key: "thread", Message: err.Error()}
	}
	b.thread = t
	c, dr, ok := lookupClass(in.NameOf("property_class"), t.D)
	if !ok {
		return b, &calc.InputError{Key: "property_class", Message: fmt.Sprintf("%q is not known; allowed: %s",
			in.NameOf("property_class"), strings.Join(propertyClassChoices(nil), ", "))}
	}
	if c.maxDia > 0 && t.D > c.maxDia*(1+1e-9) {
		return b, &calc.InputError{Key: "property_class", Message: fmt.Sprintf(
			"%q is made only up to %s diameter (ISO 898-1), and %s is %s; allowed for %s: %s",
			c.name, display.Number(c.maxDia*1e3, "mm"), t.Name, display.Number(t.D*1e3, "mm"), t.Name, strings.Join(classesFor(t.D), ", "))}
	}
	b.class, b.classRange = c, dr
	z := in.Value("count")
	if z != math.Trunc(z) {
		return b, &calc.InputError{Key: "count", Message: fmt.Sprintf("%s is not a whole number of bolts", units.Format(z, 6))}
	}
	b.count = int(z)
	b.gauge = in.Value("pressure") - in.Ambient
	if b.gauge <= 0 {
		return b, &calc.InputError{Key: "pressure", Message: fmt.Sprintf(
			"%s is not above ambient (%s); the bolts carry a head load only when the pressure under the head is above ambient",
			display.TraceIn(in.Customary(), "bar(a)")(in.Value("pressure")), display.TraceIn(in.Customary(), "bar(a)")(in.Ambient))}
	}
	b.diameter = in.Value("pressure_diameter")
	b.nut, err = envOf(in).Materials.Lookup(in.NameOf("nut_material"))
	if err != nil {
		return b, &calc.InputError{Key: "nut_material", Message: err.Error()}
	}
	switch {
	case in.Has("engagement_length"):
		b.engagement = in.Value("engagement_length")
	case in.Given("nut_material"):
		return b, &calc.InputError{Key: "engagement_length", Message: fmt.Sprintf(
			"missing: with nut_material = %q give the length of full thread engaged (a length, e.g. \"%s\" for 1.5 × d)",
			in.NameOf("nut_material"), display.TraceIn(in.Customary(), "mm")(1.5*t.D))}
	default:
		b.engagement, b.defaultLe = defaultNutHeight*t.D, true
	}
	if b.engagement < t.Pitch*(1-1e-9) {
		return b, &calc.InputError{Key: "engagement_length", Message: fmt.Sprintf(
			"%s is less than one pitch of %s (%s); engage at least one full thread, and 1 × d or more in practice",
			display.TraceIn(in.Customary(), "mm")(b.engagement), t.Name, display.TraceIn(in.Customary(), "mm")(t.Pitch))}
	}
	return b, nil
}

func evaluateBolts(in *calc.Inputs) (*calc.Outcome, error) {
	b, err := readBoltsInput(in)
	if err != nil {
		return nil, err
	}
	t := b.thread
	var (
		z      = float64(b.count)
		load   = b.gauge * math.Pi / 4 * b.diameter * b.diameter
		perOne = load / z
		d2, d3 = t.PitchDiameter(), t.StressDiameter()
		as     = t.StressArea()
		stress = perOne / as
		shear  = t.InternalShearArea(b.engagement)
		tau    = shearOverTensile * b.nut.TensileStrength
	)
	cust := in.Customary()
	mm, mm2, mpa := display.TraceIn(cust, "mm"), display.TraceIn(cust, "mm2"), display.TraceIn(cust, "MPa")
	newton, bar := display.TraceIn(cust, "N"), display.TraceIn(cust, "bar")
	classNote := "class " + b.class.name
	if b.classRange != "" {
		classNote += ", " + b.classRange
	}
	leNote := ""
	if b.defaultLe {
		leNote = " (default nut, 0.8 · d)"
	}
	res := []calc.Result{
		{Name: "head_load", Value: load, Dim: units.Force, Trace: calc.Trace{Formula: "F = p_g · π/4 · D_p²", Substituted: "= " + bar(b.gauge) + " · π/4 · (" + mm(b.diameter) + ")²"}},
		{Name: "load_per_bolt", Value: perOne, Dim: units.Force, Trace: calc.Trace{Formula: "F_b = F / z", Substituted: "= " + newton(load) + " / " + display.Number(z, "")}},
		{Name: "tensile_stress_area", Value: as, Dim: units.Area, Trace: calc.Trace{Formula: "A_s = π/4 · ((d2 + d3)/2)², d2 = d − 0.649519 · P, d3 = d − 1.226869 · P", Substituted: "= π/4 · ((" + mm(d2) + " + " + mm(d3) + ")/2)², " + t.Name + ": d = " + mm(t.D) + ", P = " + mm(t.Pitch)}},
		{Name: "bolt_stress", Value: stress, Dim: units.Stress, Trace: calc.Trace{Formula: "σ = F_b / A_s", Substituted: "= " + newton(perOne) + " / " + mm2(as)}},
		{Name: "safety_factor", Value: b.class.proof / stress, Dim: units.Dimensionless, Trace: calc.Trace{Formula: "S = S_p / σ (S_p: proof strength, ISO 898-1)", Substituted: "= " + mpa(b.class.proof) + " (" + classNote + ") / " + mpa(stress)}},
		{Name: "strip_safety_factor", Value: tau * shear / perOne, Dim: units.Dimensionless, Trace: calc.Trace{Formula: "S_strip = 0.6 · R_m · A_t / F_b, A_t = π · d · L_e · (1/2 + 0.57735 · (d − d2)/P)", Substituted: "= 0.6 · " + mpa(b.nut.TensileStrength) + " (" + b.nut.Label + ") · " + mm2(shear) + " / " + newton(perOne) +
			", A_t = π · " + mm(t.D) + " · " + mm(b.engagement) + leNote + " · " + display.Number(t.internalToothFraction(), "")}},
	}
	return &calc.Outcome{Results: res}, nil
}
