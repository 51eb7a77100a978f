package units

// displayUnits are the units a value shows in when nothing else is chosen,
// for the dimensions the workshop does not read in their coherent SI unit:
// pressures in bar, stresses in MPa, temperatures on the Celsius scale,
// speeds in rpm, angles in degrees, and an energy per volume in kJ/m3
// (numerically J/L), whose coherent J/m3 runs to six figures for a
// workshop compressor.
var displayUnits = map[Dimension]string{
	Pressure:           "bar",
	PressureDifference: "bar(d)",
	Stress:             "MPa",
	Temperature:        "degC",
	RotationalSpeed:    "rpm",
	Angle:              "deg",
	EnergyPerVolume:    "kJ/m3",
}

// DisplayUnit is the unit a value of d shows in when nothing else is
// chosen: its coherent SI unit, or the one the workshop reads it in (bar,
// MPa, degC, rpm, deg, kJ/m3); in a block written in US customary units,
// that unit's customary counterpart (ft, psi, psid, degF, hp, lbf ft). A
// temperature interval is in K, or degR in customary units; degC and degF
// always mean points.
func DisplayUnit(d Dimension, customary bool) string {
	unit, ok := displayUnits[d]
	if !ok {
		unit = DefaultUnit(d)
	}
	if !customary {
		return unit
	}
	if d == TemperatureDifference {
		return "degR"
	}
	return CustomaryFor(unit)
}

// DifferenceUnit returns the unit that shows a pressure difference for a
// pressure unit: "bar" and "bar(g)" give "bar(d)", "psi" gives "psi(d)".
// A unit with no difference form, or of another dimension, is returned as
// it is.
func DifferenceUnit(unit string) string {
	u, err := LookupUnit(unit)
	if err != nil || u.Dim != Pressure || u.Ref == Absolute {
		return unit
	}
	base, _ := pressureMark(u.Symbol)
	if d, err := LookupUnit(base + "(d)"); err == nil {
		return d.Symbol
	}
	return unit
}
