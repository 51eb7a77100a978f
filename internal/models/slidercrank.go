package models

import "math"

// sliderCrank is the exact kinematics of a piston driven by a crank of
// radius r through a connecting rod of length l (l > r), the piston's line
// of stroke passing through the crank axis. Angles are crank angles in
// radians from top dead centre (TDC); positions are the piston's travel
// away from TDC.
type sliderCrank struct {
	r, l float64
}

// rodRoot returns sqrt(l² − r² sin² θ), the projection of the rod on the
// line of stroke.
func (g sliderCrank) rodRoot(sin float64) float64 {
	return math.Sqrt(g.l*g.l - g.r*g.r*sin*sin)
}

// position returns the piston's travel from TDC at crank angle theta:
// x = r(1 − cos θ) + l − sqrt(l² − r² sin² θ).
func (g sliderCrank) position(theta float64) float64 {
	sin := math.Sin(theta)
	half := math.Sin(theta / 2)
	// 1 − cos θ = 2 sin²(θ/2) and l − S = r² sin² θ / (l + S) keep full
	// precision near the dead centres.
	rs := g.r * sin
	return 2*g.r*half*half + rs*rs/(g.l+g.rodRoot(sin))
}

// motion returns position(theta) and velocity(theta), the same numbers,
// with the sine and the root they share worked out once.
func (g sliderCrank) motion(theta float64) (x, dx float64) {
	sin, cos := math.Sincos(theta)
	half := math.Sin(theta / 2)
	root := g.rodRoot(sin)
	rs := g.r * sin
	return 2*g.r*half*half + rs*rs/(g.l+root), g.r * sin * (1 + g.r*cos/root)
}

// velocity returns dx/dθ = r sin θ (1 + r cos θ / sqrt(l² − r² sin² θ)).
func (g sliderCrank) velocity(theta float64) float64 {
	sin, cos := math.Sincos(theta)
	return g.r * sin * (1 + g.r*cos/g.rodRoot(sin))
}

// acceleration returns d²x/dθ² =
// r cos θ + r² cos 2θ / S + r⁴ sin² θ cos² θ / S³ with S = sqrt(l² − r² sin² θ).
func (g sliderCrank) acceleration(theta float64) float64 {
	sin, cos := math.Sincos(theta)
	s := g.rodRoot(sin)
	r2 := g.r * g.r
	sc := sin * cos
	return g.r*cos + r2*(cos*cos-sin*sin)/s + r2*r2*sc*sc/(s*s*s)
}

// indicatorCycle is the ideal indicator cycle of one cylinder: re-expansion
// of the clearance gas from the top pressure along p·V^n = const until it
// reaches the inlet pressure, suction at the inlet pressure, compression
// from bottom dead centre along p·V^n = const until it reaches the
// discharge pressure, delivery at the discharge pressure. When the
// dead-head pressure p1·CR^n does not exceed the discharge pressure the
// valves never open and the trapped gas runs up and down one polytrope.
type indicatorCycle struct {
	crank     sliderCrank
	area      float64 // piston area, m2
	clearance float64 // clearance volume, m3
	p1, p2    float64 // inlet and discharge pressure, Pa absolute
	n         float64 // polytropic index, compression and re-expansion
	ambient   float64 // crankcase pressure behind the piston, Pa absolute
	bottom    float64 // volume at bottom dead centre, m3
	top       float64 // pressure at TDC: p2, or the dead-head pressure when lower
	// Volumes where re-expansion reaches p1 and compression reaches p2:
	// beyond them the pressure is flat and needs no power law.
	suctionFrom, deliveryFrom float64
}

// newIndicatorCycle completes c with its volume at bottom dead centre and
// its pressure at TDC.
func newIndicatorCycle(c indicatorCycle) *indicatorCycle {
	c.bottom = c.clearance + 2*c.crank.r*c.area
	c.top = math.Min(c.p2, c.p1*math.Pow(c.bottom/c.clearance, c.n))
	c.suctionFrom = c.clearance * math.Pow(c.top/c.p1, 1/c.n)
	c.deliveryFrom = c.bottom * math.Pow(c.p1/c.p2, 1/c.n)
	return &c
}

// volume returns the gas volume in the cylinder at crank angle theta.
func (c *indicatorCycle) volume(theta float64) float64 {
	return c.clearance + c.area*c.crank.position(theta)
}

// pressure returns the cylinder pressure (Pa absolute) at crank angle
// theta; the suction stroke runs from 0 to π, compression from π to 2π.
func (c *indicatorCycle) pressure(theta float64) float64 {
	return c.pressureAt(theta, c.volume(theta))
}

// pressureAt is pressure(theta) given the volume v there.
func (c *indicatorCycle) pressureAt(theta, v float64) float64 {
	if firstHalf(theta) {
		if v >= c.suctionFrom {
			return c.p1
		}
		return math.Max(c.top*math.Pow(c.clearance/v, c.n), c.p1)
	}
	if v <= c.deliveryFrom {
		return c.p2
	}
	return math.Min(c.p1*math.Pow(c.bottom/v, c.n), c.p2)
}

// gasTorque returns the load torque that the gas on the piston puts on the
// crank at theta, by virtual work: T = −(p − p_amb)·A·dx/dθ. It is positive
// when the crank must drive the piston (compression and delivery).
func (c *indicatorCycle) gasTorque(theta float64) float64 {
	x, dx := c.crank.motion(theta)
	return -(c.pressureAt(theta, c.clearance+c.area*x) - c.ambient) * c.area * dx
}

// firstHalf reports whether crank angle theta falls in the first half of
// its revolution, (theta mod 2π) ≤ π; a revolution's own angles need no
// remainder, the costliest step of a sample.
func firstHalf(theta float64) bool {
	if theta >= 0 && theta < 2*math.Pi {
		return theta <= math.Pi
	}
	return math.Mod(theta, 2*math.Pi) <= math.Pi
}

// inertiaTorque returns the load torque needed to accelerate a
// reciprocating mass m at crank speed omega (rad/s):
// T = m·ω²·(d²x/dθ²)·(dx/dθ). It averages to zero over a revolution.
func (c *indicatorCycle) inertiaTorque(theta, mass, omega float64) float64 {
	return mass * omega * omega * c.crank.acceleration(theta) * c.crank.velocity(theta)
}
