package units

import (
	"strconv"
	"strings"
)

// Dimension is the kind of a quantity. Kinds that share SI base dimensions
// (pressure and stress, torque and energy) are kept apart on purpose: a
// stress is never gauge, and a torque is never shown in joules.
type Dimension int

// The dimensions that specgen parses and formats.
const (
	Dimensionless Dimension = iota
	Length
	Area
	Volume
	VolumeFlow
	Pressure    // absolute in SI; parsed gauge unless marked absolute
	Stress      // a pressure difference, never gauge or absolute
	Temperature // absolute, kelvin in SI
	TemperatureDifference
	RotationalSpeed // rad/s in SI
	Angle
	Force
	Torque
	Power
	Energy
	Mass
	Density
	Stiffness
	Time
	Velocity
	Acceleration
	MassFlow
	SpecificEnergy
	Inertia
	PressureDifference // the difference of two pressures: shown marked "bar(d)", "psid", never gauge
	EnergyPerVolume    // J/m3 in SI: the energy a volume of air costs (power over flow)
	// SpecificPower is shaft power per unit of volume flow delivered, J/m3
	// in SI; kept apart from pressure, which has the same base units.
	SpecificPower
	Throughput // a gas flow as pressure times volume per time, such as a leak
)

// dimensionInfo holds the words used for a dimension in messages.
type dimensionInfo struct {
	name     string // "length", "volume flow"
	examples string // common units, "mm, cm, m, in, ft"
	si       string // the SI unit symbol
}

var dimensions = [...]dimensionInfo{
	Dimensionless:         {"dimensionless number", `a plain number or %`, ""},
	Length:                {"length", "mm, cm, m, in, ft", "m"},
	Area:                  {"area", "mm2, cm2, m2, in2", "m2"},
	Volume:                {"volume", "cm3, L, m3, in3, ft3", "m3"},
	VolumeFlow:            {"volume flow", "L/min, L/s, m3/h, m3/min, cfm", "m3/s"},
	Pressure:              {"pressure", "kPa, MPa, bar, mbar, psi, bar(a), psia, atm, torr, inHg, mmHg", "Pa"},
	Stress:                {"stress", "MPa, N/mm2, psi, ksi", "Pa"},
	Temperature:           {"temperature", "degC, degF, K", "K"},
	TemperatureDifference: {"temperature difference", "K, degC, degF", "K"},
	RotationalSpeed:       {"rotational speed", "rpm, rev/s, rad/s", "rad/s"},
	Angle:                 {"angle", "deg, rad", "rad"},
	Force:                 {"force", "N, kN, lbf, kgf", "N"},
	Torque:                {"torque", "N m, N mm, kN m, lbf in, lbf ft", "N m"},
	Power:                 {"power", "W, kW, hp", "W"},
	Energy:                {"energy", "J, kJ, Wh, kWh", "J"},
	Mass:                  {"mass", "g, kg, lb", "kg"},
	Density:               {"density", "kg/m3, g/cm3", "kg/m3"},
	Stiffness:             {"stiffness", "N/mm, N/m, lbf/in", "N/m"},
	Time:                  {"time", "ms, s, min, h", "s"},
	Velocity:              {"velocity", "m/s, ft/min", "m/s"},
	Acceleration:          {"acceleration", "m/s2, ft/s2", "m/s2"},
	MassFlow:              {"mass flow", "kg/s, g/s, kg/h", "kg/s"},
	SpecificEnergy:        {"specific energy", "J/kg, kJ/kg", "J/kg"},
	Inertia:               {"moment of inertia", "kg m2, kg mm2", "kg m2"},
	PressureDifference:    {"pressure difference", "bar(d), mbar(d), kPa(d), MPa(d), psid", "Pa(d)"},
	EnergyPerVolume:       {"energy per volume", "kJ/m3, J/L, kWh/m3", "J/m3"},
	SpecificPower:         {"specific power", "kW/(m3/min), W/(L/min), hp/cfm", "W/(m3/s)"},
	Throughput:            {"gas throughput", "mbar L/s, Pa m3/s, Torr L/s", "Pa m3/s"},
}

// valid reports whether d is one of the declared dimensions.
func (d Dimension) valid() bool { return d >= 0 && int(d) < len(dimensions) }

// String returns the name of d in words, e.g. "volume flow".
func (d Dimension) String() string {
	if !d.valid() {
		return "Dimension(" + strconv.Itoa(int(d)) + ")"
	}
	return dimensions[d].name
}

// Examples returns common units of d for messages, e.g. "mm, cm, m, in, ft".
// It is empty for an undeclared dimension.
func (d Dimension) Examples() string {
	if !d.valid() {
		return ""
	}
	return dimensions[d].examples
}

// Article returns d's name preceded by "a" or "an": "an energy", "a length".
func (d Dimension) Article() string {
	name := d.String()
	if strings.ContainsRune("aeiou", rune(name[0])) {
		return "an " + name
	}
	return "a " + name
}

// DefaultUnit returns the SI unit symbol to show d in when nothing else is
// chosen, e.g. "m", "Pa", "K". For Pressure it is "Pa", which, like every
// unmarked pressure unit, reads gauge; Dimensionless gives "".
func DefaultUnit(d Dimension) string {
	if !d.valid() {
		return ""
	}
	return dimensions[d].si
}
