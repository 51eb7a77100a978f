package models

import (
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/calc"
)

func TestValveReference(t *testing.T) {
	runBlockCases(t, "valve", 2, func(t *testing.T, basis string, _ *calc.Set, _ *calc.Evaluated) float64 {
		t.Fatalf("unknown basis %q", basis)
		return 0
	})
}

// TestValveRelief: a valve that protects a compressor and a receiver
// names both in its trace with the absolute pressure it opens at, and the
// no-relief rule accepts it only when it opens at or below the receiver's
// allowable pressure (S235, 150 mm × 1 mm: 2·360 MPa·1 mm/152 mm = 47.37
// bar burst, 18.95 bar allowed at a factor of 2.5, below the bench
// cylinder's 24.5 bar dead-head).
func TestValveRelief(t *testing.T) {
	wall := map[string]any{"material": "s235", "inner_diameter": "150 mm", "wall_thickness": "1 mm"}
	for _, c := range []struct {
		preload string
		danger  bool
	}{
		// 6 mm seat, 5 N/mm: 1 mm preload gives 1.768 bar, 20 mm gives 35.4 bar.
		{"1 mm", false},
		{"20 mm", true},
	} {
		site := append(benchSite(wall), map[string]any{
			"id": "relief", "kind": "valve", "seat_diameter": "6 mm", "spring_rate": "5 N/mm",
			"preload": c.preload, "protects": []string{"low", "rx"},
		})
		set, err := evaluateBlocks(t, site)
		if err != nil {
			t.Fatal(err)
		}
		v, _ := set.Lookup("relief")
		crack, _ := v.Result("cracking_pressure")
		for _, s := range []string{"relief: opens at", "low dead-heads at 25.48 bar(a)", "rx allows"} {
			if !strings.Contains(crack.Trace.Substituted, s) {
				t.Errorf("preload %s: trace %q does not say %q", c.preload, crack.Trace.Substituted, s)
			}
		}
		low, _ := set.Lookup("low")
		danger := false
		for _, n := range low.Cautions {
			danger = danger || n.Rule == "no-relief"
		}
		if danger != c.danger {
			t.Errorf("preload %s (Δp %g Pa): no-relief raised %v, want %v; cautions %+v", c.preload, crack.Value, danger, c.danger, low.Cautions)
		}
	}
}

// TestValveDocNamesWorkingPressures keeps the write-up's list of the parts
// whose working pressure the relief-below-target rule checks complete.
func TestValveDocNamesWorkingPressures(t *testing.T) {
	doc := strings.Join(strings.Fields(valveDoc), " ")
	for _, k := range kinds {
		if w := k.WorkingPressure; w.Key != "" && !strings.Contains(doc, "a "+k.Name+"'s "+w.Name) {
			t.Errorf("valve doc does not say it checks a %s's %s", k.Name, w.Name)
		}
	}
}
