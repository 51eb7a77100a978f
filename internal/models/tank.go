package models

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"gonum.org/v1/gonum/integrate/quad"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// tankKind models an air receiver: the time its supply takes to fill it,
// the energy it stores, and, when its wall is given, the wall's stress and
// allowable pressure.
var tankKind = calc.Kind{
	Name:            "tank",
	Summary:         "air receiver: fill time from a compressor, stored energy, and optionally the wall's stress and allowable pressure",
	Doc:             tankDoc,
	Roles:           calc.HoldsPressure | calc.PressurePart | calc.Receiver,
	WorkingPressure: calc.WorkingPressure{Key: "pressure", Name: "target pressure"},
	Inputs: append([]calc.InputSpec{
		{Name: "volume", Dim: units.Volume, Range: calc.Between(minVesselVolume, 1e3), Meaning: "internal volume of the receiver, up to 1000 m3"},
		{Name: "pressure", Dim: units.Pressure, Range: positiveUpTo(1e9), Meaning: "working (target) pressure the receiver is filled to, up to 1 GPa; must be above ambient"},
		{Name: "start_pressure", Dim: units.Pressure, Default: "0 bar", Range: calc.Between(0, 1e9), Meaning: "pressure in the receiver when filling starts; must be below the target"},
		{Name: "supply", Type: calc.Link, Optional: true, LinkRoles: calc.Delivers, Meaning: "id of the compressor or machine block that fills the receiver; without it fill_time is not computed"},
	}, append(append(tankWallInputs(),
		calc.InputSpec{Name: "head", Type: calc.Name, Optional: true, Choices: func(any) []string { return vesselHeads },
			Meaning: "the heads that close the shell, for code_allowable_pressure: ellipsoidal (2:1), hemispherical, torispherical (crown radius the shell's outside diameter, knuckle 6 %) or flat (welded); bolted is refused: a bolted cover needs its gasket's moment"},
		calc.InputSpec{Name: "head_thickness", Dim: units.Length, Optional: true, Range: calc.Between(minTubeWall, 5), Meaning: "thickness of the heads as built (after forming), up to 5 m; give it with head"},
		calc.InputSpec{Name: "flat_head_factor", Dim: units.Dimensionless, Optional: true, Range: calc.Between(minFlatHeadFactor, 1),
			Meaning: "factor C of a welded flat head (ASME VIII-1 UG-34 sketches, from memory), 0.2 to 1; default 0.33"},
	), testInputs...)...),
	Results: append([]calc.ResultSpec{
		{Name: "fill_time", Dim: units.Time, Unit: "s", Meaning: "time the supply takes from start_pressure to the target pressure (needs supply)"},
		{Name: "stored_energy", Dim: units.Energy, Unit: "kJ", Meaning: "energy released by an isentropic expansion of the air at the target pressure to ambient"},
		{Name: "hoop_stress", Dim: units.Stress, Unit: "MPa", Meaning: "circumferential stress at the bore of the shell, Lamé, at the target pressure (with a wall)"},
		{Name: "safety_factor", Dim: units.Dimensionless, Unit: "", Factor: true, FactorMaterial: "material",
			Meaning: "design strength of the shell over its equivalent stress at the bore, as the tube kind (with a wall)"},
		{Name: "allowable_pressure", Dim: units.Pressure, Unit: "bar", Meaning: "burst pressure of the shell over the site's minimum safety factor, as the tube kind (with a wall)"},
		{Name: "code_allowable_pressure", Dim: units.Pressure, Unit: "bar", Meaning: "the least pressure of the thin-shell formulas of ASME VIII-1 (UG-27, and UG-32 or UG-34 for the heads) with the joint efficiency, in the corroded condition (with a metal wall)"},
	}, testResults...),
	Charts:   []string{"fill"},
	Chart:    tankChart,
	Evaluate: evaluateTank,
}

// tankWall lists the wall inputs a tank shares with the tube kind:
// optional, and given all together or not at all.
var tankWall = []string{"material", "inner_diameter", "wall_thickness", "outer_diameter", "closed_ends",
	"joint_efficiency", "corrosion_allowance", "design_temperature"}

