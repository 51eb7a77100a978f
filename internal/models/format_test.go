package models

import (
	"strings"
	"testing"
)

// TestCustomaryBlockDisplay: a block written wholly in US customary units
// shows its results in them; one unit of metric keeps the kind's units.
func TestCustomaryBlockDisplay(t *testing.T) {
	base := map[string]any{"id": "c", "kind": "compressor", "bore": "1.9685 in", "stroke": "1.5748 in",
		"rod_length": "3.5 in", "clearance_volume": "0.25 in3", "speed": "1450 rpm", "discharge_pressure": "116 psi",
		"inlet_temperature": "68 degF"}
	for _, c := range []struct {
		name   string
		change map[string]any
		want   map[string]string
	}{
		{"customary", nil, map[string]string{
			// By hand: Vs = π/4·1.9685²·1.5748 = 4.793 in³; T2 = 485.40 K = 414 °F (as in
			// testdata/cautions/customary-units.toml); c = 0.25/4.793 = 0.05216, r = 8.8933,
			// η_v = 1 − 0.05216·(8.8933^(1/1.3) − 1) = 0.7720, FAD = 0.7720·4.793 in³·1450/min
			// = 5365 in³/min = 3.105 cfm (1 ft³ = 1728 in³).
			"swept_volume": "4.79 in³", "discharge_temperature": "414 °F", "free_air_delivery": "3.10 cfm"}},
		// By hand: π/4·(5 cm)²·4.0 cm (1.5748 in) = 78.54 cm³.
		{"mixed", map[string]any{"bore": "50 mm"}, map[string]string{"swept_volume": "78.5 cm³"}},
	} {
		block := map[string]any{}
		for k, v := range base {
			block[k] = v
		}
		for k, v := range c.change {
			block[k] = v
		}
		set, err := evaluateBlocks(t, []map[string]any{block})
		if err != nil {
			t.Fatal(err)
		}
		e, _ := set.Lookup("c")
		for name, want := range c.want {
			if got, err := e.Format(name, ""); err != nil || got != want {
				t.Errorf("%s: %s shows %q, %v; want %q", c.name, name, got, err, want)
			}
		}
	}
}

// TestCustomaryWorking: the working of a customary block substitutes its
// values in its units; a metric block keeps millimetres.
func TestCustomaryWorking(t *testing.T) {
	for _, c := range []struct{ bore, stroke, rod, want string }{
		{"1.9685 in", "1.5748 in", "3.5 in", "= π/4 · (1.968 in)²"},
		{"50 mm", "40 mm", "90 mm", "= π/4 · (50 mm)²"},
	} {
		set, err := evaluateBlocks(t, []map[string]any{{"id": "c", "kind": "compressor", "bore": c.bore, "stroke": c.stroke,
			"rod_length": c.rod, "clearance_ratio": 0.05, "speed": "1450 rpm", "discharge_pressure": "116 psi"}})
		if err != nil {
			t.Fatal(err)
		}
		e, _ := set.Lookup("c")
		r, _ := e.Result("piston_area")
		if r.Trace.Substituted != c.want {
			t.Errorf("bore %s: working %q, want %q", c.bore, r.Trace, c.want)
		}
	}
}

// TestCustomaryWorkingKinds: the valve, bolts and multistage traces, like
// the compressor's, substitute a customary block's values in its units and
// a metric block's in metric ones. Conversions: 1 in = 25.4 mm, 1 lbf =
// 4.448222 N, 1 psi = 6894.757 Pa, 1 atm = 14.696 psi (NIST SP 811 App. B,
// from memory).
func TestCustomaryWorkingKinds(t *testing.T) {
	for _, c := range []struct {
		block  map[string]any
		result string
		want   []string
		wrong  []string // units of the other system
	}{
		{map[string]any{"id": "v", "kind": "valve", "seat_diameter": "0.25 in", "spring_rate": "100 lbf/in", "preload": "0.2 in"},
			"spring_force", []string{"= 100 lbf/in · 0.2 in"}, []string{"mm", "N/mm"}},
		{map[string]any{"id": "v", "kind": "valve", "seat_diameter": "0.25 in", "spring_rate": "100 lbf/in", "preload": "0.2 in"},
			"cracking_pressure", []string{"= 20 lbf / (π/4 · (0.25 in)²)"}, []string{"mm", " N "}},
		{map[string]any{"id": "v", "kind": "valve", "seat_diameter": "6 mm", "spring_rate": "5 N/mm", "preload": "2 mm"},
			"cracking_pressure", []string{"= 10 N / (π/4 · (6 mm)²)"}, []string{"in", "lbf"}},
		// 116 psi over a 2.362 in gasket, six M8 bolts: F = 116 · π/4 · 2.362² = 508.3 lbf, 84.71 lbf each;
		// A_s(M8) = 36.61 mm² (ISO 898-1) = 36.61 / 645.16 = 0.05674 in².
		{map[string]any{"id": "b", "kind": "bolts", "thread": "M8", "count": 6, "property_class": "8.8", "pressure": "116 psi", "pressure_diameter": "2.362 in"},
			"head_load", []string{"= 116 psi · π/4 · (2.362 in)²"}, []string{"mm", "bar"}},
		{map[string]any{"id": "b", "kind": "bolts", "thread": "M8", "count": 6, "property_class": "8.8", "pressure": "116 psi", "pressure_diameter": "2.362 in"},
			"bolt_stress", []string{"= 84.71 lbf / 0.05674 in²"}, []string{"mm", " N "}},
		{map[string]any{"id": "b", "kind": "bolts", "thread": "M8", "count": 6, "property_class": "8.8", "pressure": "8 bar", "pressure_diameter": "60 mm"},
			"head_load", []string{"= 8 bar · π/4 · (60 mm)²"}, []string{"in", "psi"}},
		// 87 psi gauge is 87 + 14.696 = 101.7 psia.
		{map[string]any{"id": "m", "kind": "multistage", "stages": 2, "discharge_pressure": "87 psi", "inlet_temperature": "68 degF"},
			"stage_pressure_ratio", []string{"= (101.7 psia / 14.7 psia)^(1/2)"}, []string{"bar"}},
		// 1160 psi gauge is 1174.7 psia, above the ideal-gas limit of 50 bar(a) = 725 psia.
		{map[string]any{"id": "m", "kind": "multistage", "stages": 3, "discharge_pressure": "1160 psi", "inlet_temperature": "68 degF"},
			"specific_work", []string{"NOTE: at 1175 psia"}, []string{"bar"}},
		{map[string]any{"id": "m", "kind": "multistage", "stages": 2, "discharge_pressure": "6 bar"},
			"stage_pressure_ratio", []string{"= (7.013 bar(a) / 1.013 bar(a))^(1/2)"}, []string{"psi"}},
	} {
		set, err := evaluateBlocks(t, []map[string]any{c.block})
		if err != nil {
			t.Fatal(err)
		}
		e, _ := set.Lookup(c.block["id"].(string))
		r, ok := e.Result(c.result)
		if !ok {
			t.Fatalf("%s: no %s", c.block["kind"], c.result)
		}
		for _, w := range c.want {
			if !strings.Contains(r.Trace.Substituted, w) {
				t.Errorf("%s %s: working %q lacks %q", c.block["kind"], c.result, r.Trace.Substituted, w)
			}
		}
		for _, w := range c.wrong {
			if strings.Contains(r.Trace.Substituted, w) {
				t.Errorf("%s %s: working %q shows %q, a unit the block is not written in", c.block["kind"], c.result, r.Trace.Substituted, w)
			}
		}
	}
}
