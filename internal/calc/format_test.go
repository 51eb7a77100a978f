package calc

import (
	"testing"

	"specgen/internal/units"
)

// TestFormatValueMarksPressures checks that a pressure asked for in an
// unmarked unit is shown with its mark: gauge at or above ambient,
// absolute below it; marked and absolute-by-nature units stay as asked.
func TestFormatValueMarksPressures(t *testing.T) {
	const ambient = 101325 // Pa; ISO 2533 standard atmosphere
	for _, c := range []struct {
		si   float64 // Pa absolute
		unit string
		want string
	}{
		{701325, "bar", "6.00 bar(g)"},
		{905, "mbar", "9.05 mbar(a)"}, // a vacuum: the gauge figure would read -1004 mbar
		{ambient, "kPa", "0 kPa(g)"},
		{701325, "bar(a)", "7.01 bar(a)"},
		{905, "mbar(g)", "-1000 mbar(g)"},
		{905, "torr", "6.79 torr"}, // NIST SP 811 App. B: 1 torr = 133.3224 Pa (from memory)
		// NIST SP 811 App. B: 1 psi = 6894.757 Pa; 101325 + 100·6894.757 = 790800.7 Pa.
		{790800.7, "psi", "100 psig"},
	} {
		got, err := FormatValue(c.si, units.Pressure, c.unit, ambient, 3)
		if err != nil || got != c.want {
			t.Errorf("FormatValue(%g Pa, %s) = %q, %v; want %q", c.si, c.unit, got, err, c.want)
		}
	}
}

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
