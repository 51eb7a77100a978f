package models

import (
	"strings"
	"testing"
)

// TestCodeFigures checks the figures that do not govern, which only the
// working of code_allowable_pressure shows, and the walls that get no code
// figure, which say why in the working of allowable_pressure. Hand
// arithmetic (ASME VIII-1 UG-27, UG-32(f), Appendices 1-2 and 1-3, from
// memory), S235: S = min(360/3.5, 2/3 · 235) = 102.857 MPa:
//   - 20 mm bore, 8 mm wall, E = 1: longitudinal, thin 2 · 102.857 · 8/(10 −
//     3.2) = 242.0 MPa, above 1.25 · S · E = 128.6 MPa, so thick: Z = (18/10)²
//     = 3.24, S · E · (Z − 1) = 230.4 MPa = 2304 bar.
//   - hemispherical head 12 mm on a 60 mm bore, E = 0.70 (S · E = 72.0 MPa):
//     thin 2 · 72 · 12/(30 + 2.4) = 53.33 MPa, above 0.665 · S · E = 47.88 MPa,
//     so thick: Y = (42/30)³ = 2.744, 2 · 72 · 1.744/4.744 = 52.94 MPa.
func TestCodeFigures(t *testing.T) {
	for _, c := range []struct {
		block    map[string]any
		result   string
		says     []string
		noResult bool
	}{
		{map[string]any{"id": "p", "kind": "tube", "inner_diameter": "20 mm", "wall_thickness": "8 mm", "pressure": "100 bar", "material": "s235"},
			"code_allowable_pressure", []string{"shell, longitudinal stress: the thin formula does not apply: it gives 2420 bar", "S·E·(Z − 1), Z = ((R + t)/R)² (thick wall, Appendix 1-2(a)(2))", "= 2304 bar"}, false},
		{map[string]any{"id": "p", "kind": "tank", "volume": "1 L", "pressure": "10 bar", "inner_diameter": "60 mm", "wall_thickness": "25 mm", "material": "s235",
			"head": "hemispherical", "head_thickness": "12 mm"},
			"code_allowable_pressure", []string{"hemispherical head: the thin formula does not apply: it gives 533.3 bar, above 0.665·S·E", "Y = ((30 mm + 12 mm)/30 mm)³ = 529.4 bar"}, false},
		{map[string]any{"id": "p", "kind": "tube", "inner_diameter": "20 mm", "wall_thickness": "2 mm", "pressure": "10 bar", "material": "pla"},
			"allowable_pressure", []string{"no code figure: PLA (3D-printing filament) is a plastic"}, true},
		{map[string]any{"id": "p", "kind": "tube", "inner_diameter": "20 mm", "wall_thickness": "2 mm", "pressure": "10 bar", "material": "aluminium-6061-t6", "design_temperature": "120 degC"},
			"allowable_pressure", []string{"no code figure at a design temperature of 120 °C: above 100 °C the allowable stress of Aluminium 6061-T6"}, true},
		{map[string]any{"id": "p", "kind": "tube", "inner_diameter": "20 mm", "wall_thickness": "2 mm", "pressure": "10 bar", "material": "aluminium-6061-t6", "design_temperature": "80 degC"},
			"code_allowable_pressure", []string{"S = min(S_u/3.5, 2/3·S_y) = min(260 MPa/3.5, 2/3 · 240 MPa) = 74.29 MPa", "at 80 °C"}, false},
	} {
		set, err := evaluateBlocks(t, []map[string]any{c.block})
		if err != nil {
			t.Fatal(err)
		}
		e, _ := set.Lookup("p")
		r, ok := e.Result(c.result)
		if !ok {
			t.Fatalf("%v: no %s", c.block, c.result)
		}
		for _, s := range c.says {
			if !strings.Contains(r.Trace.Formula+" "+r.Trace.Substituted, s) {
				t.Errorf("%v: %s working %q / %q lacks %q", c.block, c.result, r.Trace.Formula, r.Trace.Substituted, s)
			}
		}
		if _, has := e.Result("code_allowable_pressure"); has == c.noResult {
			t.Errorf("%v: code_allowable_pressure given %v, want %v", c.block, has, !c.noResult)
		}
	}
}
