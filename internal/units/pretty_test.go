package units

import "testing"

// TestPrettyReadsBack checks that every unit's pretty spelling parses back
// to the same unit, and spot-checks the spellings.
func TestPrettyReadsBack(t *testing.T) {
	for key, u := range unitIndex {
		p := Pretty(u.Symbol)
		back, err := LookupUnit(p)
		if err != nil {
			t.Errorf("%q (from %q): pretty %q does not parse: %v", u.Symbol, key, p, err)
			continue
		}
		if back.Symbol != u.Symbol {
			t.Errorf("pretty %q of %q reads back as %q", p, u.Symbol, back.Symbol)
		}
	}
	for sym, want := range map[string]string{"cm3": "cm³", "degC": "°C", "N m": "N·m", "kg/m3": "kg/m³", "L/min": "L/min", "bar(a)": "bar(a)", "m/s2": "m/s²", "kg m2": "kg·m²"} {
		if got := Pretty(sym); got != want {
			t.Errorf("Pretty(%q) = %q, want %q", sym, got, want)
		}
	}
}
