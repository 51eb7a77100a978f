package models

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// machineKind couples compressor blocks on one crankshaft by mass
// continuity: the pressures the stages run at, the machine's delivery,
// power and intercooler heat, and the torque of all stages together.
var machineKind = calc.Kind{
	Name:            "machine",
	Summary:         "compressor stages on one crankshaft, coupled by mass continuity: operating interstage pressures, free air delivery at the machine's inlet, power, intercooler heat, torque of all stages",
	Doc:             machineDoc,
	Roles:           calc.HoldsPressure | calc.Delivers,
	WorkingPressure: calc.WorkingPressure{Key: "discharge_pressure", Name: "discharge pressure"},
	LinkHint:        "a machine block is its stages on one crank: name its compressor blocks",
	Inputs: []calc.InputSpec{
		{Name: "stages", Type: calc.LinkList, LinkRoles: calc.Delivers | calc.Crank, LinkAll: true,
			Meaning: "ids of the compressor blocks on the crankshaft, 2 to 6, in the order the air passes through them; the first draws from the machine's inlet"},
		{Name: "discharge_pressure", Dim: units.Pressure, Optional: true, Range: positiveUpTo(1e9), Meaning: "pressure the last stage delivers against, up to 1 GPa; default: the last stage block's"},
		{Name: "intercooled_temperature", Dim: units.Temperature, Optional: true, List: true, Range: calc.Between(minGasTemperature, maxGasTemperature),
			Meaning: "air temperature leaving the intercoolers, one for all or a list with one per intercooler; default: each later stage block's inlet temperature"},
		{Name: "pressure_drop", Dim: units.Stress, Optional: true, List: true, Range: calc.Between(0, 1e8),
			Meaning: "pressure lost in the intercoolers, one for all or a list with one per intercooler; default: none"},
	},
	Results:  machineResults(),
	Charts:   []string{"torque"},
	Chart:    machineChart,
	Evaluate: evaluateMachine,
}

// airCp is the specific heat of dry air at constant pressure near room
// temperature, J/(kg K) (1.005 kJ/(kg K) at 300 K: Çengel and Boles,
// Thermodynamics, table of ideal-gas specific heats; from memory).
const airCp = 1005.0

// offDesignLimit is how far, as a fraction of the absolute pressure, a
// stage block's own pressures may lie from those the machine runs it at
// before a NOTICE says so (the figure).
const offDesignLimit = 0.02

const machineDoc = `The machine kind couples the compressor blocks named in stages (2 to 6), on
one crankshaft turning at their common speed N, by mass continuity. Stage 1
draws from the machine's inlet: its block's inlet pressure p1 and
temperature T1. Each later stage draws from an intercooler at T_ic (one
value or one per intercooler; default: the stage block's own inlet
temperature), and the last delivers against p_d (default: the last stage
block's discharge pressure). Pressures are absolute in the formulas.

Model
- Each stage k is its block's ideal cycle, with its own displacement per
  revolution V_d,k, clearance ratio c_k and polytropic index n_k. The mass
  it draws per second, from suction p_s,k to discharge p_o,k, is
    ṁ_k = η_v,k · V_d,k · N · p_s,k / (R · T_k)
    η_v,k = 1 + c_k − c_k · (p_o,k/p_s,k)^(1/n_k)
  (as the compressor kind; η_v = 1 when p_o ≤ p_s, and 0 at or beyond the
  dead-head). R = 287.05 J/(kg K).
- In steady running every stage carries the same mass flow ṁ. The
  interstage pressures are where that holds: interstage_pressure_k is
  stage k's discharge, and stage k+1 draws at that less the intercooler's
  pressure_drop. They are solved, not chosen: for a trial ṁ the suction
  pressure of each stage from the last back follows from its discharge
  (ṁ_k rises with p_s,k, so one root, found by Newton's method), and ṁ
  is found by Brent's method where the first stage delivers exactly ṁ
  from the machine's inlet.
- Open valves: when the discharge pressure is so low that a later stage
  would need a pressure ratio below 1 to pass the flow (the tank is nearly
  empty), its valves stand open. Its suction pressure equals its
  discharge, it does no work, and the flow is the earlier stage's at that
  pressure. A stage facing a discharge below its inlet delivers its full
  displacement.
- The stages' own design pressures play no part: a stage whose block's
  inlet or discharge pressure lies more than 2 % (absolute) from what the
  machine runs it at gets a NOTICE naming both.

Results
  ṁ (mass_flow); FAD = ṁ · R · T1 / p1, the delivery as volume at the
  machine's inlet (free air delivery in the sense of ISO 1217, referred to
  the machine's inlet point, not a later stage's).
  T_d,k = T_k · (p_o,k/p_s,k)^((n_k−1)/n_k)          discharge_temperature_k
  P_i,k = ṁ · n_k/(n_k−1) · R · T_k · (r_k^((n_k−1)/n_k) − 1)
  shaft_power = Σ P_i,k / η_m,k (each stage's mechanical efficiency)
  specific_power = shaft_power / FAD
  intercooler_heat_k = ṁ · c_p · (T_d,k − T_ic,k), c_p = 1005 J/(kg K)
  split_mismatch: the largest p_k/p_eq,k − 1 over the interstage
    pressures, against the equal-ratio split p_eq,k = p1·(p_d/p1)^(k/S) of
    S stages (the multistage kind's ideal study)
  max_pressure = p1 · Π CR_k^(n_k): with the outlet blocked every stage
    runs to its dead-head (the intercooler drops vanish with the flow).
  Torque: each stage's ideal indicator cycle at its operating pressures,
  T(θ) = −(p − p_amb)·A·dx/dθ for each cylinder, summed over the stages
  with stage k reaching top dead centre at its block's phase, or, when no
  stage gives one, at 360°·(k−1)/S. mean_torque = Σ P_i,k/ω;
  peak_torque and energy_fluctuation as the compressor kind. Chart:
  torque, the sum and each stage over one revolution, peak and mean
  marked.

Assumptions and limits
- The stages' ideal cycles: no valve pressure drop or throttling, no
  leakage, no heat pick-up at suction. Real machines deliver less and run
  hotter; the coupled figures are upper bounds on delivery as the stage
  blocks' are. Suction heating of a later stage raises T_k and lowers its
  draw, moving the interstage pressure up.
- The intercooler drop is taken as fixed; a real one falls with the flow.
- Every intercooler brings the air to T_ic; condensate is not modelled.
- The compressor blocks keep their own results at their own pressures; a
  later stage's free_air_delivery is air at its own inlet.`

