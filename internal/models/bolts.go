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
		{Name: "thread", Type: calc.Name, Meaning: "ISO metric thread, M2 to M24: coarse as \"M8\", fine as \"M8x1\"; or Unified inch thread, #4 to 1 in: UNC as \"1/4-20\", UNF as \"1/4-28\" (the tables are under Threads above)"},
		{Name: "count", Dim: units.Dimensionless, Range: calc.Between(1, maxBolts), Meaning: "number of bolts sharing the head load, a whole number from 1 to 1000"},
		{Name: "property_class", Type: calc.Name, Choices: propertyClassChoices, Resolve: resolvePropertyClass, Meaning: "property class of metric bolts (ISO 898-1: 4.6 to 12.9, written 8.8 or \"8.8\") or grade of inch bolts (\"SAE 2\", \"SAE 5\", \"SAE 8\", \"A307\", \"A325\", \"A490\"): " + strings.Join(propertyClassChoices(nil), ", ")},
		{Name: "pressure", Dim: units.Pressure, Range: positiveUpTo(1e9), Meaning: "pressure under the head, gauge unless marked absolute; must be above ambient"},
		{Name: "pressure_diameter", Dim: units.Length, Range: calc.Between(minPartSize, 10), Meaning: "diameter the pressure acts over: the gasket's mean diameter, or its outer diameter to be safe; up to 10 m"},
		{Name: "nut_material", Type: calc.Name, Default: defaultNutMaterial, Choices: materialChoices, Resolve: resolveMaterial, Label: materialLabel, Suggest: suggestMaterial, Meaning: "material the bolts thread into: the nut, or the head or cylinder for a tapped hole; give engagement_length with it"},
		{Name: "engagement_length", Dim: units.Length, Optional: true, Range: calc.Between(minPartSize, 1), Meaning: "length of full thread engaged in the nut or tapped hole, at least one pitch; default 0.8 × the nominal diameter for the default nut, required when nut_material is given"},
	},
	Results: []calc.ResultSpec{
		{Name: "head_load", Dim: units.Force, Unit: "N", Meaning: "force of the gauge pressure on the head over the pressure diameter"},
		{Name: "load_per_bolt", Dim: units.Force, Unit: "N", Meaning: "head load shared equally by the bolts"},
		{Name: "tensile_stress_area", Dim: units.Area, Unit: "mm2", Meaning: "tensile stress area of one bolt's thread (ISO 898-1; ASME B1.1 for Unified threads)"},
		{Name: "bolt_stress", Dim: units.Stress, Unit: "MPa", Meaning: "tensile stress in one bolt from the pressure load, preload not included"},
		{Name: "safety_factor", Dim: units.Dimensionless, Unit: "", Meaning: "proof strength of the property class over the bolt stress (A307: its minimum tensile strength)", Factor: true},
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

// propertyClass is a property class or grade of bolts: its strength by
// band of nominal diameter, the sizes it is made in, and its thread family.
type propertyClass struct {
	name           string
	bands          []classBand
	minDia, maxDia float64 // m; 0 when the class has no lower or upper size
	sizes          string  // the sizes it is made in, for messages
	unified        bool    // an inch grade, for Unified threads
	tensileOnly    bool    // no proof load: the factor is on the minimum tensile strength
	standard       string
	source         string // where the strengths come from, for traces
}

// classBand is a class's strength for nominal diameters up to upTo (m; 0
// for the rest): the proof strength, or for a tensile-only grade the
// minimum tensile strength.
type classBand struct {
	upTo   float64
	proof  float64
	within string // the band's diameters, for traces ("" for all)
}

// classAt is a class at one diameter: its strength there and the band's
// diameters.
type classAt struct {
	propertyClass
	proof  float64
	within string
}

// ksi is 1000 lbf/in² in pascals (NIST SP 811).
const ksi = 6.894757293168361e6

// propertyClasses are the proof strengths of ISO 898-1:2013, Table 3, and
// of the inch grades: SAE J429 grades 2, 5 and 8, ASTM A325 and A490, and
// ASTM A307 grade A, which has no proof load and is taken on its minimum
// tensile strength (all from memory).
var propertyClasses = []propertyClass{
	{name: "4.6", bands: []classBand{{proof: 225e6}}, standard: "ISO 898-1", source: "ISO 898-1 Table 3, from memory"},
	{name: "4.8", bands: []classBand{{proof: 310e6}}, standard: "ISO 898-1", source: "ISO 898-1 Table 3, from memory"},
	{name: "5.6", bands: []classBand{{proof: 280e6}}, standard: "ISO 898-1", source: "ISO 898-1 Table 3, from memory"},
	{name: "5.8", bands: []classBand{{proof: 380e6}}, standard: "ISO 898-1", source: "ISO 898-1 Table 3, from memory"},
	{name: "6.8", bands: []classBand{{proof: 440e6}}, standard: "ISO 898-1", source: "ISO 898-1 Table 3, from memory"},
	{name: "8.8", bands: []classBand{{upTo: 16e-3, proof: 580e6, within: "d ≤ 16 mm"}, {proof: 600e6, within: "d > 16 mm"}}, standard: "ISO 898-1", source: "ISO 898-1 Table 3, from memory"},
	{name: "9.8", bands: []classBand{{proof: 650e6, within: "d ≤ 16 mm"}}, maxDia: 16e-3, sizes: "only up to 16 mm diameter", standard: "ISO 898-1", source: "ISO 898-1 Table 3, from memory"},
	{name: "10.9", bands: []classBand{{proof: 830e6}}, standard: "ISO 898-1", source: "ISO 898-1 Table 3, from memory"},
	{name: "12.9", bands: []classBand{{proof: 970e6}}, standard: "ISO 898-1", source: "ISO 898-1 Table 3, from memory"},
	{name: "SAE 2", bands: []classBand{{upTo: 0.75 * inch, proof: 55 * ksi, within: "1/4 to 3/4 in"}, {proof: 33 * ksi, within: "over 3/4 to 1-1/2 in"}},
		minDia: 0.25 * inch, maxDia: 1.5 * inch, sizes: "from 1/4 to 1-1/2 in", unified: true, standard: "SAE J429", source: "SAE J429, from memory"},
	{name: "SAE 5", bands: []classBand{{upTo: inch, proof: 85 * ksi, within: "1/4 to 1 in"}, {proof: 74 * ksi, within: "over 1 to 1-1/2 in"}},
		minDia: 0.25 * inch, maxDia: 1.5 * inch, sizes: "from 1/4 to 1-1/2 in", unified: true, standard: "SAE J429", source: "SAE J429, from memory"},
	{name: "SAE 8", bands: []classBand{{proof: 120 * ksi, within: "1/4 to 1-1/2 in"}},
		minDia: 0.25 * inch, maxDia: 1.5 * inch, sizes: "from 1/4 to 1-1/2 in", unified: true, standard: "SAE J429", source: "SAE J429, from memory"},
	{name: "A307", bands: []classBand{{proof: 60 * ksi, within: "1/4 to 4 in"}},
		minDia: 0.25 * inch, maxDia: 4 * inch, sizes: "from 1/4 to 4 in", unified: true, tensileOnly: true, standard: "ASTM A307", source: "ASTM A307 grade A, from memory"},
	{name: "A325", bands: []classBand{{upTo: inch, proof: 85 * ksi, within: "1/2 to 1 in"}, {proof: 74 * ksi, within: "1-1/8 to 1-1/2 in"}},
		minDia: 0.5 * inch, maxDia: 1.5 * inch, sizes: "from 1/2 to 1-1/2 in", unified: true, standard: "ASTM A325", source: "ASTM A325, from memory"},
	{name: "A490", bands: []classBand{{proof: 120 * ksi, within: "1/2 to 1-1/2 in"}},
		minDia: 0.5 * inch, maxDia: 1.5 * inch, sizes: "from 1/2 to 1-1/2 in", unified: true, standard: "ASTM A490", source: "ASTM A490, from memory"},
}

// lookupClass returns class name at nominal diameter d, and the diameters
// its strength holds for ("" when all). A bolt outside the class's sizes
// is found too: readBoltsInput refuses it.
func lookupClass(name string, d float64) (classAt, string, bool) {
	for _, c := range propertyClasses {
		if c.name != name {
			continue
		}
		for _, b := range c.bands {
			if b.upTo == 0 || d <= b.upTo*(1+1e-9) {
				return classAt{propertyClass: c, proof: b.proof, within: b.within}, b.within, true
			}
		}
	}
	return classAt{}, "", false
}

// fits reports whether the class is made for thread t: of its family and
// within its sizes.
func (c propertyClass) fits(t Thread) bool {
	return c.unified == t.Unified() && t.D >= c.minDia*(1-1e-9) && (c.maxDia == 0 || t.D <= c.maxDia*(1+1e-9))
}

// classesFor lists the property classes made for thread t.
func classesFor(t Thread) []string {
	var names []string
	for _, c := range propertyClasses {
		if c.fits(t) {
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

// resolvePropertyClass reads the ways people write an inch grade: "SAE5",
// "sae 5", "Grade 5", "SAE J429 Grade 5", "ASTM A325", "a325".
func resolvePropertyClass(_ any, text string) (string, bool) {
	n := strings.ToUpper(strings.Join(strings.Fields(text), ""))
	n = strings.TrimPrefix(strings.TrimPrefix(n, "ASTM"), "SAEJ429")
	n = strings.TrimPrefix(strings.TrimPrefix(n, "SAE"), "GRADE")
	if n == "2" || n == "5" || n == "8" {
		return "SAE " + n, true
	}
	for _, c := range propertyClasses {
		if c.unified && c.name == n {
			return n, true
		}
	}
	return "", false
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

Bolt (Unified inch threads, ASME B1.1)
  A_s = 0.7854 · (D − 0.9743/n)²    D the basic major diameter in inches,
  n the threads per inch: the area at the mean of the pitch diameter
  (D − 0.649519/n) and the minor diameter (D − 1.299038/n), for every grade.
  Inch grades (from memory; ksi, proof strength S_p, or for A307 the
  minimum tensile strength, which the factor is then on: A307 has no proof
  load):
    SAE J429 grade 2 ("SAE 2")  1/4 to 3/4 in: 55; over 3/4 to 1-1/2 in: 33
    SAE J429 grade 5 ("SAE 5")  1/4 to 1 in: 85; over 1 to 1-1/2 in: 74
    SAE J429 grade 8 ("SAE 8")  1/4 to 1-1/2 in: 120
    ASTM A325 ("A325")          1/2 to 1 in: 85; 1-1/8 to 1-1/2 in: 74
    ASTM A490 ("A490")          1/2 to 1-1/2 in: 120
    ASTM A307 grade A ("A307")  1/4 to 4 in: 60 (minimum tensile strength)
  A grade outside its sizes, an inch grade on a metric thread or an ISO
  class on an inch one is refused with the classes that fit. "Grade 5",
  "SAE5" and "ASTM A325" name the same grades.

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
  signs and leading zeros ("M1e1", "M+8", "M08") are refused.
  Unified (ASME B1.1, from memory; the size, a hyphen, the threads per inch,
  optionally the series: "1/4-20" or "1/4-20 UNC"): UNC #4-40, #5-40, #6-32,
  #8-32, #10-24, #12-24, 1/4-20, 5/16-18, 3/8-16, 7/16-14, 1/2-13, 9/16-12,
  5/8-11, 3/4-10, 7/8-9, 1-8. UNF #4-48, #5-44, #6-40, #8-36, #10-32,
  #12-28, 1/4-28, 5/16-24, 3/8-24, 7/16-20, 1/2-20, 9/16-18, 5/8-18, 3/4-16,
  7/8-14, 1-12. Number sizes have D = 0.060 + 0.013·N in ("#10" is 0.190
  in). A designation that is neither is answered with threads of its own
  family only: a metric size for an M-designation, an inch size for an
  inch one.`

// boltsInput is a bolts block's inputs in SI.
type boltsInput struct {
	thread     Thread
	class      classAt
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
	c, _, ok := lookupClass(in.NameOf("property_class"), t.D)
	if !ok {
		return b, &calc.InputError{Key: "property_class", Message: fmt.Sprintf("%q is not known; allowed: %s",
			in.NameOf("property_class"), strings.Join(propertyClassChoices(nil), ", "))}
	}
	if err := checkClassFits(c.propertyClass, t); err != nil {
		return b, err
	}
	b.class = c
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

// checkClassFits refuses a class made for the other thread family or
// outside its sizes, naming the classes made for the thread.
func checkClassFits(c propertyClass, t Thread) error {
	if c.fits(t) {
		return nil
	}
	allowed := "allowed for " + t.Name + ": " + strings.Join(classesFor(t), ", ")
	size := display.Number(t.D*1e3, "mm")
	if t.Unified() {
		size = display.Number(t.D/inch, "in")
	}
	if len(classesFor(t)) == 0 {
		allowed = "no grade of the table is made for " + t.Name + ": the inch grades start at 1/4 in (SAE J429, ASTM A307)"
	}
	var why string
	switch {
	case c.unified && !t.Unified():
		why = fmt.Sprintf("%q is an inch grade (%s) for Unified threads, and %s is a metric thread", c.name, c.standard, t.Name)
	case !c.unified && t.Unified():
		why = fmt.Sprintf("%q is an ISO 898-1 property class for metric threads, and %s is a Unified inch thread", c.name, t.Name)
	default:
		why = fmt.Sprintf("%q is made %s (%s), and %s is %s", c.name, c.sizes, c.standard, t.Name, size)
	}
	return &calc.InputError{Key: "property_class", Message: why + "; " + allowed}
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
	if b.class.unified {
		classNote = b.class.name
	}
	if b.class.within != "" {
		classNote += ", " + b.class.within
	}
	factorTrace := calc.Trace{Formula: "S = S_p / σ (S_p: proof strength, " + b.class.source + ")", Substituted: "= " + mpa(b.class.proof) + " (" + classNote + ") / " + mpa(stress)}
	if b.class.tensileOnly {
		factorTrace.Formula = "S = S_u / σ (" + b.class.name + " has no proof load: the factor is on its minimum tensile strength, " + b.class.source + ")"
	}
	areaTrace := calc.Trace{Formula: "A_s = π/4 · ((d2 + d3)/2)², d2 = d − 0.649519 · P, d3 = d − 1.226869 · P", Substituted: "= π/4 · ((" + mm(d2) + " + " + mm(d3) + ")/2)², " + t.Name + ": d = " + mm(t.D) + ", P = " + mm(t.Pitch)}
	if t.Unified() {
		tpi := display.Number(inch/t.Pitch, "")
		areaTrace = calc.Trace{Formula: "A_s = 0.7854 · (D − 0.9743/n)² (ASME B1.1; D in inches, n threads per inch)",
			Substituted: "= 0.7854 · (" + display.Number(t.D/inch, "in") + " − 0.9743/" + tpi + ")², " + t.Name + " " + t.Series}
	}
	leNote := ""
	if b.defaultLe {
		leNote = " (default nut, 0.8 · d)"
	}
	res := []calc.Result{
		{Name: "head_load", Value: load, Dim: units.Force, Trace: calc.Trace{Formula: "F = p_g · π/4 · D_p²", Substituted: "= " + bar(b.gauge) + " · π/4 · (" + mm(b.diameter) + ")²"}},
		{Name: "load_per_bolt", Value: perOne, Dim: units.Force, Trace: calc.Trace{Formula: "F_b = F / z", Substituted: "= " + newton(load) + " / " + display.Number(z, "")}},
		{Name: "tensile_stress_area", Value: as, Dim: units.Area, Trace: areaTrace},
		{Name: "bolt_stress", Value: stress, Dim: units.Stress, Trace: calc.Trace{Formula: "σ = F_b / A_s", Substituted: "= " + newton(perOne) + " / " + mm2(as)}},
		{Name: "safety_factor", Value: b.class.proof / stress, Dim: units.Dimensionless, Trace: factorTrace},
		{Name: "strip_safety_factor", Value: tau * shear / perOne, Dim: units.Dimensionless, Trace: calc.Trace{Formula: "S_strip = 0.6 · R_m · A_t / F_b, A_t = π · d · L_e · (1/2 + 0.57735 · (d − d2)/P)", Substituted: "= 0.6 · " + mpa(b.nut.TensileStrength) + " (" + b.nut.Label + ") · " + mm2(shear) + " / " + newton(perOne) +
			", A_t = π · " + mm(t.D) + " · " + mm(b.engagement) + leNote + " · " + display.Number(t.internalToothFraction(), "")}},
	}
	return &calc.Outcome{Results: res}, nil
}
