package models

import (
	"math"
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// testAirR is the specific gas constant of dry air, J/(kg K), as the
// ISO 2533 standard atmosphere gives it (287.05287; from memory), rounded
// as the model documents.
const testAirR = 287.05

// Brute-force scans of the interstage pressures: equal steps from the
// inlet to the discharge pressure, one pressure for two stages, a grid of
// two for three.
const (
	scanSteps1 = 100_000
	scanSteps2 = 1000
)

// stagedWork is the work per kilogram of compressing from p[0] to p[len−1]
// through the pressures p with the air entering the first stage at t1 and
// the others at tic: Σ n/(n−1)·R·T·((p_k+1/p_k)^((n−1)/n) − 1), or
// Σ R·T·ln(p_k+1/p_k) when n = 1.
func stagedWork(p []float64, t1, tic, n float64) float64 {
	w := 0.0
	for k := 0; k+1 < len(p); k++ {
		t := tic
		if k == 0 {
			t = t1
		}
		r := p[k+1] / p[k]
		if n == 1 {
			w += testAirR * t * math.Log(r)
		} else {
			w += n / (n - 1) * testAirR * t * (math.Pow(r, (n-1)/n) - 1)
		}
	}
	return w
}

// scanInterstage returns the interstage pressures of least work on the
// scan grid, and that work.
func scanInterstage(t *testing.T, stages int, p1, p2, t1, tic, n float64) ([]float64, float64) {
	t.Helper()
	best, bestW := []float64(nil), math.Inf(1)
	switch stages {
	case 2:
		h := (p2 - p1) / scanSteps1
		for i := 1; i < scanSteps1; i++ {
			pi := p1 + float64(i)*h
			if w := stagedWork([]float64{p1, pi, p2}, t1, tic, n); w < bestW {
				best, bestW = []float64{pi}, w
			}
		}
	case 3:
		h := (p2 - p1) / scanSteps2
		for i := 1; i < scanSteps2; i++ {
			for j := i + 1; j < scanSteps2; j++ {
				pa, pb := p1+float64(i)*h, p1+float64(j)*h
				if w := stagedWork([]float64{p1, pa, pb, p2}, t1, tic, n); w < bestW {
					best, bestW = []float64{pa, pb}, w
				}
			}
		}
	default:
		t.Fatalf("the scan covers 2 or 3 stages, not %d", stages)
	}
	return best, bestW
}

// multistageReference computes the scan bases from the block's inputs:
// "scan-min", the least work found, and "scan-argmin-K", interstage
// pressure K where it was found.
func multistageReference(t *testing.T, ch *caseCheck, _ *calc.Set, e *calc.Evaluated) float64 {
	t.Helper()
	p1 := inletPressure(t, e)
	t1 := mustInput(t, e, "inlet_temperature")
	tic, ok := inputValue(t, e, "intercooled_temperature")
	if !ok {
		tic = t1
	}
	best, w := scanInterstage(t, int(mustInput(t, e, "stages")), p1, mustInput(t, e, "discharge_pressure"), t1, tic, mustInput(t, e, "polytropic_index"))
	switch ch.Basis {
	case "scan-min":
		return w
	case "scan-argmin-1":
		return best[0]
	case "scan-argmin-2":
		return best[1]
	}
	t.Fatalf("unknown basis %q", ch.Basis)
	return 0
}

// staging is two stages from 1 atm to 8 bar gauge; changes replace keys,
// or remove them (nil).
func staging(changes map[string]any) []map[string]any {
	ms := map[string]any{"id": "ms", "kind": "multistage", "stages": 2, "discharge_pressure": "8 bar", "mass_flow": "2 g/s"}
	for k, v := range changes {
		if v == nil {
			delete(ms, k)
		} else {
			ms[k] = v
		}
	}
	return []map[string]any{{
		"id": "low", "kind": "compressor", "bore": "28 mm", "stroke": "32 mm", "rod_length": "70 mm",
		"clearance_volume": "1.8 cm3", "speed": "900 rpm", "discharge_pressure": "6 bar",
	}, {"id": "rx", "kind": "tank", "volume": "20 L", "pressure": "8 bar"}, ms}
}

// TestMultistageResultsPresent: a block reports the interstage pressures
// its stages have and no others, and total_power only with a flow.
func TestMultistageResultsPresent(t *testing.T) {
	for _, c := range []struct {
		changes map[string]any
		want    []string
		absent  []string
	}{
		{nil, []string{"interstage_pressure_1", "total_power"}, []string{"interstage_pressure_2"}},
		{map[string]any{"stages": 6}, []string{"interstage_pressure_5"}, nil},
		{map[string]any{"stages": 4, "mass_flow": nil}, []string{"interstage_pressure_3"}, []string{"interstage_pressure_4", "total_power"}},
	} {
		set, err := evaluateBlocks(t, staging(c.changes))
		if err != nil {
			t.Fatal(err)
		}
		e, _ := set.Lookup("ms")
		for _, name := range c.want {
			if _, ok := e.Result(name); !ok {
				t.Errorf("%v: no %s", c.changes, name)
			}
		}
		for _, name := range c.absent {
			if _, ok := e.Result(name); ok {
				t.Errorf("%v: %s reported", c.changes, name)
			}
		}
	}
}

// TestStagesChart: the staged path starts at the inlet, climbs each stage
// to the discharge temperature, drops at each interstage pressure to the
// intercooled temperature and ends at the discharge pressure; the single
// stage ends at its discharge temperature.
func TestStagesChart(t *testing.T) {
	set, err := evaluateBlocks(t, staging(map[string]any{"stages": 3, "intercooled_temperature": "35 degC"}))
	if err != nil {
		t.Fatal(err)
	}
	e, _ := set.Lookup("ms")
	c, err := e.Chart("stages")
	if err != nil {
		t.Fatal(err)
	}
	if len(c.Panels) != 1 || len(c.Panels[0].Series) != 2 || len(c.Panels[0].Marks) != 2 {
		t.Fatalf("want one panel with two series and two marks; got %+v", c.Panels)
	}
	staged, single := c.Panels[0].Series[0], c.Panels[0].Series[1]
	p1, p2 := e.Ambient, e.Ambient+8e5
	td, _ := e.Result("discharge_temperature")
	td1, _ := e.Result("single_stage_discharge_temperature")
	near := func(a, b float64) bool { return math.Abs(a-b) <= 1e-9*math.Abs(b) }
	last := len(staged.X) - 1
	if !near(staged.X[0], p1) || !near(staged.Y[0], 293.15) || !near(staged.X[last], p2) || !near(staged.Y[last], td.Value) {
		t.Errorf("staged path runs from (%g, %g) to (%g, %g); want (%g, 293.15) to (%g, %g)",
			staged.X[0], staged.Y[0], staged.X[last], staged.Y[last], p1, p2, td.Value)
	}
	if sl := len(single.X) - 1; !near(single.X[sl], p2) || !near(single.Y[sl], td1.Value) || single.Style != calc.Dashed {
		t.Errorf("single stage ends at (%g, %g), style %v; want (%g, %g), dashed", single.X[sl], single.Y[sl], single.Style, p2, td1.Value)
	}
	for k, m := range c.Panels[0].Marks {
		r, _ := e.Result([]string{"interstage_pressure_1", "interstage_pressure_2"}[k])
		if !m.Vertical || !near(m.Value, r.Value) {
			t.Errorf("mark %d at %g, want vertical at %g", k, m.Value, r.Value)
		}
		drop := false
		for i := 1; i < len(staged.X); i++ {
			drop = drop || (near(staged.X[i], r.Value) && near(staged.X[i-1], r.Value) && near(staged.Y[i], 308.15) && staged.Y[i-1] > staged.Y[i])
		}
		if !drop {
			t.Errorf("no intercooler drop to 308.15 K at %g Pa", r.Value)
		}
	}
	for i := 1; i < len(staged.X); i++ {
		if staged.X[i] < staged.X[i-1] {
			t.Fatalf("staged path goes back in pressure at point %d", i)
		}
	}
}

func TestMultistageInputErrors(t *testing.T) {
	cases := []struct {
		changes map[string]any
		key     string
		says    []string
	}{
		{map[string]any{"stages": 2.5}, "stages", []string{"2.5", "whole number", "2, 3, 4, 5 or 6"}},
		{map[string]any{"stages": 1}, "stages", []string{"out of range", ">= 2"}},
		{map[string]any{"stages": 7}, "stages", []string{"<= 6"}},
		{map[string]any{"supply": "low"}, "mass_flow", []string{"mass_flow or supply"}},
		{map[string]any{"supply": "rx", "mass_flow": nil}, "supply", []string{"tank", "compressor"}},
		{map[string]any{"discharge_pressure": "0.5 bar", "inlet_pressure": "2 bar(a)"}, "discharge_pressure", []string{"1.513 bar(a)", "2 bar(a)"}},
		// By hand: r = (9.01325/1.01325)^(1/2) = 2.9825; 293.15 K · 2.9825^(0.3/1.3) = 377.2 K, 104.1 °C.
		{map[string]any{"intercooled_temperature": "150 degC"}, "intercooled_temperature", []string{"150 °C", "above the 104.1 °C", "intercooler cools"}},
		{map[string]any{"expect": map[string]any{"interstage_pressure_2": "3 bar"}}, "expect.interstage_pressure_2", []string{"computes no interstage_pressure_2", "with at least 3 stages"}},
	}
	for _, c := range cases {
		wantInputError(t, c.changes, c.key, c.says, staging)
	}
}

// TestMultistageIdealGasNote: the specific work's trace warns of the ideal
// gas above 50 bar and not below.
func TestMultistageIdealGasNote(t *testing.T) {
	for p, want := range map[string]bool{"200 bar": true, "8 bar": false} {
		set, err := evaluateBlocks(t, staging(map[string]any{"discharge_pressure": p, "stages": 3}))
		if err != nil {
			t.Fatal(err)
		}
		e, _ := set.Lookup("ms")
		r, _ := e.Result("specific_work")
		if got := strings.Contains(r.Trace.Substituted, "NOTE: at"); got != want {
			t.Errorf("%s: note %v, want %v (%s)", p, got, want, r.Trace.Substituted)
		}
	}
}