// maxMachineStages bounds a machine's stages, as the results declared for
// them.
const maxMachineStages = maxStages

// machineResults declares the results, the numbered ones for every stage
// or intercooler a machine may have.
func machineResults() []calc.ResultSpec {
	specs := []calc.ResultSpec{}
	for k := 1; k < maxMachineStages; k++ {
		specs = append(specs, calc.ResultSpec{Name: fmt.Sprintf("interstage_pressure_%d", k), Dim: units.Pressure, Unit: "bar",
			Meaning: fmt.Sprintf("operating discharge pressure of stage %d, where its delivered mass equals what stage %d draws (with at least %d stages)", k, k+1, k+1)})
	}
	specs = append(specs,
		calc.ResultSpec{Name: "mass_flow", Dim: units.MassFlow, Unit: "g/s", Meaning: "mass of air every stage carries per unit time"},
		calc.ResultSpec{Name: "free_air_delivery", Dim: units.VolumeFlow, Unit: "L/min", Meaning: "the machine's delivery, as volume at the first stage's inlet pressure and temperature"},
	)
	for k := 1; k <= maxMachineStages; k++ {
		specs = append(specs, calc.ResultSpec{Name: fmt.Sprintf("discharge_temperature_%d", k), Dim: units.Temperature, Unit: "degC",
			Meaning: fmt.Sprintf("air temperature leaving stage %d at its operating pressures (with at least %d stages)", k, k)})
	}
	specs = append(specs,
		calc.ResultSpec{Name: "shaft_power", Dim: units.Power, Unit: "W", Meaning: "power the drive must supply: each stage's indicated power at its operating pressures over its mechanical efficiency, summed"},
		calc.ResultSpec{Name: "specific_power", Dim: units.SpecificPower, Unit: "kW/(m3/min)", Meaning: "shaft power per unit of free air delivered"},
	)
	for k := 1; k < maxMachineStages; k++ {
		specs = append(specs, calc.ResultSpec{Name: fmt.Sprintf("intercooler_heat_%d", k), Dim: units.Power, Unit: "W",
			Meaning: fmt.Sprintf("heat intercooler %d takes out of the air, after stage %d (with at least %d stages)", k, k, k+1)})
	}
	return append(specs,
		calc.ResultSpec{Name: "split_mismatch", Dim: units.Dimensionless, Unit: "%", Meaning: "largest relative difference of an operating interstage pressure from the equal-ratio split's (absolute pressures)"},
		calc.ResultSpec{Name: "max_pressure", Dim: units.Pressure, Unit: "bar", Meaning: "dead-head pressure: what the last stage reaches with the outlet blocked"},
		calc.ResultSpec{Name: "mean_torque", Dim: units.Torque, Unit: "N m", Meaning: "indicated power of all stages over the crank speed: the steady drive torque without friction"},
		calc.ResultSpec{Name: "peak_torque", Dim: units.Torque, Unit: "N m", Meaning: "largest gas load torque of all stages together over a revolution"},
		calc.ResultSpec{Name: "energy_fluctuation", Dim: units.Energy, Unit: "J", Meaning: "swing of the energy a flywheel must store and give back against a constant drive torque"},
	)
}

// machineStage is one compressor block as the machine couples it, SI,
// pressures absolute.
type machineStage struct {
	id       string
	cyl      cylinder // its block's geometry, gas and own pressures
	disp     float64  // volume all its cylinders sweep in a revolution
	suctionT float64  // temperature it draws at
	phase    float64  // crank angle at which its first cylinder reaches TDC
}

// machine is a machine block read, SI, pressures absolute.
type machine struct {
	stages  []machineStage
	p1, t1  float64   // the machine's inlet: the first stage's
	pd      float64   // discharge pressure
	drops   []float64 // pressure lost in each intercooler
	omega   float64   // crank speed, rad/s
	ambient float64
}

