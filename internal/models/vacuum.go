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
	Summary: "a compressor cylinder pumping a vessel down: ultimate pressure, pumping speed, pump-down time, power, discharge temperature, hold force",
	Doc:     vacuumDoc,
	Roles:   calc.HoldsPressure | calc.HoldsVacuum,
	Inputs: append(append(cylinderInputs("bore", "stroke", "crank_radius", "rod_length", "clearance_volume", "clearance_ratio", "cylinders", "speed"),
		calc.InputSpec{Name: "polytropic_index", Dim: units.Dimensionless, Default: "1.3", Range: calc.Between(1, 1.67), Meaning: "n in p·V^n = const for the compression from the vessel pressure to the exhaust, 1 (isothermal) to 1.67; 1.4 is adiabatic air"},
		calc.InputSpec{Name: "reexpansion_index", Dim: units.Dimensionless, Default: "1", Range: calc.Between(1, 1.67), Meaning: "m in p·V^m = const for the clearance air re-expanding, 1 to 1.67, at most polytropic_index; default 1: constant temperature, the conservative textbook figure (the small charge touches warm walls)"},
		calc.InputSpec{Name: "vessel_volume", Dim: units.Volume, Range: calc.Between(minVesselVolume, 1e3), Meaning: "internal volume of the vessel pumped down, with its piping, up to 1000 m3"},
		calc.InputSpec{Name: "target_pressure", Dim: units.Pressure, Absolute: true, Range: positiveUpTo(1e9), Meaning: "absolute pressure the vessel is pumped down to, e.g. \"20 mbar(a)\", \"15 torr\" or \"-990 mbar(g)\"; above the ultimate pressure"},
		calc.InputSpec{Name: "start_pressure", Dim: units.Pressure, Optional: true, BelowAmbient: true, Range: positiveUpTo(1e9), Meaning: "vessel pressure when pumping starts, at most ambient; default: ambient"},
		calc.InputSpec{Name: "exhaust_cracking_pressure", Dim: units.Stress, Default: "0 mbar", Range: calc.Between(0, maxExhaustCracking), Meaning: "pressure difference the exhaust valve needs to open, 0 to 10 bar: the cylinder exhausts, and the clearance air starts re-expanding, at ambient plus this"},
		calc.InputSpec{Name: "leak_rate", Dim: units.Throughput, Default: "0 mbar L/s", Range: calc.Between(0, maxLeakRate), Meaning: "air leaking into the vessel as a throughput (mbar L/s, Pa m3/s, Torr L/s): lowers the pumping speed by leak/p"},
		calc.InputSpec{Name: "clamp_area", Dim: units.Area, Optional: true, Range: positiveUpTo(100), Meaning: "area the vacuum holds down (inside a clamping table's gasket): gives hold_force"},
	), cylinderInputs("inlet_temperature", "head_material", "valve_material")...),
	Results: []calc.ResultSpec{
		{Name: "displacement_rate", Dim: units.VolumeFlow, Unit: "L/min", Meaning: "volume all pistons sweep per unit time"},
		{Name: "clearance_ratio", Dim: units.Dimensionless, Unit: "", Meaning: "clearance volume over swept volume"},
		{Name: "ultimate_pressure", Dim: units.Pressure, Unit: "mbar(a)", Meaning: "lowest vessel pressure the pump reaches: its net pumping speed falls to zero there"},
		{Name: "pumping_speed", Dim: units.VolumeFlow, Unit: "L/min", Meaning: "net volume drawn from the vessel per unit time, at vessel pressure, at the start pressure"},
		{Name: "target_pumping_speed", Dim: units.VolumeFlow, Unit: "L/min", Meaning: "net volume drawn from the vessel per unit time, at vessel pressure, at the target pressure"},
		{Name: "pumpdown_time", Dim: units.Time, Unit: "s", Meaning: "time from the start pressure to the target pressure"},
		{Name: "peak_power", Dim: units.Power, Unit: "W", Meaning: "largest indicated power over the pump-down, at peak_power_pressure"},
		{Name: "peak_power_pressure", Dim: units.Pressure, Unit: "mbar(a)", Meaning: "vessel pressure at which the indicated power is largest"},
		{Name: "discharge_temperature", Dim: units.Temperature, Unit: "degC", Meaning: "air temperature at the end of compression with the vessel at the target pressure; hotter still below it"},
		{Name: "hold_force", Dim: units.Force, Unit: "N", Meaning: "force the atmosphere presses the clamped area down with at the target pressure (with clamp_area)"},
	},
	Charts:   []string{"pumpdown"},
	Chart:    vacuumChart,
	Evaluate: evaluateVacuum,
}

