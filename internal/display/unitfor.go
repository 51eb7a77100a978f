package display

import (
	"strings"

	"github.com/millrace-workshop/specgen/internal/units"
)

// unitFor are the units a value shows in when nothing else is chosen, for
// the dimensions the workshop does not read in their coherent SI unit:
// pressures in bar, stresses in MPa, temperatures on the Celsius scale,
// speeds in rpm, angles in degrees, and an energy per volume in kJ/m3
// (numerically J/L), whose coherent J/m3 runs to six figures for a
// workshop compressor.
var unitFor = map[units.Dimension]string{
	units.Pressure:           "bar",
	units.PressureDifference: "bar(d)",
	units.Stress:             "MPa",
	units.Temperature:        "degC",
	units.RotationalSpeed:    "rpm",
	units.Angle:              "deg",
	units.EnergyPerVolume:    "kJ/m3",
}

// UnitFor is the unit a value of d shows in when nothing else is chosen,
// such as a derived value without a [show] unit: its coherent SI unit, or
// the one the workshop reads it in (bar, MPa, degC, rpm, deg, kJ/m3); in a
// block written in US customary units, that unit's customary counterpart
// (ft, psi, psid, degF, hp, lbf ft). A temperature interval is in K, or
// degR in customary units: degC and degF always mean points.
func UnitFor(d units.Dimension, customary bool) string {
	unit, ok := unitFor[d]
	if !ok {
		unit = units.DefaultUnit(d)
	}
	if !customary {
		return unit
	}
	if d == units.TemperatureDifference {
		return "degR"
	}
	return units.CustomaryFor(unit)
}

// DifferenceUnit is the unit that shows a pressure difference for a
// pressure unit, so that a difference is never read back as gauge: "bar"
// and "bar(g)" give "bar(d)", "psi" gives "psi(d)". A unit with no
// difference form, or of another dimension, is returned as it is.
func DifferenceUnit(unit string) string {
	u, err := units.LookupUnit(unit)
	if err != nil || u.Dim != units.Pressure || u.Ref == units.Absolute {
		return unit
	}
	if d, ok := units.Known(strings.TrimSuffix(u.Symbol, "(g)") + "(d)"); ok {
		return d.Symbol
	}
	return unit
}
