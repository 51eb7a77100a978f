// Package display decides how a quantity is shown, for every part of
// specgen that shows one: result tables, inline values, claims, cautions,
// chart descriptions and the working behind a result. It chooses gauge or
// absolute marks for pressures, the unit a duration reads best in, the
// number of figures a trace needs, and the customary counterpart of a
// metric unit; the units package underneath parses, converts and rounds.
package display

import (
	"math"
	"strconv"
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
		sig = PressureFigures(si, unit, ambient, sig)
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
	if err != nil || (u.Ref != units.Unmarked && u.Ref != units.Unsettled) {
		return unit
	}
	mark := "(g)"
	if si < ambient {
		mark = "(a)"
	}
	if m, ok := units.Known(u.Symbol + mark); ok {
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
	if a, ok := units.Known(markless(u.Symbol) + "(a)"); ok {
		return a.Symbol
	}
	return "bar(a)"
}

// markless is a pressure unit's symbol without its gauge, absolute or
// vacuum mark: "bar(g)" → "bar", "inHg vac" → "inHg".
func markless(symbol string) string {
	for _, mark := range []string{"(a)", "(g)", " vac"} {
		symbol = strings.TrimSuffix(symbol, mark)
	}
	return symbol
}

// PressureFigures is how many significant figures an absolute pressure abs
// (Pa) needs shown in unit: sig, but more for a gauge or vacuum reading
// below ambient, which must not round past a perfect vacuum (-14.696
// psi(g) shown as -14.7), nor so coarsely that it hides the absolute value
// (6.11 mbar(a) read as -1010 mbar(g)): up to six figures. Tables, inline
// values and claims all show a vacuum with these figures, so that they
// never disagree.
func PressureFigures(abs float64, unit string, ambient float64, sig int) int {
	u, err := units.LookupUnit(unit)
	if err != nil || u.Dim != units.Pressure || u.Ref == units.Absolute || abs >= ambient {
		return sig
	}
	gauge := func(figs int) float64 {
		v, err := units.FromSI(abs, units.Pressure, unit, ambient)
		if err != nil {
			return math.NaN()
		}
		shown, _ := strconv.ParseFloat(units.Format(v, figs), 64)
		return shown * u.Factor // a vacuum unit's factor is negative
	}
	figs := sig
	for more := sig + 1; more <= 8; more++ {
		g := gauge(figs)
		pastVacuum := g < -ambient
		hides := math.Abs(g-(abs-ambient)) > abs/10
		if !pastVacuum && !(hides && more <= 6) {
			break
		}
		figs = more
	}
	return figs
}

// PressurePair shows an absolute pressure (Pa) both ways in unit's family,
// the reading that matters first: "6.00 bar(g) · 7.01 bar(a)" at or above
// ambient, "9.05 mbar(a) · −1010 mbar(g)" below it. Units that are absolute
// by nature (torr, atm) show alone.
func PressurePair(abs float64, unit string, ambient float64, sig int) string {
	if u, ok := units.Known(unit); ok && u.Ref == units.Absolute && !strings.HasSuffix(u.Symbol, "(a)") {
		s, _ := Value(abs, units.Pressure, u.Symbol, ambient, sig)
		return s
	}
	base := pressureBase(unit)
	// Value gives a gauge vacuum the figures it needs (PressureFigures).
	g, errG := Value(abs, units.Pressure, base+"(g)", ambient, sig)
	a, errA := Value(abs, units.Pressure, base+"(a)", ambient, sig)
	if errG != nil || errA != nil {
		s, _ := Value(abs, units.Pressure, "Pa(a)", ambient, sig)
		return s
	}
	if abs < ambient {
		// A vacuum reads best absolute first.
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

// pressureBase is the unit of a pressure without its gauge or absolute mark.
func pressureBase(unit string) string {
	u, err := units.LookupUnit(unit)
	if err != nil || u.Dim != units.Pressure {
		return "bar"
	}
	s := markless(u.Symbol)
	switch s {
	case "atm", "torr":
		return "kPa"
	}
	if _, ok := units.Known(s + "(a)"); !ok {
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
