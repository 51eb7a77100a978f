package units

// readAs checks that a value written in u can be read as the dimension
// want. It returns whether the value is a difference (a temperature unit
// read as a TemperatureDifference drops its offset), or a message fragment,
// starting with " is", that says why u does not fit.
//
// Pressure and Stress units are interchangeable, but a stress is a
// difference and so takes no gauge or absolute mark; neither does a
// PressureDifference, which also takes its own "(d)" units. Temperature
// units serve as TemperatureDifference units.
func readAs(u Unit, want Dimension) (difference bool, problem string) {
	switch {
	case u.Dim == want:
		return false, ""
	case (want == Stress || want == PressureDifference) && u.Dim == Pressure:
		// Both are differences: an unmarked pressure unit reads as one (a
		// claim on a difference), a mark contradicts it.
		switch u.Ref {
		case Gauge:
			return false, " is a gauge pressure; " + differenceTakes(want)
		case Absolute:
			return false, " is an absolute pressure; " + differenceTakes(want)
		}
		return false, ""
	case want == Pressure && u.Dim == Stress:
		return false, ""
	case want == TemperatureDifference && u.Dim == Temperature:
		return true, ""
	}
	return false, " is " + u.Dim.Article() + "; takes " + want.Article() + " (" + want.Examples() + ")"
}

// differenceTakes says what a stress or a pressure difference takes,
// after a marked pressure unit.
func differenceTakes(want Dimension) string {
	if want == Stress {
		return "a stress is a difference: use an unmarked unit (" + Stress.Examples() + ")"
	}
	return "takes a pressure difference (" + PressureDifference.Examples() + ")"
}

// fits reports whether u can be read as want; see readAs.
func fits(u Unit, want Dimension) bool {
	_, problem := readAs(u, want)
	return problem == ""
}
