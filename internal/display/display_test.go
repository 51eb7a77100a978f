package display

import (
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/units"
)

// ambient is the ambient pressure of these cases: the ISO 2533 standard
// atmosphere, 101 325 Pa.
const ambient = 101325

// TestValueMarksPressures checks that a pressure asked for in an
// unmarked unit is shown with its mark: gauge at or above ambient,
// absolute below it; marked and absolute-by-nature units stay as asked.
func TestValueMarksPressures(t *testing.T) {
	for _, c := range []struct {
		si   float64 // Pa absolute
		unit string
		want string
	}{
		{701325, "bar", "6.00 bar(g)"},
		{905, "mbar", "9.05 mbar(a)"}, // a vacuum: the gauge figure would read -1004 mbar
		{ambient, "kPa", "0 kPa(g)"},
		{701325, "bar(a)", "7.01 bar(a)"},
		{905, "mbar(g)", "-1004 mbar(g)"}, // a gauge vacuum keeps the figures that show the absolute value
		{905, "torr", "6.79 torr"},        // NIST SP 811 App. B: 1 torr = 133.3224 Pa (from memory)
		// NIST SP 811 App. B: 1 psi = 6894.757 Pa; 101325 + 100·6894.757 = 790800.7 Pa.
		{790800.7, "psi", "100 psig"},
	} {
		got, err := Value(c.si, units.Pressure, c.unit, ambient, 3)
		if err != nil || got != c.want {
			t.Errorf("Value(%g Pa, %s) = %q, %v; want %q", c.si, c.unit, got, err, c.want)
		}
		// An inline value and its table never disagree: the table's pair
		// holds the same figure.
		if pair := PressurePair(c.si, c.unit, ambient, 3); strings.HasSuffix(c.unit, "(g)") && !strings.Contains(pair, got) {
			t.Errorf("%g Pa in %s: inline %q, table %q", c.si, c.unit, got, pair)
		}
	}
}

// TestVacuumPressurePair: a pressure below ambient shows absolute first,
// and its gauge value never rounds below minus the ambient pressure.
func TestVacuumPressurePair(t *testing.T) {
	// 1 Pa absolute on 1 atm: -14.6958 psi(g) (NIST SP 811: 1 psi = 6894.757 Pa);
	// three figures would give -14.7, below a perfect vacuum.
	got := PressurePair(1, "psi", ambient, 3)
	if !strings.HasPrefix(got, "0.000145 psia · -14.69") {
		t.Errorf("pressurePair = %q", got)
	}
}

// TestAbsoluteByNaturePressurePair: torr and atm have no gauge form, so a
// result asked for in them shows the absolute value alone, in that unit.
func TestAbsoluteByNaturePressurePair(t *testing.T) {
	// NIST SP 811 App. B: 1 torr = 133.3224 Pa (from memory); 905 Pa = 6.788 torr.
	if got := PressurePair(905, "torr", ambient, 3); got != "6.79 torr" {
		t.Errorf("pressurePair(905 Pa, torr) = %q, want \"6.79 torr\"", got)
	}
	// 1 atm = 101325 Pa (NIST SP 811 App. B).
	if got := PressurePair(202650, "atm", ambient, 3); got != "2.00 atm" {
		t.Errorf("pressurePair(202650 Pa, atm) = %q, want \"2.00 atm\"", got)
	}
}

// TestHighPressurePairDiffers: gauge and absolute that round alike at the
// site's figures get more, so the pair does not read as one number twice.
func TestHighPressurePairDiffers(t *testing.T) {
	// 1031.2 bar(g) = 1031.2e5 + 101325 Pa absolute = 1032.213 bar(a).
	got := PressurePair(1031.2e5+101325, "bar", ambient, 3)
	if got != "1031 bar(g) · 1032 bar(a)" {
		t.Errorf("pressurePair = %q, want \"1031 bar(g) · 1032 bar(a)\"", got)
	}
	// Low pressures keep the site's figures.
	if got := PressurePair(6e5+101325, "bar", ambient, 3); got != "6.00 bar(g) · 7.01 bar(a)" {
		t.Errorf("pressurePair = %q", got)
	}
}

// TestDurationUnit: a duration reads in seconds to three minutes, minutes
// to three hours, then hours (common practice for fill and pump-down times).
func TestDurationUnit(t *testing.T) {
	for _, c := range []struct {
		s    float64
		want string
	}{{59, "s"}, {179.9, "s"}, {180, "min"}, {10799, "min"}, {10800, "h"}, {4.17e7, "h"}} {
		if got := DurationUnit(c.s); got != c.want {
			t.Errorf("DurationUnit(%g s) = %q, want %q", c.s, got, c.want)
		}
	}
}

// TestFiguresFor: a trace whose result is a small difference of its terms
// carries more figures: 4 plus about log10 of term over result.
func TestFiguresFor(t *testing.T) {
	for _, c := range []struct {
		term, result float64
		want         int
	}{{1, 1, 4}, {1, 2, 4}, {100, 1, 6}, {1e4, 1, 8}, {1, 0, 4}, {1e30, 1, 12}} {
		if got := FiguresFor(c.term, c.result); got != c.want {
			t.Errorf("FiguresFor(%g, %g) = %d, want %d", c.term, c.result, got, c.want)
		}
	}
}
