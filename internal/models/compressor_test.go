package models

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// standardAtmosphere is the ambient pressure of the tests that evaluate a
// kind directly (ISO 2533: 101 325 Pa).
const standardAtmosphere = 101325.0

// caseInputs turns input strings into validated SI inputs the way a block's
// decoder does: parse each per its InputSpec, pressures absolute against
// ambient, defaults filled, ranges checked.
// The site settings are env (nil for the defaults).
func caseInputs(k calc.Kind, raw map[string]any, ambient float64, env *Env) (*calc.Inputs, error) {
	if env == nil {
		env = DefaultEnv()
	}
	in := inputsIn(env, ambient, nil)
	known := map[string]bool{}
	for _, spec := range k.Inputs {
		known[spec.Name] = true
		text, given := "", false
		if v, ok := raw[spec.Name]; ok {
			text, given = fmt.Sprint(v), true
		} else if spec.Default != "" {
			text = spec.Default
		} else if spec.Optional {
			continue
		} else {
			return nil, fmt.Errorf("%s: missing", spec.Name)
		}
		q, err := units.Parse(text, spec.Dim)
		if err != nil {
			return nil, fmt.Errorf("%s: %w", spec.Name, err)
		}
		v := q.Absolute(ambient)
		if !spec.Range.Contains(v) {
			return nil, fmt.Errorf("%s: %s out of range", spec.Name, text)
		}
		in.Set(spec.Name, v, given)
	}
	for name := range raw {
		if !known[name] {
			return nil, fmt.Errorf("%s: unknown input", name)
		}
	}
	return in, nil
}

// evaluateCase evaluates the compressor kind on raw inputs.
func evaluateCase(t testing.TB, raw map[string]any, ambient float64) (*calc.Inputs, *calc.Outcome) {
	t.Helper()
	in, err := caseInputs(compressorKind, raw, ambient, nil)
	if err != nil {
		t.Fatal(err)
	}
	out, err := compressorKind.Evaluate(in)
	if err != nil {
		t.Fatal(err)
	}
	return in, out
}

// resultMap indexes an outcome's results by name.
func resultMap(out *calc.Outcome) map[string]calc.Result {
	m := map[string]calc.Result{}
	for _, r := range out.Results {
		m[r.Name] = r
	}
	return m
}

// optionalResults are results a kind gives only with optional inputs: a
// well-formed outcome may leave them out.
var optionalResults = map[string]bool{"rod_clearance": true, "code_allowable_pressure": true,
	"test_energy": true, "tnt_equivalent": true, "test_distance": true}

// checkWellFormed checks that the outcome has every declared result but the
// optional ones, in order, each finite and with a trace.
func checkWellFormed(t *testing.T, label string, kind *calc.Kind, out *calc.Outcome) {
	t.Helper()
	next := 0
	for _, spec := range kind.Results {
		if next < len(out.Results) && out.Results[next].Name == spec.Name {
			r := out.Results[next]
			next++
			if r.Dim != spec.Dim {
				t.Errorf("%s: result %s is %v, declared %v", label, r.Name, r.Dim, spec.Dim)
			}
			if math.IsNaN(r.Value) || math.IsInf(r.Value, 0) {
				t.Errorf("%s: %s = %g", label, r.Name, r.Value)
			}
			if r.Trace.Formula == "" || !strings.HasPrefix(r.Trace.Substituted, "= ") ||
				strings.Contains(r.Trace.Substituted, "NaN") || strings.Contains(r.Trace.Substituted, "Inf") {
				t.Errorf("%s: %s has trace %q / %q", label, r.Name, r.Trace.Formula, r.Trace.Substituted)
			}
			continue
		}
		if !optionalResults[spec.Name] {
			t.Errorf("%s: declared result %s is missing or out of order", label, spec.Name)
		}
	}
	if next < len(out.Results) {
		t.Errorf("%s: result %s is not declared, or out of order", label, out.Results[next].Name)
	}
	for _, c := range out.Curves {
		for i := range c.X {
			if math.IsNaN(c.X[i]+c.Y[i]) || math.IsInf(c.X[i]+c.Y[i], 0) {
				t.Fatalf("%s: curve %s point %d is (%g, %g)", label, c.Name, i, c.X[i], c.Y[i])
			}
		}
	}
}