// machinePoint is a machine running steadily against one discharge
// pressure.
type machinePoint struct {
	mass     float64   // kg/s, through every stage
	suction  []float64 // each stage's suction pressure
	delivery []float64 // each stage's discharge pressure
	open     []bool    // the stage's valves stand open: it passes the air without compressing it
}

// readMachine reads a machine block's inputs and its stages, with the
// checks single inputs cannot make. in is the machine's own inputs, or a
// linked machine's as its model saw them.
func readMachine(in *calc.Inputs) (machine, error) {
	links := in.LinksOf("stages")
	m := machine{ambient: in.Ambient}
	if len(links) < 2 || len(links) > maxMachineStages {
		return m, &calc.InputError{Key: "stages", Message: fmt.Sprintf(
			"names %d block(s); a machine has 2 to %d stages (a single stage is its compressor block, which is the machine)", len(links), maxMachineStages)}
	}
	cust := in.Customary()
	rpm := func(w float64) string { return display.Number(w*30/math.Pi, "rpm") }
	var ids []string
	phased := 0
	for k, l := range links {
		if slices.Contains(ids, l.ID) {
			return m, &calc.InputError{Key: "stages", Message: fmt.Sprintf(
				"names block %q twice; list each stage once, in the order the air passes through them (identical cylinders of one stage are its cylinders input)", l.ID)}
		}
		ids = append(ids, l.ID)
		c, err := readCompressor(l.Model)
		if err != nil {
			return m, &calc.InputError{Key: "stages", Message: fmt.Sprintf("stage %s: %v", l.ID, err)}
		}
		s := machineStage{id: l.ID, cyl: c, suctionT: c.t1,
			disp: float64(c.cylinders) * math.Pi / 4 * c.bore * c.bore * 2 * c.crankRadius}
		if ph, ok := l.Inputs["phase"]; ok {
			s.phase = ph
			phased++
		}
		if k == 0 {
			m.p1, m.t1, m.omega = c.p1, c.t1, c.omega
		} else if math.Abs(c.omega-m.omega) > 1e-9*m.omega {
			return m, &calc.InputError{Key: "stages", Message: fmt.Sprintf(
				"%s turns at %s and %s at %s; the stages on one crankshaft turn together: give them one speed", links[0].ID, rpm(m.omega), l.ID, rpm(c.omega))}
		}
		m.stages = append(m.stages, s)
	}
	switch phased {
	case 0:
		for k := range m.stages {
			m.stages[k].phase = 2 * math.Pi * float64(k) / float64(len(m.stages))
		}
	case len(m.stages):
	default:
		return m, &calc.InputError{Key: "stages", Message: "some stage blocks give a phase and some do not; give every stage's phase, or none (the stages are then spaced evenly)"}
	}
	last := m.stages[len(m.stages)-1].cyl
	m.pd = last.p2
	if in.Has("discharge_pressure") {
		m.pd = in.Value("discharge_pressure")
	}
	pair := func(p float64) string { return display.GaugeAndAbsolute(p, m.ambient, cust) }
	if m.pd <= m.p1 {
		return m, &calc.InputError{Key: "discharge_pressure", Message: fmt.Sprintf(
			"discharge pressure %s must be above the machine's inlet %s, the first stage's", pair(m.pd), pair(m.p1))}
	}
	coolers := len(m.stages) - 1
	perCooler := func(key string, fallback func(k int) float64) ([]float64, error) {
		vs := in.ValuesOf(key)
		switch {
		case len(vs) == 0:
			vs = make([]float64, coolers)
			for k := range vs {
				vs[k] = fallback(k)
			}
		case len(vs) == 1:
			vs = slices.Repeat(vs, coolers)
		case len(vs) != coolers:
			return nil, &calc.InputError{Key: key, Message: fmt.Sprintf(
				"gives %d values for %d intercooler(s); give one value for all, or one per intercooler", len(vs), coolers)}
		}
		return vs, nil
	}
	tic, err := perCooler("intercooled_temperature", func(k int) float64 { return m.stages[k+1].suctionT })
	if err != nil {
		return m, err
	}
	for k, t := range tic {
		m.stages[k+1].suctionT = t
	}
	if m.drops, err = perCooler("pressure_drop", func(int) float64 { return 0 }); err != nil {
		return m, err
	}
	return m, nil
}

// linkedMachine reads a linked block as a machine, when it is one (its
// model saw stages).
func linkedMachine(l *calc.Linked) (machine, bool, error) {
	if l.Model == nil || len(l.Model.LinksOf("stages")) == 0 {
		return machine{}, false, nil
	}
	m, err := readMachine(l.Model)
	return m, true, err
}

// revs is the crank speed in revolutions per second.
func (m machine) revs() float64 { return m.omega / (2 * math.Pi) }

// draws is the mass a stage draws per second from suction ps against a
// discharge po: its volumetric efficiency times the displacement rate at
// suction density.
func (s machineStage) draws(ps, po, revs float64) float64 {
	return s.efficiency(ps, po) * s.disp * revs * ps / (airGasConstant * s.suctionT)
}

