package calc

import (
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/units"
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

// TestStandardFlowClaim: a claim in standard air is checked on the free
// air flow at the block's ambient pressure, and says what standard air
// is. 60 L/min of free air at 101.325 kPa(a) is 60 × 101.325/100 =
// 60.795 NL/min = 2.147 SCFM (ISO 8778 standard reference atmosphere,
// 100 kPa(a) and 20 °C, from memory; 1 ft3 = 28.316 846 592 L, NIST SP 811
// App. B.8).
func TestStandardFlowClaim(t *testing.T) {
	c, err := ParseClaim("free_air_delivery", ">= 2.1 SCFM", units.VolumeFlow)
	if err != nil {
		t.Fatal(err)
	}
	r := c.Check(1e-3, units.VolumeFlow, DefaultAmbient, 3)
	want := `free_air_delivery: claim ">= 2.1 SCFM" holds: computed 2.15 SCFM (SCFM is air at 100 kPa(a) and 20 °C, dry (the ISO 8778 standard reference atmosphere, from memory), read by mass as free air at the ambient pressure and 20 °C, here 101 kPa(a))`
	if !r.OK || r.Message != want {
		t.Errorf("ok %v, %q\nwant %q", r.OK, r.Message, want)
	}
}

// TestFractionClaim: a claim in a mixed fraction of an inch is a value, not
// a range.
func TestFractionClaim(t *testing.T) {
	c, err := ParseClaim("bore", "1-1/2 in ± 0.01 in", units.Length)
	if err != nil || c.Value != 1.5 || c.Unit != "in" {
		t.Errorf("%+v, %v", c, err)
	}
	if _, err := ParseClaim("bore", "20-25 mm", units.Length); err == nil || !strings.Contains(err.Error(), "looks like a range") {
		t.Errorf("a range written with a hyphen: %v", err)
	}
}