// compressorReference computes the basis "per kg drawn in, R = X J/(kg K)":
// the check's value is a work or power per kg of air drawn in, so the
// reference is the value times the mass drawn in per revolution (for a work)
// or per second (for a power), m = p1·η_v·V_d / (R·T1).
func compressorReference(t *testing.T, ch *caseCheck, _ *calc.Set, e *calc.Evaluated) float64 {
	t.Helper()
	if ch.Basis == "rod-sweep" {
		return rodSweep(t, e)
	}
	var gasConstant float64
	if _, err := fmt.Sscanf(ch.Basis, "per kg drawn in, R = %g J/(kg K)", &gasConstant); err != nil || gasConstant <= 0 {
		t.Fatalf("unknown basis %q", ch.Basis)
	}
	perRev := inletPressure(t, e) * mustResult(t, e, "volumetric_efficiency") * mustResult(t, e, "displacement") /
		(gasConstant * mustInput(t, e, "inlet_temperature"))
	perKg := ch.value(t, units.SpecificEnergy, e.Ambient)
	switch r, _ := e.Result(ch.Result); r.Dim {
	case units.Energy:
		return perKg * perRev
	case units.Power:
		return perKg * perRev * mustInput(t, e, "speed") / (2 * math.Pi)
	default:
		t.Fatalf("%s: basis %q applies to a work or a power", r.Name, ch.Basis)
	}
	return 0
}

// benchBlock is a two-cylinder bench compressor with a reciprocating mass,
// so that every curve is computed.
func benchBlock() map[string]any {
	return map[string]any{
		"bore": "28 mm", "stroke": "32 mm", "rod_length": "70 mm",
		"clearance_volume": "1.5 cm3", "cylinders": 2, "speed": "1500 rpm",
		"discharge_pressure": "6 bar", "reciprocating_mass": "85 g",
	}
}

// withInputs returns benchBlock with some inputs replaced or removed (nil).
func withInputs(changes map[string]any) map[string]any {
	raw := benchBlock()
	for k, v := range changes {
		if v == nil {
			delete(raw, k)
		} else {
			raw[k] = v
		}
	}
	return raw
}

func TestCompressorNoDelivery(t *testing.T) {
	// c = 0.5: dead-head p1·3^1.3 = 4.17 bar(a), below 10 bar(a).
	_, out := evaluateCase(t, withInputs(map[string]any{
		"clearance_volume": nil, "clearance_ratio": 0.5, "discharge_pressure": "10 bar(a)",
	}), standardAtmosphere)
	checkWellFormed(t, "no delivery", &compressorKind, out)
	got := resultMap(out)
	for _, name := range []string{"volumetric_efficiency", "free_air_delivery", "indicated_work", "indicated_power", "isothermal_power", "shaft_power", "mean_torque"} {
		if v := got[name].Value; v != 0 {
			t.Errorf("%s = %g with no delivery, want 0", name, v)
		}
	}
	dead := standardAtmosphere * math.Pow(3, 1.3)
	if v := got["max_pressure"].Value; math.Abs(v-dead) > 1e-9*dead {
		t.Errorf("max_pressure = %g Pa, want p1·CR^n = %g Pa", v, dead)
	}
	// The piston never sees more than the dead-head pressure.
	area := got["piston_area"].Value
	if v, want := got["peak_piston_force"].Value, (dead-standardAtmosphere)*area; math.Abs(v-want) > 1e-9*want {
		t.Errorf("peak_piston_force = %g N, want (p_max − p_amb)·A = %g N", v, want)
	}
	if len(out.Cautions) != 1 || out.Cautions[0].Level != calc.Danger || out.Cautions[0].Rule != "no-delivery" ||
		!strings.Contains(out.Cautions[0].Message, "10 bar(a)") || !strings.Contains(out.Cautions[0].Message, display.Number(dead/1e5, "bar(a)")) {
		t.Errorf("cautions = %+v, want one DANGER no-delivery naming 10 bar(a) and the dead-head pressure", out.Cautions)
	}
}

func TestCompressorDeliveringHasNoCaution(t *testing.T) {
	_, out := evaluateCase(t, benchBlock(), standardAtmosphere)
	checkWellFormed(t, "bench", &compressorKind, out)
	if len(out.Cautions) != 0 {
		t.Errorf("cautions = %+v, want none", out.Cautions)
	}
}

// TestCompressorIsothermal: n = 1 is the isothermal limit, T2 = T1 and the
// indicated power equals the isothermal power (any thermodynamics text).
func TestCompressorIsothermal(t *testing.T) {
	in, out := evaluateCase(t, withInputs(map[string]any{"polytropic_index": 1}), standardAtmosphere)
	checkWellFormed(t, "n = 1", &compressorKind, out)
	got := resultMap(out)
	if v, want := got["discharge_temperature"].Value, in.Value("inlet_temperature"); math.Abs(v-want) > 1e-9 {
		t.Errorf("discharge_temperature = %g K, want T1 = %g K", v, want)
	}
	if v, want := got["indicated_power"].Value, got["isothermal_power"].Value; math.Abs(v-want) > 1e-12*want {
		t.Errorf("indicated_power = %g W, isothermal_power = %g W; equal at n = 1", v, want)
	}
	// Just above 1 the polytropic work tends to the isothermal one.
	_, near := evaluateCase(t, withInputs(map[string]any{"polytropic_index": 1.000001}), standardAtmosphere)
	if v, want := resultMap(near)["indicated_power"].Value, got["indicated_power"].Value; math.Abs(v-want) > 1e-5*want {
		t.Errorf("indicated_power at n = 1.000001 is %g W, at n = 1 %g W", v, want)
	}
}