// Bounds of the vacuum inputs beyond any small pump: they keep the model
// finite.
const (
	maxExhaustCracking = 1e6 // Pa: 10 bar across an exhaust valve
	maxLeakRate        = 1e3 // Pa m3/s: 10 000 mbar L/s
)

const vacuumDoc = `The vacuum kind models a compressor cylinder (the compressor kind's geometry)
used as a vacuum pump: it draws air from a closed vessel of volume V at the
vessel pressure p and discharges it to the atmosphere at p_a through an
exhaust valve that needs Δp_ex to open, so the cylinder exhausts at
p_d = p_a + Δp_ex. Pressures in the formulas are absolute. In a block, plain
"mbar", "bar", "kPa" and "psi" are gauge (read from ambient), so write a
vacuum target as "20 mbar(a)", "2 kPa(a)", "15 torr", "20 hPa", or as a
gauge reading "-990 mbar(g)" or "29 inHg vac".

Assumptions
- Ideal valves apart from the exhaust's cracking pressure: no pressure drop
  on suction, no leakage past the piston or the valves.
- The air drawn in is compressed from p to p_d along p·V^n = const
  (polytropic_index n). The clearance air left at p_d re-expands along
  p·V^m = const (reexpansion_index m). The default m = 1 re-expands it at
  constant temperature: the small charge touches the warm walls. That is
  the textbook figure for a piston vacuum pump and the conservative one:
  it gives the highest ultimate pressure. m may not exceed n.
- The vessel stays at constant temperature (isothermal). Air leaks into it
  at the throughput Q (leak_rate); outgassing and vapour are not modelled.

Model
  V̇d = z·π/4·D²·s·N     c = Vc/Vs     τ = V/V̇d
  η_v(p) = 1 − c·((p_d/p)^(1/m) − 1)   volumetric efficiency
  S(p) = V̇d·η_v(p) − Q/p               net pumping speed, volume at p
  Ultimate pressure, where the net speed is zero, p·S(p) = 0:
    without a leak  p_u = p_d·(c/(1 + c))^m
    with m = 1      p_u = (Q/V̇d + c·p_d)/(1 + c)
    otherwise found by bisection.
  Pump-down, V·dp/dt = −p·S(p), with the same speed law:
    without a leak, with u = (p_d/p)^(1/m) the integral is elementary:
    t = τ/(1 + c) · [ln(p0/p) + m·ln(η_v(p0)/η_v(p))]
    (τ·ln(p0/p) as the clearance vanishes); with a leak,
    t = ∫ V dp/(p·S(p)) from p to p0, by Simpson's rule in ln(p − p_u).

Power and temperature
  The indicator diagram at vessel pressure p, with r = p_d/p, Vb = Vs + Vc,
  V2 = Vb·r^(−1/n) (discharge opens), V4 = Vc·r^(1/m) (suction opens):
  W(p) = p·Vb·(r^((n−1)/n) − 1)/(n − 1) + p_d·(V2 − Vc)
       − p_d·Vc·(1 − r^(−(m−1)/m))/(m − 1) − p·(Vb − V4)
  (each index term becomes a logarithm, p·Vb·ln r or p_d·Vc·ln r, at 1).
  P(p) = z·N·W(p), the indicated power. It is small at the start, where
  the pressure ratio is small, and near the ultimate pressure, where little
  air is drawn; peak_power is its largest value over the pump-down, found
  by scanning p from p0 to the target and refining, and
  peak_power_pressure where it occurs.
  T_d = T1·(p_d/p_t)^((n−1)/n), discharge_temperature at the target,
  with T1 the vessel air's temperature. It rises as the vessel pressure
  falls: pumping down to 20 mbar(a) heats the last air to several hundred
  degrees in this model, though so little of it that the cylinder walls
  cool it. The hot-air and material-limit cautions of the compressor kind
  apply, with head_material and valve_material.
  hold_force = (p_a − p_t)·A with clamp_area A: what the atmosphere presses
  a clamped part down with at the target pressure.

Limits
- A target at or below the ultimate pressure is never reached: an error.
- Real pumps fall short of p_u and take longer: valve springs and port
  losses, leaks past rings and valves, outgassing of the vessel walls and
  water vapour. Treat the results as the best the cylinder can do, and the
  power as indicated power: the drive needs more for friction.
  Chart: pumpdown, the vessel pressure (log scale) over time, continued past
  the target (dashed) towards the ultimate pressure.`

