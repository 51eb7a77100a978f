package units

import "math"

// FromSI converts si, an SI value of dimension dim, to the unit spelled
// unit. A pressure (dim Pressure) is absolute in SI: gauge and unmarked
// units subtract ambient (Pa), absolute units do not. Pressure and Stress
// units are interchangeable, but a stress takes no (a) or (g) mark;
// temperature units serve for a TemperatureDifference, without offset. A
// flow of standard or normal air (SCFM, Nl/min) shows the free-air flow si
// at ambient and 20 °C as the reference air it is, by mass. A spelling that names one unit per dimension
// ("ft-lb") is read as dim. A unit of another dimension, or a result that
// is not finite, is an error.
func FromSI(si float64, dim Dimension, unit string, ambient float64) (float64, error) {
	u, difference, err := unitAs(unit, dim)
	if err != nil {
		return 0, err
	}
	if dim == Pressure && u.Ref != Absolute {
		// A gauge pressure within rounding noise of ambient is zero, not
		// "6.6e-12 bar".
		if math.Abs(si-ambient) <= 1e-12*math.Abs(ambient) {
			si = ambient
		}
		si -= ambient
	}
	if !finite(si) {
		return 0, newError(unit, ": the value to show is not a finite number")
	}
	// Likewise a temperature at a scale's zero: 32 degF is 273.15000000000003 K,
	// which is 0 degC, not "5.68e-14 degC".
	if !difference && u.Offset != 0 && math.Abs(si-u.Offset) <= 1e-12*u.Offset {
		si = u.Offset
	}
	if u.Standard() {
		si /= u.freeAirPerReference(ambient)
	}
	v := u.fromSI(si, difference)
	if !finite(v) {
		return 0, newError(unit, ": the value is out of range in this unit")
	}
	return v, nil
}

// ToSI converts v, written in the unit spelled unit, to the SI value of
// dimension dim: the inverse of FromSI (a gauge or unmarked pressure adds
// ambient, Pa).
func ToSI(v float64, dim Dimension, unit string, ambient float64) (float64, error) {
	u, difference, err := unitAs(unit, dim)
	if err != nil {
		return 0, err
	}
	si := u.toSI(v, difference)
	switch {
	case dim == Pressure && u.Ref != Absolute:
		si += ambient
	case u.Standard():
		si *= u.freeAirPerReference(ambient)
	}
	return si, nil
}

// unitAs is the unit spelled unit read as dim, and whether it reads a
// difference (see readAs).
func unitAs(unit string, dim Dimension) (Unit, bool, error) {
	if !dim.valid() {
		return Unit{}, false, newError(unit, ": cannot convert unknown "+dim.String())
	}
	u, err := LookupUnitAs(unit, dim)
	if err != nil {
		return Unit{}, false, err
	}
	difference, problem := readAs(u, dim)
	if problem != "" {
		return Unit{}, false, newError(unit, problem)
	}
	return u, difference, nil
}

// finite reports whether v is neither NaN nor infinite.
func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
