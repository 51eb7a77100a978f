package models

import (
	"math"
	"reflect"
	"testing"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// The shortcuts taken in sampling a revolution must give the very numbers
// of the plain formulas: tables, traces and chart data are compared byte
// for byte between builds, so no tolerance here.

func TestMotionIsPositionAndVelocity(t *testing.T) {
	for _, g := range []sliderCrank{{r: 0.016, l: 0.07}, {r: 0.05, l: 0.11}, {r: 1, l: 1.0001}} {
		for i := -7200; i <= 10800; i++ {
			th := 2 * math.Pi * float64(i) / 3600
			x, dx := g.motion(th)
			if x != g.position(th) || dx != g.velocity(th) {
				t.Fatalf("r=%g l=%g θ=%g: motion %g, %g; position %g, velocity %g", g.r, g.l, th, x, dx, g.position(th), g.velocity(th))
			}
		}
	}
}

func TestGasTorqueAsDefined(t *testing.T) {
	for _, raw := range []map[string]any{
		benchBlock(),
		withInputs(map[string]any{"discharge_pressure": "40 bar", "clearance_volume": "4 cm3"}), // dead-head: valves never open
		withInputs(map[string]any{"polytropic_index": 1.0}),
	} {
		c := testCompressor(t, raw)
		cyc := c.cycleAt(c.p1, c.p2)
		for i := -3600; i <= 7200; i++ {
			th := 2 * math.Pi * float64(i) / 3600
			want := -(cyc.pressure(th) - cyc.ambient) * cyc.area * cyc.crank.velocity(th)
			if got := cyc.gasTorque(th); got != want {
				t.Fatalf("%v θ=%g: gas torque %g, by its definition %g", raw, th, got, want)
			}
		}
	}
}

func TestPhaseSumByShift(t *testing.T) {
	for _, z := range []int{1, 2, 3, 4, 7} {
		m := crankSteps(z)
		one := sampleRevolution(m, func(th float64) float64 { return math.Sin(3*th) + 0.1*th })
		want := make([]float64, m)
		for k := range z {
			for i := range want {
				want[i] += one[(i-k*m/z+m)%m]
			}
		}
		got := phaseSum(one, z)
		if !reflect.DeepEqual(got, want) {
			t.Errorf("z=%d: phaseSum differs from the sum by modulus", z)
		}
		for _, i := range []int{0, 1, m/z - 1, m / z % m, m - 1, m / 2} {
			if at := phaseAt(func(th float64) float64 { return math.Sin(3*th) + 0.1*th }, i, m, z); at != want[i] {
				t.Errorf("z=%d: phaseAt(%d) = %g, want %g", z, i, at, want[i])
			}
		}
	}
}

// TestCurvesAloneAsWithResults checks that a chart's second run, which
// works out the drawn points alone, gives the curves of the first.
func TestCurvesAloneAsWithResults(t *testing.T) {
	for _, z := range []int{1, 2, 3, 7} {
		for _, mass := range []any{nil, "85 g"} {
			c := testCompressor(t, withInputs(map[string]any{"cylinders": z, "reciprocating_mass": mass}))
			cyc, steps := c.cycleAt(c.p1, c.p2), crankSteps(z)
			gas := phaseSum(sampleRevolution(steps, cyc.gasTorque), z)
			full, alone := compressorCurves(cyc, c, gas, steps), compressorCurves(cyc, c, nil, steps)
			if !sameCurves(full, alone) {
				t.Errorf("z=%d mass=%v: curves worked out alone differ from those of the whole revolution", z, mass)
			}
			if len(full) != map[bool]int{true: 5, false: 3}[mass != nil] {
				t.Errorf("z=%d mass=%v: %d curves", z, mass, len(full))
			}
		}
	}
}

// sameCurves compares curves bit for bit: −0 and 0 print differently.
func sameCurves(a, b []calc.Curve) bool {
	bits := func(v []float64) []uint64 {
		out := make([]uint64, len(v))
		for i, x := range v {
			out[i] = math.Float64bits(x)
		}
		return out
	}
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		x, y := a[i], b[i]
		if x.Name != y.Name || x.Dashed != y.Dashed || x.XDim != y.XDim || x.YDim != y.YDim ||
			!reflect.DeepEqual(bits(x.X), bits(y.X)) || !reflect.DeepEqual(bits(x.Y), bits(y.Y)) {
			return false
		}
	}
	return true
}

// testCompressor reads a compressor block's cylinder from raw inputs.
func testCompressor(t *testing.T, raw map[string]any) cylinder {
	t.Helper()
	in, err := caseInputs(compressorKind, raw, standardAtmosphere, nil)
	if err != nil {
		t.Fatal(err)
	}
	c, err := readCompressor(in)
	if err != nil {
		t.Fatal(err)
	}
	return c
}