func TestCompressorInputErrors(t *testing.T) {
	cases := []struct {
		changes map[string]any
		key     string
		says    []string
	}{
		{map[string]any{"rod_length": "15 mm"}, "rod_length", []string{"15 mm", "16 mm"}},
		{map[string]any{"rod_length": "16 mm"}, "rod_length", []string{"16 mm"}},
		{map[string]any{"crank_radius": "16 mm"}, "stroke", []string{"not both"}},
		{map[string]any{"stroke": nil}, "stroke", []string{"crank_radius"}},
		{map[string]any{"clearance_ratio": 0.05}, "clearance_volume", []string{"not both"}},
		{map[string]any{"clearance_volume": nil}, "clearance_volume", []string{"clearance_ratio"}},
		{map[string]any{"cylinders": 1.5}, "cylinders", []string{"1.5", "whole number"}},
		{map[string]any{"discharge_pressure": "1 bar(a)"}, "discharge_pressure", []string{"1 bar(a)", "1.013 bar(a)"}},
		{map[string]any{"discharge_pressure": "2 bar(a)", "inlet_pressure": "2 bar(a)"}, "discharge_pressure", []string{"2 bar(a)"}},
	}
	for _, c := range cases {
		in, err := caseInputs(compressorKind, withInputs(c.changes), standardAtmosphere, nil)
		if err != nil {
			t.Fatalf("%v: %v", c.changes, err)
		}
		out, err := compressorKind.Evaluate(in)
		var ie *calc.InputError
		if !errors.As(err, &ie) || out != nil {
			t.Errorf("%v: got %v, %v; want an *InputError", c.changes, out, err)
			continue
		}
		if ie.Key != c.key {
			t.Errorf("%v: error blames %q, want %q", c.changes, ie.Key, c.key)
		}
		for _, s := range c.says {
			if !strings.Contains(ie.Message, s) {
				t.Errorf("%v: message %q does not say %q", c.changes, ie.Message, s)
			}
		}
	}
}

// TestCompressorCrankshaftTorque: summed over evenly phased cylinders, the
// sampled gas torque averages to the mean torque W/2π, the inertia torque
// to zero (its integral is the change of kinetic energy over a period),
// and crank_radius is the same as half the stroke.
func TestCompressorCrankshaftTorque(t *testing.T) {
	for _, z := range []int{1, 2, 3, 7} {
		_, out := evaluateCase(t, withInputs(map[string]any{"cylinders": z}), standardAtmosphere)
		checkWellFormed(t, fmt.Sprint(z, " cylinders"), &compressorKind, out)
		got := resultMap(out)
		curves := map[string]calc.Curve{}
		for _, c := range out.Curves {
			curves[c.Name] = c
		}
		for _, name := range []string{"pv", "isothermal", "gas_torque", "inertia_torque", "total_torque"} {
			if len(curves[name].X) < 2 || len(curves[name].X) != len(curves[name].Y) {
				t.Fatalf("z=%d: curve %s missing or ragged", z, name)
			}
		}
		if !curves["isothermal"].Dashed {
			t.Errorf("isothermal curve is not dashed")
		}
		mean := func(c calc.Curve) float64 { // the last point repeats the first
			s := 0.0
			for _, y := range c.Y[:len(c.Y)-1] {
				s += y
			}
			return s / float64(len(c.Y)-1)
		}
		tm := got["mean_torque"].Value
		if v := mean(curves["gas_torque"]); math.Abs(v-tm) > 1e-3*tm {
			t.Errorf("z=%d: mean of gas_torque curve %g N m, mean_torque %g N m", z, v, tm)
		}
		if v := mean(curves["inertia_torque"]); math.Abs(v) > 1e-6*got["peak_torque"].Value {
			t.Errorf("z=%d: inertia torque averages %g N m, want 0", z, v)
		}
		if got["peak_torque"].Value < tm || got["energy_fluctuation"].Value <= 0 {
			t.Errorf("z=%d: peak_torque %g N m below mean %g N m or energy_fluctuation %g J not positive",
				z, got["peak_torque"].Value, tm, got["energy_fluctuation"].Value)
		}
	}
	_, byStroke := evaluateCase(t, benchBlock(), standardAtmosphere)
	_, byRadius := evaluateCase(t, withInputs(map[string]any{"stroke": nil, "crank_radius": "16 mm"}), standardAtmosphere)
	for i, r := range byStroke.Results {
		if r.Value != byRadius.Results[i].Value {
			t.Errorf("%s: %g from stroke, %g from crank_radius", r.Name, r.Value, byRadius.Results[i].Value)
		}
	}
}