// vacuumInput is a vacuum block's inputs in SI, pressures absolute.
type vacuumInput struct {
	cyl                            cylinder
	volume, target, start, ambient float64
	clampArea                      float64 // 0 without clamp_area
}

// vacuumPump is the cylinder as a pump: what the formulas need.
type vacuumPump struct {
	rate    float64 // displacement rate V̇d, m3/s
	c       float64 // clearance ratio
	n, m    float64 // compression and re-expansion indices
	exhaust float64 // p_d, the pressure the cylinder exhausts at, Pa absolute
	leak    float64 // Q, the leak into the vessel, Pa m3/s
}

// efficiency is the volumetric efficiency with suction at p, the clearance
// air re-expanding from the exhaust pressure; Expm1 keeps it accurate near
// p = p_d and for m near 1.
func (v vacuumPump) efficiency(p float64) float64 {
	return 1 - v.c*math.Expm1(math.Log(v.exhaust/p)/v.m)
}

// speed is the net pumping speed at p: the volume drawn less the leak, as
// volumes at p.
func (v vacuumPump) speed(p float64) float64 {
	return v.rate*v.efficiency(p) - v.leak/p
}

// throughput is p·S(p): the air the pump takes from the vessel, net of the
// leak, as pressure times volume per time.
func (v vacuumPump) throughput(p float64) float64 {
	return p*v.rate*v.efficiency(p) - v.leak
}

