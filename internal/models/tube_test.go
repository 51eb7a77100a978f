package models

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/units"
)

// kindInputs reads raw inputs like a block's decoder: quantities through
// caseInputs, Name inputs checked against their choices, defaults filled.
func kindInputs(k calc.Kind, raw map[string]any, ambient float64, env *Env) (*calc.Inputs, error) {
	quantities := calc.Kind{Name: k.Name}
	qraw := map[string]any{}
	names := map[string]string{}
	for _, spec := range k.Inputs {
		v, given := raw[spec.Name]
		if spec.Type != calc.Name {
			quantities.Inputs = append(quantities.Inputs, spec)
			if given {
				qraw[spec.Name] = v
			}
			continue
		}
		if given {
			names[spec.Name] = fmt.Sprint(v)
		} else if spec.Default != "" {
			names[spec.Name] = spec.Default
		}
		if text, ok := names[spec.Name]; ok && spec.Choices != nil && !slices.Contains(spec.Choices(env), text) {
			return nil, fmt.Errorf("%s: %q is not a choice", spec.Name, text)
		}
	}
	for name := range raw {
		if _, ok := k.Input(name); !ok {
			return nil, fmt.Errorf("%s: unknown input", name)
		}
	}
	in, err := caseInputs(quantities, qraw, ambient, env)
	if err != nil {
		return nil, err
	}
	for key, text := range names {
		_, given := raw[key]
		in.SetName(key, text, given)
	}
	return in, nil
}

// evaluateTubeCase evaluates the tube kind on raw inputs in env.
func evaluateTubeCase(raw map[string]any, env *Env) (*calc.Outcome, error) {
	in, err := kindInputs(tubeKind, raw, standardAtmosphere, env)
	if err != nil {
		return nil, err
	}
	return tubeKind.Evaluate(in)
}

// tubeReference computes the basis "over NAME": the check's value is the
// ratio of its result to the block's result NAME, of the same dimension.
func tubeReference(t *testing.T, ch *caseCheck, _ *calc.Set, e *calc.Evaluated) float64 {
	t.Helper()
	name, ok := strings.CutPrefix(ch.Basis, "over ")
	if !ok {
		t.Fatalf("unknown basis %q", ch.Basis)
	}
	r, _ := e.Result(ch.Result)
	d, ok := e.Result(name)
	if !ok || d.Dim != r.Dim {
		t.Fatalf("cannot divide %s by %q", ch.Result, name)
	}
	return ch.value(t, units.Dimensionless, e.Ambient) * d.Value
}

// tubeBlock is a capped steel tube, 20 mm bore, 2 mm wall, at 10 bar.
func tubeBlock(changes map[string]any) map[string]any {
	raw := map[string]any{"inner_diameter": "20 mm", "wall_thickness": "2 mm", "pressure": "10 bar", "material": "s235"}
	for k, v := range changes {
		if v == nil {
			delete(raw, k)
		} else {
			raw[k] = v
		}
	}
	return raw
}

