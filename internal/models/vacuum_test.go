package models

import (
	"fmt"
	"math"
	"testing"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// midpointPumpdown integrates dt = −V·dp/(p·S(p)) from p0 down to p by the
// midpoint rule with a million equal steps in ln p, with the net speed
// S = V̇d·(1 − c·((pd/p)^(1/m) − 1)) − Q/p.
func midpointPumpdown(v, p0, p, pd, rate, c, m, leak float64) float64 {
	const steps = 1_000_000
	h := math.Log(p0/p) / steps
	t := 0.0
	for i := range steps {
		q := p0 * math.Exp(-(float64(i)+0.5)*h)
		eta := 1 - c*(math.Pow(pd/q, 1/m)-1)
		t += v * h / (rate*eta - leak/q)
	}
	return t
}

// shoelacePower is the indicated power of a vacuum pump with the vessel at
// p: the area of the indicator diagram (suction at p, compression along n
// to pd, delivery at pd, re-expansion along m), found as a closed polygon
// through 2000 points of each curve, times the cylinders and the speed:
// the test's own integration, independent of the model's closed form.
func shoelacePower(swept, c, n, m, p, pd, z, revs float64) float64 {
	vc := c * swept
	vb := swept + vc
	v2, v4 := vb*math.Pow(pd/p, -1/n), vc*math.Pow(pd/p, 1/m)
	const points = 2000
	var xs, ys []float64
	for i := 0; i <= points; i++ { // compression, vb → v2
		x := vb + (v2-vb)*float64(i)/points
		xs, ys = append(xs, x), append(ys, p*math.Pow(vb/x, n))
	}
	for i := 0; i <= points; i++ { // re-expansion, vc → v4
		x := vc + (v4-vc)*float64(i)/points
		xs, ys = append(xs, x), append(ys, pd*math.Pow(vc/x, m))
	}
	area := 0.0
	for i := range xs {
		j := (i + 1) % len(xs)
		area += xs[i]*ys[j] - xs[j]*ys[i]
	}
	// Anticlockwise in the p-V plane: work into the gas.
	return z * revs * area / 2
}

// vacuumReference computes the bases from the block's own inputs: the
// cylinder's displacement rate and clearance ratio, then "midpoint", the
// test's integration of the pump-down, or "shoelace-peak", the largest of
// the test's own indicator-diagram power over 20 000 vessel pressures from
// the start to the target.
func vacuumReference(t *testing.T, ch *caseCheck, _ *calc.Set, e *calc.Evaluated) float64 {
	t.Helper()
	get := func(name string) float64 { return mustInput(t, e, name) }
	stroke, ok := inputValue(t, e, "stroke")
	if !ok {
		stroke = 2 * mustInput(t, e, "crank_radius")
	}
	swept := math.Pi / 4 * math.Pow(mustInput(t, e, "bore"), 2) * stroke
	c, ok := inputValue(t, e, "clearance_ratio")
	if !ok {
		c = mustInput(t, e, "clearance_volume") / swept
	}
	revs := get("speed") / (2 * math.Pi)
	rate := get("cylinders") * swept * revs
	p0, ok := inputValue(t, e, "start_pressure")
	if !ok {
		p0 = e.Ambient
	}
	pd := e.Ambient + get("exhaust_cracking_pressure")
	switch ch.Basis {
	case "midpoint":
		return midpointPumpdown(get("vessel_volume"), p0, get("target_pressure"), pd, rate, c, get("reexpansion_index"), get("leak_rate"))
	case "shoelace-peak":
		const steps = 2000
		best := 0.0
		for i := range steps + 1 {
			p := p0 * math.Pow(get("target_pressure")/p0, float64(i)/steps)
			best = math.Max(best, shoelacePower(swept, c, get("polytropic_index"), get("reexpansion_index"), p, pd, get("cylinders"), revs))
		}
		return best
	}
	t.Fatalf("unknown basis %q", ch.Basis)
	return 0
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
		// 0.05 clearance, m = 1: ultimate 101 325 Pa · 0.05/1.05 = 48.25 mbar(a).
		{map[string]any{"target_pressure": "45 mbar(a)"}, "target_pressure", []string{"45 mbar(a)", "48.25 mbar(a)", "ultimate"}},
		{map[string]any{"target_pressure": "10 mbar"}, "target_pressure", []string{"\"10 mbar\" is a plain mbar, which reads gauge", "absolute", "mbar(a)", "torr", "-900 mbar(g)"}},
		{map[string]any{"target_pressure": "100 hPa(g)"}, "target_pressure", []string{"target pressure 1113 mbar(a) must be below the start pressure 1013 mbar(a)"}},
		{map[string]any{"reexpansion_index": 1.4}, "reexpansion_index", []string{"1.4 is above polytropic_index 1.3"}},
		// At 1 atm the pump draws 101 325 Pa · 1.5708e-3 m3/s · 1 = 159.2 Pa m3/s = 1592 mbar L/s.
		{map[string]any{"leak_rate": "200 Pa m3/s"}, "leak_rate", []string{"never pumps down", "1592 mbar·L/s"}},
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
				pump := vacuumPump{rate: 1e-3, c: c, n: n, m: n, exhaust: pa}
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

// TestHPaAmbient: plain hPa, as a barometer reads, is taken absolute for
// the block's ambient pressure.
func TestHPaAmbient(t *testing.T) {
	set, err := evaluateBlocks(t, benchPot(map[string]any{"ambient_pressure": "950 hPa", "target_pressure": "100 hPa"}))
	if err != nil {
		t.Fatal(err)
	}
	e, _ := set.Lookup("pot")
	target, _ := inputValue(t, e, "target_pressure")
	if e.Ambient != 95000 || target != 10000 {
		t.Errorf("ambient %g Pa, target %g Pa; want 95 000 and 10 000 (1 hPa = 100 Pa)", e.Ambient, target)
	}
}

// TestNormalFlows: flows shown or claimed in normal units are taken by
// mass from the state each is measured at. The pot's speed at the start is
// drawn at 1 atm and 20 °C: 94.24778 L/min · 1 · 273.15/293.15 = 87.8180
// Nl/min (DIN 1343: 0 °C, 1 atm), and at 900 mbar(a) 94.24778 · 90 000/101 325
// · 273.15/293.15 · η_v; in l/min ANR (ISO 8778: 20 °C, 1 bar) the start
// speed is 94.24778 · 1.01325 = 95.4966 l/min ANR. Clearance ratio 1e-6 keeps
// η_v at 1 to 1e-6.
func TestNormalFlows(t *testing.T) {
	set, err := evaluateBlocks(t, benchPot(map[string]any{"clearance_ratio": 0.000001, "target_pressure": "100 mbar(a)",
		"expect": map[string]any{"pumping_speed": "87.82 Nl/min ± 0.01"}}))
	if err != nil {
		t.Fatal(err)
	}
	e, _ := set.Lookup("pot")
	if len(e.Claims) != 1 || !e.Claims[0].OK {
		t.Errorf("claim in Nl/min: %+v", e.Claims)
	}
	for unit, want := range map[string]string{"Nl/min": "87.8 Nl/min", "l/min ANR": "95.5 l/min ANR", "L/min": "94.2 L/min"} {
		if got, err := e.Format("pumping_speed", unit); err != nil || got != want {
			t.Errorf("pumping_speed in %s: %q, %v; want %q", unit, got, err, want)
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
