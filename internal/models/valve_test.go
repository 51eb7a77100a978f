package models

import (
	"math"
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
)

// TestValveRelief: a valve that protects a compressor and a receiver
// names both in its trace with the absolute pressure it opens at, and the
// no-relief rule accepts it only when it opens at or below the receiver's
// allowable pressure (S235, 150 mm × 1 mm: 2·360 MPa·1 mm/152 mm = 47.37
// bar burst, 18.95 bar allowed at a factor of 2.5, below the bench
// cylinder's 24.5 bar dead-head).
func TestValveRelief(t *testing.T) {
	wall := map[string]any{"material": "s235", "inner_diameter": "150 mm", "wall_thickness": "1 mm"}
	for _, c := range []struct {
		preload string
		danger  bool
	}{
		// 6 mm seat, 5 N/mm: 1 mm preload gives 1.768 bar, 20 mm gives 35.4 bar.
		{"1 mm", false},
		{"20 mm", true},
	} {
		site := append(benchSite(wall), map[string]any{
			"id": "relief", "kind": "valve", "seat_diameter": "6 mm", "spring_rate": "5 N/mm",
			"preload": c.preload, "protects": []string{"low", "rx"},
		})
		set, err := evaluateBlocks(t, site)
		if err != nil {
			t.Fatal(err)
		}
		v, _ := set.Lookup("relief")
		crack, _ := v.Result("cracking_pressure")
		for _, s := range []string{"relief: opens at", "low dead-heads at 25.48 bar(a)", "rx allows"} {
			if !strings.Contains(crack.Trace.Substituted, s) {
				t.Errorf("preload %s: trace %q does not say %q", c.preload, crack.Trace.Substituted, s)
			}
		}
		low, _ := set.Lookup("low")
		danger := false
		for _, n := range low.Cautions {
			danger = danger || n.Rule == "no-relief"
		}
		if danger != c.danger {
			t.Errorf("preload %s (Δp %g Pa): no-relief raised %v, want %v; cautions %+v", c.preload, crack.Value, danger, c.danger, low.Cautions)
		}
	}
}

// TestValveDocNamesWorkingPressures keeps the write-up's list of the parts
// whose working pressure the relief-below-target rule checks complete.
func TestValveDocNamesWorkingPressures(t *testing.T) {
	doc := strings.Join(strings.Fields(valveDoc), " ")
	for _, k := range kinds {
		if w := k.WorkingPressure; w.Key != "" && !strings.Contains(doc, "a "+k.Name+"'s "+w.Name) {
			t.Errorf("valve doc does not say it checks a %s's %s", k.Name, w.Name)
		}
	}
}

// TestReliefQuotedAndHot: other blocks quote a relief valve's set_pressure
// as a gauge pressure (a bolts block at the valve's 1.768 bar(g): 6 mm
// seat, 5 N/mm spring compressed 1 mm, 5 N/28.274 mm²), and a valve that
// protects a compressor relieves air at its discharge temperature unless
// told otherwise; a check valve has no relief results.
func TestReliefQuotedAndHot(t *testing.T) {
	site := append(benchSite(nil), map[string]any{
		"id": "relief", "kind": "valve", "seat_diameter": "6 mm", "spring_rate": "5 N/mm", "preload": "1 mm", "protects": []string{"low", "rx"},
	}, map[string]any{
		"id": "head", "kind": "bolts", "thread": "M6", "count": 4, "property_class": "8.8", "pressure": "=relief.set_pressure", "pressure_diameter": "60 mm",
	}, map[string]any{
		"id": "check", "kind": "valve", "seat_diameter": "6 mm", "spring_rate": "5 N/mm", "preload": "1 mm",
	})
	set, err := evaluateBlocks(t, site)
	if err != nil {
		t.Fatal(err)
	}
	head, _ := set.Lookup("head")
	load, _ := head.Result("head_load")
	if want := 5 / (math.Pi / 4 * 36e-6) * math.Pi / 4 * 0.06 * 0.06; math.Abs(load.Value-want) > 1e-9*want {
		t.Errorf("head_load at the quoted set pressure = %g N, want %g N", load.Value, want)
	}
	relief, _ := set.Lookup("relief")
	capacity, _ := relief.Result("relieving_capacity")
	low, _ := set.Lookup("low")
	t2, _ := low.Result("discharge_temperature")
	if !strings.Contains(capacity.Trace.Substituted, "the discharge temperature of low") ||
		!strings.Contains(capacity.Trace.Substituted, strings.TrimSuffix(display.Number(t2.Value, "K"), " K")) {
		t.Errorf("relieving_capacity working %q is not at low's discharge temperature %g K", capacity.Trace.Substituted, t2.Value)
	}
	check, _ := set.Lookup("check")
	for _, name := range []string{"set_pressure", "relieving_pressure", "flow_area", "relieving_capacity"} {
		if _, ok := check.Result(name); ok {
			t.Errorf("a check valve has %s", name)
		}
	}
}

// valveReference computes a relief valve's capacity from the isentropic
// flow of air (γ = 1.4, R = 287.05 J/(kg K)) through its flow area, worked
// out here from the inputs: "nozzle-m1", the choked flow, at the speed of
// sound in the throat (M = 1) from the stagnation state, and
// "nozzle-subsonic", the flow at the Mach number the back pressure
// allows. Stagnation is the relieving pressure: the set pressure plus the
// greater of 10 % of its gauge value and 20 kPa.
func valveReference(t *testing.T, ch *caseCheck, _ *calc.Set, e *calc.Evaluated) float64 {
	t.Helper()
	in := func(name string) float64 { return mustInput(t, e, name) }
	const gamma, gas = 1.4, 287.05
	d, x := in("seat_diameter"), in("preload")
	crack := in("spring_rate") * x / (math.Pi / 4 * d * d)
	accumulation := math.Max(0.1*crack, 20e3)
	p0, t0 := e.Ambient+crack+accumulation, in("relieving_temperature")
	lift := accumulation / crack * x
	if l, ok := inputValue(t, e, "lift"); ok {
		lift = math.Min(lift, l)
	}
	area := in("discharge_coefficient") * math.Min(math.Pi/4*d*d, math.Pi*d*lift)
	var mach float64
	switch ch.Basis {
	case "nozzle-m1":
		mach = 1
	case "nozzle-subsonic":
		// p0/p = (1 + (γ−1)/2·M²)^(γ/(γ−1)) at the back pressure.
		mach = math.Sqrt(2 / (gamma - 1) * (math.Pow(p0/e.Ambient, (gamma-1)/gamma) - 1))
		if mach >= 1 {
			t.Fatalf("basis nozzle-subsonic: the flow is choked (M = %g)", mach)
		}
	default:
		t.Fatalf("unknown basis %q", ch.Basis)
	}
	// Static state at M from the stagnation state, then ρ·V·A.
	temp := t0 / (1 + (gamma-1)/2*mach*mach)
	p := p0 * math.Pow(temp/t0, gamma/(gamma-1))
	return area * p / (gas * temp) * mach * math.Sqrt(gamma*gas*temp)
}
