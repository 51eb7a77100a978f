package models

import (
	"math"
	"testing"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// pvArea is the area enclosed by one motor cylinder's ideal indicator
// diagram, found as a closed polygon (shoelace formula) through the corners
// of admission and exhaust and 100 000 points along the expansion curve:
// the test's own integration, independent of the model's closed form.
func pvArea(v0, v1, v2, ps, pa, n float64) float64 {
	xs := []float64{v0, v0, v1}
	ys := []float64{pa, ps, ps}
	const points = 100_000
	for i := 1; i <= points; i++ {
		v := v1 + (v2-v1)*float64(i)/points
		xs, ys = append(xs, v), append(ys, ps*math.Pow(v1/v, n))
	}
	xs, ys = append(xs, v2), append(ys, pa)
	area := 0.0
	for i := range xs {
		j := (i + 1) % len(xs)
		area += xs[i]*ys[j] - xs[j]*ys[i]
	}
	// The cycle runs clockwise in the p-V plane: positive work out.
	return -area / 2
}

// stepExhaust is the mass-averaged temperature of the air a motor cylinder
// exhausts, by the test's own energy balance in 100 000 small steps: from
// (pe, te) in the volume v2 the cylinder blows down to pa, each parcel
// leaving with the enthalpy of the air then in the cylinder while what
// stays expands reversibly and adiabatically; then the piston pushes out
// all but the clearance v0. Below pa, air at ta flows in parcel by parcel,
// each bringing its enthalpy into the cylinder's internal energy, and the
// piston pushes out the mix. Ideal gas, γ = 1.4; R cancels.
func stepExhaust(pe, te, pa, ta, v0, v2 float64) float64 {
	const steps, gamma, r = 100_000, 1.4, 1.0
	cv, cp := r/(gamma-1), gamma*r/(gamma-1)
	if pe < pa {
		m, temp := pe*v2/(r*te), te
		target := pa * v2 / r // m·T when the cylinder reaches pa
		dm := (target - m*temp) / (gamma * ta) / steps
		for range steps {
			u := cv*m*temp + cp*ta*dm
			m += dm
			temp = u / (cv * m)
		}
		return temp
	}
	p, temp := pe, te
	m := p * v2 / (r * temp)
	var out, enthalpy float64
	for i := 1; i <= steps; i++ {
		next := pe + (pa-pe)*float64(i)/steps
		tNext := temp * math.Pow(next/p, (gamma-1)/gamma)
		mNext := next * v2 / (r * tNext)
		out += m - mNext
		enthalpy += cp * (m - mNext) * (temp + tNext) / 2
		p, temp, m = next, tNext, mNext
	}
	pushed := m * (v2 - v0) / v2
	return (enthalpy + cp*pushed*temp) / (cp * (out + pushed))
}

// motorReference computes the "pv-area" bases from the block's inputs:
// the enclosed area times the cylinders ("pv-area", J per revolution),
// times the speed in rev/s ("pv-area · N") or over 2π ("pv-area / 2π");
// and "energy-balance", the exhaust temperature by stepExhaust.
func motorReference(t *testing.T, ch *caseCheck, _ *calc.Set, e *calc.Evaluated) float64 {
	t.Helper()
	get := func(name string) float64 { return mustInput(t, e, name) }
	bore := get("bore")
	stroke, ok := inputValue(t, e, "stroke")
	if !ok {
		stroke = 2 * mustInput(t, e, "crank_radius")
	}
	swept := math.Pi / 4 * bore * bore * stroke
	clearance, ok := inputValue(t, e, "clearance_volume")
	if !ok {
		clearance = mustInput(t, e, "clearance_ratio") * swept
	}
	v1 := clearance + get("cutoff")*swept
	ps, n := get("supply_pressure"), get("polytropic_index")
	work := get("cylinders") * pvArea(clearance, v1, clearance+swept, ps, e.Ambient, n)
	switch ch.Basis {
	case "energy-balance":
		pe := ps * math.Pow(v1/(clearance+swept), n)
		ts := get("supply_temperature")
		return stepExhaust(pe, ts*math.Pow(pe/ps, (n-1)/n), e.Ambient, ts, clearance, clearance+swept)
	case "pv-area":
		return work
	case "pv-area · N":
		return work * mustInput(t, e, "speed") / (2 * math.Pi)
	case "pv-area / 2π":
		return work / (2 * math.Pi)
	}
	t.Fatalf("unknown basis %q", ch.Basis)
	return 0
}

// TestPVArea checks the test's own integration on a rectangle and on the
// isothermal work p1·V1·ln(V2/V1) of a complete expansion.
func TestPVArea(t *testing.T) {
	if got := pvArea(1, 3, 3, 5, 1, 1.3); math.Abs(got-8) > 1e-12 {
		t.Errorf("rectangle 2 × 4: area %g, want 8", got)
	}
	// Admission 1 → 2 at 5, expansion to 10 at p·V = 10, exhaust at 1.
	want := 5*1 + 10*math.Log(5) - 1*9
	if got := pvArea(1, 2, 10, 5, 1, 1); math.Abs(got-want) > 1e-9*want {
		t.Errorf("isothermal cycle: area %.12g, want %.12g", got, want)
	}
}

// motorSite is one motor block; changes replace keys, or remove them (nil).
func motorSite(changes map[string]any) []map[string]any {
	m := map[string]any{"id": "m", "kind": "motor", "bore": "32 mm", "stroke": "30 mm", "rod_length": "70 mm",
		"clearance_ratio": 0.05, "speed": "600 rpm", "supply_pressure": "6 bar", "cutoff": 0.4}
	for k, v := range changes {
		if v == nil {
			delete(m, k)
		} else {
			m[k] = v
		}
	}
	return []map[string]any{m}
}

// TestMotorTorqueCurve: by virtual work, the gas torque through the exact
// slider crank integrates over a revolution to minus the indicated work
// (load convention), for one and for three cylinders; the p-V curve closes.
func TestMotorTorqueCurve(t *testing.T) {
	for _, z := range []int{1, 3} {
		set, err := evaluateBlocks(t, motorSite(map[string]any{"cylinders": z}))
		if err != nil {
			t.Fatal(err)
		}
		e, _ := set.Lookup("m")
		work, _ := e.Result("indicated_work")
		var torque, pv calc.Curve
		for _, c := range e.Curves {
			switch c.Name {
			case "gas_torque":
				torque = c
			case "pv":
				pv = c
			}
		}
		integral := 0.0
		for i := 1; i < len(torque.X); i++ {
			integral += (torque.Y[i] + torque.Y[i-1]) / 2 * (torque.X[i] - torque.X[i-1])
		}
		// Trapezoids of 0.5° on a curve with kinks: agreement to 0.1 %.
		if math.Abs(integral+work.Value) > 1e-3*work.Value {
			t.Errorf("z=%d: ∫T dθ = %g J, want −%g J", z, integral, work.Value)
		}
		last := len(pv.X) - 1
		if pv.X[0] != pv.X[last] || pv.Y[0] != pv.Y[last] {
			t.Errorf("z=%d: p-V curve runs from (%g, %g) to (%g, %g); want it closed", z, pv.X[0], pv.Y[0], pv.X[last], pv.Y[last])
		}
		chart, err := e.Chart("pv")
		if err != nil || len(chart.Panels) != 1 || len(chart.Panels[0].Series[0].X) != len(pv.X) {
			t.Errorf("z=%d: pv chart %+v, %v", z, chart, err)
		}
	}
}

// TestMotorOverExpansion: a cut-off early enough to expand below ambient
// raises a NOTICE; a late one does not.
func TestMotorOverExpansion(t *testing.T) {
	for _, c := range []struct {
		cutoff float64
		notice bool
	}{{0.1, true}, {0.4, false}} {
		set, err := evaluateBlocks(t, motorSite(map[string]any{"cutoff": c.cutoff}))
		if err != nil {
			t.Fatal(err)
		}
		e, _ := set.Lookup("m")
		pe, _ := e.Result("expansion_pressure")
		got := false
		for _, n := range e.Cautions {
			got = got || n.Rule == "over-expansion"
		}
		if got != c.notice || (pe.Value < e.Ambient) != c.notice {
			t.Errorf("cut-off %g: expansion to %g Pa(a), notice %v; want notice %v", c.cutoff, pe.Value, got, c.notice)
		}
	}
}

func TestMotorInputErrors(t *testing.T) {
	cases := []struct {
		changes map[string]any
		key     string
		says    []string
	}{
		{map[string]any{"supply_pressure": "-0.2 bar"}, "supply_pressure", []string{"0.8133 bar(a)", "above ambient 1.013 bar(a)"}},
		{map[string]any{"cutoff": 0}, "cutoff", []string{"out of range", "> 0 and <= 1"}},
		{map[string]any{"cutoff": 1.2}, "cutoff", []string{"out of range"}},
		{map[string]any{"rod_length": "10 mm"}, "rod_length", []string{"must exceed the crank radius 15 mm"}},
		{map[string]any{"clearance_ratio": nil}, "clearance_volume", []string{"missing"}},
		{map[string]any{"crank_radius": "15 mm"}, "stroke", []string{"not both"}},
		// By hand (n = 1.3, c = 0.05): W1/Vs = 2.013·0.2 + 2.013·0.25/0.3·(1 − (0.25/1.05)^0.3)
		// − 1.013 = 0.403 + 0.587 − 1.013 < 0: the cycle takes work in.
		{map[string]any{"supply_pressure": "1 bar", "cutoff": 0.2}, "cutoff", []string{"does no net work", "raise cutoff or supply_pressure"}},
		{map[string]any{"supply_pressure": "1e-9 bar"}, "cutoff", []string{"does no net work"}},
	}
	for _, c := range cases {
		wantInputError(t, c.changes, c.key, c.says, motorSite)
	}
}