// efficiency is the stage's volumetric efficiency from clearance
// re-expansion: 1 against a discharge at or below its suction, 0 at or
// beyond its dead-head.
func (s machineStage) efficiency(ps, po float64) float64 {
	if po <= ps {
		return 1
	}
	return math.Max(0, 1+s.cyl.clearanceRatio-s.cyl.clearanceRatio*math.Pow(po/ps, 1/s.cyl.n))
}

// suctionFor is the suction pressure at which the stage draws mass mdot
// against discharge po, or po itself with its valves open when even
// drawing at po it would pass less than mdot.
func (s machineStage) suctionFor(mdot, po, revs float64) (float64, bool) {
	k := s.disp * revs / (airGasConstant * s.suctionT)
	if mdot >= k*po {
		return po, true
	}
	// f(p) = k·p·(1 + c − c·(po/p)^(1/n)) − ṁ rises and is convex in p:
	// Newton from p = po, where f ≥ 0, falls to the root without passing it.
	c, n := s.cyl.clearanceRatio, s.cyl.n
	p := po
	for range 100 {
		u := math.Pow(po/p, 1/n)
		f := k*p*(1+c-c*u) - mdot
		df := k * (1 + c - c*(1-1/n)*u)
		next := p - f/df
		if !(next < p) {
			break
		}
		p = next
	}
	return p, false
}

// solve finds the steady running point against discharge pressure pd.
func (m machine) solve(pd float64) machinePoint {
	revs, last := m.revs(), len(m.stages)-1
	pt := machinePoint{suction: make([]float64, len(m.stages)), delivery: make([]float64, len(m.stages)), open: make([]bool, len(m.stages))}
	// back fills the stages' pressures for a trial mass flow, from the
	// last stage back to the first, and returns what the first delivers.
	back := func(mdot float64) float64 {
		po := pd
		for k := last; k > 0; k-- {
			pt.delivery[k] = po
			pt.suction[k], pt.open[k] = m.stages[k].suctionFor(mdot, po, revs)
			po = pt.suction[k] + m.drops[k-1]
		}
		pt.delivery[0], pt.suction[0] = po, m.p1
		return m.stages[0].draws(m.p1, po, revs)
	}
	// What the first stage delivers falls as the trial flow rises, so
	// the root is bracketed by no flow and its full displacement.
	pt.mass = brentRoot(func(mdot float64) float64 { return back(mdot) - mdot }, 0, m.stages[0].draws(m.p1, m.p1, revs))
	back(pt.mass)
	return pt
}

// brentRoot returns the root of f between a and b, where f changes sign,
// to the last bits of a double: Brent's method (inverse quadratic
// interpolation, secant and bisection; R. P. Brent, Algorithms for
// Minimization without Derivatives, ch. 4, as in Numerical Recipes'
// zbrent).
func brentRoot(f func(float64) float64, a, b float64) float64 {
	fa, fb := f(a), f(b)
	if fa == 0 {
		return a
	}
	if fb == 0 || fa*fb > 0 {
		return b
	}
	c, fc := b, fb
	var d, e float64
	for range 200 {
		if (fb > 0) == (fc > 0) {
			c, fc = a, fa
			d = b - a
			e = d
		}
		if math.Abs(fc) < math.Abs(fb) {
			a, b, c = b, c, b
			fa, fb, fc = fb, fc, fb
		}
		tol := 2 * 0x1p-52 * math.Abs(b)
		half := (c - b) / 2
		if math.Abs(half) <= tol || fb == 0 {
			return b
		}
		if math.Abs(e) >= tol && math.Abs(fa) > math.Abs(fb) {
			var p, q float64
			s := fb / fa
			if a == c {
				p, q = 2*half*s, 1-s
			} else {
				qa, r := fa/fc, fb/fc
				p = s * (2*half*qa*(qa-r) - (b-a)*(r-1))
				q = (qa - 1) * (r - 1) * (s - 1)
			}
			if p > 0 {
				q = -q
			}
			p = math.Abs(p)
			if 2*p < math.Min(3*half*q-math.Abs(tol*q), math.Abs(e*q)) {
				e, d = d, p/q
			} else {
				d, e = half, half
			}
		} else {
			d, e = half, half
		}
		a, fa = b, fb
		if math.Abs(d) > tol {
			b += d
		} else if half > 0 {
			b += tol
		} else {
			b -= tol
		}
		fb = f(b)
	}
	return b
}

// deadHead is the pressure the last stage reaches with the outlet blocked:
// each stage compresses its trapped air to its dead-head, and the next
// draws at that (no flow, so no intercooler drop).
func (m machine) deadHead() float64 {
	p := m.p1
	for _, s := range m.stages {
		p *= math.Pow((1+s.cyl.clearanceRatio)/s.cyl.clearanceRatio, s.cyl.n)
	}
	return p
}

// indicatedPower is stage k's gas power at the running point:
// ṁ · n/(n−1) · R · T · (r^((n−1)/n) − 1), nothing with its valves open.
func (m machine) indicatedPower(pt machinePoint, k int) float64 {
	r := pt.delivery[k] / pt.suction[k]
	if pt.open[k] || r <= 1 {
		return 0
	}
	return pt.mass * stageWork(m.stages[k].suctionT, r, m.stages[k].cyl.n)
}

