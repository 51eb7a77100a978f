package models

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/inputerr"
)

// flywheelReference computes the bases of the flywheel cases: the source
// block's own energy_fluctuation ("source result"), and the inertia of the
// disc or ring with the model's mass and diameter by the elementary
// formulas ½·m·R² ("½·m·R²") and ½·m·(a² + b²) ("½·m·(a² + b²)").
func flywheelReference(t *testing.T, ch *caseCheck, set *calc.Set, e *calc.Evaluated) float64 {
	t.Helper()
	switch ch.Basis {
	case "source result":
		for _, in := range e.Inputs {
			if in.Name == "source" {
				src, _ := set.Lookup(in.Links[0])
				r, ok := src.Result("energy_fluctuation")
				if !ok {
					t.Fatalf("source %s has no energy_fluctuation", in.Links[0])
				}
				return r.Value
			}
		}
		t.Fatalf("block %s has no source", e.Block.ID)
	case "½·m·R²":
		r := mustResult(t, e, "diameter") / 2
		return mustResult(t, e, "mass") * r * r / 2
	case "½·m·(a² + b²)":
		depth, _ := inputValue(t, e, "rim_depth")
		b := mustResult(t, e, "diameter") / 2
		a := b - depth
		return mustResult(t, e, "mass") * (a*a + b*b) / 2
	}
	t.Fatalf("unknown basis %q", ch.Basis)
	return 0
}

// flywheelSite is a source block (the bench compressor, changed by
// "source." keys; or the demo motor when "motor" is set) and a steel disc
// flywheel changed by the other keys (nil removes one).
func flywheelSite(changes map[string]any) []map[string]any {
	src := map[string]any{"id": "low", "kind": "compressor", "bore": "28 mm", "stroke": "32 mm", "rod_length": "70 mm",
		"clearance_volume": "1.8 cm3", "speed": "900 rpm", "discharge_pressure": "6 bar"}
	if _, ok := changes["motor"]; ok {
		src = motorSite(map[string]any{"id": "low"})[0]
	}
	fw := map[string]any{"id": "fw", "kind": "flywheel", "source": "low", "speed_fluctuation": 0.05,
		"material": "s235", "thickness": "20 mm"}
	for k, v := range changes {
		target := fw
		if name, ok := strings.CutPrefix(k, "source."); ok {
			target, k = src, name
		}
		switch {
		case k == "motor":
		case v == nil:
			delete(target, k)
		default:
			target[k] = v
		}
	}
	return []map[string]any{src, fw}
}