// tankJointEfficiency is a receiver's joint efficiency unless given: a
// welded shell whose seams are not radiographed (ASME VIII-1 Table UW-12,
// from memory).
const tankJointEfficiency = "0.70"

// tankWallInputs returns the tube kind's wall inputs, optional on a tank.
func tankWallInputs() []calc.InputSpec {
	var specs []calc.InputSpec
	for _, name := range tankWall {
		spec, _ := tubeKind.Input(name)
		spec.Optional = true
		if name == "joint_efficiency" {
			spec.Default = tankJointEfficiency
			spec.Meaning = strings.Replace(spec.Meaning, "joint efficiency E", "joint efficiency E (default 0.70: welded, not radiographed)", 1)
		}
		if name == "design_temperature" {
			spec.Meaning = "metal temperature the code figure is for; default: the supply's discharge temperature, else 20 °C"
		}
		if spec.Default != "" {
			spec.DefaultWith = "material"
		}
		spec.Meaning = "shell wall, as the tube kind: " + spec.Meaning
		specs = append(specs, spec)
	}
	return specs
}

// wallResults are the tube results a tank with a wall reports.
var wallResults = []string{"hoop_stress", "safety_factor", "allowable_pressure", "code_allowable_pressure"}

// airGamma is the ratio of specific heats of air used for stored energy
// (ASME PCC-2 Article 501 uses 1.4; from memory).
const airGamma = 1.4

// Fill curve and table sizes.
const (
	fillCurveIntervals = 200 // equal pressure steps of the "fill" curve
	fillTableMaxRows   = 50  // the table's step grows 1-2-5 beyond this
	// fillTableMaxRowsPsi: a psi is small, so customary tables step sooner.
	fillTableMaxRowsPsi = 15
)

