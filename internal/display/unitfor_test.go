package display

import (
	"testing"

	"github.com/millrace-workshop/specgen/internal/units"
)

// TestUnitFor checks the default display units: each can show its
// dimension, and the choices the workshop reads.
func TestUnitFor(t *testing.T) {
	for d := range units.Dimension(100) { // past the last: undeclared ones are skipped
		if units.DefaultUnit(d) == "" && d != units.Dimensionless {
			continue
		}
		for _, customary := range []bool{false, true} {
			unit := UnitFor(d, customary)
			if _, err := units.FromSI(1, d, unit, 0); err != nil {
				t.Errorf("UnitFor(%s, %v) = %q: does not fit (%v)", d, customary, unit, err)
			}
		}
	}
	for _, c := range []struct {
		d         units.Dimension
		customary bool
		want      string
	}{
		{units.Length, false, "m"},
		{units.Length, true, "ft"},
		{units.EnergyPerVolume, false, "kJ/m3"},
		{units.EnergyPerVolume, true, "kJ/m3"},
		{units.PressureDifference, false, "bar(d)"},
		{units.PressureDifference, true, "psi(d)"},
		{units.TemperatureDifference, false, "K"},
		{units.TemperatureDifference, true, "degR"},
		{units.Temperature, true, "degF"},
		{units.Torque, true, "lbf ft"},
	} {
		if got := UnitFor(c.d, c.customary); got != c.want {
			t.Errorf("UnitFor(%s, %v) = %q, want %q", c.d, c.customary, got, c.want)
		}
	}
}

func TestDifferenceUnit(t *testing.T) {
	for unit, want := range map[string]string{
		"bar": "bar(d)", "bar(g)": "bar(d)", "psi": "psi(d)", "psig": "psi(d)", "kPa": "kPa(d)",
		"bar(a)": "bar(a)", "ksi": "ksi", "mm": "mm", "psid": "psid",
	} {
		if got := DifferenceUnit(unit); got != want {
			t.Errorf("DifferenceUnit(%q) = %q, want %q", unit, got, want)
		}
	}
}