// TestFlywheelHoldsSpeed integrates the crankshaft's equation of motion,
// I·ω·dω/dθ = T_m − T(θ), by the classical Runge-Kutta method along the
// source's torque curve (linear between its samples), from the speed chart's
// first point (the chart draws the speed less the mean): the result must
// follow the chart, swing by the speed
// fluctuation asked for, and centre on the source's speed. Sources: the
// bench compressor (gas torque), the same at 3000 rpm with a reciprocating
// mass (total torque), and the air motor.
func TestFlywheelHoldsSpeed(t *testing.T) {
	for _, c := range []struct {
		name    string
		changes map[string]any
		curve   string
	}{
		{"compressor", map[string]any{}, "gas_torque"},
		{"compressor Cs 0.01", map[string]any{"speed_fluctuation": 0.01}, "gas_torque"},
		{"compressor with inertia", map[string]any{"source.reciprocating_mass": "300 g", "source.speed": "3000 rpm"}, "total_torque"},
		{"motor", map[string]any{"motor": true, "shape": "rim", "rim_depth": "10 mm"}, "gas_torque"},
	} {
		t.Run(c.name, func(t *testing.T) {
			set, err := evaluateBlocks(t, flywheelSite(c.changes))
			if err != nil {
				t.Fatal(err)
			}
			fw, _ := set.Lookup("fw")
			src, _ := set.Lookup("low")
			var torque calc.Curve
			for _, cv := range src.Curves {
				if cv.Name == c.curve {
					torque = cv
				}
			}
			chart, err := fw.Chart("speed")
			if err != nil {
				t.Fatal(err)
			}
			excess := chart.Panels[0].Series[0].Y
			inertia, _ := fw.Result("inertia")
			cs, _ := inputValue(t, fw, "speed_fluctuation")
			omega, _ := inputValue(t, src, "speed")
			if len(excess) != len(torque.X) {
				t.Fatalf("chart has %d points, torque curve %d", len(excess), len(torque.X))
			}
			speed := make([]float64, len(excess))
			for i, d := range excess {
				speed[i] = omega + d
			}
			x, y := torque.X, torque.Y
			mean := 0.0
			for i := 1; i < len(x); i++ {
				mean += (y[i] + y[i-1]) / 2 * (x[i] - x[i-1])
			}
			mean /= x[len(x)-1] - x[0]
			// dω/dθ with T linear on [x[i], x[i+1]], at fraction s of it.
			slope := func(i int, s, w float64) float64 {
				return (mean - (y[i] + s*(y[i+1]-y[i]))) / (inertia.Value * w)
			}
			w := speed[0]
			low, high := w, w
			for i := 0; i+1 < len(x); i++ {
				h := x[i+1] - x[i]
				k1 := slope(i, 0, w)
				k2 := slope(i, 0.5, w+h/2*k1)
				k3 := slope(i, 0.5, w+h/2*k2)
				k4 := slope(i, 1, w+h*k3)
				w += h / 6 * (k1 + 2*k2 + 2*k3 + k4)
				if math.Abs(w-speed[i+1]) > 1e-7*omega {
					t.Fatalf("at %g rad: Runge-Kutta %.10g rad/s, chart %.10g rad/s", x[i+1], w, speed[i+1])
				}
				low, high = math.Min(low, w), math.Max(high, w)
			}
			// The chart's 0.5° samples see a little less swing than the
			// model's 0.05° energy: agreement to 0.5 %.
			if got := (high - low) / omega; math.Abs(got-cs) > 5e-3*cs {
				t.Errorf("speed swings by %.6g of the mean, want %g", got, cs)
			}
			if mid := (high + low) / 2; math.Abs(mid-omega) > 1e-3*cs*omega {
				t.Errorf("speed centres on %.9g rad/s, want %.9g", mid, omega)
			}
			if m := chart.Panels[0].Marks; len(m) != 3 || m[0].Value != 0 || m[1].Value != cs*omega/2 || m[2].Value != -cs*omega/2 {
				t.Errorf("marks %+v, want the mean and ±%g rad/s", m, cs*omega/2)
			}
		})
	}
}

// TestFlywheelWithDensity: with a density and no material there is no
// strength, so no safety factor; everything else is there.
func TestFlywheelWithDensity(t *testing.T) {
	set, err := evaluateBlocks(t, flywheelSite(map[string]any{"material": nil, "density": "7850 kg/m3"}))
	if err != nil {
		t.Fatal(err)
	}
	e, _ := set.Lookup("fw")
	if _, ok := e.Result("safety_factor"); ok {
		t.Error("a flywheel given by density has a safety_factor")
	}
	for _, name := range []string{"energy_fluctuation", "inertia", "diameter", "mass", "rim_speed", "rim_stress"} {
		if _, ok := e.Result(name); !ok {
			t.Errorf("no %s", name)
		}
	}
}

func TestFlywheelInputErrors(t *testing.T) {
	cases := []struct {
		changes map[string]any
		key     string
		says    []string
	}{
		{map[string]any{"density": "7850 kg/m3"}, "density", []string{"not both"}},
		{map[string]any{"material": nil}, "density", []string{"missing", "material"}},
		{map[string]any{"material": "unobtainium"}, "material", []string{"not known"}},
		{map[string]any{"shape": "rim"}, "shape", []string{"rim_depth"}},
		{map[string]any{"rim_depth": "10 mm"}, "rim_depth", []string{"shape = \"rim\""}},
		// A 20 mm × 60 mm steel ring already holds 3.2e-3 kg m² as a
		// solid disc 120 mm across; with Cs = 0.5 the wheel needs only
		// 7.0e-4 kg m².
		{map[string]any{"shape": "rim", "rim_depth": "60 mm", "speed_fluctuation": 0.5}, "rim_depth", []string{"no bore", "disc"}},
		{map[string]any{"shape": "hoop"}, "shape", []string{"not known", "disc, rim"}},
		{map[string]any{"speed_fluctuation": 0}, "speed_fluctuation", []string{"out of range"}},
		{map[string]any{"source": []string{"low", "low"}}, "source", []string{`names block "low" twice`, "cylinders"}},
		{map[string]any{"source": []string{"low", "low", "low", "low", "low", "low", "low"}}, "source", []string{`names block "low" twice`}},
	}
	for _, c := range cases {
		wantInputError(t, c.changes, c.key, c.says, flywheelSite)
	}
}