// stageTorques samples each stage's gas load torque over one revolution
// at the running point, every cylinder of it and its phase included.
func (m machine) stageTorques(pt machinePoint, steps int) [][]float64 {
	out := make([][]float64, len(m.stages))
	for k, s := range m.stages {
		c := s.cyl
		cyc := c.cycleAt(pt.suction[k], pt.delivery[k])
		z := float64(c.cylinders)
		out[k] = sampleRevolution(steps, func(theta float64) float64 {
			t := 0.0
			for j := range c.cylinders {
				t += cyc.gasTorque(math.Mod(theta-s.phase-2*math.Pi*float64(j)/z+4*math.Pi, 2*math.Pi))
			}
			return t
		})
	}
	return out
}

// peakTorque is the largest summed gas torque of all stages at the
// running point, with the summed curve.
func (m machine) peakTorque(pt machinePoint) (float64, []float64) {
	stages := m.stageTorques(pt, cycleSteps)
	sum := make([]float64, cycleSteps)
	for _, st := range stages {
		for i, t := range st {
			sum[i] += t
		}
	}
	return slices.Max(sum), sum
}

func evaluateMachine(in *calc.Inputs) (*calc.Outcome, error) {
	m, err := readMachine(in)
	if err != nil {
		return nil, err
	}
	cust := in.Customary()
	bara, pair := display.TraceIn(cust, "bar(a)"), func(p float64) string { return display.GaugeAndAbsolute(p, m.ambient, cust) }
	dead := m.deadHead()
	if m.pd >= dead {
		return nil, &calc.InputError{Key: "discharge_pressure", Message: fmt.Sprintf(
			"discharge pressure %s is at or above the machine's dead-head pressure %s: it delivers nothing; lower it or the stages' clearance", pair(m.pd), pair(dead))}
	}
	pt := m.solve(m.pd)
	for k := range m.stages {
		if pt.delivery[k] < pt.suction[k] {
			return nil, &calc.InputError{Key: "stages", Message: fmt.Sprintf(
				"stage %s would deliver at %s, below its suction %s: the stage after it draws more than it can give; list the stages in the order the air passes through them, the largest first",
				m.stages[k].id, bara(pt.delivery[k]), bara(pt.suction[k]))}
		}
	}
	if !in.Has("discharge_pressure") {
		// The default it took, for the rules that read a working pressure.
		in.Set("discharge_pressure", m.pd, false)
	}
	res := m.results(pt, dead, cust)
	peak, sum := m.peakTorque(pt)
	mean := 0.0
	for k := range m.stages {
		mean += m.indicatedPower(pt, k) / m.omega
	}
	low, high := excessEnergyRange(sum, mean)
	nm := display.TraceIn(cust, "N m")
	res = append(res,
		calc.Result{Name: "mean_torque", Value: mean, Dim: units.Torque, Trace: calc.Trace{Formula: "T_m = Σ P_i,k / ω", Substituted: "= " + display.TraceIn(cust, "W")(mean*m.omega) + " / " + display.Number(m.omega, "rad/s")}},
		calc.Result{Name: "peak_torque", Value: peak, Dim: units.Torque, Trace: calc.Trace{Formula: "T_peak = max over θ of Σ stages Σ cylinders −(p(θ) − p_amb)·A·dx/dθ, at the operating pressures",
			Substituted: fmt.Sprintf("= %s, over %d crank steps; %s", nm(peak), cycleSteps, m.phasing())}},
		calc.Result{Name: "energy_fluctuation", Value: high - low, Dim: units.Energy, Trace: calc.Trace{Formula: "ΔE = max − min of ∫(T_m − T(θ)) dθ", Substituted: "= " + display.Number(high, "J") + " − (" + display.Number(low, "J") + ")"}},
	)
	out := &calc.Outcome{Results: res}
	if in.WantCurves() {
		out.Curves = m.torqueCurves(pt, sum)
	}
	return out, nil
}

// phasing says where each stage reaches top dead centre.
func (m machine) phasing() string {
	parts := make([]string, len(m.stages))
	for k, s := range m.stages {
		parts[k] = fmt.Sprintf("%s at %s°", s.id, display.Number(s.phase*180/math.Pi, ""))
	}
	return "top dead centre: " + strings.Join(parts, ", ")
}

