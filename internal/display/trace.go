package display

import (
	"math"
	"strings"

	"github.com/millrace-workshop/specgen/internal/units"
)

// TraceFigures is the number of significant figures of a trace's numbers.
const TraceFigures = 4

// TraceIn formats an SI value for a formula trace in unit, a metric symbol
// of the unit table, or in its US customary counterpart when customary.
// Only for units read from zero (lengths, volumes, absolute pressures).
func TraceIn(customary bool, unit string) func(float64) string {
	return TraceInSig(customary, unit, TraceFigures)
}

// TraceInSig is TraceIn at sig significant figures.
func TraceInSig(customary bool, unit string, sig int) func(float64) string {
	if customary {
		unit = units.CustomaryFor(unit)
	}
	u, err := units.LookupUnit(unit)
	if err != nil {
		return func(si float64) string { return NumberSig(si, unit, sig) }
	}
	pretty := units.Pretty(u.Symbol)
	return func(si float64) string { return NumberSig((si-u.Offset)/u.Factor, pretty, sig) }
}

// Number formats a value already scaled to unit at TraceFigures significant
// figures, without trailing zeros after the decimal point ("28 mm",
// "1.013 bar(a)").
func Number(v float64, unit string) string { return NumberSig(v, unit, TraceFigures) }

// NumberSig is Number at sig significant figures.
func NumberSig(v float64, unit string, sig int) string {
	s := units.Format(v, sig)
	if strings.Contains(s, ".") && !strings.Contains(s, "e") {
		s = strings.TrimSuffix(strings.TrimRight(s, "0"), ".")
	}
	if unit == "" {
		return s
	}
	return s + " " + unit
}

// Gauge shows a gauge pressure (a difference from ambient, Pa) in the
// block's units with the trade's gauge mark: "7 bar(g)", "100 psig".
func Gauge(gauge float64, customary bool) string {
	s := TraceIn(customary, "bar")(gauge)
	if customary {
		return s + "g"
	}
	return s + "(g)"
}

// GaugeAndAbsolute shows an absolute pressure p the way blocks are written,
// gauge first, with the absolute figure beside it: "7 bar(g) (8.013 bar(a))",
// "100 psig (114.7 psia)".
func GaugeAndAbsolute(p, ambient float64, customary bool) string {
	return Gauge(p-ambient, customary) + " (" + TraceIn(customary, "bar(a)")(p) + ")"
}

// FiguresFor is how many significant figures the terms of a trace need so
// that a result that is their small difference still comes out to
// TraceFigures: 4, plus the digits lost to cancellation (about log10 of
// term over result). Without them a reviewer working the trace of a low
// pressure ratio or a near dead-head by hand gets a different answer.
func FiguresFor(term, result float64) int {
	ratio := math.Abs(term / result)
	if !(ratio > 1) || math.IsInf(ratio, 0) {
		return TraceFigures
	}
	// Each term rounded to TraceFigures is off by up to about 5e-4 of
	// itself; the difference, by that times ratio.
	return TraceFigures + max(0, min(int(math.Ceil(math.Log10(0.7*ratio))), 8))
}

// Described formats an SI value for a chart's text description at 3
// significant figures, in unit or its customary counterpart.
func Described(customary bool, unit string) func(float64) string {
	if customary {
		unit = units.CustomaryFor(unit)
	}
	u, err := units.LookupUnit(unit)
	if err != nil {
		return func(si float64) string { return units.Format(si, 3) + " " + unit }
	}
	pretty := units.Pretty(u.Symbol)
	return func(si float64) string { return units.Format((si-u.Offset)/u.Factor, 3) + " " + pretty }
}