const tankDoc = `The tank kind models an air receiver of volume V filled to the target pressure
p2 from p0 (start_pressure) by the compressor block named in supply, and the
energy the air at p2 stores. Pressures are absolute in the formulas.

Fill time
- The receiver stays at the supply's inlet temperature (an isothermal tank:
  small receivers shed the heat of compression quickly; a real fill starts a
  little faster and the pressure sags as the air cools).
- The supply is the compressor block's ideal cycle, re-evaluated at each tank
  pressure p: its free air delivery is
    FAD(p) = V̇d · (1 + c − c·(p/p1)^(1/n))
  with its displacement rate V̇d, clearance ratio c, polytropic index n and
  inlet pressure p1. Below p1 the cylinder delivers its full displacement
  (FAD = V̇d). The compressor's own discharge_pressure plays no part.
- Mass balance at constant temperature: dp/dt = p1·FAD(p)/V, so
    t = ∫ from p0 to p2 of V dp / (p1·FAD(p)).
  With x = p/p1, τ = V/V̇d and a = 1 + c:
    n = 1:  t = τ/c · ln((a − c·x0)/(a − c·x2))   (closed form)
    c → 0:  t = τ·(x2 − x0)                        (constant delivery)
  otherwise the integral is split into a logarithmic part, integrated in
  closed form, and a smooth remainder, integrated by 16-point
  Gauss-Legendre quadrature on steps of at most 0.5 in ln(p).
- The delivery falls to zero at the supply's dead-head pressure
  p_max = p1·((1 + c)/c)^n; a target at or above it is an error.
- A machine block as supply: the whole machine fills the tank. At each
  tank pressure p the machine is solved again with p as its discharge
  pressure (its interstage pressures move as the tank fills; at first its
  later stages' valves stand open), and
    t = ∫ from p0 to p2 of V dp / (R·T1·ṁ(p))
  with its mass flow ṁ and the first stage's inlet temperature T1 (the
  tank at that temperature, as above). The integral is taken by 16-point
  Gauss-Legendre quadrature, halving each interval until the halves agree
  with the whole to 1e-10. The target must be below the machine's
  dead-head pressure. The machine's own discharge_pressure plays no part.
- Without supply there is no fill_time, fill curve or fill table.
  Chart "fill": tank pressure over time. Table: the fill time to each
  whole bar (gauge) from start_pressure, and to the target; above 50 rows
  the step grows to 2, 5, 10, 20, 50 ... bar. A block written in US
  customary units steps in psi (1, 2, 5, 10 ... psi, at most 15 rows).

Wall (optional)
  Give material, inner_diameter and wall_thickness or outer_diameter (and
  closed_ends, default true) for the cylindrical shell; the tube kind's
  model then runs at the target pressure and the tank reports its
  hoop_stress (Lamé, at the bore), safety_factor and allowable_pressure
  (Barlow burst pressure over the site's minimum factor; specgen explain tube).
  Beside them it reports code_allowable_pressure, the least pressure of the
  common pressure-vessel formulas (ASME Section VIII Division 1, from
  memory) for the shell and, with head and head_thickness, its heads, with
  the joint efficiency E (default 0.70: a welded receiver whose seams are
  not radiographed) in the corroded condition (walls less
  corrosion_allowance, inside dimensions plus it; specgen explain tube for
  the shell and the allowable stress S). Heads, D the inside diameter, R the
  inside radius, t the head's corroded thickness:
    ellipsoidal (2:1)  P = 2·S·E·t/(D + 0.2·t)        UG-32(d)
    hemispherical      P = 2·S·E·t/(R + 0.2·t)        UG-32(f), up to
                       t = 0.356·R (P = 0.665·S·E); thicker: Appendix 1-3,
                       P = 2·S·E·(Y − 1)/(Y + 2), Y = ((R + t)/R)³
    torispherical      P = S·E·t/(0.885·L + 0.1·t)    UG-32(e), crown
                       radius L the shell's outside diameter (plus the
                       corrosion allowance), knuckle 6 % of L
    flat (welded)      P = S·E·(t/d)²/C               UG-34, d = D, C 0.33
                       unless flat_head_factor gives it (at least 0.20)
  A bolted flat cover is refused: its thickness depends on the moment of
  its gasket load (UG-34 with Appendix 2), which the model lacks. The
  design temperature is the supply's discharge temperature unless given.
  The rules compare the working pressure and a compressor's dead-head
  pressure with the lower of allowable_pressure and code_allowable_pressure.
  Nozzles, openings, supports and weld details are not checked: a vessel
  that passes here is not a vessel that passes its code. Welding takes the
  temper out of heat-treated aluminium alloys (6061-T6): a welded one has
  the strength of its annealed welds, well below its table values.

Stored energy
  E = p2·V/(γ−1) · [1 − (p_a/p2)^((γ−1)/γ)],  γ = 1.4
  the work of an isentropic expansion of the air to ambient p_a, the form
  ASME PCC-2 Article 501 (pneumatic testing) uses in its mandatory appendix
  on stored energy. The trace also shows the isothermal figure p2·V·ln(p2/p_a),
  the upper bound if the air could take up heat as it expands.

Pneumatic test (every tank)
  test_energy, tnt_equivalent and test_distance are the stored energy of a
  pneumatic test at test_pressure by the equations of ASME PCC-2 Article
  501, Mandatory Appendices II and III, as the published text states them:
    E = 2.5 · p_at · V · [1 − (p_a/p_at)^0.286]   J, p_at in Pa(a), V in m³,
        p_a = 101 000 Pa, p_at = the gauge test pressure + 101 325 Pa
    TNT = E / 4 266 920 J/kg
    R = the greater of 30 m (E ≤ 135.5 MJ; 60 m up to 271 MJ) and
        R_scaled · TNT^(1/3), R_scaled = 20 m/kg^(1/3)
  A block written in US units takes the US form with its own constants:
  E = 360 · p_at · V · [...] ft·lbf with psia and ft³, p_a = 14.7 psia,
  TNT = E / 1 488 617 ft·lbf/lb, R_scaled = 50 ft/lb^(1/3), and 100 ft
  (200 ft) up to 100 000 000 (200 000 000) ft·lbf (from memory). The two TNT
  constants differ by about 4 %, and so do the two forms' figures. Some
  secondary sources write the distance as R_scaled · (2·TNT)^(1/3), a charge
  doubled for a burst at ground level (26 % farther): check the edition
  you work to. test_pressure defaults to 1.1 × code_allowable_pressure, or
  without one 1.1 × the target pressure (the pneumatic test of ASME VIII-1
  UG-100, from memory). PCC-2's 0.286 and 101 000 Pa stand for 2/7 and the
  standard atmosphere: from 2 bar(g) up its E is within 1 % of the
  isentropic expression above (tested). A hydrostatic test stores a small
  fraction of this: the stored-energy caution recommends one.`

