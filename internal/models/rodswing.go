package models

import "math"

// rodSwing is the connecting rod swinging past the bottom edge of the
// cylinder wall: a slider crank with the crank axis at the origin and the
// line of stroke along +y, a rod of width w in the plane of swing, and the
// bore's bottom inner corners at (±D/2, h).
type rodSwing struct {
	crank sliderCrank
	bore  float64 // D
	width float64 // w
	h     float64 // height of the liner's bottom edge above the crank axis
}

// rodSwingSamples is the number of crank angles sampled per revolution
// before the least clearance is refined (0.1° steps).
const rodSwingSamples = cycleSteps

// ends returns the crank pin and the wrist pin at crank angle theta.
func (s rodSwing) ends(theta float64) (cx, cy, wy float64) {
	sin, cos := math.Sincos(theta)
	r := s.crank.r
	return r * sin, r * cos, r*cos + s.crank.rodRoot(sin)
}

// clearance returns the distance from the nearer bottom corner of the
// bore to the rod's outline at theta, negative where they overlap, and
// whether the rod's centreline crosses the corners' height there.
func (s rodSwing) clearance(theta float64) (float64, bool) {
	cx, cy, wy := s.ends(theta)
	if s.h < cy || s.h > wy {
		return 0, false
	}
	d := math.Min(segmentDistance(s.bore/2, s.h, cx, cy, 0, wy), segmentDistance(-s.bore/2, s.h, cx, cy, 0, wy))
	return d - s.width/2, true
}

// segmentDistance is the distance from (px, py) to the segment from
// (ax, ay) to (bx, by).
func segmentDistance(px, py, ax, ay, bx, by float64) float64 {
	dx, dy := bx-ax, by-ay
	u := ((px-ax)*dx + (py-ay)*dy) / (dx*dx + dy*dy)
	u = math.Max(0, math.Min(1, u))
	return math.Hypot(px-(ax+u*dx), py-(ay+u*dy))
}

// least returns the least clearance over a revolution and the crank angle
// in [0, 2π) where it occurs; ok is false when the rod's centreline never
// crosses the corners' height. The samples every 0.1° are refined by
// golden-section search between the neighbours of the least one, and the
// angles where the crank pin or the wrist pin passes that height (where
// the counted stretch of the revolution begins or ends) are taken too.
func (s rodSwing) least() (clear, at float64, ok bool) {
	clear = math.Inf(1)
	try := func(theta float64) {
		if c, counts := s.clearance(theta); counts && c < clear {
			clear, at, ok = c, theta, true
		}
	}
	step := 2 * math.Pi / rodSwingSamples
	best := -1
	for i := range rodSwingSamples {
		before := clear
		try(step * float64(i))
		if clear < before {
			best = i
		}
	}
	for _, theta := range s.crossings() {
		try(theta)
	}
	if best >= 0 {
		lo, hi := step*float64(best-1), step*float64(best+1)
		f := func(theta float64) float64 {
			c, counts := s.clearance(theta)
			if !counts {
				return math.Inf(1)
			}
			return c
		}
		try(goldenMin(f, lo, hi))
	}
	return clear, math.Mod(at+2*math.Pi, 2*math.Pi), ok
}

// crossings are the crank angles at which the crank pin or the wrist pin
// is at the corners' height.
func (s rodSwing) crossings() []float64 {
	var out []float64
	r, l := s.crank.r, s.crank.l
	if math.Abs(s.h) <= r {
		a := math.Acos(s.h / r)
		out = append(out, a, 2*math.Pi-a)
	}
	// The wrist pin is at y = R·cos θ + sqrt(L² − R²·sin² θ); squaring
	// (y − R·cos θ)² = L² − R² + R²·cos² θ gives cos θ = (y² + R² − L²)/(2·R·y).
	if y := s.h; y > 0 {
		if c := (y*y + r*r - l*l) / (2 * r * y); math.Abs(c) <= 1 {
			a := math.Acos(c)
			out = append(out, a, 2*math.Pi-a)
		}
	}
	return out
}

// goldenMin returns where f, unimodal on [lo, hi], is least, by
// golden-section search to a micro-radian.
func goldenMin(f func(float64) float64, lo, hi float64) float64 {
	const inv = 0.6180339887498949 // (√5 − 1)/2
	a, b := lo+(1-inv)*(hi-lo), lo+inv*(hi-lo)
	fa, fb := f(a), f(b)
	for hi-lo > 1e-6 {
		if fa <= fb {
			hi, b, fb = b, a, fa
			a = lo + (1-inv)*(hi-lo)
			fa = f(a)
		} else {
			lo, a, fa = a, b, fb
			b = lo + inv*(hi-lo)
			fb = f(b)
		}
	}
	return (lo + hi) / 2
}