// results are the coupled figures at the running point with their
// working.
func (m machine) results(pt machinePoint, dead float64, cust bool) []calc.Result {
	var (
		bara   = display.TraceIn(cust, "bar(a)")
		lpm    = display.TraceIn(cust, "L/min")
		watts  = display.TraceIn(cust, "W")
		gps    = func(v float64) string { return display.Number(v*1e3, "g/s") }
		kelvin = func(t float64) string { return display.Number(t, "K") }
		num    = func(v float64) string { return display.Number(v, "") }
		revs   = m.revs()
		rps    = display.Number(revs, "rev/s")
		first  = m.stages[0]
		fad    = pt.mass * airGasConstant * m.t1 / m.p1
		n      = len(m.stages)
	)
	var res []calc.Result
	for k := 0; k+1 < n; k++ {
		s, next := m.stages[k], m.stages[k+1]
		formula := fmt.Sprintf("p_%d from ṁ_%d = ṁ_%d, ṁ = η_v · V_d · N · p_s / (R · T_s)", k+1, k+1, k+2)
		sub := fmt.Sprintf("= %s: %s draws %s at η_v = %s from %s, %s; %s draws it at η_v = %s from %s, %s",
			bara(pt.delivery[k]), s.id, gps(pt.mass), num(s.efficiency(pt.suction[k], pt.delivery[k])), bara(pt.suction[k]), kelvin(s.suctionT),
			next.id, num(next.efficiency(pt.suction[k+1], pt.delivery[k+1])), bara(pt.suction[k+1]), kelvin(next.suctionT))
		if pt.open[k+1] {
			formula = fmt.Sprintf("p_%d = p_d,%d + Δp: the valves of %s stand open (it would need a pressure ratio below 1)", k+1, k+2, next.id)
			sub = fmt.Sprintf("= %s + %s", bara(pt.delivery[k+1]), display.TraceIn(cust, "bar")(m.drops[k]))
		} else if m.drops[k] > 0 {
			sub += fmt.Sprintf(" (after the intercooler's %s)", display.TraceIn(cust, "bar")(m.drops[k]))
		}
		res = append(res, calc.Result{Name: fmt.Sprintf("interstage_pressure_%d", k+1), Value: pt.delivery[k], Dim: units.Pressure,
			Trace: calc.Trace{Formula: formula, Substituted: sub}})
	}
	res = append(res,
		calc.Result{Name: "mass_flow", Value: pt.mass, Dim: units.MassFlow, Trace: calc.Trace{
			Formula:     "ṁ = η_v,1 · V_d,1 · N · p1 / (R · T1), R = 287.05 J/(kg K), the same through every stage",
			Substituted: fmt.Sprintf("= %s · %s · %s · %s / (287.05 J/(kg K) · %s), against %s", num(first.efficiency(m.p1, pt.delivery[0])), display.TraceIn(cust, "cm3")(first.disp), rps, bara(m.p1), kelvin(m.t1), bara(m.pd))}},
		calc.Result{Name: "free_air_delivery", Value: fad, Dim: units.VolumeFlow, Gas: units.GasState{Pressure: m.p1, Temperature: m.t1}, Trace: calc.Trace{
			Formula:     "FAD = ṁ · R · T1 / p1, at the first stage's inlet",
			Substituted: fmt.Sprintf("= %s · 287.05 J/(kg K) · %s / %s", gps(pt.mass), kelvin(m.t1), bara(m.p1))}},
	)
	var powers []string
	shaft := 0.0
	tds := make([]float64, n)
	for k, s := range m.stages {
		r := pt.delivery[k] / pt.suction[k]
		t := calc.Trace{Formula: fmt.Sprintf("T_d,%d = T_%d · r^((n−1)/n)", k+1, k+1),
			Substituted: fmt.Sprintf("= %s · %s^((%s − 1)/%s)", kelvin(s.suctionT), display.NumberSig(r, "", display.FiguresFor(r, r-1)), num(s.cyl.n), num(s.cyl.n))}
		td := s.suctionT * math.Pow(math.Max(r, 1), (s.cyl.n-1)/s.cyl.n)
		if pt.open[k] {
			td = s.suctionT
			t = calc.Trace{Formula: fmt.Sprintf("T_d,%d = T_%d: its valves stand open, no compression", k+1, k+1), Substituted: "= " + kelvin(s.suctionT)}
		}
		tds[k] = td
		res = append(res, calc.Result{Name: fmt.Sprintf("discharge_temperature_%d", k+1), Value: td, Dim: units.Temperature, Trace: t})
		p := m.indicatedPower(pt, k)
		shaft += p / s.cyl.etaMech
		powers = append(powers, watts(p)+" / "+num(s.cyl.etaMech))
	}
	res = append(res,
		calc.Result{Name: "shaft_power", Value: shaft, Dim: units.Power, Trace: calc.Trace{
			Formula:     "P_s = Σ P_i,k / η_m,k, P_i,k = ṁ · n/(n−1) · R · T_k · (r_k^((n−1)/n) − 1)",
			Substituted: "= " + strings.Join(powers, " + ")}},
		calc.Result{Name: "specific_power", Value: shaft / fad, Dim: units.SpecificPower, Trace: calc.Trace{
			Formula: "P_s / FAD", Substituted: "= " + watts(shaft) + " / " + lpm(fad)}},
	)
	for k := 0; k+1 < n; k++ {
		td, tic := tds[k], m.stages[k+1].suctionT
		res = append(res, calc.Result{Name: fmt.Sprintf("intercooler_heat_%d", k+1), Value: pt.mass * airCp * (td - tic), Dim: units.Power, Trace: calc.Trace{
			Formula:     fmt.Sprintf("Q_%d = ṁ · c_p · (T_d,%d − T_ic,%d), c_p = 1005 J/(kg K)", k+1, k+1, k+1),
			Substituted: fmt.Sprintf("= %s · 1005 J/(kg K) · (%s − %s)", gps(pt.mass), kelvin(td), kelvin(tic))}})
	}
	worst, at := 0.0, 0
	for k := 0; k+1 < n; k++ {
		eq := m.p1 * math.Pow(m.pd/m.p1, float64(k+1)/float64(n))
		if d := pt.delivery[k]/eq - 1; math.Abs(d) > math.Abs(worst) || k == 0 {
			worst, at = d, k
		}
	}
	eq := m.p1 * math.Pow(m.pd/m.p1, float64(at+1)/float64(n))
	res = append(res,
		calc.Result{Name: "split_mismatch", Value: worst, Dim: units.Dimensionless, Trace: calc.Trace{
			Formula:     fmt.Sprintf("p_k / p_eq,k − 1, the largest, p_eq,k = p1 · (p_d/p1)^(k/%d)", n),
			Substituted: fmt.Sprintf("= %s / %s − 1 (k = %d; p_eq,%d = %s · (%s / %s)^(%d/%d))", bara(pt.delivery[at]), bara(eq), at+1, at+1, bara(m.p1), bara(m.pd), bara(m.p1), at+1, n)}},
		calc.Result{Name: "max_pressure", Value: dead, Dim: units.Pressure, Trace: calc.Trace{
			Formula:     "p_max = p1 · Π CR_k^n_k (outlet blocked: every stage at its dead-head, no flow through the intercoolers)",
			Substituted: "= " + bara(m.p1) + m.deadHeadFactors()}},
	)
	return res
}

