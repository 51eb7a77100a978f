package models

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// testStage is a machine's stage as the test reads it from the stage
// block's results and inputs: the volume it sweeps per revolution, its
// clearance ratio and index, speed, mechanical efficiency, and the
// temperature it draws at.
type testStage struct {
	disp, c, n, revs, etaM, temp float64
}

// testMachine is a two-or-more-stage machine as the test reads it.
type testMachine struct {
	stages []testStage
	p1, pd float64
	drops  []float64
}

// listInput returns a machine input written as one value or a list, one
// value per intercooler, or nil when absent.
func listInput(e *calc.Evaluated, name string, coolers int) []float64 {
	for _, in := range e.Inputs {
		if in.Name != name {
			continue
		}
		if in.Values != nil {
			return in.Values
		}
		vs := make([]float64, coolers)
		for k := range vs {
			vs[k] = in.Value
		}
		return vs
	}
	return nil
}

// readTestMachine reads machine block e and its stage blocks from set.
func readTestMachine(t *testing.T, set *calc.Set, e *calc.Evaluated) testMachine {
	t.Helper()
	var ids []string
	for _, in := range e.Inputs {
		if in.Name == "stages" {
			ids = in.Links
		}
	}
	m := testMachine{}
	coolers := len(ids) - 1
	tics := listInput(e, "intercooled_temperature", coolers)
	m.drops = listInput(e, "pressure_drop", coolers)
	if m.drops == nil {
		m.drops = make([]float64, coolers)
	}
	for k, id := range ids {
		s, ok := set.Lookup(id)
		if !ok {
			t.Fatalf("no stage %s", id)
		}
		get := func(name string) float64 {
			if r, ok := s.Result(name); ok {
				return r.Value
			}
			v, ok := inputValue(t, s, name)
			if !ok {
				t.Fatalf("stage %s has no %s", id, name)
			}
			return v
		}
		st := testStage{disp: get("displacement"), c: get("clearance_ratio"), n: get("polytropic_index"),
			revs: get("speed") / (2 * math.Pi), etaM: get("mechanical_efficiency"), temp: get("inlet_temperature")}
		if k == 0 {
			m.p1 = s.Ambient
			if v, ok := inputValue(t, s, "inlet_pressure"); ok {
				m.p1 = v
			}
		} else if tics != nil {
			st.temp = tics[k-1]
		}
		m.stages = append(m.stages, st)
		m.pd = get("discharge_pressure")
	}
	if v, ok := inputValue(t, e, "discharge_pressure"); ok {
		m.pd = v
	}
	return m
}

// draw is the mass a stage draws per second from ps against po: the
// compressor kind's volumetric efficiency 1 + c − c·(po/ps)^(1/n), 1 at a
// ratio at or below 1, never below 0, times the displacement rate at the
// suction density p/(R·T).
func (s testStage) draw(ps, po float64) float64 {
	eta := 1.0
	if po > ps {
		eta = math.Max(0, 1+s.c-s.c*math.Pow(po/ps, 1/s.n))
	}
	return eta * s.disp * s.revs * ps / (testAirR * s.temp)
}