// supplyModel is a compressor block's cycle as a receiver's supply sees it,
// pressures absolute.
type supplyModel struct {
	id   string
	rate float64 // displacement rate V̇d, m3/s
	c, n float64 // clearance ratio, polytropic index
	p1   float64 // inlet pressure
	pMax float64 // dead-head pressure, as the compressor reports it
}

// readSupply takes the supply's cycle from its results and inputs.
func readSupply(l *calc.Linked) (supplyModel, error) {
	s := supplyModel{id: l.ID, rate: l.Results["displacement_rate"], c: l.Results["clearance_ratio"],
		n: l.Inputs["polytropic_index"], p1: l.Ambient, pMax: l.Results["max_pressure"]}
	if p, ok := l.Inputs["inlet_pressure"]; ok {
		s.p1 = p
	}
	if !(s.rate > 0 && s.c > 0 && s.n >= 1 && s.p1 > 0 && s.pMax > s.p1) {
		return s, fmt.Errorf("supply %s (%s) gives no usable cycle: displacement rate %g m3/s, clearance ratio %g, polytropic index %g, inlet %g Pa",
			l.ID, l.Kind, s.rate, s.c, s.n, s.p1)
	}
	return s, nil
}

// poleU is U = (1 + c)/c: with u = (p/p1)^(1/n), the delivery
// 1 + c − c·u vanishes at u = U, the dead-head pressure.
func (s supplyModel) poleU() float64 { return (1 + s.c) / s.c }

// delivers reports whether the supply still delivers at pressure p.
func (s supplyModel) delivers(p float64) bool {
	return p <= s.p1 || s.poleU()-math.Pow(p/s.p1, 1/s.n) > 0
}

// gaussLegendre16 are the nodes and weights of 16-point Gauss-Legendre
// quadrature on [-1, 1].
var gaussLegendre16 = func() (nodes [2][16]float64) {
	quad.Legendre{}.FixedLocations(nodes[0][:], nodes[1][:], -1, 1)
	return nodes
}()

// fillTime returns the time to raise a tank of volume v from pa to pb
// (absolute, pa ≤ pb, and the supply delivering at pb).
func (s supplyModel) fillTime(v, pa, pb float64) float64 {
	tau := v / s.rate
	t := 0.0
	if pa < s.p1 {
		t = tau * (math.Min(pb, s.p1) - pa) / s.p1
		pa = s.p1
	}
	if pb <= pa {
		return t
	}
	return t + tau*s.riseIntegral(math.Pow(pa/s.p1, 1/s.n), math.Pow(pb/s.p1, 1/s.n))
}

// riseIntegral returns ∫ dx/(1 + c − c·x^(1/n)) for x = u^n, u from ua to
// ub (1 ≤ ua ≤ ub < U). With x = u^n the integrand is n·u^(n−1)/(c·(U − u));
// adding and subtracting U^(n−1) splits it into n·U^(n−1)/(c·(U − u)),
// integrated in closed form, and a smooth remainder which, with
// u = U·e^L, is (n·U^(n−1)/c)·e^L·expm1((n−1)L)/(−expm1(L)) dL.
func (s supplyModel) riseIntegral(ua, ub float64) float64 {
	bigU := s.poleU()
	sum := math.Log1p((ub - ua) / (bigU - ub))
	if s.n != 1 {
		g := func(l float64) float64 {
			return math.Exp(l) * math.Expm1((s.n-1)*l) / -math.Expm1(l)
		}
		la, lb := math.Log(ua/bigU), math.Log(ub/bigU)
		steps := int(math.Ceil((lb - la) / 0.5))
		h := (lb - la) / float64(steps)
		for i := range steps {
			lo := la + h*float64(i)
			mid, half := lo+h/2, h/2
			for j, x := range gaussLegendre16[0] {
				sum += half * gaussLegendre16[1][j] * g(mid+half*x)
			}
		}
	}
	return s.n * math.Pow(bigU, s.n-1) / s.c * sum
}