func TestTubeInputErrors(t *testing.T) {
	for _, c := range []struct {
		name    string
		changes map[string]any
		key     string
		want    []string
	}{
		{"both walls", map[string]any{"outer_diameter": "24 mm"}, "wall_thickness", []string{"not both"}},
		{"no wall", map[string]any{"wall_thickness": nil}, "wall_thickness", []string{"missing", "outer_diameter"}},
		{"outer below inner", map[string]any{"wall_thickness": nil, "outer_diameter": "18 mm"}, "outer_diameter",
			[]string{"18 mm", "20 mm"}},
		{"wall at the radius", map[string]any{"wall_thickness": "10 mm"}, "wall_thickness",
			[]string{"wall thickness 10 mm", "inner radius 10 mm"}},
		{"wall past the radius from outer", map[string]any{"wall_thickness": nil, "outer_diameter": "50 mm"}, "outer_diameter",
			[]string{"wall thickness 15 mm", "inner radius 10 mm"}},
		{"zero gauge", map[string]any{"pressure": "0 bar"}, "pressure", []string{"0 bar(g) is ambient", "no pressure difference"}},
		{"length under internal pressure", map[string]any{"length": "300 mm"}, "length", []string{"outside pressure", "10 bar(g) (11.01 bar(a))", "leave length out"}},
		{"pneumatic test under vacuum", map[string]any{"pressure": "-0.5 bar", "volume": "10 L"}, "volume", []string{"internal pressure", "leave volume out"}},
		{"unknown material", map[string]any{"material": "stainles-304"}, "material", []string{`did you mean "stainless-304"?`}},
		{"missing material", map[string]any{"material": nil}, "material", []string{"missing"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			// The material goes past kindInputs' choice check: the model
			// must report unknown and missing materials itself.
			raw := tubeBlock(c.changes)
			material, hasMaterial := raw["material"]
			delete(raw, "material")
			in, err := kindInputs(tubeKind, raw, standardAtmosphere, DefaultEnv())
			if err != nil {
				t.Fatal(err)
			}
			if hasMaterial {
				in.SetName("material", fmt.Sprint(material), true)
			}
			_, err = tubeKind.Evaluate(in)
			var ie *calc.InputError
			if !errors.As(err, &ie) {
				t.Fatalf("error %v, want an *InputError", err)
			}
			if ie.Key != c.key {
				t.Errorf("blames %s, want %s (%s)", ie.Key, c.key, ie.Message)
			}
			for _, w := range c.want {
				if !strings.Contains(ie.Message, w) {
					t.Errorf("message %q lacks %q", ie.Message, w)
				}
			}
		})
	}
}

// TestTubeThinWallConvergence checks that the thick-wall hoop stress tends
// to the thin-wall one as the wall thins: with x = t/ri the ratio is
// 1 + (x + x²)/(2 + x), which lies between 1 + t/Di and 1 + 2·t/Di.
func TestTubeThinWallConvergence(t *testing.T) {
	prev := math.Inf(1)
	for _, ratio := range []float64{0.45, 0.3, 0.1, 0.05, 0.02, 1e-2, 1e-3, 1e-4, 1e-5, 1e-6} {
		out, err := evaluateTubeCase(tubeBlock(map[string]any{
			"inner_diameter": "1 m", "wall_thickness": fmt.Sprintf("%g m", ratio)}), DefaultEnv())
		if err != nil {
			t.Fatal(err)
		}
		got := resultMap(out)
		r := got["hoop_stress"].Value/got["hoop_stress_thin"].Value - 1
		if !(r > ratio*(1-1e-6) && r < 2*ratio) || r >= prev {
			t.Errorf("t/Di = %g: Lamé/thin − 1 = %g, want between %g and %g and below %g", ratio, r, ratio, 2*ratio, prev)
		}
		prev = r
		note := strings.Contains(got["hoop_stress_thin"].Trace.Substituted, "NOTE")
		if note != (ratio > thinWallLimit) {
			t.Errorf("t/Di = %g: NOTE in trace = %v (%s)", ratio, note, got["hoop_stress_thin"].Trace.Substituted)
		}
	}
}

// TestTubeBurstConservative checks Barlow's burst pressure on the outside
// diameter against two other estimates it must not exceed: the pressure
// that brings the Lamé bore stress to the tensile strength,
// S·(k² − 1)/(k² + 1), and the von Mises collapse pressure of a fully
// plastic wall, (2/√3)·S·ln k (Nadai; from memory).
func TestTubeBurstConservative(t *testing.T) {
	mats, _ := DefaultMaterials()
	for _, name := range []string{"s235", "cast-iron", "pla"} {
		m, _ := mats.Lookup(name)
		s := m.TensileStrength
		for _, wall := range []string{"0.01 mm", "0.5 mm", "2 mm", "5 mm", "9.99 mm"} {
			out, err := evaluateTubeCase(tubeBlock(map[string]any{"wall_thickness": wall, "material": name}), DefaultEnv())
			if err != nil {
				t.Fatal(err)
			}
			got := resultMap(out)
			burst := got["burst_pressure"].Value - standardAtmosphere
			q, _ := units.Parse(wall, units.Length)
			k := (0.01 + q.Value) / 0.01
			lame := s * (k*k - 1) / (k*k + 1)
			plastic := 2 / math.Sqrt(3) * s * math.Log(k)
			if burst > lame*(1+1e-12) || burst > plastic*(1+1e-12) {
				t.Errorf("%s, wall %s: burst %g Pa above Lamé %g Pa or plastic collapse %g Pa", name, wall, burst, lame, plastic)
			}
			allow := got["allowable_pressure"].Value - standardAtmosphere
			if want := burst / DefaultSafety.MinimumFor(m); math.Abs(allow-want) > 1e-9*want {
				t.Errorf("%s, wall %s: allowable %g Pa, want burst / site minimum = %g Pa", name, wall, allow, want)
			}
		}
	}
}

