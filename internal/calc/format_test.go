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
		{790800.7, "psi", "100 psi(g)"},
	} {
		got, err := FormatValue(c.si, units.Pressure, c.unit, ambient, 3)
		if err != nil || got != c.want {
			t.Errorf("FormatValue(%g Pa, %s) = %q, %v; want %q", c.si, c.unit, got, err, c.want)
		}
	}
}