// TestExcessEnergySinusoid: for T = T_m + a·sin kθ the running excess
// energy ∫(T_m − T)dθ = (a/k)(cos kθ − 1) swings by 2a/k.
func TestExcessEnergySinusoid(t *testing.T) {
	for _, k := range []float64{1, 2, 3} {
		const tm, a = 4.0, 1.5
		torque := sampleRevolution(cycleSteps, func(th float64) float64 { return tm + a*math.Sin(k*th) })
		low, high := excessEnergyRange(torque, tm)
		if want := 2 * a / k; math.Abs(high-low-want) > 1e-6*want {
			t.Errorf("k=%g: swing %g J, want 2a/k = %g J", k, high-low, want)
		}
	}
}

// TestPhaseSum: evenly phased sinusoids cancel (the z-th roots of unity sum
// to zero) and a constant adds up z times.
func TestPhaseSum(t *testing.T) {
	for _, z := range []int{2, 3, 5, 8} {
		m := crankSteps(z)
		if m%z != 0 || m%curvePoints != 0 || m < cycleSteps {
			t.Fatalf("z=%d: %d steps", z, m)
		}
		sum := phaseSum(sampleRevolution(m, func(th float64) float64 { return 1 + math.Sin(th) }), z)
		for i, v := range sum {
			if math.Abs(v-float64(z)) > 1e-12*float64(z) {
				t.Fatalf("z=%d: sum at step %d is %g, want %d", z, i, v, z)
			}
		}
	}
}

func BenchmarkCompressorEvaluate(b *testing.B) {
	in, err := caseInputs(compressorKind, benchBlock(), standardAtmosphere, nil)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := compressorKind.Evaluate(in); err != nil {
			b.Fatal(err)
		}
	}
}

// TestCompressorExtremes evaluates combinations of every input at the ends
// of its allowed range: each must give an *InputError or finite results and
// curves, never a NaN, an Inf or a panic.
func TestCompressorExtremes(t *testing.T) {
	base, err := caseInputs(compressorKind, withInputs(map[string]any{"clearance_volume": nil, "clearance_ratio": 0.05}), standardAtmosphere, nil)
	if err != nil {
		t.Fatal(err)
	}
	ends := func(r calc.Range) []float64 {
		low := r.Min
		if r.MinOpen {
			low = math.Nextafter(r.Min, math.Inf(1))
		}
		return []float64{low, r.Max}
	}
	rng := rand.New(rand.NewPCG(1, 2))
	finiteOutcomes := 0
	for trial := range 300 {
		in := NewInputs(standardAtmosphere, nil)
		for _, spec := range compressorKind.Inputs {
			if !base.Has(spec.Name) && spec.Name != "inlet_pressure" {
				continue
			}
			v := base.Value(spec.Name)
			if spec.Name == "inlet_pressure" {
				v = standardAtmosphere
			}
			if pick := rng.IntN(3); pick < 2 {
				v = ends(spec.Range)[pick]
			}
			in.Set(spec.Name, v, true)
		}
		out, err := compressorKind.Evaluate(in)
		if err != nil {
			var ie *calc.InputError
			if !errors.As(err, &ie) {
				t.Fatalf("trial %d: %v is not an *InputError", trial, err)
			}
			continue
		}
		finiteOutcomes++
		checkWellFormed(t, fmt.Sprintf("trial %d %v", trial, valuesOf(in)), &compressorKind, out)
	}
	if finiteOutcomes < 50 {
		t.Errorf("only %d of 300 trials evaluated; the test exercises too little", finiteOutcomes)
	}
}

// TestPeakForceOnSuction: with an inlet well below ambient (a vacuum
// booster), the larger piston load is on suction: (p_amb − p1)·A =
// (101325 − 50000) Pa · π/4 · (50 mm)² = 100.78 N (by hand), not the
// delivery load near zero.
func TestPeakForceOnSuction(t *testing.T) {
	in := NewInputs(101325, map[string]float64{
		"bore": 0.05, "stroke": 0.04, "rod_length": 0.1, "clearance_ratio": 0.05, "cylinders": 1,
		"speed": 900 * 2 * math.Pi / 60, "inlet_pressure": 50000, "discharge_pressure": 101325 + 1000,
		"inlet_temperature": 293.15, "polytropic_index": 1.3, "mechanical_efficiency": 0.85,
	})
	out, err := evaluateCompressor(in)
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range out.Results {
		if r.Name == "peak_piston_force" && math.Abs(r.Value-100.78) > 0.01 {
			t.Errorf("peak_piston_force = %.3f N, want 100.78 N", r.Value)
		}
	}
}