// TestTubeFactorCriterion checks that the safety factor takes von Mises
// against a yield strength and the largest principal stress against a
// tensile strength, using two site materials that differ only in having a
// yield point.
func TestTubeFactorCriterion(t *testing.T) {
	base, _ := DefaultMaterials()
	mats, err := ParseMaterials(`
[ductile]
class = "metal"
tensile_strength = "300 MPa"
yield_strength = "300 MPa"
elastic_modulus = "200 GPa"
density = "7.8 g/cm3"
service_temperature = "300 degC"

[brittle]
class = "metal"
brittle = true
tensile_strength = "300 MPa"
elastic_modulus = "200 GPa"
density = "7.8 g/cm3"
service_temperature = "300 degC"
`, base)
	if err != nil {
		t.Fatal(err)
	}
	env := &Env{Materials: mats, Safety: Safety{MinimumFactorMetal: 3, MinimumFactorBrittle: 5}}
	// 20 mm bore, Do 30 mm, 100 bar = 10 MPa: k² = 2.25,
	// hoop = 10 · 3.25/1.25 = 26 MPa, axial = 10/1.25 = 8 MPa, radial = −10 MPa;
	// von Mises = √3 · 10 · 2.25/1.25 = 31.1769 MPa (closed ends).
	factor := map[string]float64{}
	for _, m := range []string{"ductile", "brittle"} {
		out, err := evaluateTubeCase(map[string]any{"inner_diameter": "20 mm", "outer_diameter": "30 mm", "pressure": "100 bar", "material": m}, env)
		if err != nil {
			t.Fatal(err)
		}
		got := resultMap(out)
		factor[m] = got["safety_factor"].Value
		// Barlow: 2 · 300 MPa · 5 mm / 30 mm = 100 MPa; over the site's own minimum.
		wantAllow := map[string]float64{"ductile": 100e6 / 3, "brittle": 100e6 / 5}[m]
		if a := got["allowable_pressure"].Value - standardAtmosphere; math.Abs(a-wantAllow) > 1 {
			t.Errorf("%s: allowable %g Pa(g), want %g", m, a, wantAllow)
		}
	}
	if want := 300 / 31.17691454; math.Abs(factor["ductile"]-want) > 1e-6*want {
		t.Errorf("ductile factor %g, want 300/σ_vM = %g", factor["ductile"], want)
	}
	if want := 300.0 / 26; math.Abs(factor["brittle"]-want) > 1e-9*want {
		t.Errorf("brittle factor %g, want 300/σ_θ = %g", factor["brittle"], want)
	}
}

// TestTubeAmbient checks that the pressure is taken as gauge against the
// block's ambient, and that pressures come back absolute.
func TestTubeAmbient(t *testing.T) {
	for _, ambient := range []float64{standardAtmosphere, 80e3} {
		in, err := kindInputs(tubeKind, tubeBlock(nil), ambient, DefaultEnv())
		if err != nil {
			t.Fatal(err)
		}
		out, err := tubeKind.Evaluate(in)
		if err != nil {
			t.Fatal(err)
		}
		got := resultMap(out)
		// 10 bar gauge = 1 MPa: radial stress −1 MPa; Barlow 2 · 360 · 2/24 = 60 MPa gauge.
		if got["radial_stress"].Value != -1e6 {
			t.Errorf("ambient %g: radial stress %g, want −1 MPa", ambient, got["radial_stress"].Value)
		}
		if b := got["burst_pressure"].Value; math.Abs(b-(60e6+ambient)) > 1e-3 {
			t.Errorf("ambient %g: burst %g Pa(a), want %g", ambient, b, 60e6+ambient)
		}
	}
}
