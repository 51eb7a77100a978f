package calc

import (
	"testing"

	"specgen/internal/units"
)

func TestCompareClaims(t *testing.T) {
	cases := []struct {
		before, now string
		dim         units.Dimension
		want        string
	}{
		{">= 80 L/min", ">= 70 L/min", units.VolumeFlow, "weakened"},
		{">= 70 L/min", ">= 80 L/min", units.VolumeFlow, "strengthened"},
		{"<= 120 degC", "<= 130 degC", units.Temperature, "weakened"},
		{"22.5 cm3 ± 2%", "22.5 cm3 ± 5%", units.Volume, "weakened"},
		{"22.5 cm3 ± 5%", "22.5 cm3 ± 0.2 cm3", units.Volume, "strengthened"},
		{"20 to 25 cm3", "21 to 26 cm3", units.Volume, "changed"},
		{">= 80 L/min", "<= 90 L/min", units.VolumeFlow, "changed"},
		// One band in other units: 4.8 m3/h is 80 L/min.
		{">= 80 L/min", ">= 4.8 m3/h", units.VolumeFlow, "changed"},
		// 2.8 cfm is 79.3 L/min (1 ft3 = 28.316846592 L, NIST SP 811 App. B.8, from memory).
		{">= 80 L/min", ">= 2.8 cfm", units.VolumeFlow, "weakened"},
		{">= 6 bar", ">= 7 bar(a)", units.Pressure, "weakened"}, // 7 bar(a) is 5.99 bar at 1 atm
		{">= 80 L/min", "lots", units.VolumeFlow, "changed"},
	}
	for _, c := range cases {
		if got := CompareClaims("r", c.before, c.now, c.dim, DefaultAmbient); got != c.want {
			t.Errorf("%q → %q: %s, want %s", c.before, c.now, got, c.want)
		}
	}
}
