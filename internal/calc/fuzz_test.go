package calc

import (
	"math"
	"testing"

	"github.com/millrace-workshop/specgen/internal/units"
)

// FuzzParseClaim checks that ParseClaim never panics, that a parsed claim
// has a finite value and finite, non-negative tolerances in a unit that
// shows the result's dimension, and that checking it never panics.
func FuzzParseClaim(f *testing.F) {
	dims := []units.Dimension{units.Volume, units.VolumeFlow, units.Pressure, units.Temperature, units.Dimensionless,
		units.Length, units.Power, units.Torque, units.Stress}
	for _, s := range []string{"22.5 cm3 ± 2%", "22.5 cm3 ± 0.5 cm3", "22.5 cm3 +- 0.5", "22.5 cm3 +/- 500 mm3",
		"20 cm3", "20.0", "2.5e3 cm3", ">= 15 L/min", "≥ 0.5 cfm", "<= 120 degC", "< 120 degC ", "> 6 bar(a)",
		"6 bar", "7.01325 bar(a)", "100 psi ± 0.5 bar", "120 degC ± 5 degF", "85 %", "-0.5 bar", "± 2%",
		">= 20 cm3 ± 1", "20 cm3 ± -1 cm3", "1e400 cm3", "20 cm3 ± 1e400%", "1e-400 cm3", "2.5e-3000 L",
		"20 cm3 ± 1e308 m3", "5 e3 L", "\xff", ""} {
		for i := range dims {
			f.Add(s, uint8(i))
		}
	}
	f.Fuzz(func(t *testing.T, text string, d uint8) {
		dim := dims[int(d)%len(dims)]
		c, err := ParseClaim("result", text, dim)
		if err != nil {
			if err.Error() == "" {
				t.Fatalf("ParseClaim(%q, %s): empty error", text, dim)
			}
			return
		}
		checkClaim(t, c)
		if _, err := units.FromSI(1, dim, c.Unit, DefaultAmbient); err != nil {
			t.Fatalf("ParseClaim(%q, %s): unit %q cannot show the result: %v", text, dim, c.Unit, err)
		}
		for _, si := range []float64{0, 1, 300, 701325, -1e-3, 1e30} {
			if r := c.Check(si, dim, DefaultAmbient, 3); r.Message == "" {
				t.Fatalf("Check of %q against %g: empty message", text, si)
			}
		}
	})
}

// checkClaim fails t when a parsed claim holds a non-finite number or a
// negative tolerance.
func checkClaim(t *testing.T, c Claim) {
	t.Helper()
	if !finite(c.Value) || !finite(c.Tolerance) || !finite(c.RelTol) || c.Tolerance < 0 || c.RelTol < 0 {
		t.Fatalf("claim %q: value %g, tolerance %g, relative %g", c.Text, c.Value, c.Tolerance, c.RelTol)
	}
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