// TestNoDeliveryDischargeTemperature checks that a cylinder whose discharge
// valve never opens reports the peak of its trapped air, T1·CR^(n−1), not
// the temperature at a discharge pressure it never reaches.
func TestNoDeliveryDischargeTemperature(t *testing.T) {
	set, err := evaluateBlocks(t, []map[string]any{{"id": "c", "kind": "compressor", "bore": "28 mm", "stroke": "32 mm",
		"rod_length": "70 mm", "clearance_ratio": 100, "speed": "900 rpm", "discharge_pressure": "6 bar"}})
	if err != nil {
		t.Fatal(err)
	}
	e, _ := set.Lookup("c")
	got, _ := e.Result("discharge_temperature")
	// By hand: CR = (1 + c)/c = 1.01; 293.15 K · 1.01^0.3 = 294.026 K.
	want := 293.15 * math.Pow(1.01, 0.3)
	if math.Abs(got.Value-want) > 1e-9*want {
		t.Errorf("discharge_temperature = %.6g K, want %.6g K", got.Value, want)
	}
}

// TestCompressorDocSampling keeps the write-up's crank-angle step and the
// curves' step the ones the model uses.
func TestCompressorDocSampling(t *testing.T) {
	for _, want := range []string{
		"sampled every " + display.Number(360.0/cycleSteps, "") + "° of crank angle",
	} {
		if !strings.Contains(strings.Join(strings.Fields(compressorDoc), " "), want) {
			t.Errorf("compressor doc lacks %q", want)
		}
	}
	for _, want := range []string{"(" + display.Number(360.0/curvePoints, "") + "° steps)"} {
		if !strings.Contains(flywheelDoc, want) {
			t.Errorf("flywheel doc lacks %q", want)
		}
	}
}

// TestCustomaryInputErrors checks that a block written in US customary
// units is told of its mistakes in them: 1 in = 25.4 mm, 1 psi =
// 6894.757 Pa, 1 atm = 14.696 psia, t/°F = 1.8·T/K − 459.67 (NIST SP 811
// App. B, from memory); each figure below is worked by hand from them.
func TestCustomaryInputErrors(t *testing.T) {
	cyl := "bore = \"2 in\"\nstroke = \"1.5 in\"\nclearance_volume = \"0.3 in3\"\n"
	cases := []struct {
		name, src string
		wants     []string
	}{
		// (100 + 14.696) and (120 + 14.696) psia.
		{"inlet above discharge", `kind = "compressor"` + "\n" + cyl + `rod_length = "3.5 in"
speed = "1725 rpm"
discharge_pressure = "100 psi"
inlet_pressure = "120 psi"`, []string{"discharge pressure 100 psig (114.7 psia) must be above the inlet pressure 120 psig (134.7 psia)"}},
		// Crank radius 0.75 in.
		{"short rod", `kind = "compressor"` + "\n" + cyl + `rod_length = "0.7 in"
speed = "1725 rpm"
discharge_pressure = "100 psi"`, []string{"rod length 0.7 in must exceed the crank radius 0.75 in"}},
		// 2 · 1.5 in · 40000/60 rev/s = 2000 in/s = 166.7 ft/s; 40 m/s = 131.2 ft/s.
		{"fast piston", `kind = "compressor"` + "\n" + cyl + `rod_length = "3.5 in"
speed = "40000 rpm"
discharge_pressure = "100 psi"`, []string{"a 1.5 in stroke gives a mean piston speed of 166.7 ft/s", "up to 131.2 ft/s"}},
		{"motor supply", `kind = "motor"` + "\n" + cyl + `rod_length = "3.5 in"
speed = "600 rpm"
supply_pressure = "-2 psi"
cutoff = 0.5`, []string{"supply pressure -2 psig (12.7 psia) must be above ambient 14.7 psia"}},
		// T1 = 293.15 K, r = (29.392/14.696)^(1/2) = 1.41421, T = 293.15·1.41421^(0.3/1.3)
		// = 293.15·1.083263 = 317.56 K = 111.9 °F.
		{"intercooler", `kind = "multistage"
stages = 2
discharge_pressure = "14.696 psi"
inlet_temperature = "68 degF"
intercooled_temperature = "150 degF"`, []string{"150 °F is above the 111.9 °F"}},
		{"tube vacuum", `kind = "tube"
inner_diameter = "2 in"
wall_thickness = "0.1 in"
pressure = "0 psi"
material = "s235"`, []string{"0 psig is ambient"}},
		// The wall must be thinner than ri = 1 in.
		{"tube thick", `kind = "tube"
inner_diameter = "2 in"
wall_thickness = "1.2 in"
pressure = "50 psi"
material = "s235"`, []string{"wall thickness 1.2 in must be less than the inner radius 1 in"}},
		{"vacuum start", `kind = "vacuum"` + "\n" + cyl + `rod_length = "3.5 in"
speed = "1725 rpm"
vessel_volume = "5 gal"
target_pressure = "1 psia"
start_pressure = "16 psia"`, []string{"start pressure 16 psia is above ambient 14.7 psia"}},
		// M8 pitch 1.25 mm = 0.04921 in.
		{"bolt engagement", `kind = "bolts"
thread = "M8"
count = 4
property_class = "8.8"
pressure = "100 psi"
pressure_diameter = "3 in"
nut_material = "s235"
engagement_length = "0.03 in"`, []string{"0.03 in is less than one pitch of M8 (0.04921 in)"}},
	}
	for _, c := range cases {
		b, err := testCatalog.ParseBlock("content/shop.md", 5, "id = \"x\"\n"+c.src+"\n")
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		_, err = testCatalog.Evaluate([]*calc.Block{b}, calc.Options{})
		if err == nil {
			t.Errorf("%s: no error", c.name)
			continue
		}
		for _, w := range c.wants {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: %q lacks %q", c.name, err, w)
			}
		}
	}
}

