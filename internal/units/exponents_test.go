package units

import "testing"

// TestExponentsDeclared checks that every dimension has its exponents, and
// that the dimensions Named chooses among are the ones that share them.
func TestExponentsDeclared(t *testing.T) {
	for d := range Dimension(len(dimensions)) {
		if ExponentsOf(d).IsZero() && d != Dimensionless && d != Angle {
			t.Errorf("%s: no exponents", d)
		}
	}
	inOrder := map[Dimension]bool{}
	for _, d := range namedOrder {
		if inOrder[d] {
			t.Errorf("%s twice in namedOrder", d)
		}
		inOrder[d] = true
	}
	for d := range Dimension(len(dimensions)) {
		if inOrder[d] == IsPoint(d) {
			t.Errorf("%s: in namedOrder %v, a point %v; every dimension but the points belongs", d, inOrder[d], IsPoint(d))
		}
	}
}

// TestExponentsAlgebra checks products, quotients and powers of dimensions
// against their SI definitions (SI Brochure, 9th ed., Table 4: coherent
// derived units; from memory).
func TestExponentsAlgebra(t *testing.T) {
	e := ExponentsOf
	for _, c := range []struct {
		what string
		got  Exponents
		want Dimension
	}{
		{"N = kg m/s2: force is mass times acceleration", e(Mass).Times(e(Acceleration)), Force},
		{"Pa = N/m2: force over area", e(Force).Over(e(Area)), PressureDifference},
		{"J = Pa m3: pressure times volume", e(Pressure).Times(e(Volume)), Energy},
		{"W = J/s: energy over time", e(Energy).Over(e(Time)), Power},
		{"J/m3 = W/(m3/s): power over volume flow", e(Power).Over(e(VolumeFlow)), PressureDifference},
		{"m/s = m × 1/s: radius times rotational speed (rad counts as one)", e(Length).Times(e(RotationalSpeed)), Velocity},
		{"kg/s = kg/m3 × m3/s", e(Density).Times(e(VolumeFlow)), MassFlow},
		{"J/kg = W/(kg/s)", e(Power).Over(e(MassFlow)), SpecificEnergy},
		{"kg m2 = kg × m2", e(Mass).Times(e(Area)), Inertia},
		{"N/m = N/m", e(Force).Over(e(Length)), Stiffness},
		{"rad = 1/s × s", e(RotationalSpeed).Times(e(Time)), Dimensionless},
		{"K = K × 1", e(TemperatureDifference).Times(e(Dimensionless)), TemperatureDifference},
	} {
		if got, ok := Named(c.got); !ok || got != c.want {
			t.Errorf("%s: %v gives %v (%v), want %v", c.what, c.got, got, ok, c.want)
		}
	}
	if a, ok := e(Area).Power(1, 2); !ok || a != e(Length) {
		t.Errorf("square root of an area: %v, %v; want a length", a, ok)
	}
	if _, ok := e(Volume).Power(1, 2); ok {
		t.Error("square root of a volume: no error")
	}
	if v, ok := e(Length).Power(3, 1); !ok || v != e(Volume) {
		t.Errorf("cube of a length: %v, %v", v, ok)
	}
	if _, ok := e(Length).Power(1000, 1); ok {
		t.Error("length to the 1000th: no error")
	}
	if _, ok := Named(e(Pressure).Over(e(Temperature))); ok {
		t.Error("Pa/K is named, want none")
	}
}

func TestExponentsString(t *testing.T) {
	for _, c := range []struct {
		e    Exponents
		want string
	}{
		{Exponents{}, ""},
		{ExponentsOf(Length), "m"},
		{ExponentsOf(Pressure), "kg/(m s2)"},
		{ExponentsOf(RotationalSpeed), "1/s"},
		{ExponentsOf(SpecificEnergy).Over(ExponentsOf(TemperatureDifference)), "m2/(s2 K)"},
		{ExponentsOf(Inertia), "m2 kg"},
		{ExponentsOf(Density), "kg/m3"},
	} {
		if got := c.e.String(); got != c.want {
			t.Errorf("%v: %q, want %q", c.e, got, c.want)
		}
	}
}
