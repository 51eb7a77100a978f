package models

import (
	"fmt"
	"math"
	"slices"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// driveKind models an electric motor driving a compressor or machine
// through a belt: the crank speed it gives, how hard the motor works, and
// whether it can start the load.
var driveKind = calc.Kind{
	Name:    "drive",
	Summary: "electric motor and belt driving a compressor or machine: crank speed, belt speed, motor load, rated torque and the margin to start against pressure",
	Doc:     driveDoc,
	Raises:  []string{"motor-overload", "start-stall", "start-unchecked", "fast-belt"},
	Inputs: []calc.InputSpec{
		{Name: "motor_power", Dim: units.Power, Range: calc.Between(1, 1e6), Meaning: "rated shaft output of the motor, from its plate, 1 W to 1 MW"},
		{Name: "motor_speed", Dim: units.RotationalSpeed, Range: calc.Between(minCrankSpeed, 1e4), Meaning: "rated speed of the motor under load, from its plate (below the synchronous speed by its slip)"},
		{Name: "service_factor", Dim: units.Dimensionless, Default: "1.0", Range: calc.Between(1, 2), Meaning: "the motor's service factor, from its plate: the fraction of rated power it carries continuously, 1 to 2"},
		{Name: "motor_pulley", Dim: units.Length, Range: calc.Between(minPartSize, 2), Meaning: "pitch diameter of the pulley on the motor, 0.1 mm to 2 m"},
		{Name: "driven_pulley", Dim: units.Length, Range: calc.Between(minPartSize, 5), Meaning: "pitch diameter of the pulley or flywheel rim on the crankshaft, 0.1 mm to 5 m"},
		{Name: "belt_slip", Dim: units.Dimensionless, Default: "0.02", Range: calc.Range{Min: 0, Max: 0.2, HasMin: true, HasMax: true},
			Meaning: "speed the belt loses on the pulleys, 0 to 0.2 (0.02, common practice for V-belts)"},
		{Name: "belt_efficiency", Dim: units.Dimensionless, Default: "0.95", Range: calc.Between(0.5, 1),
			Meaning: "power the belt passes on, 0.5 to 1 (0.95, common practice for V-belts)"},
		{Name: "load", Type: calc.Link, LinkRoles: calc.Delivers, Meaning: "id of the compressor or machine block the belt drives"},
		{Name: "starting_torque", Dim: units.Dimensionless, Optional: true, Range: calc.Between(0.1, 10),
			Meaning: "the motor's locked-rotor (starting) torque as a multiple of its rated torque, from its plate or data sheet, 0.1 to 10; without it the start is not checked"},
		{Name: "unloaded_start", Type: calc.Name, Default: "false", Choices: func(any) []string { return []string{"false", "true"} },
			Meaning: "true when an unloader vents the cylinders at start, so the motor starts against ambient pressure"},
		{Name: "relief", Type: calc.Link, Optional: true, LinkRoles: calc.Relieves,
			Meaning: "id of the relief valve that limits the pressure the load can start against; default: the load's discharge pressure"},
	},
	Results: []calc.ResultSpec{
		{Name: "crank_speed", Dim: units.RotationalSpeed, Unit: "rpm", Meaning: "speed the belt turns the crankshaft at", WithoutLinks: true},
		{Name: "belt_speed", Dim: units.Velocity, Unit: "m/s", Meaning: "speed of the belt on the motor pulley", WithoutLinks: true},
		{Name: "ratio", Dim: units.Dimensionless, Unit: "", Meaning: "driven pulley over motor pulley: the speed reduction", WithoutLinks: true},
		{Name: "motor_load_fraction", Dim: units.Dimensionless, Unit: "", Meaning: "the load's shaft power over what the motor passes through the belt at its rating"},
		{Name: "rated_torque", Dim: units.Torque, Unit: "N m", Meaning: "the motor's torque at its rated power and speed", WithoutLinks: true},
		{Name: "starting_margin", Dim: units.Dimensionless, Unit: "", Meaning: "the motor's starting torque at the crank over the load's torque at start (with starting_torque)"},
	},
	Evaluate: evaluateDrive,
}

// Thresholds of the drive's cautions.
const (
	// startMargin: below this starting margin a start is a WARNING (the
	// issue's figure: supply sag, cold oil and stiff new rings eat into
	// the motor's plate torque).
	startMargin = 1.2
	// fastBelt is the speed above which a classical V-belt section is a
	// WARNING (common practice: classical sections are rated to about
	// 30 m/s; narrow and banded sections run faster).
	fastBelt = 30.0 // m/s
	// speedAgreement is how closely the load's written speed must match
	// the drive's crank speed: a figure written to three significant
	// figures is within half a per cent.
	speedAgreement = 0.005
)

const driveDoc = `The drive kind models an electric motor turning a compressor or machine (the
block named in load) through a belt: motor pulley pitch diameter d1, driven
pulley d2, the motor's rated power P and speed n_m.

Speed and load
  ratio i = d2/d1
  crank_speed = n_m · d1/d2 · (1 − s), s the belt slip (default 0.02)
  belt_speed v = π · d1 · n_m (ω_m · d1/2), on the motor pulley
  rated_torque T_r = P / ω_m
  motor_load_fraction = P_load / (η_b · P), with the load's shaft power
  and the belt efficiency η_b (default 0.95): above the service factor
  the motor is overloaded (WARNING).
  The load's blocks must turn at the drive's crank speed, within 0.5 %:
  a load written at another speed is an error naming both.

Starting
  With starting_torque k_s (the motor's locked-rotor torque over its
  rated torque, from its plate or data sheet):
    starting_margin = k_s · T_r · i · η_b / (T_gas,peak(p_s) + T_f)
  T_gas,peak(p_s) is the largest gas torque of the load over a revolution
  with its discharge at the highest pressure it can start against, p_s: the
  opening pressure of the relief valve named in relief (ambient plus its
  cracking pressure), else the load's discharge pressure; with
  unloaded_start = true, ambient. A machine is solved at p_s and its
  stages' torques added. T_f = P_s/ω − T_m is the load's running friction
  torque: its shaft over its indicated power, at its own speed.
  Below 1.2 the start is a WARNING, below 1.0 a DANGER: the motor stalls
  on a loaded start. Without starting_torque the start is not checked and
  a NOTICE says so. When the start is checked against the discharge
  pressure while a relief valve on the load, one of its stages or the
  receiver it fills opens higher, a NOTICE names that valve.

Typical starting torque of small motors, as a multiple of rated torque
(from memory; the motor's plate or data sheet governs):
  three-phase squirrel-cage (NEMA design B, IEC design N)   1.5 to 2.5
  single-phase capacitor-start, and capacitor-start/run     2 to 3.5
  single-phase split-phase                                  1 to 1.5
  permanent-split-capacitor (PSC)                           0.5 to 1
  shaded-pole                                               0.3 to 0.5
Starting torque falls with the square of the supply voltage: 10 % low at
the terminals during the start (a long or thin supply cable, a weak
supply) leaves 81 % of it.

Limits
- The load's power and torque are its ideal cycle's: valve losses and heat
  pick-up at suction are not modelled, so a real machine delivers less and
  needs somewhat more; read motor_load_fraction as a lower bound.
- The belt's slip and efficiency are fixed figures; both vary with belt
  tension and load. Belt speed above 30 m/s is a WARNING for classical
  V-belt sections (common practice).
- Friction at breakaway, with cold oil or new rings, is higher than the
  running friction taken here; inertia of the machine and flywheel
  lengthens the start but does not stop it.
- The motor's torque between standstill and rated speed (its pull-up
  torque) is not checked: a motor whose pull-up torque dips below the
  load can hang part-way up to speed.
- Electrical sizing (cable, fuse, starter, overload relay) is for a
  licensed electrician under local codes.`

// driveLoad is what a drive needs of its load: its speed, its power and
// friction, and its peak torque against a start pressure.
type driveLoad struct {
	id, blocks    string  // the load's id, and the blocks that turn
	omega         float64 // its crank speed, rad/s
	shaft         float64 // shaft power at its own working point, W
	friction      float64 // running friction torque, N m
	discharge     float64 // pressure it works against
	peakGasTorque func(p float64) float64
	ambient       float64
}

// readLoad reads the drive's load: a machine, or a single compressor.
func readLoad(l *calc.Linked) (driveLoad, error) {
	ld := driveLoad{id: l.ID, blocks: l.ID, shaft: l.Results["shaft_power"], ambient: l.Ambient}
	if m, isMachine, err := linkedMachine(l); isMachine {
		if err != nil {
			return ld, err
		}
		ld.omega, ld.discharge = m.omega, m.pd
		var ids []string
		for _, s := range m.stages {
			ids = append(ids, s.id)
		}
		ld.blocks = fmt.Sprintf("%s's stages (%s)", l.ID, joinIDs(ids))
		ld.peakGasTorque = func(p float64) float64 {
			peak, _ := m.peakTorque(m.solve(p))
			return peak
		}
	} else {
		c, err := readCompressor(l.Model)
		if err != nil {
			return ld, err
		}
		ld.omega, ld.discharge = c.omega, c.p2
		ld.peakGasTorque = func(p float64) float64 {
			return slices.Max(phaseSum(sampleRevolution(crankSteps(c.cylinders), c.cycleAt(c.p1, p).gasTorque), c.cylinders))
		}
	}
	ld.friction = ld.shaft/ld.omega - l.Results["mean_torque"]
	return ld, nil
}

// joinIDs lists block ids for a message: "a, b and c".
func joinIDs(ids []string) string {
	switch len(ids) {
	case 0:
		return ""
	case 1:
		return ids[0]
	}
	out := ids[0]
	for _, id := range ids[1 : len(ids)-1] {
		out += ", " + id
	}
	return out + " and " + ids[len(ids)-1]
}

func evaluateDrive(in *calc.Inputs) (*calc.Outcome, error) {
	var (
		power, motorSpeed = in.Value("motor_power"), in.Value("motor_speed")
		d1, d2            = in.Value("motor_pulley"), in.Value("driven_pulley")
		slip, etaBelt     = in.Value("belt_slip"), in.Value("belt_efficiency")
		sf                = in.Value("service_factor")
		cust              = in.Customary()
		mm, watts, nm     = display.TraceIn(cust, "mm"), display.TraceIn(cust, "W"), display.TraceIn(cust, "N m")
		rpm               = func(w float64) string { return display.Number(w*30/math.Pi, "rpm") }
		num               = func(v float64) string { return display.Number(v, "") }
	)
	// The speed, ratio and torque come from the drive's own inputs; only
	// the load fraction and the start need the load.
	crank := motorSpeed * d1 / d2 * (1 - slip)
	ratio := d2 / d1
	belt := motorSpeed * d1 / 2
	rated := power / motorSpeed
	if in.LinksWithheld() {
		// Quoted by the load's own blocks before the load is evaluated.
		return &calc.Outcome{Results: []calc.Result{
			{Name: "crank_speed", Value: crank, Dim: units.RotationalSpeed},
			{Name: "belt_speed", Value: belt, Dim: units.Velocity},
			{Name: "ratio", Value: ratio, Dim: units.Dimensionless},
			{Name: "rated_torque", Value: rated, Dim: units.Torque},
		}}, nil
	}
	ld, err := readLoad(in.LinkOf("load"))
	if err != nil {
		return nil, &calc.InputError{Key: "load", Message: err.Error()}
	}
	if math.Abs(ld.omega/crank-1) > speedAgreement {
		return nil, &calc.InputError{Key: "load", Message: fmt.Sprintf(
			"%s turns at %s, but the drive turns the crank at %s (%s · %s / %s · (1 − %s)); the blocks of the load must turn at the drive's crank speed, within 0.5 %%: change the pulleys or the load's speed",
			ld.blocks, rpm(ld.omega), rpm(crank), rpm(motorSpeed), mm(d1), mm(d2), num(slip))}
	}
	fraction := ld.shaft / (etaBelt * power)
	res := []calc.Result{
		{Name: "crank_speed", Value: crank, Dim: units.RotationalSpeed, Trace: calc.Trace{Formula: "n_c = n_m · d1/d2 · (1 − s)",
			Substituted: fmt.Sprintf("= %s · %s / %s · (1 − %s); %s turns at %s", rpm(motorSpeed), mm(d1), mm(d2), num(slip), ld.blocks, rpm(ld.omega))}},
		{Name: "belt_speed", Value: belt, Dim: units.Velocity, Trace: calc.Trace{Formula: "v = π · d1 · n_m",
			Substituted: fmt.Sprintf("= π · %s · %s", mm(d1), rpm(motorSpeed))}},
		{Name: "ratio", Value: ratio, Dim: units.Dimensionless, Trace: calc.Trace{Formula: "i = d2 / d1", Substituted: "= " + mm(d2) + " / " + mm(d1)}},
		{Name: "motor_load_fraction", Value: fraction, Dim: units.Dimensionless, Trace: calc.Trace{Formula: "P_load / (η_b · P)",
			Substituted: fmt.Sprintf("= %s / (%s · %s), the shaft power of %s", watts(ld.shaft), num(etaBelt), watts(power), ld.id)}},
		{Name: "rated_torque", Value: rated, Dim: units.Torque, Trace: calc.Trace{Formula: "T_r = P / ω_m",
			Substituted: fmt.Sprintf("= %s / %s", watts(power), display.Number(motorSpeed, "rad/s"))}},
	}
	out := &calc.Outcome{Results: res}
	if fraction > sf {
		out.Cautions = append(out.Cautions, calc.CautionNote{Level: calc.Warning, Rule: "motor-overload", Message: fmt.Sprintf(
			"The motor is overloaded: %s needs %s at the shaft, %s of the %s the motor passes through the belt at its rating, above its service factor of %s. It will overheat and trip, or burn out: fit a larger motor, or slow the crank with a smaller motor pulley.",
			ld.id, watts(ld.shaft), display.Number(100*fraction, "%"), watts(etaBelt*power), num(sf))})
	}
	if belt > fastBelt {
		out.Cautions = append(out.Cautions, calc.CautionNote{Level: calc.Warning, Rule: "fast-belt", Message: fmt.Sprintf(
			"The belt runs at %s, above the %s classical V-belt sections are rated for (common practice). A belt beyond its rating flings off or breaks: use a smaller motor pulley, a narrow-section belt rated for the speed, and guard the drive all round.",
			display.TraceIn(cust, "m/s")(belt), display.TraceIn(cust, "m/s")(fastBelt))})
	}
	start, startFrom, err := startPressure(in, ld)
	if err != nil {
		return nil, err
	}
	bara := display.TraceIn(cust, "bar(a)")
	if !in.Has("starting_torque") {
		out.Cautions = append(out.Cautions, calc.CautionNote{Level: calc.Notice, Rule: "start-unchecked", Message: fmt.Sprintf(
			"The start is not checked: give starting_torque, the motor's starting torque as a multiple of its rated torque from its plate or data sheet (specgen explain drive lists typical figures). %s has to start against %s (%s).",
			ld.id, bara(start), startFrom)})
		return out, nil
	}
	gas := ld.peakGasTorque(start)
	need := gas + ld.friction
	if !(need > 0) {
		out.Cautions = append(out.Cautions, calc.CautionNote{Level: calc.Notice, Rule: "start-unchecked", Message: fmt.Sprintf(
			"The start is not checked: against %s (%s) %s puts no torque on the crank that the model knows of (no gas load, and a mechanical efficiency of 1, so no friction); the breakaway friction of a real machine is not modelled.",
			bara(start), startFrom, ld.id)})
		return out, nil
	}
	k := in.Value("starting_torque")
	margin := k * rated * ratio * etaBelt / need
	out.Results = append(out.Results, calc.Result{Name: "starting_margin", Value: margin, Dim: units.Dimensionless, Trace: calc.Trace{
		Formula: "k_s · T_r · i · η_b / (T_gas,peak(p_s) + T_f), T_f = P_s/ω − T_m (running friction)",
		Substituted: fmt.Sprintf("= %s · %s · %s · %s / (%s + %s); p_s = %s (%s)",
			num(k), nm(rated), num(ratio), num(etaBelt), nm(gas), nm(ld.friction), bara(start), startFrom)}})
	if margin < startMargin {
		level, what := calc.Warning, "little margin: a sag in the supply voltage at start (torque falls with its square), cold oil or new rings can stall it"
		if margin < 1 {
			level, what = calc.Danger, "less torque than the load needs: the motor will stall on a loaded start, draw its locked-rotor current and overheat"
		}
		out.Cautions = append(out.Cautions, calc.CautionNote{Level: level, Rule: "start-stall", Message: fmt.Sprintf(
			"The starting margin is %s, below %s: the motor has %s. Against %s (%s) the load needs %s at the crank; the motor gives %s through the belt. Fit an unloader so that it starts against ambient, a motor with more starting torque, or a larger driven pulley.",
			units.Format(margin, 3), num(startMargin), what, bara(start), startFrom, nm(need), nm(k*rated*ratio*etaBelt))})
	}
	return out, nil
}

// startPressure is the highest pressure the load can start against, and
// where it comes from: ambient with an unloader, else the opening pressure
// of the relief valve named, else the load's discharge pressure.
func startPressure(in *calc.Inputs, ld driveLoad) (float64, string, error) {
	switch {
	case in.NameOf("unloaded_start") == "true":
		if in.LinkOf("relief") != nil {
			return 0, "", &calc.InputError{Key: "relief", Message: "an unloaded start is against ambient pressure, whatever the relief valve; give unloaded_start = true or relief, not both"}
		}
		return ld.ambient, "unloaded start: ambient", nil
	case in.LinkOf("relief") != nil:
		v := in.LinkOf("relief")
		if v.Model == nil || len(v.Model.LinksOf("protects")) == 0 {
			return 0, "", &calc.InputError{Key: "relief", Message: fmt.Sprintf(
				"valve %s protects nothing (a check valve); name the relief valve on the load's discharge or receiver, whose protects lists them", v.ID)}
		}
		return v.Ambient + v.Results["cracking_pressure"], "where relief valve " + v.ID + " opens", nil
	}
	return ld.discharge, "the discharge pressure of " + ld.id, nil
}

// unnamedRelief raises a NOTICE on a drive whose start is checked against
// its load's discharge pressure while a relief valve on the load, one of
// its stages or the receiver it fills opens higher: with the unloader or
// pressure switch failed, the load starts against that valve's setting.
func unnamedRelief(s *calc.Set) []calc.Raised {
	var out []calc.Raised
	for _, d := range s.Blocks {
		in := d.ModelInputs()
		if _, checked := d.Result("starting_margin"); !checked || in == nil || in.LinkOf("relief") != nil || in.NameOf("unloaded_start") == "true" {
			continue
		}
		ld, err := readLoad(in.LinkOf("load"))
		if err != nil {
			continue
		}
		fed := map[string]bool{ld.id: true}
		if m, isMachine, _ := linkedMachine(in.LinkOf("load")); isMachine {
			for _, st := range m.stages {
				fed[st.id] = true
			}
		}
		for _, e := range s.Having(calc.Receiver) {
			if l := receiverSupply(e); l != nil && fed[l.ID] {
				fed[e.Block.ID] = true
			}
		}
		var highest *calc.Evaluated
		top := ld.discharge
		for _, v := range s.Having(calc.Relieves) {
			crack, ok := v.Result("cracking_pressure")
			if !ok || v.ModelInputs() == nil || v.Ambient+crack.Value <= top {
				continue
			}
			for _, p := range v.ModelInputs().LinksOf("protects") {
				if fed[p.ID] {
					highest, top = v, v.Ambient+crack.Value
					break
				}
			}
		}
		if highest == nil {
			continue
		}
		out = append(out, calc.Raised{Block: d, Note: calc.CautionNote{Level: calc.Notice, Message: fmt.Sprintf(
			"The start is checked against %s, the discharge pressure of %s, but relief valve %s on it opens at %s: if the pressure switch or the unloader fails, %s starts against that. Name the valve in relief = %q to check that start, or give unloaded_start = true if an unloader vents the cylinders before every start.",
			d.Show(ld.discharge, units.Pressure, "bar"), ld.id, highest.Block.ID, d.Show(top, units.Pressure, "bar"), ld.id, highest.Block.ID)}})
	}
	return out
}

// receiverSupply is the block a receiver is filled from, or nil.
func receiverSupply(e *calc.Evaluated) *calc.Linked {
	if e.ModelInputs() == nil {
		return nil
	}
	return e.ModelInputs().LinkOf("supply")
}