// TestCustomaryChartDescriptions checks that the description of every
// chart of a block written in US customary units speaks its units, as the
// chart's axes do. 100 psig = 114.7 psia (1 atm = 14.696 psi, NIST SP 811
// App. B, from memory).
func TestCustomaryChartDescriptions(t *testing.T) {
	cyl := "bore = \"2 in\"\nstroke = \"1.5 in\"\nrod_length = \"3.5 in\"\nclearance_volume = \"0.3 in3\"\nspeed = \"1725 rpm\"\n"
	blocks := []string{
		"id = \"c\"\nkind = \"compressor\"\n" + cyl + "discharge_pressure = \"100 psi\"\ninlet_temperature = \"68 degF\"\nhead_material = \"aluminium-6061-t6\"\n",
		"id = \"m\"\nkind = \"motor\"\n" + cyl + "supply_pressure = \"90 psi\"\ncutoff = 0.4\nsupply_temperature = \"68 degF\"\n",
		"id = \"v\"\nkind = \"vacuum\"\n" + cyl + "vessel_volume = \"5 gal\"\ntarget_pressure = \"2 psia\"\n",
		"id = \"s\"\nkind = \"multistage\"\nstages = 2\ndischarge_pressure = \"175 psi\"\ninlet_temperature = \"68 degF\"\n",
		"id = \"t\"\nkind = \"tank\"\nvolume = \"20 gal\"\npressure = \"100 psi\"\nsupply = \"c\"\n",
	}
	set := evaluateSources(t, "content/shop.md", blocks)
	for _, e := range set.Blocks {
		if !e.Customary() {
			t.Fatalf("block %s is not taken as customary", e.Block.ID)
		}
		for _, name := range e.Block.Kind.Charts {
			c, err := e.Chart(name)
			if err != nil {
				t.Fatal(err)
			}
			for _, metric := range []string{"bar", "°C", "Pa"} {
				if strings.Contains(c.Desc, metric) {
					t.Errorf("%s chart %s says %q: %s", e.Block.ID, name, metric, c.Desc)
				}
			}
		}
	}
	c, _ := set.Lookup("c")
	if pv, _ := c.Chart("pv"); !strings.Contains(pv.Desc, "delivered at 115 psia") {
		t.Errorf("pv chart: %s", pv.Desc)
	}
}

// traceNumbers returns the numbers of a trace's substituted working, in
// order, up to its first ";" (what follows is commentary).
func traceNumbers(t *testing.T, r calc.Result) []float64 {
	t.Helper()
	sub, _, _ := strings.Cut(r.Trace.Substituted, ";")
	var v []float64
	for _, s := range regexp.MustCompile(`[0-9]+(\.[0-9]+)?`).FindAllString(sub, -1) {
		x, _ := strconv.ParseFloat(s, 64)
		v = append(v, x)
	}
	return v
}