// filler is what fills a receiver: a compressor's cycle or a machine.
type filler interface {
	// fillTime is the time to raise a tank of volume v from pa to pb
	// (absolute, pa ≤ pb, the supply delivering at pb).
	fillTime(v, pa, pb float64) float64
	// fillWorking is the working of the tank's fill time.
	fillWorking(t tankInput) calc.Trace
}

// tankInput is a tank block's inputs in SI, pressures absolute.
type tankInput struct {
	volume, target, start, ambient float64
	supply                         filler
	customary                      bool // the block is written in US customary units
}

// readTankInput applies the checks that single-input ranges cannot.
func readTankInput(in *calc.Inputs) (tankInput, error) {
	t := tankInput{volume: in.Value("volume"), target: in.Value("pressure"), start: in.Value("start_pressure"), ambient: in.Ambient,
		customary: in.Customary()}
	pair := func(p float64) string { return display.GaugeAndAbsolute(p, t.ambient, t.customary) }
	if t.target <= t.ambient {
		return t, &calc.InputError{Key: "pressure", Message: fmt.Sprintf(
			"target pressure %s must be above ambient %s: a receiver stores compressed air", pair(t.target), display.TraceIn(t.customary, "bar(a)")(t.ambient))}
	}
	if t.start >= t.target {
		return t, &calc.InputError{Key: "start_pressure", Message: fmt.Sprintf(
			"start pressure %s must be below the target pressure %s", pair(t.start), pair(t.target))}
	}
	if err := checkWallInputs(in); err != nil {
		return t, err
	}
	if l := in.LinkOf("supply"); l != nil {
		if m, isMachine, err := linkedMachine(l); isMachine {
			if err != nil {
				return t, &calc.InputError{Key: "supply", Message: err.Error()}
			}
			if dead := m.deadHead(); t.target >= dead || !(m.solve(t.target).mass > 0) {
				return t, &calc.InputError{Key: "pressure", Message: fmt.Sprintf(
					"target pressure %s is at or above the dead-head pressure %s of machine %s: its delivery falls to zero before the receiver gets there; lower the target",
					pair(t.target), pair(dead), l.ID)}
			}
			t.supply = machineFill{id: l.ID, m: m}
			return t, nil
		}
		s, err := readSupply(l)
		if err != nil {
			return t, &calc.InputError{Key: "supply", Message: err.Error()}
		}
		if t.target >= s.pMax || !s.delivers(t.target) {
			return t, &calc.InputError{Key: "pressure", Message: fmt.Sprintf(
				"target pressure %s is at or above the dead-head pressure %s of supply %s: its delivery falls to zero before the receiver gets there; "+
					"lower the target or the supply's clearance", pair(t.target), pair(s.pMax), s.id)}
		}
		t.supply = s
	}
	return t, nil
}

func evaluateTank(in *calc.Inputs) (*calc.Outcome, error) {
	t, err := readTankInput(in)
	if err != nil {
		return nil, err
	}
	out := &calc.Outcome{}
	if t.supply != nil {
		out.Results = append(out.Results, fillResult(t))
		out.Curves = append(out.Curves, fillCurve(t))
		out.Tables = append(out.Tables, fillTable(t))
	}
	out.Results = append(out.Results, storedEnergyResult(t))
	code, hasCode := 0.0, false
	if in.Has("inner_diameter") {
		wall, err := tankWallOutcome(in)
		if err != nil {
			return nil, err
		}
		for _, r := range wall.Results {
			if slices.Contains(wallResults, r.Name) {
				out.Results = append(out.Results, r)
			}
			if r.Name == "code_allowable_pressure" {
				code, hasCode = r.Value-t.ambient, true
			}
		}
	}
	test, err := pneumaticTestResults(in, t.volume, t.target-t.ambient, code, hasCode)
	if err != nil {
		return nil, err
	}
	out.Results = append(out.Results, test...)
	return out, nil
}

