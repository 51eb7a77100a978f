package models

import (
	"fmt"
	"math"
	"sync"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// compressorKind models one single-acting compressor stage of identical,
// evenly phased cylinders: slider-crank geometry, the ideal polytropic
// cycle with clearance re-expansion, piston force, crank torque and power.
var compressorKind = calc.Kind{
	Name:            "compressor",
	Summary:         "one single-acting stage: slider-crank geometry, polytropic cycle with clearance re-expansion, forces, torque, power",
	Doc:             compressorDoc,
	Roles:           calc.HoldsPressure | calc.Delivers | calc.Crank,
	WorkingPressure: calc.WorkingPressure{Key: "discharge_pressure", Name: "discharge pressure"},
	Raises:          []string{"no-delivery"},
	Inputs: append(append(cylinderInputs("bore", "stroke", "crank_radius", "rod_length", "clearance_volume", "clearance_ratio",
		"cylinders", "speed"),
		calc.InputSpec{Name: "discharge_pressure", Dim: units.Pressure, Range: positiveUpTo(1e9), Meaning: "pressure the cylinder delivers against, up to 1 GPa"},
	), append(cylinderInputs("inlet_pressure", "inlet_temperature", "polytropic_index", "mechanical_efficiency",
		"head_material", "valve_material", "reciprocating_mass"),
		calc.InputSpec{Name: "phase", Dim: units.Angle, Optional: true, Range: calc.Range{Min: 0, Max: 2 * math.Pi, HasMin: true, HasMax: true, MaxOpen: true},
			Meaning: "crank angle, 0 to under 360°, by which this stage reaches top dead centre after the crank's zero, for a machine block that lists it; default: a machine spaces its stages evenly"},
		calc.InputSpec{Name: "rod_width", Dim: units.Length, Optional: true, Range: calc.Between(minPartSize, 1), Meaning: "width of the connecting rod in its plane of swing where it passes the bottom edge of the cylinder wall, up to 1 m; give liner_bottom with it for rod_clearance"},
		calc.InputSpec{Name: "liner_bottom", Dim: units.Length, Optional: true, Range: calc.Between(minPartSize, 50), Meaning: "distance from the crank axis up to the bottom edge of the cylinder wall (bore or liner), up to 50 m; give rod_width with it"},
	)...),
	Results: []calc.ResultSpec{
		{Name: "piston_area", Dim: units.Area, Unit: "cm2", Meaning: "area of one piston"},
		{Name: "swept_volume", Dim: units.Volume, Unit: "cm3", Meaning: "volume one piston sweeps in one stroke"},
		{Name: "displacement", Dim: units.Volume, Unit: "cm3", Meaning: "volume all pistons sweep in one revolution"},
		{Name: "displacement_rate", Dim: units.VolumeFlow, Unit: "L/min", Meaning: "displacement times speed"},
		{Name: "clearance_ratio", Dim: units.Dimensionless, Unit: "", Meaning: "clearance volume over swept volume"},
		{Name: "compression_ratio", Dim: units.Dimensionless, Unit: "", Meaning: "largest over smallest cylinder volume, (Vs + Vc)/Vc"},
		{Name: "pressure_ratio", Dim: units.Dimensionless, Unit: "", Meaning: "discharge over inlet pressure, both absolute"},
		{Name: "volumetric_efficiency", Dim: units.Dimensionless, Unit: "", Meaning: "air drawn in per stroke over swept volume, from clearance re-expansion only"},
		{Name: "free_air_delivery", Dim: units.VolumeFlow, Unit: "L/min", Meaning: "air delivered, as volume at inlet conditions"},
		{Name: "max_pressure", Dim: units.Pressure, Unit: "bar", Meaning: "dead-head pressure: what the cylinder reaches with the outlet blocked"},
		{Name: "discharge_temperature", Dim: units.Temperature, Unit: "degC", Meaning: "air temperature at the end of compression"},
		{Name: "peak_piston_force", Dim: units.Force, Unit: "N", Meaning: "largest gas force on one piston against the crankcase"},
		{Name: "mean_piston_speed", Dim: units.Velocity, Unit: "m/s", Meaning: "twice the stroke times speed"},
		{Name: "max_rod_angle", Dim: units.Angle, Unit: "deg", Meaning: "largest angle of the rod to the line of stroke"},
		{Name: "indicated_work", Dim: units.Energy, Unit: "J", Meaning: "gas work of all cylinders in one revolution"},
		{Name: "indicated_power", Dim: units.Power, Unit: "W", Meaning: "gas work per unit time"},
		{Name: "isothermal_power", Dim: units.Power, Unit: "W", Meaning: "power to compress the same air isothermally, the ideal"},
		{Name: "shaft_power", Dim: units.Power, Unit: "W", Meaning: "power the drive must supply: indicated over mechanical efficiency"},
		{Name: "mean_torque", Dim: units.Torque, Unit: "N m", Meaning: "indicated work per revolution over 2π: the steady drive torque without friction"},
		{Name: "peak_torque", Dim: units.Torque, Unit: "N m", Meaning: "largest gas load torque on the crankshaft over a revolution"},
		{Name: "energy_fluctuation", Dim: units.Energy, Unit: "J", Meaning: "swing of the energy a flywheel must store and give back against a constant drive torque"},
		{Name: "rod_clearance", Dim: units.Length, Unit: "mm", Meaning: "least gap over a revolution between the swinging rod and the bottom inner corner of the bore, negative where they overlap (with rod_width and liner_bottom)"},
	},
	Charts:   compressorCharts,
	Chart:    compressorChart,
	Evaluate: evaluateCompressor,
}

const compressorDoc = `The compressor kind models one single-acting compression stage: z identical
cylinders on one crankshaft, each with bore D, stroke s = 2R, rod length L and
clearance volume Vc, turning at N revolutions per second, drawing air at p1, T1
and delivering it at p2 (pressures absolute).

Assumptions
- Ideal valves: no pressure drop, no leakage, no throttling; suction happens at
  exactly p1 and delivery at exactly p2.
- Compression and re-expansion of the clearance gas both follow p·V^n = const
  with the same polytropic index n (1 ≤ n ≤ 1.67; n = 1 is isothermal).
- Volumetric efficiency comes from clearance re-expansion only: no heating of
  the charge by the cylinder walls, no leakage past the rings or valves.
- The air drawn in is at inlet conditions (p1, T1); free air delivery is that
  volume per unit time, the idea behind ISO 1217.
- The crankcase behind the piston is at ambient pressure.
- The cylinders are evenly phased: cylinder k reaches top dead centre 360°·k/z
  after cylinder 0, and their torques add on the one crankshaft.
- Constant crank speed for the inertia torque.

Geometry
  A = π/4·D²   Vs = A·s   V_d = z·Vs   V̇_d = V_d·N   c = Vc/Vs
  CR = (Vs + Vc)/Vc   c_m = 2·s·N   φ_max = asin(R/L)
  Piston travel from TDC (exact slider-crank):
  x(θ) = R·(1 − cos θ) + L − sqrt(L² − R²·sin² θ)

Cycle
  r = p2/p1   η_v = 1 − c·(r^(1/n) − 1)   FAD = η_v·V̇_d
  p_max = p1·CR^n (dead-head)   T2 = T1·r^((n−1)/n)
  W = z·n/(n−1)·p1·Vi·(r^((n−1)/n) − 1) with Vi = η_v·Vs (per revolution)
  W = z·p1·Vi·ln r when n = 1
  P_i = W·N   P_iso = z·p1·Vi·ln r·N   P_s = P_i/η_m
  F_peak = max(p_top − p_amb, p_amb − p1)·A, p_top = p2 (or p_max when
  lower): the larger of the load on delivery and, with an inlet below
  ambient, on suction

Torque
  The cylinder pressure p(θ) follows re-expansion, suction, compression and
  delivery over 0..360° from TDC. The gas load torque on the crank, by virtual
  work, is T(θ) = −(p(θ) − p_amb)·A·dx/dθ (positive when the crank drives the
  piston), summed over the cylinders and sampled every 0.1° of crank angle or
  finer. T_m = W/2π; peak_torque is the largest summed load torque;
  energy_fluctuation is the max − min of ∫(T_m − T(θ))dθ over a revolution,
  the energy a flywheel must absorb. With a reciprocating mass m per
  cylinder, the inertia torque m·ω²·(d²x/dθ²)·(dx/dθ) is drawn as a separate
  curve; it is not in the results, nor in the peak piston force.
  Curves: pv (one cylinder, with the isothermal compression line dashed for
  comparison); gas_torque, inertia_torque and total_torque (all cylinders,
  over crank angle). phase plays no part here: a machine block that lists
  the stage reads it to place the stage on its crank.

Limits
- When p2 ≥ p_max the discharge valve never opens: volumetric efficiency,
  free air delivery and indicated work are 0 and a DANGER caution is raised.
- Real machines deliver less than η_v·V̇_d (heating, leakage, valve losses)
  and need more than P_s; treat the results as upper bounds on delivery and
  lower bounds on power.
- The discharge temperature assumes the same n; real discharge temperatures
  depend on cooling. With no delivery it is the peak of the trapped air,
  T1·CR^(n−1).

Rod swing (with rod_width and liner_bottom)
  The crank axis is the origin and the line of stroke the y axis: the crank
  pin is at (R·sin θ, R·cos θ), the wrist pin at (0, R·cos θ + sqrt(L² −
  R²·sin² θ)), and the bottom inner corners of the bore at (±D/2, h), h the
  height of the cylinder wall's bottom edge above the crank axis.
  rod_clearance is the least distance from a corner to the rod's
  centreline, less half rod_width, over the crank angles at which the
  centreline crosses height h: sampled every 0.1°, refined by
  golden-section search, and taken at the angles where either pin passes
  h. Negative means the rod's outline overlaps the corner. The rod is a
  strip of constant width there; a rod that widens towards the big end, the
  crank webs and the counterweights are not checked. The kinematics chart
  marks the crank angle of the least clearance; the rod-strikes-liner rule
  raises a DANGER at or below 0 and a WARNING below 1 mm.`

// readCompressor reads a compressor block: its cylinder, then its
// inlet and discharge pressures.
func readCompressor(in *calc.Inputs) (cylinder, error) {
	c, err := readCylinder(in)
	if err != nil {
		return c, err
	}
	c.p2 = in.Value("discharge_pressure")
	if in.Has("inlet_pressure") {
		c.p1 = in.Value("inlet_pressure")
	}
	if c.p2 <= c.p1 {
		pair := func(p float64) string { return display.GaugeAndAbsolute(p, in.Ambient, in.Customary()) }
		return c, &calc.InputError{Key: "discharge_pressure", Message: fmt.Sprintf(
			"discharge pressure %s must be above the inlet pressure %s", pair(c.p2), pair(c.p1))}
	}
	return c, nil
}

func evaluateCompressor(in *calc.Inputs) (*calc.Outcome, error) {
	c, err := readCompressor(in)
	if err != nil {
		return nil, err
	}
	var (
		z      = float64(c.cylinders)
		stroke = 2 * c.crankRadius
		revs   = c.omega / (2 * math.Pi) // rev/s
		area   = math.Pi / 4 * c.bore * c.bore
		swept  = area * stroke
		disp   = z * swept
		rate   = disp * revs
		cr     = (swept + c.clearanceVolume) / c.clearanceVolume
		r      = c.p2 / c.p1
		pMax   = c.p1 * math.Pow(cr, c.n)
		ve     = 1 - c.clearanceRatio*(math.Pow(r, 1/c.n)-1)
	)
	delivers := ve > 0
	if !delivers {
		ve = 0
	}
	vi := ve * swept
	work := z * polytropicWork(c.p1, vi, r, c.n)
	power := work * revs
	isoPower := z * polytropicWork(c.p1, vi, r, 1) * revs
	meanTorque := work / (2 * math.Pi)

	cyc := c.cycleAt(c.p1, c.p2)
	steps := crankSteps(c.cylinders)
	if in.CurvesOnly() {
		return &calc.Outcome{Curves: compressorCurves(cyc, c, nil, steps)}, nil
	}
	oneBuf, sumBuf := revolutionScratch(steps), revolutionScratch(steps)
	defer revolutions.Put(oneBuf)
	defer revolutions.Put(sumBuf)
	gas := phaseSumInto(*sumBuf, sampleInto(*oneBuf, cyc.gasTorque), c.cylinders)
	peakTorque := gas[0]
	for _, t := range gas {
		peakTorque = math.Max(peakTorque, t)
	}
	eLow, eHigh := excessEnergyRange(gas, meanTorque)

	// Trace helpers in convenient units, customary for a customary block.
	cust := in.Customary()
	mm, mm2, cm3 := display.TraceIn(cust, "mm"), display.TraceIn(cust, "mm2"), display.TraceIn(cust, "cm3")
	bara, lpm, watts, nm := display.TraceIn(cust, "bar(a)"), display.TraceIn(cust, "L/min"), display.TraceIn(cust, "W"), display.TraceIn(cust, "N m")
	num := func(v float64) string { return display.Number(v, "") }
	rps := display.Number(revs, "rev/s")
	nWord := num(c.n)
	// Enough figures that the differences in the traces (r − 1 at a low
	// ratio, 1 − c·(...) near dead-head, p − p_amb) work out by hand.
	rSig := display.FiguresFor(r, r-1)
	ratio := display.NumberSig(r, "", rSig)
	veSig := max(rSig, display.FiguresFor(1, ve))
	atTop := cyc.top-c.ambient >= c.ambient-c.p1
	forceSig := display.FiguresFor(cyc.top, cyc.top-c.ambient)
	if !atTop {
		forceSig = display.FiguresFor(c.ambient, c.ambient-c.p1)
	}
	forceBar := display.TraceInSig(cust, "bar(a)", forceSig)

	res := []calc.Result{
		{Name: "piston_area", Value: area, Dim: units.Area, Trace: calc.Trace{Formula: "A = π/4 · D²", Substituted: "= π/4 · (" + mm(c.bore) + ")²"}},
		{Name: "swept_volume", Value: swept, Dim: units.Volume, Trace: calc.Trace{Formula: "Vs = A · s", Substituted: "= " + mm2(area) + " · " + mm(stroke)}},
		{Name: "displacement", Value: disp, Dim: units.Volume, Trace: calc.Trace{Formula: "V_d = z · Vs", Substituted: "= " + num(z) + " · " + cm3(swept)}},
		{Name: "displacement_rate", Value: rate, Dim: units.VolumeFlow, Trace: calc.Trace{Formula: "V̇_d = V_d · N", Substituted: "= " + cm3(disp) + " · " + rps}},
		clearanceResult(c, swept, cm3),
		{Name: "compression_ratio", Value: cr, Dim: units.Dimensionless, Trace: calc.Trace{Formula: "CR = (Vs + Vc) / Vc", Substituted: "= (" + cm3(swept) + " + " + cm3(c.clearanceVolume) + ") / " + cm3(c.clearanceVolume)}},
		{Name: "pressure_ratio", Value: r, Dim: units.Dimensionless, Trace: calc.Trace{Formula: "r = p2 / p1", Substituted: "= " + bara(c.p2) + " / " + bara(c.p1)}},
		{Name: "volumetric_efficiency", Value: ve, Dim: units.Dimensionless, Trace: calc.Trace{Formula: "η_v = 1 − c·(r^(1/n) − 1)", Substituted: "= 1 − " + display.NumberSig(c.clearanceRatio, "", veSig) + "·(" + display.NumberSig(r, "", veSig) + "^(1/" + nWord + ") − 1)" + noDelivery(delivers)}},
		{Name: "free_air_delivery", Value: ve * rate, Dim: units.VolumeFlow, Gas: units.GasState{Pressure: c.p1, Temperature: c.t1}, Trace: calc.Trace{Formula: "FAD = η_v · V̇_d" + ownInlet(in, c), Substituted: "= " + num(ve) + " · " + lpm(rate)}},
		{Name: "max_pressure", Value: pMax, Dim: units.Pressure, Trace: calc.Trace{Formula: "p_max = p1 · CR^n", Substituted: "= " + bara(c.p1) + " · " + num(cr) + "^" + nWord}},
		compressorDischargeTemperature(c, delivers, r, cr, nWord),
		{Name: "peak_piston_force", Value: math.Max(cyc.top-c.ambient, c.ambient-c.p1) * area, Dim: units.Force,
			Trace: peakForceTrace(delivers, atTop, forceBar(cyc.top), forceBar(c.p1), forceBar(c.ambient), mm2(area))},
		{Name: "mean_piston_speed", Value: 2 * stroke * revs, Dim: units.Velocity, Trace: calc.Trace{Formula: "c_m = 2 · s · N", Substituted: "= 2 · " + mm(stroke) + " · " + rps}},
		{Name: "max_rod_angle", Value: math.Asin(c.crankRadius / c.rod), Dim: units.Angle, Trace: calc.Trace{Formula: "φ_max = asin(R / L)", Substituted: "= asin(" + mm(c.crankRadius) + " / " + mm(c.rod) + ")"}},
		{Name: "indicated_work", Value: work, Dim: units.Energy, Trace: workTrace(num(z), bara(c.p1), cm3(vi), ratio, c.n)},
		{Name: "indicated_power", Value: power, Dim: units.Power, Trace: calc.Trace{Formula: "P_i = W · N", Substituted: "= " + display.Number(work, "J") + " · " + rps}},
		{Name: "isothermal_power", Value: isoPower, Dim: units.Power, Trace: calc.Trace{Formula: "P_iso = z · p1 · Vi · ln r · N", Substituted: "= " + num(z) + " · " + bara(c.p1) + " · " + cm3(vi) + " · ln " + ratio + " · " + rps}},
		{Name: "shaft_power", Value: power / c.etaMech, Dim: units.Power, Trace: calc.Trace{Formula: "P_s = P_i / η_m", Substituted: "= " + watts(power) + " / " + num(c.etaMech)}},
		{Name: "mean_torque", Value: meanTorque, Dim: units.Torque, Trace: calc.Trace{Formula: "T_m = W / 2π", Substituted: "= " + display.Number(work, "J") + " / 2π"}},
		{Name: "peak_torque", Value: peakTorque, Dim: units.Torque, Trace: calc.Trace{Formula: "T_peak = max over θ of Σ −(p(θ) − p_amb)·A·dx/dθ", Substituted: fmt.Sprintf("= %s, over %d crank steps, %s", nm(peakTorque), steps, phasing(c.cylinders))}},
		{Name: "energy_fluctuation", Value: eHigh - eLow, Dim: units.Energy, Trace: calc.Trace{Formula: "ΔE = max − min of ∫(T_m − T(θ)) dθ", Substituted: "= " + display.Number(eHigh, "J") + " − (" + display.Number(eLow, "J") + ")"}},
	}

	swing, hasSwing, err := readRodSwing(in, c)
	if err != nil {
		return nil, err
	}
	if hasSwing {
		res = append(res, rodClearanceResult(swing, cust))
	}

	out := &calc.Outcome{Results: res}
	if in.WantCurves() {
		out.Curves = compressorCurves(cyc, c, gas, steps)
	}
	if !delivers {
		out.Cautions = append(out.Cautions, calc.CautionNote{Level: calc.Danger, Rule: "no-delivery", Result: "volumetric_efficiency", Message: fmt.Sprintf(
			"The discharge valve never opens: the discharge pressure %s is at or above the dead-head pressure %s "+
				"(inlet pressure × compression ratio^n), so the cylinder delivers no air and only compresses and "+
				"re-expands what it traps. Reduce the clearance volume or the discharge pressure.",
			bara(c.p2), bara(pMax))})
	}
	return out, nil
}

// readRodSwing reads rod_width and liner_bottom, which come together;
// has is false when the block gives neither.
func readRodSwing(in *calc.Inputs, c cylinder) (s rodSwing, has bool, err error) {
	switch {
	case !in.Has("rod_width") && !in.Has("liner_bottom"):
		return s, false, nil
	case !in.Has("liner_bottom"):
		return s, false, &calc.InputError{Key: "rod_width", Message: "is given but liner_bottom is missing: give both for rod_clearance (liner_bottom: the distance from the crank axis up to the bottom edge of the cylinder wall)"}
	case !in.Has("rod_width"):
		return s, false, &calc.InputError{Key: "liner_bottom", Message: "is given but rod_width is missing: give both for rod_clearance (rod_width: the rod's width in its plane of swing at the cylinder's bottom edge)"}
	}
	s = rodSwing{crank: sliderCrank{r: c.crankRadius, l: c.rod}, bore: c.bore, width: in.Value("rod_width"), h: in.Value("liner_bottom")}
	if top := c.rod + c.crankRadius; s.h > top {
		mm := display.TraceIn(in.Customary(), "mm")
		return s, false, &calc.InputError{Key: "liner_bottom", Message: fmt.Sprintf(
			"%s is above the wrist pin's highest point, %s from the crank axis (rod length + crank radius): the rod never reaches the bottom of the cylinder wall there; allowed: up to %s",
			mm(s.h), mm(top), mm(top))}
	}
	return s, true, nil
}

// rodClearanceResult is the least gap between the swinging rod and the
// bottom corner of the bore, with the crank angle it occurs at.
func rodClearanceResult(s rodSwing, cust bool) calc.Result {
	clear, at, _ := s.least()
	mm := display.TraceIn(cust, "mm")
	return calc.Result{Name: "rod_clearance", Value: clear, Dim: units.Length, Trace: calc.Trace{
		Formula: "c = min over θ of dist(corner, rod centreline) − w/2, corners (±D/2, h), crank pin (R·sin θ, R·cos θ), wrist pin (0, R·cos θ + sqrt(L² − R²·sin² θ)), at the crank angles where the rod crosses height h",
		Substituted: fmt.Sprintf("= %s − %s/2 at θ = %s° from top dead centre (D = %s, h = %s, R = %s, L = %s)",
			mm(clear+s.width/2), mm(s.width), display.Number(at*180/math.Pi, ""), mm(s.bore), mm(s.h), mm(s.crank.r), mm(s.crank.l))}}
}

// compressorDischargeTemperature is the temperature at the end of compression: at the
// discharge pressure, or, when the discharge valve never opens, at the top
// of the trapped air's compression, the dead-head pressure.
func compressorDischargeTemperature(c cylinder, delivers bool, r, cr float64, nWord string) calc.Result {
	k := "K"
	if !delivers {
		return calc.Result{Name: "discharge_temperature", Value: c.t1 * math.Pow(cr, c.n-1), Dim: units.Temperature, Trace: calc.Trace{Formula: "T_max = T1 · CR^(n−1) (no delivery: the trapped air peaks at the dead-head pressure)", Substituted: "= " + display.Number(c.t1, k) + " · " + display.Number(cr, "") + "^(" + nWord + " − 1)"}}
	}
	return calc.Result{Name: "discharge_temperature", Value: c.t1 * math.Pow(r, (c.n-1)/c.n), Dim: units.Temperature, Trace: calc.Trace{Formula: "T2 = T1 · r^((n−1)/n)", Substituted: "= " + display.Number(c.t1, k) + " · " + display.Number(r, "") + "^((" + nWord + " − 1)/" + nWord + ")"}}
}

// clearanceResult reports the clearance ratio, derived or as given.
func clearanceResult(c cylinder, swept float64, cm3 func(float64) string) calc.Result {
	t := calc.Trace{Formula: "c = Vc / Vs", Substituted: "= " + cm3(c.clearanceVolume) + " / " + cm3(swept)}
	if !c.clearanceGiven {
		t = calc.Trace{Formula: "c (given)", Substituted: "= " + display.Number(c.clearanceRatio, "")}
	}
	return calc.Result{Name: "clearance_ratio", Value: c.clearanceRatio, Dim: units.Dimensionless, Trace: t}
}

// ownInlet says, for a stage drawing above or below ambient (a later
// stage of a machine, say), that its delivery is air at its own inlet, not
// at the machine's.
func ownInlet(in *calc.Inputs, c cylinder) string {
	if c.p1 == c.ambient {
		return ""
	}
	return fmt.Sprintf(", as volume at this stage's own inlet, %s and %s: for a later stage, not the machine's delivery (a machine block gives that at the first stage's inlet)",
		display.TraceIn(in.Customary(), "bar(a)")(c.p1), display.TraceIn(in.Customary(), "degC")(c.t1))
}

// noDelivery annotates a volumetric efficiency that came out at or below zero.
func noDelivery(delivers bool) string {
	if delivers {
		return ""
	}
	return " ≤ 0: no delivery, reported as 0"
}

// peakForceTrace shows the largest piston force: at the top pressure of
// the cycle, or, with an inlet below ambient, on suction when that is more.
func peakForceTrace(delivers, atTop bool, top, p1, ambient, area string) calc.Trace {
	switch {
	case !atTop:
		return calc.Trace{Formula: "F = (p_amb − p1) · A (suction below ambient is the larger load)", Substituted: "= (" + ambient + " − " + p1 + ") · " + area}
	case delivers:
		return calc.Trace{Formula: "F = (p2 − p_amb) · A", Substituted: "= (" + top + " − " + ambient + ") · " + area}
	}
	return calc.Trace{Formula: "F = (p_max − p_amb) · A (no delivery: p_max < p2)", Substituted: "= (" + top + " − " + ambient + ") · " + area}
}

// workTrace shows the indicated work per revolution, isothermal when n = 1.
func workTrace(z, p1, vi, r string, n float64) calc.Trace {
	if n == 1 {
		return calc.Trace{Formula: "W = z · p1 · Vi · ln r, Vi = η_v · Vs", Substituted: "= " + z + " · " + p1 + " · " + vi + " · ln " + r}
	}
	nw, nm1 := display.Number(n, ""), display.Number(n-1, "")
	return calc.Trace{Formula: "W = z · n/(n−1) · p1 · Vi · (r^((n−1)/n) − 1), Vi = η_v · Vs", Substituted: "= " + z + " · " + nw + "/" + nm1 + " · " + p1 + " · " + vi + " · (" + r + "^(" + nm1 + "/" + nw + ") − 1)"}

}

// phasing describes how the cylinders are spaced on the crank.
func phasing(z int) string {
	if z == 1 {
		return "one cylinder"
	}
	return fmt.Sprintf("%d cylinders %s° apart", z, display.Number(360/float64(z), ""))
}

// crankSteps returns the number of crank-angle samples per revolution: the
// least multiple of both cycleSteps and z, so that every cylinder's phase
// falls on a sample.
func crankSteps(z int) int {
	a, b := cycleSteps, z
	for b != 0 {
		a, b = b, a%b
	}
	return cycleSteps / a * z
}

// sampleRevolution samples f at m equal steps of crank angle, θ_i = 2π·i/m.
func sampleRevolution(m int, f func(theta float64) float64) []float64 {
	return sampleInto(make([]float64, m), f)
}

// sampleInto is sampleRevolution into out, m = len(out).
func sampleInto(out []float64, f func(theta float64) float64) []float64 {
	m := len(out)
	for i := range out {
		out[i] = f(2 * math.Pi * float64(i) / float64(m))
	}
	return out
}

// revolutions hold a revolution's worth of samples between evaluations:
// a block's torque is sampled at thousands of steps, and read only while
// the block is evaluated.
var revolutions = sync.Pool{New: func() any { return new([]float64) }}

// revolutionScratch returns scratch space of m samples from revolutions;
// its contents are undefined.
func revolutionScratch(m int) *[]float64 {
	buf := revolutions.Get().(*[]float64)
	if cap(*buf) < m {
		*buf = make([]float64, m)
	}
	*buf = (*buf)[:m]
	return buf
}

// phaseSum adds the curve of z evenly phased cylinders: cylinder k passes
// TDC at 2π·k/z, so its value at step i is one's at step i − k·m/z.
// len(one) must be a multiple of z.
func phaseSum(one []float64, z int) []float64 {
	return phaseSumInto(make([]float64, len(one)), one, z)
}

// phaseSumInto is phaseSum into sum, len(sum) = len(one).
func phaseSumInto(sum, one []float64, z int) []float64 {
	m := len(one)
	clear(sum)
	for k := range z {
		shift := k * m / z
		// sum[i] += one[(i−shift) mod m], in two runs without the modulus.
		for i, v := range one[m-shift:] {
			sum[i] += v
		}
		for i, v := range one[:m-shift] {
			sum[shift+i] += v
		}
	}
	return sum
}

// excessEnergyRange integrates T_m − T(θ) over one revolution of periodic
// samples (trapezoidal rule) and returns the lowest and highest running
// value, counting the start as zero.
func excessEnergyRange(torque []float64, mean float64) (low, high float64) {
	m := len(torque)
	h := 2 * math.Pi / float64(m)
	buf := revolutionScratch(m)
	defer revolutions.Put(buf)
	e := *buf // e[i] at θ_(i+1); the running sum is periodic
	// Each step by the cubic through four samples (fourth order), not a
	// trapezoid: smooth stretches of torque integrate far more closely, and
	// at the kinks of valve events it is no worse.
	at := func(i int) float64 { // i from −1 to m+1, wrapped
		switch {
		case i < 0:
			return torque[i+m]
		case i >= m:
			return torque[i-m]
		}
		return torque[i]
	}
	acc := 0.0
	for i := range torque {
		step := h/2*(at(i)+at(i+1)) - h/24*(at(i+2)-at(i+1)-at(i)+at(i-1))
		acc += h*mean - step
		e[i] = acc
	}
	lo, hi := 0, 0
	for i, v := range e {
		if v < e[lo] {
			lo = i
		}
		if v > e[hi] {
			hi = i
		}
	}
	return vertex(e, lo), vertex(e, hi)
}

// vertex refines the extreme sample e[i] of a smooth periodic series by
// the parabola through it and its neighbours, so that the extreme is not
// limited to the sampled angles.
func vertex(e []float64, i int) float64 {
	m := len(e)
	a, b, c := e[(i-1+m)%m], e[i], e[(i+1)%m]
	curv := a - 2*b + c
	if curv == 0 {
		return b
	}
	shift := (a - c) / (2 * curv)
	if math.Abs(shift) > 1 {
		return b
	}
	return b - (c-a)*shift/4
}

// compressorCurves returns the p-V diagram of one cylinder with its
// isothermal compression line, and the crankshaft torque curves. gas is
// the phased gas torque at each of the steps, or nil to work out the
// points drawn alone (as exactly: the same sums of the same samples).
func compressorCurves(cyc *indicatorCycle, c cylinder, gas []float64, steps int) []calc.Curve {
	stride := steps / curvePoints
	pick := func(f func(i int) float64) []float64 {
		out := make([]float64, 0, curvePoints+1)
		for i := 0; i <= steps; i += stride {
			out = append(out, f(i%steps))
		}
		return out
	}
	angle := func(i int) float64 { return 2 * math.Pi * float64(i) / float64(steps) }
	// At each point drawn the volume, the pressure and a single cylinder's
	// gas torque share the piston's position and speed.
	pv := calc.Curve{Name: "pv", XDim: units.Volume, YDim: units.Pressure,
		X: make([]float64, 0, curvePoints+1), Y: make([]float64, 0, curvePoints+1)}
	var gasY []float64
	alone := gas == nil && c.cylinders == 1
	for i := 0; i <= steps; i += stride {
		th := angle(i % steps)
		x, dx := cyc.crank.motion(th)
		v := cyc.clearance + cyc.area*x
		p := cyc.pressureAt(th, v)
		pv.X, pv.Y = append(pv.X, v), append(pv.Y, p)
		if alone {
			sum := 0.0 // as phaseAt adds: a −0 torque reads 0
			sum += -(p - cyc.ambient) * cyc.area * dx
			gasY = append(gasY, sum)
		}
	}

	// Isothermal compression from bottom dead centre to the discharge
	// pressure (or to the clearance volume, whichever comes first).
	bottom := cyc.bottom
	end := math.Max(bottom*c.p1/c.p2, cyc.clearance)
	iso := calc.Curve{Name: "isothermal", XDim: units.Volume, YDim: units.Pressure, Dashed: true}
	const isoPoints = 100
	for i := range isoPoints + 1 {
		v := bottom + (end-bottom)*float64(i)/isoPoints
		iso.X = append(iso.X, v)
		iso.Y = append(iso.Y, c.p1*bottom/v)
	}

	theta := make([]float64, 0, curvePoints+1)
	for i := 0; i <= steps; i += stride {
		theta = append(theta, angle(i))
	}
	switch {
	case gas != nil:
		gasY = pick(func(i int) float64 { return gas[i] })
	case !alone:
		gasY = pick(func(i int) float64 { return phaseAt(cyc.gasTorque, i, steps, c.cylinders) })
	}
	curves := []calc.Curve{pv, iso, {Name: "gas_torque", XDim: units.Angle, YDim: units.Torque, X: theta, Y: gasY}}
	if c.mass > 0 {
		inertiaY := pick(func(i int) float64 {
			return phaseAt(func(t float64) float64 { return cyc.inertiaTorque(t, c.mass, c.omega) }, i, steps, c.cylinders)
		})
		totalY := make([]float64, len(gasY))
		for i := range totalY {
			totalY[i] = gasY[i] + inertiaY[i]
		}
		curves = append(curves,
			calc.Curve{Name: "inertia_torque", XDim: units.Angle, YDim: units.Torque, X: theta, Y: inertiaY},
			calc.Curve{Name: "total_torque", XDim: units.Angle, YDim: units.Torque, X: theta, Y: totalY})
	}
	return curves
}

// phaseAt is phaseSum(sampleRevolution(m, f), z)[i], worked out for step i
// alone: the same samples added in the same order.
func phaseAt(f func(theta float64) float64, i, m, z int) float64 {
	sum := 0.0
	for k := range z {
		j := i - k*m/z
		if j < 0 {
			j += m
		}
		sum += f(2 * math.Pi * float64(j) / float64(m))
	}
	return sum
}
