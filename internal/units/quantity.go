package units

// Quantity is a parsed value.
type Quantity struct {
	// Value is in SI units. A pressure is the number in Pa as written, gauge
	// or absolute according to Unit.Ref; use Absolute for the absolute value.
	Value float64
	Dim   Dimension // the dimension it was read as
	Unit  Unit      // the unit written
	Text  string    // the original text, trimmed
	// Number is the number as written, in ASCII ("22.5", "-1e3"), for
	// callers that need its written precision.
	Number string
}

// Absolute returns the absolute value of a pressure, adding the ambient
// pressure (Pa) when the unit was gauge, unmarked or unsettled, and
// subtracting the value from it for a vacuum unit. For other dimensions it
// returns Value.
func (q Quantity) Absolute(ambient float64) float64 {
	if q.Dim != Pressure {
		return q.Value
	}
	switch q.Unit.Ref {
	case Absolute:
		return q.Value
	case Vacuum:
		return ambient - q.Value
	}
	return q.Value + ambient
}
