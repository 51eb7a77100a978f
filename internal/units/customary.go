package units

import "strings"

// UnitSystem tells the US customary spellings from the metric ones.
type UnitSystem int

const (
	// Neutral units belong to both (rpm, s, degrees, atm, torr).
	Neutral UnitSystem = iota
	Metric
	Customary
)

// customaryUnits are the US customary symbols of the unit table.
var customaryUnits = map[string]bool{
	"in": true, "ft": true, "in2": true, "ft2": true, "in3": true, "ft3": true, "gal": true, "cfm": true,
	"psi": true, "ksi": true, "inHg": true, "degF": true, "degR": true, "lbf": true, "lbf in": true, "lbf ft": true,
	"hp": true, "lb": true, "lb/ft3": true, "lb/in3": true, "lbf/in": true, "ft/min": true, "ft/s": true,
	"ft/s2": true, "lb/h": true, "lb ft2": true, "lb in2": true, "SCFM": true, "inHg vac": true, "ft lbf": true, "in lbf": true, "hp/cfm": true,
}

// neutralUnits are used alike in both systems.
var neutralUnits = map[string]bool{
	"": true, "%": true, "rpm": true, "rev/s": true, "rad/s": true, "rad": true, "deg": true,
	"ms": true, "s": true, "min": true, "h": true, "atm": true, "torr": true, "mmHg": true, "K": true, "mmHg vac": true, "Hz": true, "Torr L/s": true,
}

// metricUnits are the metric symbols of the unit table. Every symbol of
// the table is in exactly one of the three lists (tested), so that a new
// row cannot fall into a system by default.
var metricUnits = map[string]bool{
	"um": true, "mm": true, "cm": true, "m": true, "mm2": true, "cm2": true, "m2": true, "mm3": true, "cm3": true,
	"L": true, "m3": true, "cm3/s": true, "L/min": true, "L/s": true, "m3/h": true, "m3/min": true, "m3/s": true,
	"Pa": true, "hPa": true, "kPa": true, "MPa": true, "bar": true, "mbar": true, "N/mm2": true, "GPa": true,
	"degC": true, "N": true, "kN": true, "kgf": true, "N m": true, "N mm": true, "kN m": true, "W": true, "kW": true,
	"J": true, "kJ": true, "MJ": true, "Wh": true, "kWh": true, "g": true, "kg": true, "kg/m3": true, "g/cm3": true,
	"N/mm": true, "N/m": true, "kN/m": true, "mm/s": true, "m/s": true, "m/min": true, "m/s2": true, "g/s": true,
	"kg/s": true, "kg/h": true, "J/kg": true, "kJ/kg": true, "kg m2": true, "kg mm2": true, "g cm2": true,
	"J/m3": true, "kJ/m3": true, "J/L": true, "kWh/m3": true, "Nl/min": true, "l/min ANR": true, "Pa m3/s": true, "mbar L/s": true, "hPa(a)": true, "hPa(g)": true, "Nm3/h": true, "kW/(m3/min)": true, "W/(L/min)": true, "W/(m3/s)": true,
}

// SystemOf tells which system a unit symbol (as LookupUnit gives it)
// belongs to; a pressure's gauge, absolute or difference mark does not
// matter. A symbol outside the unit table is metric.
func SystemOf(symbol string) UnitSystem {
	base, _ := pressureMark(symbol)
	switch {
	case customaryUnits[base]:
		return Customary
	case neutralUnits[base]:
		return Neutral
	}
	return Metric
}

// customaryOf is the customary unit a workshop in the US would read a
// metric display unit in.
var customaryOf = map[string]string{
	"mm": "in", "cm": "in", "m": "ft", "mm2": "in2", "cm2": "in2", "m2": "ft2",
	"mm3": "in3", "cm3": "in3", "L": "gal", "m3": "ft3",
	"L/min": "cfm", "L/s": "cfm", "m3/h": "cfm", "m3/min": "cfm", "m3/s": "cfm",
	"bar": "psi", "mbar": "psi", "kPa": "psi", "MPa": "psi", "Pa": "psi",
	"degC": "degF", "N": "lbf", "kN": "lbf", "N m": "lbf ft", "N mm": "lbf in",
	"W": "hp", "kW": "hp", "g": "lb", "kg": "lb", "kg/m3": "lb/ft3",
	"kg m2": "lb ft2", "m/s": "ft/s", "N/mm": "lbf/in", "kW/(m3/min)": "hp/cfm", "W/(L/min)": "hp/cfm", "g/s": "lb/h", "kg/s": "lb/h",
}

// CustomaryFor is the US customary counterpart of a metric display unit,
// or the unit itself when it has none (J, kJ/kg) or is not metric.
// A pressure keeps its mark: "bar(a)" becomes "psi(a)", "bar(d)" "psi(d)".
func CustomaryFor(unit string) string {
	base, mark := pressureMark(unit)
	c, ok := customaryOf[base]
	if !ok {
		return unit
	}
	if _, ok := Known(c + mark); !ok {
		return unit
	}
	return c + mark
}

// pressureMark splits a pressure unit symbol into its base and its mark
// ("bar(a)" into "bar" and "(a)"); other symbols have no mark.
func pressureMark(symbol string) (base, mark string) {
	for _, m := range []string{"(a)", "(g)", "(d)"} {
		if b, ok := strings.CutSuffix(symbol, m); ok {
			return b, m
		}
	}
	return symbol, ""
}
