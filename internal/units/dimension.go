package units

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
)