// bisectTwoStage solves a two-stage machine against discharge pd by
// bisection on the interstage pressure p (stage 1's discharge) between the
// inlet and pd plus the intercooler drop: what stage 1 delivers falls and
// what stage 2 draws rises with p. When stage 1 still delivers more at the
// top of that range, stage 2 would need a ratio below 1: its valves stand
// open and p is the top. Returns p and the mass flow.
func bisectTwoStage(m testMachine, pd float64) (p, mdot float64) {
	s1, s2, drop := m.stages[0], m.stages[1], m.drops[0]
	excess := func(p float64) float64 { return s1.draw(m.p1, p) - s2.draw(p-drop, pd) }
	lo, hi := math.Min(m.p1, pd)+drop, pd+drop
	if excess(hi) >= 0 {
		return hi, s1.draw(m.p1, hi)
	}
	for range 200 {
		mid := (lo + hi) / 2
		if excess(mid) > 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	p = (lo + hi) / 2
	return p, s1.draw(m.p1, p)
}

// stageFigures are the discharge temperature and indicated power of a
// stage carrying mdot from ps to po, polytropic with its index.
func (s testStage) figures(mdot, ps, po float64) (temp, power float64) {
	r := math.Max(po/ps, 1)
	a := (s.n - 1) / s.n
	return s.temp * math.Pow(r, a), mdot * s.n / (s.n - 1) * testAirR * s.temp * (math.Pow(r, a) - 1)
}

// machineReference computes the test's own references for a two-stage
// machine, "bisection: NAME", from its independent solution; and for any
// machine "draw of stage K", what stage K draws at the pressures the
// machine reports (mass continuity).
func machineReference(t *testing.T, ch *caseCheck, set *calc.Set, e *calc.Evaluated) float64 {
	t.Helper()
	basis := ch.Basis
	m := readTestMachine(t, set, e)
	var k int
	if _, err := fmt.Sscanf(basis, "draw of stage %d", &k); err == nil {
		interstage := func(j int) float64 {
			r, ok := e.Result(fmt.Sprintf("interstage_pressure_%d", j))
			if !ok {
				t.Fatalf("no interstage_pressure_%d", j)
			}
			return r.Value
		}
		ps, po := m.p1, m.pd
		if k > 1 {
			ps = interstage(k-1) - m.drops[k-2]
		}
		if k < len(m.stages) {
			po = interstage(k)
		}
		return m.stages[k-1].draw(ps, po)
	}
	name, ok := strings.CutPrefix(basis, "bisection: ")
	if !ok || len(m.stages) != 2 {
		t.Fatalf("unknown basis %q (bisection is for two stages)", basis)
	}
	s1, s2 := m.stages[0], m.stages[1]
	p, mdot := bisectTwoStage(m, m.pd)
	t1, w1 := s1.figures(mdot, m.p1, p)
	t2, w2 := s2.figures(mdot, p-m.drops[0], m.pd)
	shaft := w1/s1.etaM + w2/s2.etaM
	fad := mdot * testAirR * s1.temp / m.p1
	switch name {
	case "interstage pressure":
		return p
	case "mass flow":
		return mdot
	case "free air delivery":
		return fad
	case "discharge temperature 1":
		return t1
	case "discharge temperature 2":
		return t2
	case "shaft power":
		return shaft
	case "specific power":
		return shaft / fad
	case "intercooler heat":
		// c_p of dry air, 1005 J/(kg K) (Çengel and Boles, ideal-gas
		// specific heats at 300 K; from memory).
		return mdot * 1005 * (t1 - s2.temp)
	case "split mismatch":
		return p/math.Sqrt(m.p1*m.pd) - 1
	case "mean torque":
		return (w1 + w2) / (2 * math.Pi * s1.revs)
	}
	t.Fatalf("unknown basis %q", basis)
	return 0
}

// TestMachineTorqueSumsStages: with the stage blocks computed at the
// pressures the machine runs them at, the machine's torque curve is the
// sum of the stages' own gas torque curves, the second one its phase on:
// half a turn by default, or as its block's phase gives it.
func TestMachineTorqueSumsStages(t *testing.T) {
	for _, c := range []struct {
		phases []string // of the two stages; none for the default
		shift  float64  // of the second stage, in turns
	}{
		{nil, 0.5},
		{[]string{"0 deg", "90 deg"}, 0.25},
		{[]string{"30 deg", "300 deg"}, 0.75},
	} {
		a := map[string]any{"id": "a", "kind": "compressor", "bore": "50 mm", "stroke": "40 mm", "rod_length": "100 mm", "clearance_ratio": 0.05,
			"speed": "600 rpm", "inlet_pressure": "1 bar(a)", "discharge_pressure": "2 bar(a)", "inlet_temperature": "300 K"}
		b := map[string]any{"id": "b", "kind": "compressor", "bore": "50 mm", "stroke": "22 mm", "rod_length": "100 mm", "clearance_ratio": 0.05,
			"speed": "600 rpm", "inlet_pressure": "2 bar(a)", "discharge_pressure": "4 bar(a)", "inlet_temperature": "330 K"}
		if c.phases != nil {
			a["phase"], b["phase"] = c.phases[0], c.phases[1]
		}
		set, err := evaluateBlocks(t, []map[string]any{a, b, {"id": "m", "kind": "machine", "stages": []any{"a", "b"}}})
		if err != nil {
			t.Fatal(err)
		}
		curve := func(id string) []float64 {
			e, _ := set.Lookup(id)
			for _, cv := range e.Curves {
				if cv.Name == "gas_torque" {
					return cv.Y
				}
			}
			t.Fatalf("%s has no gas_torque curve", id)
			return nil
		}
		ya, yb, sum := curve("a"), curve("b"), curve("m")
		m := len(ya) - 1 // samples per turn; the last repeats the first
		// The machine's curve starts at the first stage's top dead centre.
		first := 0
		if c.phases != nil {
			first = m / 12 // 30°
			if c.phases[0] == "0 deg" {
				first = 0
			}
		}
		shift := int(math.Round(c.shift * float64(m)))
		worst := 0.0
		for i := range sum {
			want := ya[((i-first)%m+m)%m] + yb[((i-first-shift)%m+m)%m]
			worst = math.Max(worst, math.Abs(sum[i]-want))
		}
		if worst > 1e-9 {
			t.Errorf("phases %v: machine torque differs from the stages' sum by up to %g N m", c.phases, worst)
		}
	}
}

// TestMachineInputErrors: each mistake a machine block can hold is one
// error on the key to blame, saying what is allowed.
func TestMachineInputErrors(t *testing.T) {
	site := func(changes map[string]any) []map[string]any {
		lp := map[string]any{"id": "lp", "kind": "compressor", "bore": "60 mm", "stroke": "40 mm", "rod_length": "100 mm",
			"clearance_volume": "4.5 cm3", "speed": "800 rpm", "discharge_pressure": "2.2 bar"}
		hp := map[string]any{"id": "hp", "kind": "compressor", "bore": "35 mm", "stroke": "40 mm", "rod_length": "100 mm",
			"clearance_volume": "1.5 cm3", "speed": "800 rpm", "inlet_pressure": "2.2 bar", "discharge_pressure": "9 bar"}
		m := map[string]any{"id": "m", "kind": "machine", "stages": []any{"lp", "hp"}}
		for k, v := range changes {
			target := m
			if name, ok := strings.CutPrefix(k, "hp."); ok {
				target, k = hp, name
			}
			if v == nil {
				delete(target, k)
			} else {
				target[k] = v
			}
		}
		return []map[string]any{lp, hp, m}
	}
	for _, c := range []struct {
		changes map[string]any
		key     string
		says    []string
	}{
		{map[string]any{"stages": []any{"lp"}}, "stages", []string{"names 1 block(s); a machine has 2 to 6 stages"}},
		{map[string]any{"stages": []any{"lp", "lp"}}, "stages", []string{`names block "lp" twice`}},
		{map[string]any{"hp.speed": "900 rpm"}, "stages", []string{"lp turns at 800 rpm and hp at 900 rpm"}},
		{map[string]any{"stages": []any{"hp", "lp"}, "discharge_pressure": "9 bar"}, "stages", []string{"stage hp would deliver at", "below its suction", "the largest first"}},
		{map[string]any{"hp.phase": "90 deg"}, "stages", []string{"some stage blocks give a phase and some do not"}},
		{map[string]any{"discharge_pressure": "0 bar"}, "discharge_pressure", []string{"must be above the machine's inlet"}},
		{map[string]any{"discharge_pressure": "6000 bar"}, "discharge_pressure", []string{"at or above the machine's dead-head pressure"}},
		{map[string]any{"intercooled_temperature": []any{"30 degC", "35 degC"}}, "intercooled_temperature", []string{"gives 2 values for 1 intercooler(s)"}},
		{map[string]any{"pressure_drop": []any{"0.1 bar", "0.1 bar"}}, "pressure_drop", []string{"gives 2 values for 1 intercooler(s)"}},
	} {
		wantInputError(t, c.changes, c.key, c.says, site)
	}
}

// linkedBlock returns the block e's link input key names, the first of a
// list.
func linkedBlock(t *testing.T, set *calc.Set, e *calc.Evaluated, key string) *calc.Evaluated {
	t.Helper()
	for _, in := range e.Inputs {
		if in.Name == key && len(in.Links) > 0 {
			if l, ok := set.Lookup(in.Links[0]); ok {
				return l
			}
		}
	}
	t.Fatalf("block %s links no block in %s", e.Block.ID, key)
	return nil
}

// machineMidpointFill integrates dt = V·dp/(R·T1·ṁ(p)) from p0 to p2 by
// the midpoint rule in equal pressure steps, with ṁ(p) the test's own
// bisection of the two-stage machine at each tank pressure p.
func machineMidpointFill(v, p0, p2 float64, m testMachine) float64 {
	const steps = 20_000
	h := (p2 - p0) / steps
	t := 0.0
	for i := range steps {
		_, mdot := bisectTwoStage(m, p0+(float64(i)+0.5)*h)
		t += v * h / (testAirR * m.stages[0].temp * mdot)
	}
	return t
}

// TestMachineFillBounds: a receiver filled by a machine with no
// intercooler drop fills no slower than from its first stage alone
// compressing straight into the tank (the first stage then delivers
// against the tank pressure, never less than against the interstage), and
// no faster than at the first stage's full displacement,
// t ≥ V·Δp/(p1·V̇d,1), the tank at the inlet temperature. The single
// stage's fill is the test's own midpoint integration.
func TestMachineFillBounds(t *testing.T) {
	for _, c := range []struct{ start, target string }{
		{"0 bar", "8 bar"}, {"0 bar", "1 bar"}, {"3 bar", "9 bar"}, {"6 bar", "6.5 bar"},
	} {
		set, err := evaluateBlocks(t, []map[string]any{
			{"id": "lp", "kind": "compressor", "bore": "60 mm", "stroke": "40 mm", "rod_length": "100 mm", "clearance_volume": "4.5 cm3",
				"speed": "800 rpm", "discharge_pressure": "2.2 bar"},
			{"id": "hp", "kind": "compressor", "bore": "35 mm", "stroke": "40 mm", "rod_length": "100 mm", "clearance_volume": "1.5 cm3",
				"speed": "800 rpm", "inlet_pressure": "2.2 bar", "inlet_temperature": "40 degC", "discharge_pressure": "9 bar"},
			{"id": "bench", "kind": "machine", "stages": []any{"lp", "hp"}},
			{"id": "rx", "kind": "tank", "volume": "25 L", "pressure": c.target, "start_pressure": c.start, "supply": "bench"},
		})
		if err != nil {
			t.Fatal(err)
		}
		rx, _ := set.Lookup("rx")
		lp, _ := set.Lookup("lp")
		fill, _ := rx.Result("fill_time")
		v, _ := inputValue(t, rx, "volume")
		p0, _ := inputValue(t, rx, "start_pressure")
		p2, _ := inputValue(t, rx, "pressure")
		rate, _ := lp.Result("displacement_rate")
		cr, _ := lp.Result("clearance_ratio")
		n, _ := inputValue(t, lp, "polytropic_index")
		alone := midpointFill(v, p0, p2, rate.Value, cr.Value, n, lp.Ambient)
		fastest := v * (p2 - p0) / (lp.Ambient * rate.Value)
		if !(fill.Value <= alone*(1+1e-9) && fill.Value >= fastest) {
			t.Errorf("%s to %s: fill %g s, want between %g s (full displacement) and %g s (the first stage alone)", c.start, c.target, fill.Value, fastest, alone)
		}
	}
}

// TestMachineReadsInItsStagesUnits: a machine block that writes no unit
// of its own shows its figures in its stages' units, customary here.
func TestMachineReadsInItsStagesUnits(t *testing.T) {
	stage := func(id, bore, inlet, discharge string) map[string]any {
		b := map[string]any{"id": id, "kind": "compressor", "bore": bore, "stroke": "1.5 in", "rod_length": "4 in",
			"clearance_volume": "0.2 in3", "speed": "1000 rpm", "discharge_pressure": discharge, "inlet_temperature": "68 degF"}
		if inlet != "" {
			b["inlet_pressure"] = inlet
		}
		return b
	}
	for _, c := range []struct {
		machine map[string]any
		want    map[string]string
	}{
		{map[string]any{"id": "m", "kind": "machine", "stages": []any{"lp", "hp"}},
			map[string]string{"free_air_delivery": "cfm", "interstage_pressure_1": "psig", "discharge_temperature_1": "°F", "shaft_power": "hp", "specific_power": "hp/cfm"}},
		// A unit of its own, metric, takes precedence.
		{map[string]any{"id": "m", "kind": "machine", "stages": []any{"lp", "hp"}, "pressure_drop": "0.1 bar"},
			map[string]string{"free_air_delivery": "L/min", "shaft_power": "W"}},
	} {
		set, err := evaluateBlocks(t, []map[string]any{stage("lp", "2.5 in", "", "30 psi"), stage("hp", "1.5 in", "30 psi", "125 psi"), c.machine})
		if err != nil {
			t.Fatal(err)
		}
		m, _ := set.Lookup("m")
		for name, unit := range c.want {
			got, err := m.Format(name, "")
			if err != nil || !strings.HasSuffix(got, " "+unit) {
				t.Errorf("%v: %s shows as %q (%v), want it in %s", c.machine, name, got, err, unit)
			}
		}
	}
}