// ultimate is the vessel pressure at which the net pumping speed is zero.
func (v vacuumPump) ultimate() float64 {
	noLeak := v.exhaust * math.Pow(v.c/(1+v.c), v.m)
	switch {
	case v.leak == 0:
		return noLeak
	case v.m == 1:
		return (v.leak/v.rate + v.c*v.exhaust) / (1 + v.c)
	}
	// p·η_v(p) rises with p above the leak-free ultimate pressure (its
	// slope is at least (1 + c)/m there), so the root is bracketed.
	lo, hi := noLeak, 2*noLeak
	for v.throughput(hi) <= 0 && !math.IsInf(hi, 0) {
		lo, hi = hi, 2*hi
	}
	for range 200 {
		mid := (lo + hi) / 2
		if mid <= lo || mid >= hi {
			break
		}
		if v.throughput(mid) > 0 {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi
}

// simpsonSteps is the number of intervals of the pump-down integral with a
// leak: its integrand, smooth in ln(p − p_u), comes out within 1e-9 of a
// million-step sum (tested).
const simpsonSteps = 2000

// time is the time to pump a vessel of volume vol from p0 down to p (both
// above the ultimate pressure).
func (v vacuumPump) time(vol, p0, p float64) float64 {
	if v.leak == 0 {
		return vol / v.rate / (1 + v.c) * (math.Log(p0/p) + v.m*math.Log(v.efficiency(p0)/v.efficiency(p)))
	}
	// dt = V·dp/(p·S(p)); with p = p_u + e^x the integrand is bounded at
	// the ultimate pressure, where p·S(p) vanishes like p − p_u.
	pu := v.ultimate()
	a, b := math.Log(p-pu), math.Log(p0-pu)
	h := (b - a) / simpsonSteps
	f := func(x float64) float64 {
		e := math.Exp(x)
		return vol * e / v.throughput(pu+e)
	}
	sum := f(a) + f(b)
	for i := 1; i < simpsonSteps; i++ {
		w := 2.0
		if i%2 == 1 {
			w = 4
		}
		sum += w * f(a+float64(i)*h)
	}
	return sum * h / 3
}

// cycleWork is the indicated work of one cylinder in one revolution with
// the vessel at p, by the terms of the indicator diagram: compression,
// delivery, re-expansion and suction.
func (v vacuumPump) cycleWork(swept, p float64) (compress, deliver, reexpand, suction float64) {
	vc := v.c * swept
	vb := swept + vc
	lr := math.Log(v.exhaust / p)
	v2, v4 := vb*math.Exp(-lr/v.n), vc*math.Exp(lr/v.m)
	compress = p * vb * lr
	if v.n != 1 {
		compress = p * vb * math.Expm1((v.n-1)/v.n*lr) / (v.n - 1)
	}
	reexpand = v.exhaust * vc * lr
	if v.m != 1 {
		reexpand = -v.exhaust * vc * math.Expm1(-(v.m-1)/v.m*lr) / (v.m - 1)
	}
	return compress, v.exhaust * (v2 - vc), reexpand, p * (vb - v4)
}

// power is the indicated power of the pump with the vessel at p.
func (v vacuumPump) power(cyl cylinder, swept, p float64) float64 {
	wc, wd, we, ws := v.cycleWork(swept, p)
	return float64(cyl.cylinders) * cyl.omega / (2 * math.Pi) * (wc + wd - we - ws)
}

// peakScan is the number of intervals in ln p over which the power is
// scanned for its peak before refining.
const peakScan = 400

// peakPower finds the largest indicated power over the vessel pressures
// from start down to target, and the pressure where it occurs.
func (v vacuumPump) peakPower(cyl cylinder, swept, start, target float64) (power, at float64) {
	at = start
	power = v.power(cyl, swept, start)
	best := 0
	pAt := func(i int) float64 { return start * math.Pow(target/start, float64(i)/peakScan) }
	for i := 1; i <= peakScan; i++ {
		if w := v.power(cyl, swept, pAt(i)); w > power {
			power, at, best = w, pAt(i), i
		}
	}
	if best == 0 || best == peakScan {
		return power, at
	}
	// Golden-section search in ln p between the neighbours of the best
	// sample, where the power has one peak.
	lo, hi := math.Log(pAt(best+1)), math.Log(pAt(best-1))
	g := (math.Sqrt(5) - 1) / 2
	for range 100 {
		x1, x2 := hi-g*(hi-lo), lo+g*(hi-lo)
		if v.power(cyl, swept, math.Exp(x1)) > v.power(cyl, swept, math.Exp(x2)) {
			hi = x2
		} else {
			lo = x1
		}
	}
	at = math.Exp((lo + hi) / 2)
	return math.Max(power, v.power(cyl, swept, at)), at
}

// readVacuumInput applies the checks that single-input ranges cannot, and
// reads the cylinder as the compressor kind does.
func readVacuumInput(in *calc.Inputs) (vacuumInput, vacuumPump, error) {
	v := vacuumInput{volume: in.Value("vessel_volume"), target: in.Value("target_pressure"), start: in.Ambient,
		ambient: in.Ambient, clampArea: in.Value("clamp_area")}
	if in.Has("start_pressure") {
		v.start = in.Value("start_pressure")
	}
	cust := in.Customary()
	mbar := display.TraceIn(cust, "mbar(a)")
	if v.start > v.ambient {
		return v, vacuumPump{}, &calc.InputError{Key: "start_pressure", Message: fmt.Sprintf(
			"start pressure %s is above ambient %s: the pump starts at or below the atmosphere it discharges to",
			mbar(v.start), mbar(v.ambient))}
	}
	if v.target >= v.start {
		msg := fmt.Sprintf("target pressure %s must be below the start pressure %s", mbar(v.target), mbar(v.start))
		return v, vacuumPump{}, &calc.InputError{Key: "target_pressure", Message: msg}
	}
	n, m := in.Value("polytropic_index"), in.Value("reexpansion_index")
	if m > n {
		return v, vacuumPump{}, &calc.InputError{Key: "reexpansion_index", Message: fmt.Sprintf(
			"reexpansion_index %s is above polytropic_index %s: the clearance air would re-expand more steeply than the charge is compressed, and the cycle would draw air in while delivering none; allowed: 1 up to the polytropic index",
			display.Number(m, ""), display.Number(n, ""))}
	}
	cyl, err := readCylinder(in)
	cyl.p1, cyl.p2, cyl.n = v.target, v.ambient, n
	if err != nil {
		return v, vacuumPump{}, err
	}
	v.cyl = cyl
	swept := math.Pi / 4 * cyl.bore * cyl.bore * 2 * cyl.crankRadius
	pump := vacuumPump{rate: float64(cyl.cylinders) * swept * cyl.omega / (2 * math.Pi), c: cyl.clearanceRatio, n: n, m: m,
		exhaust: v.ambient + in.Value("exhaust_cracking_pressure"), leak: in.Value("leak_rate")}
	if pump.throughput(v.start) <= 0 {
		return v, vacuumPump{}, &calc.InputError{Key: "leak_rate", Message: fmt.Sprintf(
			"leak rate %s is at least what the pump draws from the vessel at the start pressure %s (p·V̇d·η_v = %s): the vessel never pumps down; find the leak or fit a larger pump",
			display.TraceIn(cust, "mbar L/s")(pump.leak), mbar(v.start), display.TraceIn(cust, "mbar L/s")(pump.throughput(v.start)+pump.leak))}
	}
	if pu := pump.ultimate(); v.target <= pu || !(pump.speed(v.target) > 0) {
		return v, vacuumPump{}, &calc.InputError{Key: "target_pressure", Message: fmt.Sprintf(
			"target pressure %s is at or below the ultimate pressure %s of this pump (%s, c = %s, m = %s), "+
				"where its net pumping speed falls to zero: it never gets there; raise the target, reduce the clearance or the leak",
			mbar(v.target), mbar(pu), ultimateFormula(pump), display.Number(pump.c, ""), display.Number(pump.m, ""))}
	}
	return v, pump, nil
}

// ultimateFormula names the formula of the ultimate pressure the pump's
// leak and re-expansion index call for.
func ultimateFormula(pump vacuumPump) string {
	switch {
	case pump.leak == 0:
		return "p_d × (c/(1 + c))^m"
	case pump.m == 1:
		return "(Q/V̇d + c·p_d)/(1 + c)"
	}
	return "where p·V̇d·η_v(p) = Q"
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
	leak := display.TraceIn(cust, "mbar L/s")
	num := func(x float64) string { return display.Number(x, "") }
	t1 := in.Value("inlet_temperature")
	speed := func(p float64) calc.Trace {
		// Near the ultimate pressure η_v is a small difference: more figures.
		sig := display.FiguresFor(1, pump.efficiency(p))
		pa := display.TraceInSig(cust, "mbar(a)", sig)
		t := calc.Trace{Formula: "S = V̇d · η_v, η_v = 1 − c·((p_d/p)^(1/m) − 1)", Substituted: fmt.Sprintf("= %s · (1 − %s·((%s/%s)^(1/%s) − 1))", lpm(pump.rate), display.NumberSig(pump.c, "", sig), pa(pump.exhaust), pa(p), num(pump.m))}
		if pump.leak > 0 {
			t.Formula = "S = V̇d · η_v − Q/p, η_v = 1 − c·((p_d/p)^(1/m) − 1)"
			t.Substituted += fmt.Sprintf(" − %s/%s", leak(pump.leak), pa(p))
		}
		return t
	}
	peak, peakAt := pump.peakPower(c, swept, v.start, v.target)
	wc, wd, we, ws := pump.cycleWork(swept, peakAt)
	joule := func(x float64) string { return display.Number(x, "J") }
	tDischarge := t1 * math.Pow(pump.exhaust/v.target, (pump.n-1)/pump.n)
	gas := func(p float64) units.GasState { return units.GasState{Pressure: p, Temperature: t1} }
	res := []calc.Result{
		{Name: "displacement_rate", Value: pump.rate, Dim: units.VolumeFlow, Trace: calc.Trace{Formula: "V̇d = z · π/4 · D² · s · N", Substituted: fmt.Sprintf("= %d · π/4 · (%s)² · %s · %s",
			c.cylinders, mm(c.bore), mm(2*c.crankRadius), display.Number(revs, "rev/s"))}},
		clearanceResult(c, swept, cm3),
		{Name: "ultimate_pressure", Value: pump.ultimate(), Dim: units.Pressure, Trace: ultimateTrace(pump, cust)},
		{Name: "pumping_speed", Value: pump.speed(v.start), Dim: units.VolumeFlow, Gas: gas(v.start), Trace: speed(v.start)},
		{Name: "target_pumping_speed", Value: pump.speed(v.target), Dim: units.VolumeFlow, Gas: gas(v.target), Trace: speed(v.target)},
		{Name: "pumpdown_time", Value: pump.time(v.volume, v.start, v.target), Dim: units.Time, Trace: pumpdownTrace(v, pump, cust)},
		{Name: "peak_power", Value: peak, Dim: units.Power, Trace: calc.Trace{
			Formula:     "P = z · N · (W_comp + W_del − W_reexp − W_suct), the indicator diagram at vessel pressure p, largest over p from p0 to the target",
			Substituted: fmt.Sprintf("= %d · %s · (%s + %s − %s − %s), at p = %s", c.cylinders, display.Number(revs, "rev/s"), joule(wc), joule(wd), joule(we), joule(ws), mbar(peakAt))}},
		{Name: "peak_power_pressure", Value: peakAt, Dim: units.Pressure, Trace: calc.Trace{
			Formula:     "p where P(p) is largest: a scan of 400 steps in ln p, refined by golden-section search",
			Substituted: "= " + mbar(peakAt)}},
		{Name: "discharge_temperature", Value: tDischarge, Dim: units.Temperature, Trace: calc.Trace{
			Formula:     "T_d = T1 · (p_d/p_t)^((n−1)/n) (at the target pressure)",
			Substituted: fmt.Sprintf("= %s · (%s / %s)^((%s − 1)/%s)", display.Number(t1, "K"), mbar(pump.exhaust), mbar(v.target), num(pump.n), num(pump.n))}},
	}
	if v.clampArea > 0 {
		// The difference of two pressures near each other needs their figures.
		pa := display.TraceInSig(cust, "mbar(a)", display.FiguresFor(v.ambient, v.ambient-v.target))
		res = append(res, calc.Result{Name: "hold_force", Value: (v.ambient - v.target) * v.clampArea, Dim: units.Force, Trace: calc.Trace{
			Formula:     "F = (p_a − p_t) · A",
			Substituted: fmt.Sprintf("= (%s − %s) · %s", pa(v.ambient), pa(v.target), display.TraceIn(cust, "cm2")(v.clampArea))}})
	}
	return &calc.Outcome{Results: res}, nil
}

// ultimateTrace shows the ultimate pressure by the formula the pump's leak
// and re-expansion index call for.
func ultimateTrace(pump vacuumPump, cust bool) calc.Trace {
	mbar, num := display.TraceIn(cust, "mbar(a)"), func(x float64) string { return display.Number(x, "") }
	index := "m = 1: constant temperature, the textbook figure"
	if pump.m != 1 {
		index = "m = " + num(pump.m)
	}
	switch {
	case pump.leak == 0:
		return calc.Trace{Formula: "p_u = p_d · (c/(1 + c))^m, p_d = p_a + Δp_ex (" + index + ")",
			Substituted: fmt.Sprintf("= %s · (%s/(1 + %s))^%s", mbar(pump.exhaust), num(pump.c), num(pump.c), num(pump.m))}
	case pump.m == 1:
		return calc.Trace{Formula: "p_u = (Q/V̇d + c·p_d)/(1 + c), where p·S(p) = 0 (" + index + ")",
			Substituted: fmt.Sprintf("= (%s / %s + %s · %s)/(1 + %s)", display.TraceIn(cust, "mbar L/s")(pump.leak),
				display.TraceIn(cust, "L/s")(pump.rate), num(pump.c), mbar(pump.exhaust), num(pump.c))}
	}
	pu := pump.ultimate()
	return calc.Trace{Formula: "p_u solves p · V̇d · (1 − c·((p_d/p)^(1/m) − 1)) = Q (bisection; " + index + ")",
		Substituted: fmt.Sprintf("= %s, where %s · %s · (1 − %s·((%s/%s)^(1/%s) − 1)) = %s", mbar(pu), mbar(pu), display.TraceIn(cust, "L/s")(pump.rate),
			num(pump.c), mbar(pump.exhaust), mbar(pu), num(pump.m), display.TraceIn(cust, "mbar L/s")(pump.leak))}
}

// pumpdownTrace shows the pump-down time. A target close to the start
// makes both logarithms small: their arguments get the figures they need
// to work out by hand.
func pumpdownTrace(v vacuumInput, pump vacuumPump, cust bool) calc.Trace {
	liters, lpm := display.TraceIn(cust, "L"), display.TraceIn(cust, "L/min")
	if pump.leak > 0 {
		mbar := display.TraceIn(cust, "mbar(a)")
		return calc.Trace{Formula: fmt.Sprintf("t = ∫ V dp / (p·V̇d·η_v(p) − Q) from p_t to p0 (isothermal vessel; Simpson's rule, %d steps in ln(p − p_u))", simpsonSteps),
			Substituted: fmt.Sprintf("= ∫ %s dp / (p · %s · η_v(p) − %s) from %s to %s", liters(v.volume), lpm(pump.rate), display.TraceIn(cust, "mbar L/s")(pump.leak), mbar(v.target), mbar(v.start))}
	}
	e0, e := pump.efficiency(v.start), pump.efficiency(v.target)
	mbar := display.TraceInSig(cust, "mbar(a)", display.FiguresFor(v.start, v.start-v.target))
	eSig := display.FiguresFor(e0, e0-e)
	return calc.Trace{Formula: "t = V/(V̇d·(1 + c)) · [ln(p0/p) + m·ln(η_v(p0)/η_v(p))] (isothermal vessel, no leak)", Substituted: fmt.Sprintf("= %s/(%s · (1 + %s)) · [ln(%s/%s) + %s·ln(%s/%s)]", liters(v.volume), lpm(pump.rate),
		display.Number(pump.c, ""), mbar(v.start), mbar(v.target), display.Number(pump.m, ""), display.NumberSig(e0, "", eSig), display.NumberSig(e, "", eSig))}
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
	why := "the cylinder's clearance gas re-expands to fill the whole stroke and no more air is drawn in"
	if pump.leak > 0 {
		why = "the air the cylinder draws in only just carries away the leak"
	}
	return &calc.Chart{
		Title: "Vessel pressure over time",
		Desc: fmt.Sprintf("The vessel pressure, on a logarithmic scale, falls from %s to the target %s in %s %s (solid), "+
			"then, pumping on (dashed), ever more slowly towards the ultimate pressure %s (horizontal line), where %s.",
			mbar(v.start), mbar(v.target), units.Format(shown, 3), word, mbar(pu), why),
		X: calc.Axis{Label: "Time", Dim: units.Time, Unit: unit},
		Panels: []calc.Panel{{
			Y:      calc.Axis{Label: "Vessel pressure", Dim: units.Pressure, Unit: "mbar(a)", Log: true},
			Series: []calc.Series{down, more},
			Marks:  []calc.Mark{{Value: pu, Label: "ultimate pressure"}, {Value: t, Vertical: true, Label: "target"}},
		}},
	}, nil
}
