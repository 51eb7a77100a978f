package units

import (
	"strconv"
	"strings"
)

// Exponents are the powers of the SI base units metre, kilogram, second and
// kelvin that a quantity is made of: a pressure is m⁻¹·kg·s⁻². The radian
// counts as one, as in the SI, so an angle has the exponents of a plain
// number and a rotational speed those of 1/s.
type Exponents [4]int8

// The base units, in the order of Exponents.
var baseSymbols = [len(Exponents{})]string{"m", "kg", "s", "K"}

// exponentsOf holds the exponents of every declared dimension; a test checks
// that no dimension other than the plain number and the angle is left zero.
var exponentsOf = [len(dimensions)]Exponents{
	Dimensionless:         {},
	Length:                {1, 0, 0, 0},
	Area:                  {2, 0, 0, 0},
	Volume:                {3, 0, 0, 0},
	VolumeFlow:            {3, 0, -1, 0},
	Pressure:              {-1, 1, -2, 0},
	Stress:                {-1, 1, -2, 0},
	Temperature:           {0, 0, 0, 1},
	TemperatureDifference: {0, 0, 0, 1},
	RotationalSpeed:       {0, 0, -1, 0},
	Angle:                 {},
	Force:                 {1, 1, -2, 0},
	Torque:                {2, 1, -2, 0},
	Power:                 {2, 1, -3, 0},
	Energy:                {2, 1, -2, 0},
	Mass:                  {0, 1, 0, 0},
	Density:               {-3, 1, 0, 0},
	Stiffness:             {0, 1, -2, 0},
	Time:                  {0, 0, 1, 0},
	Velocity:              {1, 0, -1, 0},
	Acceleration:          {1, 0, -2, 0},
	MassFlow:              {0, 1, -1, 0},
	SpecificEnergy:        {2, 0, -2, 0},
	Inertia:               {2, 1, 0, 0},
	PressureDifference:    {-1, 1, -2, 0},
	EnergyPerVolume:       {-1, 1, -2, 0},
	SpecificPower:         {-1, 1, -2, 0},
	Throughput:            {2, 1, -3, 0},
}

// namedOrder is the order in which Named tries the dimensions that share
// their exponents: a plain number before an angle, an energy before a
// torque, a pressure difference before a stress and an energy per volume.
// Points on a scale (Pressure, Temperature) are left out: no product or
// quotient is one.
var namedOrder = []Dimension{
	Dimensionless, Length, Area, Volume, VolumeFlow, PressureDifference, Stress, EnergyPerVolume, SpecificPower,
	TemperatureDifference, RotationalSpeed, Angle, Force, Energy, Torque, Power, Throughput, Mass, Density,
	Stiffness, Time, Velocity, Acceleration, MassFlow, SpecificEnergy, Inertia,
}

// ExponentsOf returns the base-unit exponents of d (zero for an undeclared
// dimension).
func ExponentsOf(d Dimension) Exponents {
	if !d.valid() {
		return Exponents{}
	}
	return exponentsOf[d]
}

// Named returns the dimension that a product or quotient with exponents e
// is, or false when none is. Where several share e, the first of
// Dimensionless, Angle; Energy, Torque; PressureDifference, Stress,
// EnergyPerVolume is taken; a caller that knows better (a power over a
// rotational speed is a torque) chooses among them itself.
func Named(e Exponents) (Dimension, bool) {
	for _, d := range namedOrder {
		if exponentsOf[d] == e {
			return d, true
		}
	}
	return 0, false
}

// IsPoint reports whether d is a point on a scale, an absolute pressure or
// temperature, whose differences are quantities of another dimension.
func IsPoint(d Dimension) bool { return d == Pressure || d == Temperature }

// Times returns the exponents of a product.
func (e Exponents) Times(o Exponents) Exponents {
	for i := range e {
		e[i] += o[i]
	}
	return e
}

// Over returns the exponents of a quotient.
func (e Exponents) Over(o Exponents) Exponents {
	for i := range e {
		e[i] -= o[i]
	}
	return e
}

// Power returns the exponents of e raised to num/den, or false when a
// power comes out fractional or too large: the square root of a volume is
// no quantity.
func (e Exponents) Power(num, den int) (Exponents, bool) {
	if den <= 0 {
		return e, false
	}
	for i, x := range e {
		p := int(x) * num
		if p%den != 0 {
			return e, false
		}
		p /= den
		if p < -100 || p > 100 {
			return e, false
		}
		e[i] = int8(p)
	}
	return e, true
}

// IsZero reports whether e is a plain number (or an angle).
func (e Exponents) IsZero() bool { return e == Exponents{} }

// String spells e from the base unit symbols, positive powers first, e.g.
// "kg/(m s2)", "m2/(s2 K)", "1/s"; "" for a plain number.
func (e Exponents) String() string {
	var num, den []string
	for i, x := range e {
		part := baseSymbols[i]
		p := int(x)
		if p < 0 {
			p = -p
		}
		if p > 1 {
			part += strconv.Itoa(p)
		}
		switch {
		case x > 0:
			num = append(num, part)
		case x < 0:
			den = append(den, part)
		}
	}
	top := strings.Join(num, " ")
	switch {
	case len(den) == 0:
		return top
	case top == "":
		top = "1"
	}
	if len(den) == 1 {
		return top + "/" + den[0]
	}
	return top + "/(" + strings.Join(den, " ") + ")"
}
