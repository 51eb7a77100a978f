package units

// readAs checks that a value written in u can be read as the dimension
// want. It returns whether the value is a difference (a temperature unit
// read as a TemperatureDifference drops its offset), or a message fragment,
// starting with " is", that says why u does not fit.
//
// Pressure and Stress units are interchangeable, but a stress is a
// difference and so takes no gauge or absolute mark. Temperature units
// serve as TemperatureDifference units.
func readAs(u Unit, want Dimension) (difference bool, problem string) {
	switch {
	case u.Dim == want:
		return false, ""
	case want == Stress && u.Dim == Pressure:
		switch u.Ref {
		case Gauge:
			return false, " is a gauge pressure; " + stressTakes()
		case Absolute:
			return false, " is an absolute pressure; " + stressTakes()
		case Vacuum:
			return false, " is a vacuum reading; " + stressTakes()
		}
		return false, ""
	case want == Pressure && u.Dim == Stress:
		return false, ""
	case want == TemperatureDifference && u.Dim == Temperature:
		return true, ""
	}
	return false, " is " + u.Dim.article() + "; takes " + want.article() + " (" + want.Examples() + ")"
}

// stressTakes says what a stress takes, after a marked pressure unit.
func stressTakes() string {
	return "a stress is a difference: use an unmarked unit (" + Stress.Examples() + ")"
}

// fits reports whether u can be read as want; see readAs.
func fits(u Unit, want Dimension) bool {
	_, problem := readAs(u, want)
	return problem == ""
}
