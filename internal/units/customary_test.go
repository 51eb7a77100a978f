package units

import "testing"

// TestCustomaryCounterparts checks that every customary counterpart is a
// customary unit of the table measuring what its metric unit measures.
func TestCustomaryCounterparts(t *testing.T) {
	for metric, customary := range customaryOf {
		m, err := LookupUnit(metric)
		if err != nil {
			t.Fatalf("%s: %v", metric, err)
		}
		c, err := LookupUnit(customary)
		if err != nil {
			t.Fatalf("%s: %v", customary, err)
		}
		if m.Dim != c.Dim || SystemOf(m.Symbol) != Metric || SystemOf(c.Symbol) != Customary {
			t.Errorf("%s (%v, %v) → %s (%v, %v)", metric, m.Dim, SystemOf(m.Symbol), customary, c.Dim, SystemOf(c.Symbol))
		}
	}
	for symbol := range customaryUnits {
		if _, err := LookupUnit(symbol); err != nil {
			t.Errorf("customary unit %s: %v", symbol, err)
		}
	}
	for symbol, want := range map[string]UnitSystem{"psi(g)": Customary, "psi(a)": Customary, "bar(a)": Metric, "rpm": Neutral, "torr": Neutral, "degF": Customary, "psi(d)": Customary, "bar(d)": Metric} {
		if got := SystemOf(symbol); got != want {
			t.Errorf("SystemOf(%q) = %v, want %v", symbol, got, want)
		}
	}
}

func TestCustomaryForKeepsMarks(t *testing.T) {
	for unit, want := range map[string]string{"bar(a)": "psi(a)", "bar(g)": "psi(g)", "bar": "psi", "bar(d)": "psi(d)", "cm3": "in3", "J": "J", "rpm": "rpm", "deg": "deg"} {
		if got := CustomaryFor(unit); got != want {
			t.Errorf("CustomaryFor(%q) = %q, want %q", unit, got, want)
		}
	}
}

// TestEveryUnitHasItsSystem keeps the three system lists complete: a row
// added to the unit table without its system fails here, naming it.
func TestEveryUnitHasItsSystem(t *testing.T) {
	for _, d := range unitTable {
		base, _ := pressureMark(d.Symbol)
		n := 0
		for _, list := range []map[string]bool{metricUnits, customaryUnits, neutralUnits} {
			if list[base] {
				n++
			}
		}
		if n != 1 {
			t.Errorf("unit %q is in %d of the system lists (metricUnits, customaryUnits, neutralUnits in customary.go); put it in one", d.Symbol, n)
		}
	}
	for _, list := range []map[string]bool{metricUnits, customaryUnits, neutralUnits} {
		for sym := range list {
			if _, err := LookupUnit(sym); err != nil {
				t.Errorf("system list names %q, which is not in the unit table", sym)
			}
		}
	}
}
