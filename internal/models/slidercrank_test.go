package models

import (
	"math"
	"path/filepath"
	"testing"

	"github.com/BurntSushi/toml"

	"github.com/millrace-workshop/specgen/internal/units"
)

// sliderCrankCase is testdata/reference/tables/slider-crank-*.toml:
// piston positions worked by hand.
type sliderCrankCase struct {
	Source      string
	FromMemory  bool   `toml:"from_memory"`
	CrankRadius string `toml:"crank_radius"`
	RodLength   string `toml:"rod_length"`
	Tolerance   string
	Point       []struct {
		Angle, Position string
	}
}

func mustParse(t *testing.T, s string, dim units.Dimension) float64 {
	t.Helper()
	q, err := units.Parse(s, dim)
	if err != nil {
		t.Fatalf("parse %q: %v", s, err)
	}
	return q.Value
}

func TestSliderCrankPosition(t *testing.T) {
	files, err := filepath.Glob("../../testdata/reference/tables/slider-crank-*.toml")
	if err != nil || len(files) == 0 {
		t.Fatalf("no slider-crank reference files: %v", err)
	}
	for _, f := range files {
		var c sliderCrankCase
		if _, err := toml.DecodeFile(f, &c); err != nil {
			t.Fatalf("%s: %v", f, err)
		}
		if c.Source == "" || len(c.Point) == 0 {
			t.Fatalf("%s: needs a source and points", f)
		}
		g := sliderCrank{r: mustParse(t, c.CrankRadius, units.Length), l: mustParse(t, c.RodLength, units.Length)}
		tol := mustParse(t, c.Tolerance, units.Length)
		for _, p := range c.Point {
			theta := mustParse(t, p.Angle, units.Angle)
			want := mustParse(t, p.Position, units.Length)
			if got := g.position(theta); math.Abs(got-want) > tol {
				t.Errorf("%s: x(%s) = %.12g m, want %s (± %s)", filepath.Base(f), p.Angle, got, p.Position, c.Tolerance)
			}
		}
	}
}

// TestSliderCrankDerivatives checks dx/dθ and d²x/dθ² against central
// finite differences of the position, whose truncation error is O(h²).
func TestSliderCrankDerivatives(t *testing.T) {
	for _, g := range []sliderCrank{{r: 0.016, l: 0.070}, {r: 0.05, l: 0.11}, {r: 0.01, l: 0.2}} {
		const h = 1e-4
		for deg := 0.0; deg < 360; deg += 7.5 {
			theta := deg * math.Pi / 180
			fd1 := (g.position(theta+h) - g.position(theta-h)) / (2 * h)
			if got := g.velocity(theta); math.Abs(got-fd1) > 1e-8*g.r {
				t.Errorf("R=%g L=%g θ=%g°: dx/dθ = %.10g, finite difference %.10g", g.r, g.l, deg, got, fd1)
			}
			fd2 := (g.velocity(theta+h) - g.velocity(theta-h)) / (2 * h)
			if got := g.acceleration(theta); math.Abs(got-fd2) > 1e-7*g.r {
				t.Errorf("R=%g L=%g θ=%g°: d²x/dθ² = %.10g, finite difference %.10g", g.r, g.l, deg, got, fd2)
			}
		}
	}
}

// cycleWork integrates a torque sampled at equal steps over one revolution
// (the trapezoidal rule on periodic samples: h times their sum).
func cycleWork(torque []float64) float64 {
	sum := 0.0
	for _, t := range torque {
		sum += t
	}
	return sum * 2 * math.Pi / float64(len(torque))
}

// TestIndicatorCycleWork integrates the sampled gas torque over a
// revolution, ∮T dθ = −∮(p − p_amb) dV, and compares it with the closed
// form n/(n−1)·p1·Vi·(r^((n−1)/n) − 1), Vi = (1 − c(r^(1/n) − 1))·Vs
// (p1·Vi·ln r for n = 1), to 1e-6 relative. The closed form with clearance
// is derived in Eastop & McConkey, Applied Thermodynamics, 5th ed., ch. 9
// (from memory), and is checked against their worked examples in
// testdata/reference/compressor.
func TestIndicatorCycleWork(t *testing.T) {
	g := sliderCrank{r: 0.016, l: 0.070}
	area := math.Pi / 4 * 0.028 * 0.028
	swept := area * 2 * g.r
	for _, n := range []float64{1, 1.0001, 1.15, 1.3, 1.4, 1.67} {
		for _, c := range []float64{0.02, 0.05, 0.12} {
			for _, r := range []float64{2, 4.5, 7.9} {
				ve := 1 - c*(math.Pow(r, 1/n)-1)
				if ve <= 0 {
					continue
				}
				cyc := newIndicatorCycle(indicatorCycle{crank: g, area: area, clearance: c * swept,
					p1: 95000, p2: 95000 * r, n: n, ambient: 101325})
				got := cycleWork(sampleRevolution(cycleSteps, cyc.gasTorque))
				want := polytropicWork(95000, ve*swept, r, n)
				if rel := math.Abs(got-want) / want; rel > 1e-6 {
					t.Errorf("n=%g c=%g r=%g: ∮T dθ = %.9g J, analytic %.9g J (rel. error %.2g)", n, c, r, got, want, rel)
				}
			}
		}
	}
}

// TestIndicatorCycleNoDelivery: with the discharge above the dead-head
// pressure the trapped gas runs up and down one polytrope and the cycle
// encloses no area.
func TestIndicatorCycleNoDelivery(t *testing.T) {
	g := sliderCrank{r: 0.016, l: 0.070}
	area := math.Pi / 4 * 0.028 * 0.028
	swept := area * 2 * g.r
	for _, n := range []float64{1, 1.3} {
		cyc := newIndicatorCycle(indicatorCycle{crank: g, area: area, clearance: 0.2 * swept,
			p1: 101325, p2: 101325 * 20, n: n, ambient: 101325})
		got := cycleWork(sampleRevolution(cycleSteps, cyc.gasTorque))
		if scale := 101325 * swept; math.Abs(got) > 1e-9*scale {
			t.Errorf("n=%g: ∮T dθ = %g J with no delivery, want 0 (scale p1·Vs = %g J)", n, got, scale)
		}
		top := cyc.pressure(0)
		if want := 101325 * math.Pow(6, n); math.Abs(top-want) > 1e-9*want {
			t.Errorf("n=%g: pressure at TDC %g Pa, want dead-head p1·CR^n = %g Pa", n, top, want)
		}
	}
}
