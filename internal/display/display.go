// Package display decides how a quantity is shown, for every part of
// specgen that shows one: result tables, inline values, claims, cautions,
// chart descriptions and the working behind a result. It chooses gauge or
// absolute marks for pressures, the unit a duration reads best in, the
// number of figures a trace needs, and the customary counterpart of a
// metric unit; the units package underneath parses, converts and rounds.
package display

import (
	"math"
	"strings"

	"github.com/millrace-workshop/specgen/internal/units"
)

// Value shows an SI value in unit with sig significant figures: "19.7 cm³".
// A pressure in an unmarked unit gets its mark (see MarkedPressureUnit).
func Value(si float64, dim units.Dimension, unit string, ambient float64, sig int) (string, error) {
	if dim == units.Dimensionless && unit == "" {
		return units.Format(si, sig), nil
	}
	if dim == units.Pressure {
		unit = MarkedPressureUnit(si, unit, ambient)
	}
	v, err := units.FromSI(si, dim, unit, ambient)
	if err != nil {
		return "", err
	}
	u, err := units.LookupUnitAs(unit, dim)
	if err != nil {
		return "", err
	}
	if u.Symbol == "" {
		return units.Format(v, sig), nil
	}
	if pretty := units.Pretty(u.Symbol); pretty != "°" {
		return units.Format(v, sig) + " " + pretty, nil
	}
	return units.Format(v, sig) + "°", nil
}

// MarkedPressureUnit gives an unmarked pressure unit ("bar") its mark, so
// that a shown pressure never leaves the reader to guess: gauge at or above
// ambient, absolute below it, where a gauge figure hides how good a vacuum
// is ("-1000 mbar" for 9 mbar(a)).
func MarkedPressureUnit(si float64, unit string, ambient float64) string {
	u, err := units.LookupUnit(unit)
	if err != nil || u.Ref != units.Unmarked {
		return unit
	}
	mark := "(g)"
	if si < ambient {
		mark = "(a)"
	}
	if m, err := units.LookupUnit(u.Symbol + mark); err == nil {
		return m.Symbol
	}
	return unit
}

// AbsoluteUnit is the absolute form of a pressure unit: "bar" → "bar(a)".
func AbsoluteUnit(unit string) string {
	u, err := units.LookupUnit(unit)
	if err != nil || u.Ref == units.Absolute {
		return unit
	}
	if a, err := units.LookupUnit(strings.TrimSuffix(u.Symbol, "(g)") + "(a)"); err == nil {
		return a.Symbol
	}
	return "bar(a)"
}

// PressurePair shows an absolute pressure (Pa) both ways in unit's family,
// the reading that matters first: "6.00 bar(g) · 7.01 bar(a)" at or above
// ambient, "9.05 mbar(a) · −1010 mbar(g)" below it. Units that are absolute
// by nature (torr, atm) show alone.
func PressurePair(abs float64, unit string, ambient float64, sig int) string {
	if u, err := units.LookupUnit(unit); err == nil && u.Ref == units.Absolute && !strings.HasSuffix(u.Symbol, "(a)") {
		s, _ := Value(abs, units.Pressure, u.Symbol, ambient, sig)
		return s
	}
	base := pressureBase(unit)
	g, errG := Value(abs, units.Pressure, base+"(g)", ambient, sig)
	a, errA := Value(abs, units.Pressure, base+"(a)", ambient, sig)
	if errG != nil || errA != nil {
		s, _ := Value(abs, units.Pressure, "Pa(a)", ambient, sig)
		return s
	}
	if abs < ambient {
		// A vacuum reads best absolute first, and its gauge value must not
		// round past a perfect vacuum (-14.696 psi(g) shown as -14.7), nor
		// so coarsely that it hides the absolute value beside it (6.11
		// mbar(a) beside -1010 mbar(g)): up to six figures.
		for more := sig + 1; more <= 8 && (roundsPastVacuum(g, ambient) || more <= 6 && gaugeHides(g, abs, ambient)); more++ {
			g, _ = Value(abs, units.Pressure, base+"(g)", ambient, more)
		}
		return a + " · " + g
	}
	// At high pressure the two can round alike ("1030 bar(g) · 1030 bar(a)"):
	// more figures show the ambient between them.
	for more := sig + 1; more <= 8 && sameNumber(g, a); more++ {
		g, _ = Value(abs, units.Pressure, base+"(g)", ambient, more)
		a, _ = Value(abs, units.Pressure, base+"(a)", ambient, more)
	}
	return g + " · " + a
}

// sameNumber reports whether two shown quantities have the same number.
func sameNumber(x, y string) bool {
	nx, _, _ := strings.Cut(x, " ")
	ny, _, _ := strings.Cut(y, " ")
	return nx == ny
}

// gaugeHides reports whether a shown gauge pressure is off the true one
// by more than a tenth of the absolute pressure abs (Pa).
func gaugeHides(shown string, abs, ambient float64) bool {
	q, err := units.Parse(shown, units.Pressure)
	if err != nil {
		return false
	}
	return math.Abs(q.Value-(abs-ambient)) > abs/10
}

// roundsPastVacuum reports whether a shown gauge pressure is below minus
// the ambient pressure, which no pressure can be.
func roundsPastVacuum(shown string, ambient float64) bool {
	q, err := units.Parse(shown, units.Pressure)
	if err != nil {
		return false
	}
	return q.Value < -ambient
}

// pressureBase is the unit of a pressure without its gauge or absolute mark.
func pressureBase(unit string) string {
	u, err := units.LookupUnit(unit)
	if err != nil || u.Dim != units.Pressure {
		return "bar"
	}
	s := strings.TrimSuffix(strings.TrimSuffix(u.Symbol, "(a)"), "(g)")
	switch s {
	case "atm", "torr":
		return "kPa"
	}
	if _, err := units.LookupUnit(s + "(a)"); err != nil {
		return "bar"
	}
	return s
}

// DurationUnit is the unit a duration reads best in: seconds up to three
// minutes, minutes up to three hours, then hours ("41 700 000 s" is 11 600 h).
func DurationUnit(seconds float64) string {
	switch {
	case seconds < 180:
		return "s"
	case seconds < 3*3600:
		return "min"
	}
	return "h"
}