// TestTracesWorkOutNearCancellation works, from the numbers the traces
// show, results that are a small difference of larger terms: the work of a
// pressure ratio of 1.012345, a piston force 0.012345 bar above ambient,
// a pumping speed near the ultimate pressure, an air motor's net work near
// zero. Shown at 4 figures each, the terms would give them 1 to 3 % off;
// the traces must carry the figures that bring them within 0.1 %.
func TestTracesWorkOutNearCancellation(t *testing.T) {
	cyl := "bore = \"50 mm\"\nstroke = \"40 mm\"\nrod_length = \"100 mm\"\nspeed = \"600 rpm\"\n"
	srcs := []string{
		"id = \"blower\"\nkind = \"compressor\"\nambient_pressure = \"1 bar(a)\"\n" + cyl +
			"clearance_ratio = 0.05\ninlet_pressure = \"1 bar(a)\"\ndischarge_pressure = \"1.012345 bar(a)\"\n",
		"id = \"pump\"\nkind = \"vacuum\"\nambient_pressure = \"1 bar(a)\"\n" + cyl +
			"clearance_volume = \"3.9 cm3\"\nreexpansion_index = 1.3\nvessel_volume = \"10 L\"\ntarget_pressure = \"19 mbar(a)\"\n",
		"id = \"air\"\nkind = \"motor\"\nambient_pressure = \"1 bar(a)\"\n" + cyl +
			"clearance_ratio = 0.05\nsupply_pressure = \"2 bar(a)\"\ncutoff = 0.17\npolytropic_index = 1\n",
	}
	set := evaluateSources(t, "content/x.md", srcs)
	result := func(id, name string) calc.Result {
		e, _ := set.Lookup(id)
		r, ok := e.Result(name)
		if !ok {
			t.Fatalf("%s has no %s", id, name)
		}
		return r
	}
	check := func(r calc.Result, got float64) {
		t.Helper()
		t.Logf("%s: %q works out to %.6g, result %.6g", r.Name, r.Trace.Substituted, got, r.Value)
		if math.Abs(got-r.Value) > 1e-3*math.Abs(r.Value) {
			t.Errorf("%s: trace %q works out to %.6g, result %.6g", r.Name, r.Trace.Substituted, got, r.Value)
		}
	}
	// W = z · n/(n−1) · p1 · Vi · (r^((n−1)/n) − 1): bar(a), cm³.
	w := result("blower", "indicated_work")
	if v := traceNumbers(t, w); len(v) == 9 {
		check(w, v[0]*v[1]/v[2]*v[3]*1e5*v[4]*1e-6*(math.Pow(v[5], v[6]/v[7])-v[8]))
	} else {
		t.Errorf("work trace %q: %d numbers", w.Trace.Substituted, len(v))
	}
	// F = (p2 − p_amb) · A: bar(a), mm².
	f := result("blower", "peak_piston_force")
	if v := traceNumbers(t, f); len(v) == 3 {
		check(f, (v[0]-v[1])*1e5*v[2]*1e-6)
	} else {
		t.Errorf("force trace %q: %d numbers", f.Trace.Substituted, len(v))
	}
	// S = V̇d · (1 − c·((p_a/p)^(1/n) − 1)): L/min, mbar(a); c = 3.9 cm³ /
	// 78.54 cm³ = 0.049656 and the ultimate pressure is 1000 mbar(a) ·
	// (c/(1 + c))^1.3 = 18.94 mbar(a).
	s := result("pump", "target_pumping_speed")
	if v := traceNumbers(t, s); len(v) == 8 {
		check(s, v[0]/6e4*(v[1]-v[2]*(math.Pow(v[3]/v[4], v[5]/v[6])-v[7])))
	} else {
		t.Errorf("speed trace %q: %d numbers", s.Trace.Substituted, len(v))
	}
	// W = z · (p_s · (V1 − Vc) + expansion − p_a · Vs): bar(a), cm³, J.
	m := result("air", "indicated_work")
	if v := traceNumbers(t, m); len(v) == 6 {
		check(m, v[0]*(v[1]*1e5*v[2]*1e-6+v[3]-v[4]*1e5*v[5]*1e-6))
	} else {
		t.Errorf("motor work trace %q: %d numbers", m.Trace.Substituted, len(v))
	}
}

