package models

import (
	"fmt"
	"math"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// vacuumKind models a compressor cylinder used as a vacuum pump: it draws
// from a closed vessel and discharges to the atmosphere.
var vacuumKind = calc.Kind{
	Name:    "vacuum",
	Summary: "a compressor cylinder pumping a vessel down: ultimate pressure, pumping speed, pump-down time",
	Doc:     vacuumDoc,
	Roles:   calc.HoldsPressure | calc.HoldsVacuum,
	Inputs: append(cylinderInputs("bore", "stroke", "crank_radius", "rod_length", "clearance_volume", "clearance_ratio",
		"cylinders", "speed", "polytropic_index"),
		calc.InputSpec{Name: "vessel_volume", Dim: units.Volume, Range: calc.Between(minVesselVolume, 1e3), Meaning: "internal volume of the vessel pumped down, with its piping, up to 1000 m3"},
		calc.InputSpec{Name: "target_pressure", Dim: units.Pressure, Absolute: true, Range: positiveUpTo(1e9), Meaning: "absolute pressure the vessel is pumped down to, e.g. \"20 mbar(a)\" or \"15 torr\"; above the ultimate pressure"},
		calc.InputSpec{Name: "start_pressure", Dim: units.Pressure, Optional: true, BelowAmbient: true, Range: positiveUpTo(1e9), Meaning: "vessel pressure when pumping starts, at most ambient; default: ambient"},
	),
	Results: []calc.ResultSpec{
		{Name: "displacement_rate", Dim: units.VolumeFlow, Unit: "L/min", Meaning: "volume all pistons sweep per unit time"},
		{Name: "clearance_ratio", Dim: units.Dimensionless, Unit: "", Meaning: "clearance volume over swept volume"},
		{Name: "ultimate_pressure", Dim: units.Pressure, Unit: "mbar(a)", Meaning: "lowest vessel pressure the cylinder reaches: its volumetric efficiency falls to zero there"},
		{Name: "pumping_speed", Dim: units.VolumeFlow, Unit: "L/min", Meaning: "volume drawn from the vessel per unit time, at vessel pressure, at the start pressure"},
		{Name: "target_pumping_speed", Dim: units.VolumeFlow, Unit: "L/min", Meaning: "volume drawn from the vessel per unit time, at vessel pressure, at the target pressure"},
		{Name: "pumpdown_time", Dim: units.Time, Unit: "s", Meaning: "time from the start pressure to the target pressure"},
	},
	Charts:   []string{"pumpdown"},
	Chart:    vacuumChart,
	Evaluate: evaluateVacuum,
}

const vacuumDoc = `The vacuum kind models a compressor cylinder (the compressor kind's geometry)
used as a vacuum pump: it draws air from a closed vessel of volume V at the
vessel pressure p and discharges it to the atmosphere at p_a. Pressures in
the formulas are absolute. In a block, plain "mbar", "bar", "kPa" and "psi"
are gauge (read from ambient), so write a vacuum target as "20 mbar(a)",
"2 kPa(a)" or "15 torr".

Assumptions
- The compressor kind's ideal cycle: ideal valves, the same polytropic index
  n for compression and re-expansion, clearance re-expansion the only loss.
- Suction at the vessel pressure p, delivery at ambient p_a.
- The vessel stays at constant temperature (isothermal), and nothing leaks
  into it: no leaks, no outgassing, no vapour.

Model
  V̇d = z·π/4·D²·s·N     c = Vc/Vs     τ = V/V̇d
  η_v(p) = 1 − c·((p_a/p)^(1/n) − 1)   volumetric efficiency at ratio p_a/p
  S(p) = V̇d·η_v(p)                     pumping speed, volume at vessel pressure
  p_u = p_a·(c/(1 + c))^n                ultimate pressure, where η_v = 0
  Isothermal vessel: V·dp/dt = −p·S(p). With u = (p_a/p)^(1/n) the integral
  is elementary, and the time from p0 to p is
  t = τ/(1 + c) · [ln(p0/p) + n·ln(η_v(p0)/η_v(p))]
  which tends to τ·ln(p0/p) as the clearance vanishes (constant speed).

Limits
- A target at or below the ultimate pressure is never reached: an error.
- Real pumps fall short of p_u and take longer: valve springs and port
  losses, leaks past rings and valves, outgassing of the vessel walls and
  water vapour. Treat the results as the best the cylinder can do.
  Chart: pumpdown, the vessel pressure (log scale) over time, continued past
  the target (dashed) towards the ultimate pressure.`

// vacuumInput is a vacuum block's inputs in SI, pressures absolute.
type vacuumInput struct {
	cyl                            cylinder
	volume, target, start, ambient float64
}

// vacuumPump is the cylinder as a pump: what the formulas need.
type vacuumPump struct {
	rate    float64 // displacement rate V̇d, m3/s
	c, n    float64 // clearance ratio, polytropic index
	ambient float64 // discharge pressure, Pa absolute
}

// efficiency is the volumetric efficiency with suction at p, delivery at
// ambient; Expm1 keeps it accurate near p = ambient and for n near 1.
func (v vacuumPump) efficiency(p float64) float64 {
	return 1 - v.c*math.Expm1(math.Log(v.ambient/p)/v.n)
}

// ultimate is the suction pressure at which the volumetric efficiency is
// zero.
func (v vacuumPump) ultimate() float64 {
	return v.ambient * math.Pow(v.c/(1+v.c), v.n)
}

// time is the time to pump a vessel of volume vol from p0 down to p
// (both above the ultimate pressure).
func (v vacuumPump) time(vol, p0, p float64) float64 {
	return vol / v.rate / (1 + v.c) * (math.Log(p0/p) + v.n*math.Log(v.efficiency(p0)/v.efficiency(p)))
}

// readVacuumInput applies the checks that single-input ranges cannot, and
// reads the cylinder as the compressor kind does.
func readVacuumInput(in *calc.Inputs) (vacuumInput, vacuumPump, error) {
	v := vacuumInput{volume: in.Value("vessel_volume"), target: in.Value("target_pressure"), start: in.Ambient, ambient: in.Ambient}
	if in.Has("start_pressure") {
		v.start = in.Value("start_pressure")
	}
	mbar := display.TraceIn(in.Customary(), "mbar(a)")
	if v.start > v.ambient {
		return v, vacuumPump{}, &calc.InputError{Key: "start_pressure", Message: fmt.Sprintf(
			"start pressure %s is above ambient %s: the pump starts at or below the atmosphere it discharges to",
			mbar(v.start), mbar(v.ambient))}
	}
	if v.target >= v.start {
		msg := fmt.Sprintf("target pressure %s must be below the start pressure %s", mbar(v.target), mbar(v.start))
		return v, vacuumPump{}, &calc.InputError{Key: "target_pressure", Message: msg}
	}
	cyl, err := readCylinder(in)
	cyl.p1, cyl.p2 = v.target, v.ambient
	if err != nil {
		return v, vacuumPump{}, err
	}
	v.cyl = cyl
	swept := math.Pi / 4 * cyl.bore * cyl.bore * 2 * cyl.crankRadius
	pump := vacuumPump{rate: float64(cyl.cylinders) * swept * cyl.omega / (2 * math.Pi), c: cyl.clearanceRatio, n: cyl.n, ambient: v.ambient}
	if pu := pump.ultimate(); v.target <= pu || !(pump.efficiency(v.target) > 0) {
		return v, vacuumPump{}, &calc.InputError{Key: "target_pressure", Message: fmt.Sprintf(
			"target pressure %s is at or below the ultimate pressure %s of this cylinder (ambient × (c/(1 + c))^n, c = %s, n = %s), "+
				"where its volumetric efficiency falls to zero: it never gets there; raise the target or reduce the clearance",
			mbar(v.target), mbar(pu), display.Number(pump.c, ""), display.Number(pump.n, ""))}
	}
	return v, pump, nil
}

func evaluateVacuum(in *calc.Inputs) (*calc.Outcome, error) {
	v, pump, err := readVacuumInput(in)
	if err != nil {
		return nil, err
	}
	c := v.cyl
	swept := math.Pi / 4 * c.bore * c.bore * 2 * c.crankRadius
	revs := c.omega / (2 * math.Pi)
	cust := in.Customary()
	mbar, lpm, mm, cm3 := display.TraceIn(cust, "mbar(a)"), display.TraceIn(cust, "L/min"), display.TraceIn(cust, "mm"), display.TraceIn(cust, "cm3")
	num := func(x float64) string { return display.Number(x, "") }
	speed := func(p float64) calc.Trace {
		// Near the ultimate pressure η_v is a small difference: more figures.
		sig := display.FiguresFor(1, pump.efficiency(p))
		pa := display.TraceInSig(cust, "mbar(a)", sig)
		return calc.Trace{Formula: "S = V̇d · η_v, η_v = 1 − c·((p_a/p)^(1/n) − 1)", Substituted: fmt.Sprintf("= %s · (1 − %s·((%s/%s)^(1/%s) − 1))", lpm(pump.rate), display.NumberSig(pump.c, "", sig), pa(v.ambient), pa(p), num(pump.n))}

	}
	res := []calc.Result{
		{Name: "displacement_rate", Value: pump.rate, Dim: units.VolumeFlow, Trace: calc.Trace{Formula: "V̇d = z · π/4 · D² · s · N", Substituted: fmt.Sprintf("= %d · π/4 · (%s)² · %s · %s",
			c.cylinders, mm(c.bore), mm(2*c.crankRadius), display.Number(revs, "rev/s"))}},
		clearanceResult(c, swept, cm3),
		{Name: "ultimate_pressure", Value: pump.ultimate(), Dim: units.Pressure, Trace: calc.Trace{Formula: "p_u = p_a · (c/(1 + c))^n", Substituted: fmt.Sprintf("= %s · (%s/(1 + %s))^%s", mbar(v.ambient), num(pump.c), num(pump.c), num(pump.n))}},
		{Name: "pumping_speed", Value: pump.rate * pump.efficiency(v.start), Dim: units.VolumeFlow, Trace: speed(v.start)},
		{Name: "target_pumping_speed", Value: pump.rate * pump.efficiency(v.target), Dim: units.VolumeFlow, Trace: speed(v.target)},
		{Name: "pumpdown_time", Value: pump.time(v.volume, v.start, v.target), Dim: units.Time, Trace: pumpdownTrace(v, pump, cust)},
	}
	return &calc.Outcome{Results: res}, nil
}

// pumpdownTrace shows the pump-down time. A target close to the start
// makes both logarithms small: their arguments get the figures they need
// to work out by hand.
func pumpdownTrace(v vacuumInput, pump vacuumPump, cust bool) calc.Trace {
	e0, e := pump.efficiency(v.start), pump.efficiency(v.target)
	mbar := display.TraceInSig(cust, "mbar(a)", display.FiguresFor(v.start, v.start-v.target))
	eSig := display.FiguresFor(e0, e0-e)
	return calc.Trace{Formula: "t = V/(V̇d·(1 + c)) · [ln(p0/p) + n·ln(η_v(p0)/η_v(p))] (isothermal vessel, no leaks)", Substituted: fmt.Sprintf("= %s/(%s · (1 + %s)) · [ln(%s/%s) + %s·ln(%s/%s)]", display.TraceIn(cust, "L")(v.volume), display.TraceIn(cust, "L/min")(pump.rate),
		display.Number(pump.c, ""), mbar(v.start), mbar(v.target), display.Number(pump.n, ""), display.NumberSig(e0, "", eSig), display.NumberSig(e, "", eSig))}

}

// pumpdownIntervals is the number of intervals of each line of the
// pumpdown chart.
const pumpdownIntervals = 200

// pumpdownTail is how far the chart's dashed continuation goes: to the
// ultimate pressure plus this fraction of the target's excess over it.
const pumpdownTail = 0.01

func vacuumChart(name string, in *calc.Inputs, _ *calc.Outcome) (*calc.Chart, error) {
	if name != "pumpdown" {
		return nil, fmt.Errorf("no chart %q", name)
	}
	v, pump, err := readVacuumInput(in)
	if err != nil {
		return nil, err
	}
	pu := pump.ultimate()
	mbar := display.TraceIn(in.Customary(), "mbar(a)")
	down := calc.Series{Name: "pump-down"}
	for i := range pumpdownIntervals + 1 {
		// Equal steps in ln p from the start to the target.
		p := v.start * math.Pow(v.target/v.start, float64(i)/pumpdownIntervals)
		if i == pumpdownIntervals {
			p = v.target
		}
		down.X, down.Y = append(down.X, pump.time(v.volume, v.start, p)), append(down.Y, p)
	}
	more := calc.Series{Name: "continued pumping", Style: calc.Dashed}
	for i := range pumpdownIntervals + 1 {
		// Equal steps in ln(p − p_u) from the target towards the ultimate.
		p := pu + (v.target-pu)*math.Pow(pumpdownTail, float64(i)/pumpdownIntervals)
		if i == 0 {
			p = v.target
		}
		more.X, more.Y = append(more.X, pump.time(v.volume, v.start, p)), append(more.Y, p)
	}
	t := down.X[len(down.X)-1]
	unit := display.DurationUnit(more.X[len(more.X)-1])
	word := map[string]string{"s": "seconds", "min": "minutes", "h": "hours"}[unit]
	shown, err := units.FromSI(t, units.Time, unit, v.ambient)
	if err != nil {
		return nil, err
	}
	return &calc.Chart{
		Title: "Vessel pressure over time",
		Desc: fmt.Sprintf("The vessel pressure, on a logarithmic scale, falls from %s to the target %s in %s %s (solid), "+
			"then, pumping on (dashed), ever more slowly towards the ultimate pressure %s (horizontal line), where the cylinder's "+
			"clearance gas re-expands to fill the whole stroke and no more air is drawn in.",
			mbar(v.start), mbar(v.target), units.Format(shown, 3), word, mbar(pu)),
		X: calc.Axis{Label: "Time", Dim: units.Time, Unit: unit},
		Panels: []calc.Panel{{
			Y:      calc.Axis{Label: "Vessel pressure", Dim: units.Pressure, Unit: "mbar(a)", Log: true},
			Series: []calc.Series{down, more},
			Marks:  []calc.Mark{{Value: pu, Label: "ultimate pressure"}, {Value: t, Vertical: true, Label: "target"}},
		}},
	}, nil
}
