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
// vacuum reading, whose Value is negative; plain hPa too, which callers
// that want it absolute take as Value); a flow of standard or normal air as
// free air at ambient and 20 °C, by mass. For other quantities it returns
// Value.
func (q Quantity) Absolute(ambient float64) float64 {
	switch {
	case q.Dim == Pressure && q.Unit.Ref != Absolute:
		return q.Value + ambient
	case q.Unit.Standard():
		return q.Value * q.Unit.freeAirPerReference(ambient)
	}
	return q.Value
}

// freeAirPerReference is the volume of free air at ambient (Pa) and 20 °C
// that one volume of u's reference air is, by mass (ideal gas: V ∝ T/p).
func (u Unit) freeAirPerReference(ambient float64) float64 {
	return u.Reference.Pressure / ambient * freeAirTemperature / u.Reference.Temperature
}

// AsFreeAir takes si, a volume flow of air measured at the state at, by
// mass to free air at ambient (Pa) and 20 °C: the SI value that FromSI
// shows in a standard unit as the flow it is.
func AsFreeAir(si float64, at GasState, ambient float64) float64 {
	return si * at.Pressure / ambient * freeAirTemperature / at.Temperature
}