// tankWallOutcome is the tube kind's outcome for the shell, with the heads
// among the code figures, at the supply's discharge temperature unless a
// design temperature is given.
func tankWallOutcome(in *calc.Inputs) (*calc.Outcome, error) {
	c, err := readTubeInput(in)
	if err != nil {
		return nil, err
	}
	temperature := ordinaryTemperature
	if l := in.LinkOf("supply"); l != nil && l.Results["discharge_temperature"] > 0 {
		temperature = l.Results["discharge_temperature"]
	}
	code, err := readVesselCode(in, c, temperature)
	if err != nil {
		return nil, err
	}
	head, th, factor, err := readTankHead(in, code.wall)
	if err != nil {
		return nil, err
	}
	if head != "" && code.noFigure == "" {
		code.figures = append(code.figures, code.wall.head(head, th, factor))
	}
	return tubeOutcome(in, c, code), nil
}

// readTankHead reads head, head_thickness and flat_head_factor; head is
// "" when the block names none.
func readTankHead(in *calc.Inputs, w codeWall) (head string, th, factor float64, err error) {
	head = in.NameOf("head")
	mm := display.TraceIn(in.Customary(), "mm")
	switch {
	case head == "" && in.Has("head_thickness"):
		return "", 0, 0, &calc.InputError{Key: "head_thickness", Message: "is given but head is missing: name the heads (" + strings.Join(vesselHeads[:4], ", ") + ")"}
	case head == "" && in.Has("flat_head_factor"):
		return "", 0, 0, &calc.InputError{Key: "flat_head_factor", Message: "is given but head is missing: it is C of a welded flat head (head = \"flat\")"}
	case head == "":
		return "", 0, 0, nil
	case head == "bolted":
		return "", 0, 0, &calc.InputError{Key: "head", Message: "\"bolted\" is refused: a bolted flat cover needs the moment its gasket's load puts on it (the W·h_G/(S·E·d³) term of UG-34 with the gasket loads of Appendix 2), which this model lacks; " +
			"allowed: " + strings.Join(vesselHeads[:4], ", ") + "; give a bolted cover's bolts as a bolts block"}
	case !in.Has("head_thickness"):
		return "", 0, 0, &calc.InputError{Key: "head", Message: fmt.Sprintf("head = %q needs head_thickness, the heads' thickness as built (a length, e.g. \"3 mm\")", head)}
	case head != "flat" && in.Has("flat_head_factor"):
		return "", 0, 0, &calc.InputError{Key: "flat_head_factor", Message: fmt.Sprintf("is C of a welded flat head; head = %q takes none", head)}
	}
	th, factor = in.Value("head_thickness"), defaultFlatHeadFactor
	if in.Has("flat_head_factor") {
		factor = in.Value("flat_head_factor")
	}
	if th <= w.ca {
		return "", 0, 0, &calc.InputError{Key: "head_thickness", Message: fmt.Sprintf(
			"%s leaves nothing of the head once the corrosion allowance %s is taken off; allowed: more than the corrosion allowance", mm(th), mm(w.ca))}
	}
	return head, th, factor, nil
}

// checkWallInputs asks for the whole wall when part of it is given.
func checkWallInputs(in *calc.Inputs) error {
	var given []string
	for _, name := range tankWall {
		if in.Given(name) {
			given = append(given, name)
		}
	}
	whole := "give material, inner_diameter and wall_thickness or outer_diameter for the shell wall, or none of them"
	if len(given) == 0 {
		for _, name := range []string{"head", "head_thickness", "flat_head_factor"} {
			if in.Given(name) {
				return &calc.InputError{Key: name, Message: "is given but the shell wall is missing: the heads' code figure needs the shell's material and diameter; " + whole}
			}
		}
		return nil
	}
	for _, name := range []string{"material", "inner_diameter"} {
		if !in.Has(name) {
			return &calc.InputError{Key: given[0], Message: fmt.Sprintf("%s is given but %s is missing: %s", given[0], name, whole)}
		}
	}
	if !in.Has("wall_thickness") && !in.Has("outer_diameter") {
		return &calc.InputError{Key: given[0], Message: fmt.Sprintf("%s is given but wall_thickness or outer_diameter is missing: %s", given[0], whole)}
	}
	return nil
}

