package models

import (
	"fmt"
	"math"
	"testing"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// midpointPumpdown integrates dt = −V·dp/(p·S(p)) from p0 down to p by the
// midpoint rule with a million equal steps in ln p, with
// S = V̇d·(1 − c·((pa/p)^(1/n) − 1)).
func midpointPumpdown(v, p0, p, pa, rate, c, n float64) float64 {
	const steps = 1_000_000
	h := math.Log(p0/p) / steps
	t := 0.0
	for i := range steps {
		q := p0 * math.Exp(-(float64(i)+0.5)*h)
		eta := 1 - c*(math.Pow(pa/q, 1/n)-1)
		t += v * h / (rate * eta)
	}
	return t
}

// vacuumReference computes the "midpoint" basis from the block's own
// inputs: the cylinder's displacement rate and clearance ratio, then the
// test's integration.
func vacuumReference(t *testing.T, ch *caseCheck, _ *calc.Set, e *calc.Evaluated) float64 {
	t.Helper()
	if ch.Basis != "midpoint" {
		t.Fatalf("unknown basis %q", ch.Basis)
	}
	stroke, ok := inputValue(t, e, "stroke")
	if !ok {
		stroke = 2 * mustInput(t, e, "crank_radius")
	}
	swept := math.Pi / 4 * math.Pow(mustInput(t, e, "bore"), 2) * stroke
	c, ok := inputValue(t, e, "clearance_ratio")
	if !ok {
		c = mustInput(t, e, "clearance_volume") / swept
	}
	rate := mustInput(t, e, "cylinders") * swept * mustInput(t, e, "speed") / (2 * math.Pi)
	p0, ok := inputValue(t, e, "start_pressure")
	if !ok {
		p0 = e.Ambient
	}
	v, p, n := mustInput(t, e, "vessel_volume"), mustInput(t, e, "target_pressure"), mustInput(t, e, "polytropic_index")
	return midpointPumpdown(v, p0, p, e.Ambient, rate, c, n)
}

// benchPot is a single-cylinder pump on a 20 L pot; changes replace keys,
// or remove them (nil).
func benchPot(changes map[string]any) []map[string]any {
	pot := map[string]any{"id": "pot", "kind": "vacuum", "bore": "50 mm", "stroke": "40 mm", "rod_length": "100 mm",
		"clearance_ratio": 0.05, "speed": "1200 rpm", "vessel_volume": "20 L", "target_pressure": "50 mbar(a)"}
	for k, v := range changes {
		if v == nil {
			delete(pot, k)
		} else {
			pot[k] = v
		}
	}
	return []map[string]any{pot}
}

// TestPumpdownChart: the solid line runs from the start pressure at time 0
// to the target at the pump-down time, falling; the dashed line goes on
// from there, falling and staying above the ultimate pressure, which is
// marked; the pressure axis is logarithmic.
func TestPumpdownChart(t *testing.T) {
	set, err := evaluateBlocks(t, benchPot(map[string]any{"start_pressure": "900 mbar(a)"}))
	if err != nil {
		t.Fatal(err)
	}
	e, _ := set.Lookup("pot")
	c, err := e.Chart("pumpdown")
	if err != nil {
		t.Fatal(err)
	}
	time, _ := e.Result("pumpdown_time")
	ultimate, _ := e.Result("ultimate_pressure")
	if len(c.Panels) != 1 || len(c.Panels[0].Series) != 2 || !c.Panels[0].Y.Log || c.Panels[0].Y.Unit != "mbar(a)" {
		t.Fatalf("want one panel, two series, log pressure in mbar(a); got %+v", c.Panels)
	}
	down, more := c.Panels[0].Series[0], c.Panels[0].Series[1]
	last := len(down.X) - 1
	if down.X[0] != 0 || math.Abs(down.Y[0]-90000) > 1e-6 || math.Abs(down.Y[last]-5000) > 1e-9 ||
		math.Abs(down.X[last]-time.Value) > 1e-12*time.Value {
		t.Errorf("pump-down runs from (%g s, %g Pa) to (%g s, %g Pa); want (0, 90000) to (%g, 5000)",
			down.X[0], down.Y[0], down.X[last], down.Y[last], time.Value)
	}
	if more.X[0] != down.X[last] || more.Y[0] != down.Y[last] || more.Style != calc.Dashed {
		t.Errorf("the continuation starts at (%g, %g), style %v; want the target point, dashed", more.X[0], more.Y[0], more.Style)
	}
	for _, s := range []calc.Series{down, more} {
		for i := 1; i < len(s.X); i++ {
			if !(s.X[i] > s.X[i-1] && s.Y[i] < s.Y[i-1] && s.Y[i] > ultimate.Value) || math.IsInf(s.X[i], 0) {
				t.Fatalf("%s: point %d (%g s, %g Pa) after (%g s, %g Pa), ultimate %g Pa", s.Name, i, s.X[i], s.Y[i], s.X[i-1], s.Y[i-1], ultimate.Value)
			}
		}
	}
	marks := c.Panels[0].Marks
	if len(marks) != 2 || marks[0].Value != ultimate.Value || marks[0].Vertical || marks[1].Value != time.Value || !marks[1].Vertical {
		t.Errorf("marks %+v; want the ultimate pressure and the pump-down time", marks)
	}
}

func TestVacuumInputErrors(t *testing.T) {
	cases := []struct {
		changes map[string]any
		key     string
		says    []string
	}{
		// 0.05 clearance, n = 1.3: ultimate 19.36 mbar(a).
		{map[string]any{"target_pressure": "15 mbar(a)"}, "target_pressure", []string{"15 mbar(a)", "19.36 mbar(a)", "ultimate"}},
		{map[string]any{"target_pressure": "10 mbar"}, "target_pressure", []string{"\"10 mbar\" is a gauge pressure", "absolute", "mbar(a)", "torr"}},
		{map[string]any{"target_pressure": "900 mbar(a)", "start_pressure": "800 mbar(a)"}, "target_pressure", []string{"900 mbar(a)", "800 mbar(a)"}},
		{map[string]any{"start_pressure": "1.2 bar(a)"}, "start_pressure", []string{"1200 mbar(a)", "ambient"}},
		{map[string]any{"clearance_ratio": nil}, "clearance_volume", []string{"missing"}},
		{map[string]any{"rod_length": "15 mm"}, "rod_length", []string{"crank radius"}},
	}
	for _, c := range cases {
		wantInputError(t, c.changes, c.key, c.says, benchPot)
	}
}

// TestPumpdownExtremes drives the pump model at the ends of its inputs'
// ranges and up to a hair above the ultimate pressure: the time is always
// finite and positive and rises as the target falls; with negligible
// clearance and a pressure ratio of 2 or less it is τ·ln(p0/p).
func TestPumpdownExtremes(t *testing.T) {
	for _, c := range []float64{minClearanceRatio, 0.05, 1, 100} {
		for _, n := range []float64{1, 1 + 1e-9, 1.3, 1.67} {
			for _, pa := range []float64{1e4, 101325, 2e5} {
				pump := vacuumPump{rate: 1e-3, c: c, n: n, ambient: pa}
				pu := pump.ultimate()
				prev := 0.0
				for _, frac := range []float64{1 - 1e-9, 0.5, 1e-3, 1e-6, 1e-9} {
					p := pu + frac*(pa-pu)
					label := fmt.Sprintf("c=%g n=%g pa=%g at %g of the way from ultimate to ambient", c, n, pa, frac)
					got := pump.time(1e-2, pa, p)
					if math.IsNaN(got) || math.IsInf(got, 0) || got <= prev {
						t.Errorf("%s: %g s after %g s", label, got, prev)
					}
					prev = got
					if c == minClearanceRatio && frac >= 0.5 {
						want := 10 * math.Log(pa/p)
						if math.Abs(got-want) > 1e-5*want {
							t.Errorf("%s: %.9g s, constant-speed closed form %.9g s", label, got, want)
						}
					}
				}
			}
		}
	}
}

// TestVacuumGaugeReading: a target written as a US vacuum gauge reads it,
// "25 inHg vac", is 25 inHg below ambient: the same block as one whose
// target is that absolute pressure, 101325 − 25 × 3386.389 = 16665.28 Pa
// (1 inHg = 3386.389 Pa, NIST SP 811 App. B.8, from memory).
func TestVacuumGaugeReading(t *testing.T) {
	pot := func(id, target string) string {
		return "id = \"" + id + "\"\nkind = \"vacuum\"\nbore = \"50 mm\"\nstroke = \"40 mm\"\nrod_length = \"100 mm\"\n" +
			"clearance_ratio = 0.05\nspeed = \"1200 rpm\"\nvessel_volume = \"20 L\"\ntarget_pressure = \"" + target + "\"\n"
	}
	set := evaluateSources(t, "content/x.md", []string{pot("gauge", "25 inHg vac"), pot("absolute", "16665.284 Pa(a)")})
	g, _ := set.Lookup("gauge")
	a, _ := set.Lookup("absolute")
	gt, _ := g.Result("pumpdown_time")
	at, _ := a.Result("pumpdown_time")
	if math.Abs(gt.Value/at.Value-1) > 1e-6 {
		t.Errorf("pump-down to 25 inHg vac takes %g s, to 16665.284 Pa(a) %g s", gt.Value, at.Value)
	}
}