// TestRimDiameter checks the cubic's root against the ring inertia it
// solves, over thin and thick rings.
func TestRimDiameter(t *testing.T) {
	for _, c := range []struct{ dm, h float64 }{{0.2, 0.001}, {0.2, 0.012}, {0.2, 0.19}, {2, 0.01}, {0.05, 0.04}} {
		const rho, width = 7850.0, 0.03
		inertia := rho * math.Pi * width * c.h * c.dm * (c.dm*c.dm + c.h*c.h) / 4
		if got := rimDiameter(inertia, rho, width, c.h); math.Abs(got-c.dm) > 1e-12*c.dm {
			t.Errorf("Dm %g, h %g: solved %.15g", c.dm, c.h, got)
		}
	}
}

// TestFlywheelOnSeveralBlocks: two single-cylinder blocks listed as the
// sources of one flywheel are phased 180° apart and their torques add, so
// the flywheel is the one a single two-cylinder block (whose cylinders the
// compressor model phases evenly) calls for. A third block at another
// speed is refused.
func TestFlywheelOnSeveralBlocks(t *testing.T) {
	stage := func(id string, cylinders int, speed string) map[string]any {
		return map[string]any{"id": id, "kind": "compressor", "bore": "40 mm", "stroke": "30 mm", "rod_length": "80 mm",
			"clearance_ratio": 0.05, "speed": speed, "discharge_pressure": "6 bar", "cylinders": cylinders}
	}
	wheel := func(id string, source any) map[string]any {
		return map[string]any{"id": id, "kind": "flywheel", "source": source, "speed_fluctuation": 0.04,
			"material": "cast-iron", "thickness": "30 mm"}
	}
	set, err := evaluateBlocks(t, []map[string]any{
		stage("a", 1, "900 rpm"), stage("b", 1, "900 rpm"), stage("twin", 2, "900 rpm"),
		wheel("on-two", []any{"a", "b"}), wheel("on-twin", "twin"),
	})
	if err != nil {
		t.Fatal(err)
	}
	two, _ := set.Lookup("on-two")
	twin, _ := set.Lookup("on-twin")
	for _, name := range []string{"energy_fluctuation", "inertia", "diameter"} {
		x, _ := two.Result(name)
		y, _ := twin.Result(name)
		// The twin's ΔE is sampled at 0.1°, the summed curves at 0.5°.
		if math.Abs(x.Value-y.Value) > 2e-3*math.Abs(y.Value) {
			t.Errorf("%s: %g from two blocks, %g from one two-cylinder block", name, x.Value, y.Value)
		}
	}
	_, err = evaluateBlocks(t, []map[string]any{stage("a", 1, "900 rpm"), stage("c", 1, "700 rpm"), wheel("w", []any{"a", "c"})})
	if err == nil || !strings.Contains(err.Error(), "different speeds") {
		t.Errorf("two speeds on one crank: %v", err)
	}
}