// fillResult is the fill time with its working.
func fillResult(t tankInput) calc.Result {
	return calc.Result{Name: "fill_time", Value: t.supply.fillTime(t.volume, t.start, t.target), Dim: units.Time, Trace: t.supply.fillWorking(t)}
}

// fillWorking is the working of the fill time from a compressor's cycle.
func (s supplyModel) fillWorking(t tankInput) calc.Trace {
	bara := display.TraceIn(t.customary, "bar(a)")
	litres := display.TraceIn(t.customary, "L")(t.volume)
	rate := display.TraceIn(t.customary, "L/min")(s.rate)
	supply := fmt.Sprintf("supply %s: V̇d = %s, c = %s, n = %s, p1 = %s, p_max = %s",
		s.id, rate, display.Number(s.c, ""), display.Number(s.n, ""), bara(s.p1), bara(s.pMax))
	if s.n == 1 {
		// The closed form runs from p1 up; below p1 the cylinder delivers
		// its full displacement, a term of its own.
		cw := display.Number(s.c, "")
		lo, hi := math.Max(t.start, s.p1), math.Max(t.target, s.p1)
		formula := "t = V/(c·V̇d) · ln((1 + c − c·p0/p1)/(1 + c − c·p2/p1))"
		sub := fmt.Sprintf("= %s/(%s · %s) · ln((1 + %s − %s·%s/%s)/(1 + %s − %s·%s/%s))",
			litres, cw, rate, cw, cw, bara(lo), bara(s.p1), cw, cw, bara(hi), bara(s.p1))
		if t.start < s.p1 {
			formula += " + V·(p1 − p0)/(p1·V̇d) below p1, at full displacement"
			sub += fmt.Sprintf(" + %s·(%s − %s)/(%s · %s)", litres, bara(math.Min(t.target, s.p1)), bara(t.start), bara(s.p1), rate)
		}
		return calc.Trace{Formula: formula + " (n = 1, isothermal tank at inlet temperature)", Substituted: sub + "; " + supply}
	}
	below := ""
	if t.start < s.p1 {
		below = fmt.Sprintf("; of which below p1, at full displacement: V·(p1 − p0)/(p1·V̇d) = %s", display.Number(s.fillTime(t.volume, t.start, math.Min(s.p1, t.target)), "s"))
	}
	return calc.Trace{Formula: "t = ∫ V dp / (p1 · V̇d · (1 + c − c·(p/p1)^(1/n))) from p0 to p2 (isothermal tank at inlet temperature)", Substituted: fmt.Sprintf("= ∫ %s dp / (%s · FAD(p)) from %s to %s; %s%s",
		litres, bara(s.p1), bara(t.start), bara(t.target), supply, below)}
}

// fillCurve samples the tank pressure over time at equal pressure steps.
func fillCurve(t tankInput) calc.Curve {
	c := calc.Curve{Name: "fill", XDim: units.Time, YDim: units.Pressure}
	elapsed, prev := 0.0, t.start
	for i := range fillCurveIntervals + 1 {
		p := t.start + (t.target-t.start)*float64(i)/fillCurveIntervals
		if i == fillCurveIntervals {
			p = t.target
		}
		elapsed += t.supply.fillTime(t.volume, prev, p)
		c.X, c.Y = append(c.X, elapsed), append(c.Y, p)
		prev = p
	}
	return c
}

