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

// Absolute returns the value at the ambient pressure (Pa): a pressure
// absolute, adding ambient when the unit was gauge or unmarked (or a
// vacuum reading, whose Value is negative); a flow of standard air as free
// air at ambient and 20 °C. For other quantities it returns Value.
func (q Quantity) Absolute(ambient float64) float64 {
	switch {
	case q.Dim == Pressure && q.Unit.Ref != Absolute:
		return q.Value + ambient
	case q.Unit.Standard:
		return q.Value * standardPressure / ambient
	}
	return q.Value
}
