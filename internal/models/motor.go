package models

import (
	"fmt"
	"math"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// motorKind models a single-acting piston air motor: the compressor's
// cylinder and slider crank driven by supply air, with admission to a
// cut-off, polytropic expansion and exhaust to ambient.
var motorKind = calc.Kind{
	Name:    "motor",
	Summary: "a piston air motor (the compressor run backwards): admission to cut-off, expansion, exhaust; power, torque, air consumption",
	Doc:     motorDoc,
	Roles:   calc.HoldsPressure | calc.Crank,
	Raises:  []string{"over-expansion"},
	Inputs: append(cylinderInputs("bore", "stroke", "crank_radius", "rod_length", "clearance_volume", "clearance_ratio", "cylinders", "speed"),
		calc.InputSpec{Name: "supply_pressure", Dim: units.Pressure, Range: positiveUpTo(1e9), Meaning: "pressure of the supply air at the inlet valve, up to 1 GPa; must be above ambient"},
		calc.InputSpec{Name: "cutoff", Dim: units.Dimensionless, Range: calc.Range{Min: 0, Max: 1, HasMin: true, HasMax: true, MinOpen: true},
			Meaning: "fraction of the stroke at which the inlet valve closes, above 0 up to 1 (1: admission over the whole stroke)"},
		calc.InputSpec{Name: "polytropic_index", Dim: units.Dimensionless, Default: "1.3", Range: calc.Between(1, 1.67), Meaning: "n in p·V^n = const for the expansion after cut-off, 1 (isothermal) to 1.67"},
		calc.InputSpec{Name: "supply_temperature", Dim: units.Temperature, Default: "20 degC", Range: calc.Between(minGasTemperature, maxGasTemperature), Meaning: "temperature of the supply air at the inlet valve"},
	),
	Results: []calc.ResultSpec{
		{Name: "swept_volume", Dim: units.Volume, Unit: "cm3", Meaning: "volume one piston sweeps in one stroke"},
		{Name: "expansion_pressure", Dim: units.Pressure, Unit: "bar", Meaning: "cylinder pressure at bottom dead centre, when the exhaust opens"},
		{Name: "expansion_temperature", Dim: units.Temperature, Unit: "degC", Meaning: "air temperature at bottom dead centre, when the exhaust opens"},
		{Name: "exhaust_temperature", Dim: units.Temperature, Unit: "degC", Meaning: "mass-averaged temperature of the air the cylinder exhausts: the blowdown to ambient and the exhaust stroke"},
		{Name: "indicated_work", Dim: units.Energy, Unit: "J", Meaning: "gas work of all cylinders on the pistons in one revolution"},
		{Name: "indicated_power", Dim: units.Power, Unit: "W", Meaning: "gas work per unit time, before friction"},
		{Name: "mean_torque", Dim: units.Torque, Unit: "N m", Meaning: "indicated work per revolution over 2π: the mean torque the motor delivers, before friction"},
		{Name: "air_consumption", Dim: units.VolumeFlow, Unit: "L/min", Meaning: "air admitted, as free air: its volume at ambient pressure and the supply air's own temperature"},
		{Name: "air_mass_flow", Dim: units.MassFlow, Unit: "g/s", Meaning: "mass of air admitted per unit time"},
		{Name: "efficiency", Dim: units.Dimensionless, Unit: "", Meaning: "indicated work over the work of the same air expanding isothermally from supply to ambient pressure"},
		{Name: "energy_fluctuation", Dim: units.Energy, Unit: "J", Meaning: "swing of the energy a flywheel must store and give back against a constant load torque"},
		{Name: "start_torque", Dim: units.Torque, Unit: "N m", Meaning: "least torque the supply air gives the crank from rest, over every crank angle, from the cylinders whose inlet is open there: 0 where the motor can stall (a single cylinder has dead centres)"},
	},
	Charts:   []string{"pv"},
	Chart:    motorChart,
	Evaluate: evaluateMotor,
}

const motorDoc = `The motor kind models a single-acting piston air motor: z identical, evenly
phased cylinders of bore D, stroke s = 2R, rod length L and clearance volume Vc
on one crankshaft at N revolutions per second, driven by supply air at p_s and
T_s and exhausting to ambient p_a (pressures absolute). The geometry inputs are
the compressor's (specgen explain compressor).

The cycle (one cylinder, one revolution, volumes V0 = Vc, V1 = Vc + x_c·Vs,
V2 = Vc + Vs with x_c the cut-off fraction of the stroke)
- Admission: the inlet opens at top dead centre and the cylinder fills to p_s
  at once; the piston moves out at p_s until the inlet closes at V1.
- Expansion: from V1 to bottom dead centre along p·V^n = const, to
  p_e = p_s·(V1/V2)^n.
- Exhaust: the exhaust opens at bottom dead centre, the cylinder blows down
  to p_a at once, and the piston returns at p_a to top dead centre. The
  exhaust stays open to TDC: no compression, so the clearance holds air at
  p_a when the inlet opens and is refilled from the supply every cycle.
- Ideal valves: no pressure drops, no leakage. The crankcase behind the
  piston is at ambient pressure. Constant crank speed.

Work, power and torque
  W1 = p_s·(V1 − V0) + p_s·V1/(n − 1)·(1 − (V1/V2)^(n−1)) − p_a·(V2 − V0)
  (the expansion term is p_s·V1·ln(V2/V1) when n = 1)
  W = z·W1 per revolution   P_i = W·N   T_m = W/2π
  When p_e < p_a the expansion runs below ambient and the end of the stroke
  takes work back (a NOTICE says so): a later cut-off gives more work.
  A cycle that gives back all it gains (W1 <= 0) is refused.

Air consumption
  The air admitted per cycle is what the cylinder holds at cut-off less what
  the clearance held before admission, both taken at the supply temperature:
  m1 = (p_s·V1 − p_a·V0)/(R·T_s). As free air (ambient pressure, supply
  temperature): V_free = (p_s·V1 − p_a·V0)/p_a, and
  air_consumption = z·V_free·N.

Air mass flow
  ṁ = z·(p_s·V1 − p_a·V0)/(R·T_s)·N, R = 287.05 J/(kg K) (dry air).

Expansion and exhaust temperature
  T_e = T_s·(p_e/p_s)^((n−1)/n), the air at bottom dead centre. What leaves
  the cylinder is colder still: when the exhaust opens the air blows down
  to p_a, and what stays behind expands further, reversibly and
  adiabatically (γ = 1.4), to T_r = T_e·(p_a/p_e)^((γ−1)/γ); the piston
  then pushes that out. An energy balance on the cylinder (the air leaving
  carries its enthalpy out of the internal energy left behind) gives the
  mass-averaged temperature of all that leaves:
  T_ex = ((p_e − p_a)·V2/γ + p_a·(V2 − V0)) / (p_e·V2/T_e − p_a·V0/T_r)
  When the expansion ends below ambient, air at T_s flows in instead,
  and what the piston pushes out is the mix,
  T_ex = p_a / (p_e/T_e + (p_a − p_e)/(γ·T_s)).
  Below 0 °C the cold-exhaust caution quotes T_ex: moisture will freeze in
  the exhaust. It is not raised when the expansion ends below ambient,
  where the over-expansion NOTICE says what to change.

Start torque
  From rest, a cylinder whose inlet is open (from top dead centre to the
  cut-off angle θ_c, where x(θ_c) = x_c·s) is at p_s and pushes with
  (p_s − p_a)·A·dx/dθ; one whose inlet is shut gives nothing. start_torque
  is the least sum over every crank angle (sampled as the torque curve,
  and at each top dead centre and just past each cut-off). A single
  cylinder has dead centres: at top dead centre the rod gives no leverage,
  and after cut-off the inlet is shut, so its start torque is 0 and the
  dead-centre CAUTION says so. Several cylinders start from any angle only
  if their inlets overlap enough.

Efficiency
  η = W1 / (p_a·V_free·ln(p_s/p_a)), the indicated work over the work the
  same air would give expanding isothermally from p_s to p_a. It is 1 only
  with no clearance, n = 1 and a cut-off that expands exactly to ambient.

Torque
  T(θ) = −(p(θ) − p_a)·A·dx/dθ, summed over the cylinders, as the compressor
  (load convention: negative where the air drives the crank); the motor
  publishes it as the gas_torque curve for a flywheel block, and
  energy_fluctuation is the max − min of ∫(T_m − T(θ))dθ over a revolution.
  Chart: pv, the indicator diagram of one cylinder.

Limits
- Real motors use less of the stroke at supply pressure (valve and port
  drops), leak, and lose power to friction: treat power and torque as upper
  bounds and the air consumption as a guide.
- The charge is taken at the supply temperature; the expansion cools it, and
  a cold exhaust can ice up with moist air.`

// motorInput is a motor block's inputs in SI, pressures absolute.
type motorInput struct {
	geom      cylinder // cylinder, crank and speed, as a compressor's
	supply    float64
	cutoff, n float64
}

// readMotorInput applies the checks that single-input ranges cannot.
func readMotorInput(in *calc.Inputs) (motorInput, error) {
	m := motorInput{supply: in.Value("supply_pressure"),
		cutoff: in.Value("cutoff"), n: in.Value("polytropic_index")}
	if m.supply <= in.Ambient {
		return m, &calc.InputError{Key: "supply_pressure", Message: fmt.Sprintf(
			"supply pressure %s must be above ambient %s: the air must push the piston out",
			display.GaugeAndAbsolute(m.supply, in.Ambient, in.Customary()), display.TraceIn(in.Customary(), "bar(a)")(in.Ambient))}
	}
	g, err := readCylinder(in)
	g.p2 = m.supply
	if err != nil {
		return m, err
	}
	m.geom = g
	return m, nil
}

// motorCycle is the ideal indicator cycle of one motor cylinder.
type motorCycle struct {
	crank      sliderCrank
	area       float64 // piston area, m2
	v0, v1, v2 float64 // clearance, cut-off and bottom dead centre volumes, m3
	ps, pa     float64 // supply and ambient pressure, Pa absolute
	n          float64
}

func newMotorCycle(m motorInput) motorCycle {
	g := m.geom
	area := math.Pi / 4 * g.bore * g.bore
	swept := area * 2 * g.crankRadius
	return motorCycle{crank: sliderCrank{r: g.crankRadius, l: g.rod}, area: area,
		v0: g.clearanceVolume, v1: g.clearanceVolume + m.cutoff*swept, v2: g.clearanceVolume + swept,
		ps: m.supply, pa: g.ambient, n: m.n}
}

// volume returns the gas volume in the cylinder at crank angle theta.
func (c motorCycle) volume(theta float64) float64 {
	return c.v0 + c.area*c.crank.position(theta)
}

// pressure returns the cylinder pressure at crank angle theta: admission
// and expansion on the out-stroke (0 to π), exhaust on the return.
func (c motorCycle) pressure(theta float64) float64 {
	if math.Mod(theta, 2*math.Pi) > math.Pi {
		return c.pa
	}
	v := c.volume(theta)
	if v <= c.v1 {
		return c.ps
	}
	return c.ps * math.Pow(c.v1/v, c.n)
}

// gasTorque is the load torque of the gas on the crank, as the
// compressor's: negative where the air drives the crank.
func (c motorCycle) gasTorque(theta float64) float64 {
	return -(c.pressure(theta) - c.pa) * c.area * c.crank.velocity(theta)
}

// expansionWork is the work of the gas from cut-off to bottom dead centre.
func (c motorCycle) expansionWork() float64 {
	ratio := c.v2 / c.v1
	if c.n == 1 {
		return c.ps * c.v1 * math.Log(ratio)
	}
	return -c.ps * c.v1 / (c.n - 1) * math.Expm1(-(c.n-1)*math.Log(ratio))
}

func evaluateMotor(in *calc.Inputs) (*calc.Outcome, error) {
	m, err := readMotorInput(in)
	if err != nil {
		return nil, err
	}
	c := newMotorCycle(m)
	var (
		g        = m.geom
		z        = float64(g.cylinders)
		revs     = g.omega / (2 * math.Pi)
		swept    = c.v2 - c.v0
		pe       = c.ps * math.Pow(c.v1/c.v2, c.n)
		expand   = c.expansionWork()
		w1       = c.ps*(c.v1-c.v0) + expand - c.pa*swept
		work     = z * w1
		free     = (c.ps*c.v1 - c.pa*c.v0) / c.pa
		wIso     = c.pa * free * math.Log(c.ps/c.pa)
		meanLoad = -work / (2 * math.Pi)
	)
	if !(w1 > 0) {
		return nil, &calc.InputError{Key: "cutoff", Message: fmt.Sprintf(
			"with a supply of %s and cut-off at %s of the stroke the cycle does no net work (%s per cylinder and revolution): the air expands so far below ambient that the piston gives back more than the admission gained; raise cutoff or supply_pressure",
			display.Gauge(c.ps-c.pa, in.Customary()), display.Number(in.Value("cutoff"), ""), display.Number(w1, "J"))}
	}
	ts := in.Value("supply_temperature")
	te := ts * math.Pow(pe/c.ps, (c.n-1)/c.n)
	steps := crankSteps(g.cylinders)
	gas := phaseSum(sampleRevolution(steps, c.gasTorque), g.cylinders)
	eLow, eHigh := excessEnergyRange(gas, meanLoad)

	cust := in.Customary()
	mm, cm3, bara := display.TraceIn(cust, "mm"), display.TraceIn(cust, "cm3"), display.TraceIn(cust, "bar(a)")
	// The net work is a difference of the admission and expansion work and
	// the exhaust work: enough figures that it works out by hand.
	wSig := display.FiguresFor(c.ps*(c.v1-c.v0)+expand, w1)
	wBar, wCm3 := display.TraceInSig(cust, "bar(a)", wSig), display.TraceInSig(cust, "cm3", wSig)
	num := func(v float64) string { return display.Number(v, "") }
	rps := display.Number(revs, "rev/s")
	expandTrace := "p_s·V1/(n−1)·(1 − (V1/V2)^(n−1))"
	if c.n == 1 {
		expandTrace = "p_s·V1·ln(V2/V1)"
	}
	res := []calc.Result{
		{Name: "swept_volume", Value: swept, Dim: units.Volume, Trace: calc.Trace{Formula: "Vs = π/4 · D² · s", Substituted: "= π/4 · (" + mm(g.bore) + ")² · " + mm(2*g.crankRadius)}},
		{Name: "expansion_pressure", Value: pe, Dim: units.Pressure, Trace: calc.Trace{Formula: "p_e = p_s · (V1/V2)^n, V1 = Vc + x_c·Vs, V2 = Vc + Vs", Substituted: "= " + bara(c.ps) + " · (" + cm3(c.v1) + " / " + cm3(c.v2) + ")^" + num(c.n)}},
		{Name: "expansion_temperature", Value: te, Dim: units.Temperature, Trace: calc.Trace{Formula: "T_e = T_s · (p_e/p_s)^((n−1)/n)", Substituted: "= " + display.Number(ts, "K") + " · (" + bara(pe) + " / " + bara(c.ps) + ")^((" + num(c.n) + " − 1)/" + num(c.n) + ")"}},
		exhaustTemperature(c, pe, te, ts, cust),
		{Name: "indicated_work", Value: work, Dim: units.Energy, Trace: calc.Trace{Formula: "W = z · (p_s·(V1 − Vc) + " + expandTrace + " − p_a·Vs)", Substituted: "= " + num(z) + " · (" + wBar(c.ps) + " · " + wCm3(c.v1-c.v0) + " + " + display.NumberSig(expand, "J", wSig) + " − " + wBar(c.pa) + " · " + wCm3(swept) + ")"}},
		{Name: "indicated_power", Value: work * revs, Dim: units.Power, Trace: calc.Trace{Formula: "P_i = W · N", Substituted: "= " + display.Number(work, "J") + " · " + rps}},
		{Name: "mean_torque", Value: work / (2 * math.Pi), Dim: units.Torque, Trace: calc.Trace{Formula: "T_m = W / 2π", Substituted: "= " + display.Number(work, "J") + " / 2π"}},
		{Name: "air_consumption", Value: z * free * revs, Dim: units.VolumeFlow, Gas: units.GasState{Pressure: c.pa, Temperature: ts}, Trace: calc.Trace{Formula: "Q = z · (p_s·V1 − p_a·Vc) / p_a · N (free air at p_a and T_s)", Substituted: "= " + num(z) + " · (" + bara(c.ps) + " · " + cm3(c.v1) + " − " + bara(c.pa) + " · " + cm3(c.v0) + ") / " + bara(c.pa) + " · " + rps}},
		{Name: "air_mass_flow", Value: z * c.pa * free / (airGasConstant * ts) * revs, Dim: units.MassFlow, Trace: calc.Trace{Formula: "ṁ = z · (p_s·V1 − p_a·Vc) / (R·T_s) · N, R = 287.05 J/(kg K)", Substituted: "= " + num(z) + " · (" + bara(c.ps) + " · " + cm3(c.v1) + " − " + bara(c.pa) + " · " + cm3(c.v0) + ") / (287.05 J/(kg K) · " + display.Number(ts, "K") + ") · " + rps}},
		{Name: "efficiency", Value: w1 / wIso, Dim: units.Dimensionless, Trace: calc.Trace{Formula: "η = W1 / (p_a · V_free · ln(p_s/p_a))", Substituted: "= " + display.Number(w1, "J") + " / (" + bara(c.pa) + " · " + cm3(free) + " · ln(" + bara(c.ps) + " / " + bara(c.pa) + "))"}},
		{Name: "energy_fluctuation", Value: eHigh - eLow, Dim: units.Energy, Trace: calc.Trace{Formula: "ΔE = max − min of ∫(T_m − T(θ)) dθ", Substituted: "= " + display.Number(eHigh, "J") + " − (" + display.Number(eLow, "J") + ")"}},
		startTorque(c, m, steps, cust),
	}
	out := &calc.Outcome{Results: res}
	if in.WantCurves() {
		out.Curves = motorCurves(c, gas, steps)
	}
	if pe < c.pa {
		out.Cautions = append(out.Cautions, calc.CautionNote{Level: calc.Notice, Rule: "over-expansion", Result: "expansion_pressure", Message: fmt.Sprintf(
			"The air expands to %s, below ambient %s, before the exhaust opens: the end of each stroke takes work back. "+
				"A later cut-off gives more work for a little more air.", bara(pe), bara(c.pa))})
	}
	return out, nil
}

// exhaustGamma is the ratio of specific heats of air for the blowdown
// (ideal diatomic gas).
const exhaustGamma = 1.4

// exhaustTemperature is the mass-averaged temperature of the air the
// cylinder exhausts: blown down from (p_e, T_e) to ambient at bottom dead
// centre, the rest pushed out by the piston; or, when the expansion ends
// below ambient, the mix with the air at T_s that flows in.
func exhaustTemperature(c motorCycle, pe, te, ts float64, cust bool) calc.Result {
	g := exhaustGamma
	bara, cm3, kelvin := display.TraceIn(cust, "bar(a)"), display.TraceIn(cust, "cm3"), func(t float64) string { return display.Number(t, "K") }
	if pe < c.pa {
		return calc.Result{Name: "exhaust_temperature", Value: c.pa / (pe/te + (c.pa-pe)/(g*ts)), Dim: units.Temperature, Trace: calc.Trace{
			Formula:     "T_ex = p_a / (p_e/T_e + (p_a − p_e)/(γ·T_s)), γ = 1.4 (expansion below ambient: air at T_s flows in, and the mix is pushed out)",
			Substituted: fmt.Sprintf("= %s / (%s/%s + (%s − %s)/(1.4 · %s))", bara(c.pa), bara(pe), kelvin(te), bara(c.pa), bara(pe), kelvin(ts))}}
	}
	tr := te * math.Pow(c.pa/pe, (g-1)/g)
	// The blowdown's share is a small difference when p_e is near p_a.
	pSig := display.TraceInSig(cust, "bar(a)", display.FiguresFor(pe, pe-c.pa))
	return calc.Result{Name: "exhaust_temperature", Value: ((pe-c.pa)*c.v2/g + c.pa*(c.v2-c.v0)) / (pe*c.v2/te - c.pa*c.v0/tr), Dim: units.Temperature, Trace: calc.Trace{
		Formula: "T_ex = ((p_e − p_a)·V2/γ + p_a·(V2 − Vc)) / (p_e·V2/T_e − p_a·Vc/T_r), T_r = T_e·(p_a/p_e)^((γ−1)/γ), γ = 1.4 (blowdown to ambient, then the exhaust stroke)",
		Substituted: fmt.Sprintf("= ((%s − %s) · %s/1.4 + %s · (%s − %s)) / (%s · %s/%s − %s · %s/%s)",
			pSig(pe), pSig(c.pa), cm3(c.v2), bara(c.pa), cm3(c.v2), cm3(c.v0), bara(pe), cm3(c.v2), kelvin(te), bara(c.pa), cm3(c.v0), kelvin(tr))}}
}

// cutoffAngle is the crank angle from top dead centre at which the piston
// has travelled the cut-off fraction of its stroke.
func cutoffAngle(c motorCycle, cutoff float64) float64 {
	x := cutoff * 2 * c.crank.r
	lo, hi := 0.0, math.Pi
	for range 100 {
		mid := (lo + hi) / 2
		if c.crank.position(mid) < x {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}

// startTorque is the least torque the supply air gives the crank from rest
// over every crank angle: the cylinders whose inlet is open there push at
// the supply pressure, the others give nothing.
func startTorque(c motorCycle, m motorInput, steps int, cust bool) calc.Result {
	z := m.geom.cylinders
	thetaC := cutoffAngle(c, m.cutoff)
	phase := 2 * math.Pi / float64(z)
	// at sums the pushes at crank angle theta; skip is a cylinder whose
	// inlet has just closed there.
	at := func(theta float64, skip int) float64 {
		sum := 0.0
		for k := range z {
			local := math.Mod(theta-float64(k)*phase+4*math.Pi, 2*math.Pi)
			if k != skip && local < thetaC {
				sum += (c.ps - c.pa) * c.area * c.crank.velocity(local)
			}
		}
		return sum
	}
	least, where := math.Inf(1), 0.0
	try := func(theta float64, skip int) {
		if t := at(theta, skip); t < least {
			least, where = t, theta
		}
	}
	for i := range steps {
		try(2*math.Pi*float64(i)/float64(steps), -1)
	}
	for k := range z {
		try(float64(k)*phase, -1)
		try(float64(k)*phase+thetaC, k)
	}
	deg := func(rad float64) string { return display.Number(math.Mod(rad, 2*math.Pi)*180/math.Pi, "°") }
	why := fmt.Sprintf("least at θ = %s, cut-off at θ_c = %s, %s", deg(where), deg(thetaC), phasing(z))
	if least <= 0 && z == 1 {
		why = fmt.Sprintf("0 at top dead centre, where the rod gives no leverage, and from cut-off at θ_c = %s to bottom dead centre, where the inlet is shut: a single cylinder has dead centres", deg(thetaC))
	} else if least <= 0 {
		why = fmt.Sprintf("0 at θ = %s, where no inlet is open with leverage on the crank (cut-off at θ_c = %s, %s)", deg(where), deg(thetaC), phasing(z))
	}
	return calc.Result{Name: "start_torque", Value: math.Max(least, 0), Dim: units.Torque, Trace: calc.Trace{
		Formula:     "T_start = min over θ of Σ (p_s − p_a)·A·dx/dθ over the cylinders whose inlet is open (0 ≤ θ_k < θ_c)",
		Substituted: fmt.Sprintf("= %s (%s)", display.TraceIn(cust, "N m")(math.Max(least, 0)), why)}}
}

// motorCurves returns the indicator diagram of one cylinder, closed at top
// dead centre, and the crankshaft's gas torque over a revolution.
func motorCurves(c motorCycle, gas []float64, steps int) []calc.Curve {
	stride := steps / curvePoints
	pv := calc.Curve{Name: "pv", XDim: units.Volume, YDim: units.Pressure}
	torque := calc.Curve{Name: "gas_torque", XDim: units.Angle, YDim: units.Torque}
	for i := 0; i <= steps; i += stride {
		theta := 2 * math.Pi * float64(i) / float64(steps)
		pv.X, pv.Y = append(pv.X, c.volume(theta)), append(pv.Y, c.pressure(theta))
		torque.X, torque.Y = append(torque.X, theta), append(torque.Y, gas[i%steps])
	}
	// The last sample is the exhaust at TDC; admission closes the loop.
	pv.X, pv.Y = append(pv.X, c.v0), append(pv.Y, c.ps)
	return []calc.Curve{pv, torque}
}

func motorChart(name string, in *calc.Inputs, out *calc.Outcome) (*calc.Chart, error) {
	if name != "pv" {
		return nil, fmt.Errorf("no chart %q", name)
	}
	m, err := readMotorInput(in)
	if err != nil {
		return nil, err
	}
	pv, ok := out.Curve("pv")
	if !ok {
		return nil, fmt.Errorf("the model gave no p-V curve")
	}
	c := newMotorCycle(m)
	pe := c.ps * math.Pow(c.v1/c.v2, c.n)
	barA := display.Described(in.Customary(), "bar(a)")
	cycle := calc.Series{Name: "indicator cycle", X: pv.X, Y: pv.Y, Labels: []calc.PointLabel{
		{X: (c.v0 + c.v1) / 2, Y: c.ps, Text: "admission"},
		{X: (c.v1 + c.v2) / 2, Y: c.ps * math.Pow(2*c.v1/(c.v1+c.v2), c.n), Text: "expansion"},
		{X: (c.v0 + c.v2) / 2, Y: c.pa, Text: "exhaust", Below: true},
	}}
	return &calc.Chart{
		Title: "Pressure over cylinder volume",
		Desc: fmt.Sprintf("The indicator diagram of one cylinder: supply air at %s fills the cylinder to cut-off at %s of the stroke, expands along p·V^%s to %s at bottom dead centre, and is pushed out at ambient %s; the enclosed area is the work of one cycle.",
			barA(c.ps), units.Format(m.cutoff, 3), units.Format(c.n, 3), barA(pe), barA(c.pa)),
		X:      calc.Axis{Label: "Cylinder volume", Dim: units.Volume, Unit: "cm3"},
		Panels: []calc.Panel{{Y: calc.Axis{Label: "Cylinder pressure", Dim: units.Pressure, Unit: "bar(a)"}, Series: []calc.Series{cycle}}},
	}, nil
}