// TestFlywheelTurningMomentDiagram checks the energy fluctuation and the
// inertia against a textbook turning-moment-diagram example (R. S. Khurmi
// and J. K. Gupta, Theory of Machines, chapter "Turning Moment Diagrams and
// Flywheel", worked example of a petrol engine; figures from memory): the
// diagram repeats every half revolution, its areas above and below the mean
// torque line, taken in order, are 295, 685, 40, 340, 960 and 270 mm² at
// 5 N·m per mm and 1° per mm; the rotating parts are 36 kg at a radius of
// gyration of 150 mm, at 1800 rpm. The book finds ΔE = 985 mm² (E − 295 to
// E + 690) = 985·5·π/180 J and a coefficient of fluctuation of speed of
// 0.003 (0.3 %).
func TestFlywheelTurningMomentDiagram(t *testing.T) {
	const (
		mmSquared = 5 * math.Pi / 180 // J per mm² of the diagram
		segment   = math.Pi / 6       // six loops in half a revolution
		samples   = 60                // per loop, 0.5° steps as the compressor's curves
		meanTorq  = 40.0              // N·m; any mean gives the same fluctuation
	)
	areas := []float64{-295, 685, -40, 340, -960, 270} // below the mean line negative
	var torque calc.Curve
	torque.Name = "total_torque"
	for half := 0; half < 2; half++ {
		for k, a := range areas {
			// A half-sine loop of width w and area A has amplitude π·A/(2·w).
			amp := math.Pi * a * mmSquared / (2 * segment)
			for j := 0; j < samples; j++ {
				theta0 := float64(half*len(areas)+k) * segment
				torque.X = append(torque.X, theta0+float64(j)*segment/samples)
				torque.Y = append(torque.Y, meanTorq+amp*math.Sin(math.Pi*float64(j)/samples))
			}
		}
	}
	torque.X = append(torque.X, 2*math.Pi)
	torque.Y = append(torque.Y, meanTorq)

	omega := 1800 * 2 * math.Pi / 60
	engine := &calc.Linked{ID: "engine", Kind: "motor", Inputs: map[string]float64{"speed": omega}, Curves: []calc.Curve{torque}}
	in := NewInputs(101325, map[string]float64{"speed_fluctuation": 0.003, "density": 7200, "thickness": 0.03})
	in.SetLinks("source", []*calc.Linked{engine})
	out, err := evaluateFlywheel(in)
	if err != nil {
		t.Fatal(err)
	}
	got := map[string]float64{}
	for _, r := range out.Results {
		got[r.Name] = r.Value
	}
	// ΔE = 985 mm² of the diagram; the trapezoidal rule on 60 samples per
	// loop is within 3e-4 of the exact area.
	wantDE := 985 * mmSquared
	if rel := math.Abs(got["energy_fluctuation"]/wantDE - 1); rel > 1e-3 {
		t.Errorf("energy_fluctuation = %.5g J, want %.5g J (relative error %.2g)", got["energy_fluctuation"], wantDE, rel)
	}
	// I = m·k² = 36 · 0.15² = 0.81 kg m². The book rounds Cs to 0.003 from
	// 0.002986, so the inertia that gives exactly 0.003 is 0.5 % below 0.81.
	if rel := math.Abs(got["inertia"]/(36*0.15*0.15) - 1); rel > 0.01 {
		t.Errorf("inertia = %.5g kg m², want 0.81 kg m² within 1 %% (relative error %.2g)", got["inertia"], rel)
	}
}

// TestFlywheelSevenSources checks that a count of blocks whose phases do
// not fall on the torque samples is refused with the counts that do.
func TestFlywheelSevenSources(t *testing.T) {
	site := flywheelSite(nil)
	var ids []string
	var blocks []map[string]any
	for i := range 7 {
		src := map[string]any{}
		for k, v := range site[0] {
			src[k] = v
		}
		src["id"] = fmt.Sprintf("s%d", i)
		ids = append(ids, src["id"].(string))
		blocks = append(blocks, src)
	}
	site[1]["source"] = ids
	blocks = append(blocks, site[1])
	_, err := evaluateBlocks(t, blocks)
	var list inputerr.List
	if !errors.As(err, &list) || len(list) != 1 || list[0].Key != "source" {
		t.Fatalf("seven sources: got %v, want one error on source", err)
	}
	for _, want := range []string{"7 blocks", "allowed: 1, 2, 3, 4, 5, 6, 8, 9, 10, 12"} {
		if !strings.Contains(list[0].Msg, want) {
			t.Errorf("message %q lacks %q", list[0].Msg, want)
		}
	}
}