// deadHeadFactors writes the compression ratios of the dead-head product.
func (m machine) deadHeadFactors() string {
	var b strings.Builder
	for _, s := range m.stages {
		fmt.Fprintf(&b, " · %s^%s", display.Number((1+s.cyl.clearanceRatio)/s.cyl.clearanceRatio, ""), display.Number(s.cyl.n, ""))
	}
	return b.String()
}

// torqueCurves are the summed gas torque and each stage's over one
// revolution, at the published curve's resolution.
func (m machine) torqueCurves(pt machinePoint, sum []float64) []calc.Curve {
	stride := cycleSteps / curvePoints
	theta := make([]float64, 0, curvePoints+1)
	pick := func(ys []float64) []float64 {
		out := make([]float64, 0, curvePoints+1)
		for i := 0; i <= cycleSteps; i += stride {
			out = append(out, ys[i%cycleSteps])
		}
		return out
	}
	for i := 0; i <= cycleSteps; i += stride {
		theta = append(theta, 2*math.Pi*float64(i)/cycleSteps)
	}
	curves := []calc.Curve{{Name: "gas_torque", XDim: units.Angle, YDim: units.Torque, X: theta, Y: pick(sum)}}
	for k, st := range m.stageTorques(pt, cycleSteps) {
		curves = append(curves, calc.Curve{Name: "torque_" + m.stages[k].id, XDim: units.Angle, YDim: units.Torque, X: theta, Y: pick(st), Dashed: true})
	}
	return curves
}

func machineChart(name string, in *calc.Inputs, out *calc.Outcome) (*calc.Chart, error) {
	if name != "torque" {
		return nil, fmt.Errorf("no chart %q", name)
	}
	gas, ok := out.Curve("gas_torque")
	if !ok {
		return nil, fmt.Errorf("the model gave no torque curve")
	}
	series := []calc.Series{{Name: "all stages", X: gas.X, Y: gas.Y}}
	var ids []string
	for _, c := range out.Curves {
		if id, ok := strings.CutPrefix(c.Name, "torque_"); ok {
			style := calc.Dashed
			if len(ids)%2 == 1 {
				style = calc.Dotted
			}
			series = append(series, calc.Series{Name: id, X: c.X, Y: c.Y, Style: style})
			ids = append(ids, id)
		}
	}
	m, err := readMachine(in)
	if err != nil {
		return nil, err
	}
	from := "the first stage's top dead centre"
	if m.stages[0].phase != 0 {
		from = "the crank's zero, where the stages' phases are counted from"
	}
	nm := display.Described(in.Customary(), "N m")
	return &calc.Chart{
		Title: "Crankshaft torque of all stages over one revolution",
		Desc: fmt.Sprintf("The gas load torque of %s on the one crankshaft, each at the pressures the machine runs it at, over one revolution from %s: their sum (solid) peaks at %s against a mean of %s; each stage's own torque is drawn broken.",
			strings.Join(ids, " and "), from, nm(out.ResultValue("peak_torque")), nm(out.ResultValue("mean_torque"))),
		X: calc.Axis{Label: "Crank angle from " + strings.TrimSuffix(from, ", where the stages' phases are counted from"), Dim: units.Angle, Unit: "deg"},
		Panels: []calc.Panel{{
			Y:      calc.Axis{Label: "Torque on the crankshaft", Dim: units.Torque, Unit: "N m"},
			Series: series,
			Marks:  []calc.Mark{{Value: out.ResultValue("peak_torque"), Label: "peak"}, {Value: out.ResultValue("mean_torque"), Label: "mean"}},
		}},
	}, nil
}