// TestTracesWorkOutNearCancellationOtherKinds does the same for the other
// kinds' small differences: the stored energy of a receiver just above
// ambient, the specific work of a pressure ratio near 1, the Lamé stresses
// of a thin wall (ro² − ri²), and a pump-down over a small drop.
func TestTracesWorkOutNearCancellationOtherKinds(t *testing.T) {
	srcs := []string{
		"id = \"rx\"\nkind = \"tank\"\nvolume = \"50 L\"\npressure = \"0.0537 bar\"\n",
		"id = \"st\"\nkind = \"multistage\"\nstages = 2\ndischarge_pressure = \"0.0537 bar\"\n",
		"id = \"wall\"\nkind = \"tube\"\ninner_diameter = \"50 mm\"\nwall_thickness = \"0.123 mm\"\npressure = \"0.5 bar\"\nmaterial = \"s235\"\n",
		"id = \"pot\"\nkind = \"vacuum\"\nbore = \"50 mm\"\nstroke = \"40 mm\"\nrod_length = \"100 mm\"\nclearance_volume = \"3.9 cm3\"\n" +
			"speed = \"1440 rpm\"\nvessel_volume = \"10 L\"\nstart_pressure = \"987.6 mbar(a)\"\ntarget_pressure = \"973.21 mbar(a)\"\n",
	}
	set := evaluateSources(t, "content/x.md", srcs)
	cases := []struct {
		id, result string
		numbers    int
		work       func(v []float64) float64
	}{
		// E = p · V / 0.4 · [1 − (p_a / p)^(0.4/1.4)]: bar(a), L.
		{"rx", "stored_energy", 8, func(v []float64) float64 {
			return v[0] * 1e5 * v[1] * 1e-3 / v[2] * (v[3] - math.Pow(v[4]/v[5], v[6]/v[7]))
		}},
		// w = N · n/(n−1) · R · T1 · (r^((n−1)/n) − 1): J/(kg K), K.
		{"st", "specific_work", 9, func(v []float64) float64 {
			return v[0] * v[1] / v[2] * v[3] * v[4] * (math.Pow(v[5], v[6]/v[7]) - v[8])
		}},
		// σ_θ = p · (ro² + ri²) / (ro² − ri²): bar, mm.
		{"wall", "hoop_stress", 5, func(v []float64) float64 {
			return v[0] * 1e5 * (v[1]*v[1] + v[2]*v[2]) / (v[3]*v[3] - v[4]*v[4])
		}},
		// t = V/(V̇d·(1 + c)) · [ln(p0/p) + n·ln(η0/η)]: L, L/min.
		{"pot", "pumpdown_time", 9, func(v []float64) float64 {
			return v[0] * 1e-3 / (v[1] / 6e4 * (v[2] + v[3])) * (math.Log(v[4]/v[5]) + v[6]*math.Log(v[7]/v[8]))
		}},
	}
	for _, c := range cases {
		e, _ := set.Lookup(c.id)
		r, ok := e.Result(c.result)
		if !ok {
			t.Fatalf("%s has no %s", c.id, c.result)
		}
		v := traceNumbers(t, r)
		if len(v) != c.numbers {
			t.Errorf("%s.%s: trace %q has %d numbers, want %d", c.id, c.result, r.Trace.Substituted, len(v), c.numbers)
			continue
		}
		got := c.work(v)
		t.Logf("%s.%s: %q works out to %.6g, result %.6g", c.id, c.result, r.Trace.Substituted, got, r.Value)
		if math.Abs(got-r.Value) > 1e-3*math.Abs(r.Value) {
			t.Errorf("%s.%s: trace %q works out to %.6g, result %.6g", c.id, c.result, r.Trace.Substituted, got, r.Value)
		}
	}
}

// valuesOf lists the SI values of inputs, for messages.
func valuesOf(in *calc.Inputs) map[string]float64 {
	values := map[string]float64{}
	for _, name := range in.Names() {
		values[name] = in.Value(name)
	}
	return values
}

// rodSweep computes the least clearance between the swinging rod and the
// bottom corners of the bore, by sweeping the geometry in 0.1° steps on
// its own (basis "rod-sweep").
func rodSweep(t *testing.T, e *calc.Evaluated) float64 {
	t.Helper()
	in := func(name string) float64 { return mustInput(t, e, name) }
	r, l, half, w, h := in("stroke")/2, in("rod_length"), in("bore")/2, in("rod_width"), in("liner_bottom")
	least := math.Inf(1)
	for i := range 3600 {
		theta := float64(i) * math.Pi / 1800
		pinX, pinY := r*math.Sin(theta), r*math.Cos(theta)
		wristY := pinY + math.Sqrt(l*l-pinX*pinX)
		if h < pinY || h > wristY {
			continue
		}
		for _, cornerX := range []float64{-half, half} {
			// The foot of the perpendicular from the corner on the rod's
			// centreline, held within the rod.
			ux, uy := -pinX/l, (wristY-pinY)/l
			along := math.Max(0, math.Min(l, (cornerX-pinX)*ux+(h-pinY)*uy))
			least = math.Min(least, math.Hypot(cornerX-(pinX+along*ux), h-(pinY+along*uy))-w/2)
		}
	}
	return least
}