// fillTable gives the time to reach each whole bar (gauge) from the start
// pressure, and the target, in a 1-2-5 step of bars when whole bars would
// give more than fillTableMaxRows rows. A block written in US customary
// units gets steps of psi instead, fewer of them, as psi are small.
func fillTable(t tankInput) calc.Table {
	unit, perUnit, maxRows := "bar", 1e5, fillTableMaxRows
	if psi, ok := units.Known("psi"); ok && t.customary {
		unit, perUnit, maxRows = "psi", psi.Factor, fillTableMaxRowsPsi
	}
	c := calc.Table{Title: "Fill time by tank pressure",
		X: calc.Axis{Label: "Tank pressure", Dim: units.Pressure, Unit: unit},
		Y: calc.Axis{Label: "Time from start", Dim: units.Time, Unit: "s"}}
	step := tableStep((t.target-t.ambient)/perUnit, maxRows)
	first := math.Ceil((t.start - t.ambient) / perUnit / step)
	elapsed, prev := 0.0, t.start
	for k := first; t.ambient+k*step*perUnit <= t.target; k++ {
		p := t.ambient + k*step*perUnit
		elapsed += t.supply.fillTime(t.volume, prev, p)
		c.XS, c.YS = append(c.XS, p), append(c.YS, elapsed)
		prev = p
	}
	// The last row is the target itself when it is not a whole step.
	if t.target-prev > 1e-9*t.target {
		elapsed += t.supply.fillTime(t.volume, prev, t.target)
		c.XS, c.YS = append(c.XS, t.target), append(c.YS, elapsed)
	}
	c.Y.Unit = display.DurationUnit(elapsed)
	return c
}

// tableStep returns the smallest step of 1, 2, 5, 10, 20, 50 ... units
// that covers span in at most maxRows steps.
func tableStep(span float64, maxRows int) float64 {
	for decade := 1.0; ; decade *= 10 {
		for _, m := range []float64{1, 2, 5} {
			if span/(m*decade) <= float64(maxRows) {
				return m * decade
			}
		}
	}
}

// storedEnergyResult is the isentropic expansion energy, with the
// isothermal figure beside it in the trace.
func storedEnergyResult(t tankInput) calc.Result {
	const k = (airGamma - 1) / airGamma
	p, pa, v := t.target, t.ambient, t.volume
	e := -p * v / (airGamma - 1) * math.Expm1(k*math.Log(pa/p))
	iso := p * v * math.Log(p/pa)
	// Near ambient, 1 − (p_a/p)^k is a small difference: more figures.
	bara := display.TraceInSig(t.customary, "bar(a)", display.FiguresFor(p, p-pa))
	litres := display.TraceIn(t.customary, "L")
	return calc.Result{Name: "stored_energy", Value: e, Dim: units.Energy, Trace: calc.Trace{Formula: "E = p·V/(γ−1) · [1 − (p_a/p)^((γ−1)/γ)], γ = 1.4 (isentropic expansion to ambient, as ASME PCC-2 Art. 501 for pneumatic tests)", Substituted: fmt.Sprintf("= %s · %s / 0.4 · [1 − (%s / %s)^(0.4/1.4)]; isothermal for comparison: p·V·ln(p/p_a) = %s",
		bara(p), litres(v), bara(pa), bara(p), display.Number(iso/1e3, "kJ"))}}
}

func tankChart(name string, in *calc.Inputs, out *calc.Outcome) (*calc.Chart, error) {
	fill, ok := out.Curve("fill")
	if !ok {
		return nil, fmt.Errorf("the fill chart needs a supply: name the compressor that fills the tank")
	}
	gauge := display.Described(in.Customary(), "bar")
	unit := display.DurationUnit(fill.X[len(fill.X)-1])
	return &calc.Chart{
		Title: "Tank pressure while filling",
		Desc: fmt.Sprintf("The receiver's gauge pressure over time as the supply fills it from %s to %s; the delivery falls as the pressure rises, so the curve flattens.",
			gauge(fill.Y[0]-in.Ambient), gauge(fill.Y[len(fill.Y)-1]-in.Ambient)),
		X: calc.Axis{Label: "Time", Dim: units.Time, Unit: unit},
		Panels: []calc.Panel{{
			Y:      calc.Axis{Label: "Tank pressure", Dim: units.Pressure, Unit: "bar"},
			Series: []calc.Series{{Name: "tank pressure", X: fill.X, Y: fill.Y}},
			Marks:  []calc.Mark{{Value: fill.Y[len(fill.Y)-1], Label: "target"}},
		}},
	}, nil
}