// offDesignStages raises a NOTICE on every stage of a machine whose
// block's own inlet or discharge pressure lies more than offDesignLimit
// (absolute) from the pressure the machine runs it at.
func offDesignStages(s *calc.Set) []calc.Raised {
	var out []calc.Raised
	for _, e := range s.Blocks {
		in := e.ModelInputs()
		if in == nil || len(in.LinksOf("stages")) == 0 {
			continue
		}
		m, err := readMachine(in)
		if err != nil {
			continue
		}
		interstage := func(k int) float64 {
			r, _ := e.Result(fmt.Sprintf("interstage_pressure_%d", k))
			return r.Value
		}
		for k, st := range m.stages {
			stage, ok := s.Lookup(st.id)
			if !ok {
				continue
			}
			suction, delivery := m.p1, m.pd
			if k > 0 {
				suction = interstage(k) - m.drops[k-1]
			}
			if k+1 < len(m.stages) {
				delivery = interstage(k + 1)
			}
			var off []string
			for _, p := range []struct {
				what          string
				own, operates float64
			}{{"inlet", st.cyl.p1, suction}, {"discharge", st.cyl.p2, delivery}} {
				if d := p.own/p.operates - 1; math.Abs(d) > offDesignLimit {
					side := "higher"
					if d < 0 {
						side = "lower"
					}
					off = append(off, fmt.Sprintf("its %s pressure is %s in its block but %s in the machine (the block's is %s %% %s, absolute)",
						p.what, stage.Show(p.own, units.Pressure, "bar"), stage.Show(p.operates, units.Pressure, "bar"), units.Format(100*math.Abs(d), 2), side))
				}
			}
			if len(off) == 0 {
				continue
			}
			out = append(out, calc.Raised{Block: stage, Note: calc.CautionNote{Level: calc.Notice, Message: fmt.Sprintf(
				"%s runs as stage %d of machine %s, where %s. This block's own results (temperature, forces, power, delivery) are for its own pressures; the machine's are the ones it runs at. Write the machine's pressures into this block to make them agree.",
				st.id, k+1, e.Block.ID, strings.Join(off, ", and "))}})
		}
	}
	return out
}

// machineFill is a machine filling a receiver, solved again at each tank
// pressure.
type machineFill struct {
	id string
	m  machine
}

// fillTolerance is how closely the halves of an interval's fill time must
// agree with the whole before it is taken.
const fillTolerance = 1e-10

// fillTime integrates dt = V dp / (R·T1·ṁ(p)) from pa to pb: the tank
// holds the machine's inlet temperature.
func (f machineFill) fillTime(v, pa, pb float64) float64 {
	if pb <= pa {
		return 0
	}
	rate := func(p float64) float64 { return v / (airGasConstant * f.m.t1 * f.m.solve(p).mass) }
	gauss := func(a, b float64) float64 {
		mid, half, sum := (a+b)/2, (b-a)/2, 0.0
		for j, x := range gaussLegendre16[0] {
			sum += gaussLegendre16[1][j] * rate(mid+half*x)
		}
		return half * sum
	}
	// Halving where the halves disagree with the whole finds the kinks
	// where a stage's valves close and the steep rise near dead-head.
	var refine func(a, b, whole float64, depth int) float64
	refine = func(a, b, whole float64, depth int) float64 {
		mid := (a + b) / 2
		left, right := gauss(a, mid), gauss(mid, b)
		if depth == 0 || math.Abs(left+right-whole) <= fillTolerance*math.Abs(left+right) {
			return left + right
		}
		return refine(a, mid, left, depth-1) + refine(mid, b, right, depth-1)
	}
	return refine(pa, pb, gauss(pa, pb), 40)
}

// fillWorking is the working of the fill time from a machine.
func (f machineFill) fillWorking(t tankInput) calc.Trace {
	bara := display.TraceIn(t.customary, "bar(a)")
	at := func(p float64) string { return display.Number(f.m.solve(p).mass*1e3, "g/s") }
	return calc.Trace{
		Formula: "t = ∫ V dp / (R · T1 · ṁ(p)) from p0 to p2, ṁ(p) the machine's mass flow solved again with the tank pressure p as its discharge (isothermal tank at the first stage's inlet temperature)",
		Substituted: fmt.Sprintf("= ∫ %s dp / (287.05 J/(kg K) · %s · ṁ(p)) from %s to %s; machine %s: ṁ = %s at the start, %s at the target%s",
			display.TraceIn(t.customary, "L")(t.volume), display.Number(f.m.t1, "K"), bara(t.start), bara(t.target), f.id, at(t.start), at(t.target), f.openRange(t, bara)),
	}
}

// openRange says up to which tank pressure a later stage's valves stand
// open during the fill, if they do.
func (f machineFill) openRange(t tankInput, bara func(float64) string) string {
	opens := func(p float64) bool { return slices.Contains(f.m.solve(p).open, true) }
	if !opens(t.start) {
		return ""
	}
	if opens(t.target) {
		return "; the later stages' valves stand open all the way"
	}
	lo, hi := t.start, t.target
	for range 60 {
		mid := (lo + hi) / 2
		if opens(mid) {
			lo = mid
		} else {
			hi = mid
		}
	}
	return "; a later stage's valves stand open up to about " + bara(hi)
}
