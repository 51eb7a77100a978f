package units

import "math"

// FromSI converts si, an SI value of dimension dim, to the unit spelled
// unit. A pressure (dim Pressure) is absolute in SI: gauge and unmarked
// units subtract ambient (Pa), absolute units do not, vacuum units read
// ambient minus it. A normal volume flow unit takes si as already at its
// reference state (see NormalFlow). Pressure and Stress
// units are interchangeable, but a stress takes no (a) or (g) mark;
// temperature units serve for a TemperatureDifference, without offset.
// A unit of another dimension, or a result that is not finite, is an error.
func FromSI(si float64, dim Dimension, unit string, ambient float64) (float64, error) {
	u, err := LookupUnit(unit)
	if err != nil {
		return 0, err
	}
	if !dim.valid() {
		return 0, newError(unit, ": cannot show unknown "+dim.String())
	}
	difference, problem := readAs(u, dim)
	if problem != "" {
		return 0, newError(unit, problem)
	}
	if dim == Pressure && u.Ref != Absolute {
		// A gauge pressure within rounding noise of ambient is zero, not
		// "6.6e-12 bar".
		if math.Abs(si-ambient) <= 1e-12*math.Abs(ambient) {
			si = ambient
		}
		si -= ambient
		if u.Ref == Vacuum {
			si = -si
		}
	}
	if !finite(si) {
		return 0, newError(unit, ": the value to show is not a finite number")
	}
	// Likewise a temperature at a scale's zero: 32 degF is 273.15000000000003 K,
	// which is 0 degC, not "5.68e-14 degC".
	if !difference && u.Offset != 0 && math.Abs(si-u.Offset) <= 1e-12*u.Offset {
		si = u.Offset
	}
	v := u.fromSI(si, difference)
	if !finite(v) {
		return 0, newError(unit, ": the value is out of range in this unit")
	}
	return v, nil
}

// finite reports whether v is neither NaN nor infinite.
func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
