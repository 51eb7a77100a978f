package models

import (
	"fmt"
	"math"
	"strings"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// multistageKind models compression in N stages with intercooling, split
// into equal pressure ratios: the split that needs least work.
var multistageKind = calc.Kind{
	Name:     "multistage",
	Summary:  "N compression stages with intercooling: interstage pressures, discharge temperature, specific work and power against one stage",
	Doc:      multistageDoc,
	Roles:    calc.HoldsPressure,
	LinkHint: "a multistage block has no cylinders: name the compressor block of the stage that delivers, or the machine block",
	Inputs: append([]calc.InputSpec{
		{Name: "stages", Dim: units.Dimensionless, Range: calc.Between(2, maxStages), Meaning: "number of compression stages, a whole number 2 to 6"},
		{Name: "discharge_pressure", Dim: units.Pressure, Range: positiveUpTo(1e9), Meaning: "pressure the last stage delivers against, up to 1 GPa"},
	}, append(cylinderInputs("inlet_pressure", "inlet_temperature", "polytropic_index"),
		calc.InputSpec{Name: "intercooled_temperature", Dim: units.Temperature, Optional: true, Range: calc.Between(minGasTemperature, maxGasTemperature), Meaning: "air temperature leaving each intercooler; default: the inlet temperature (perfect intercooling)"},
		calc.InputSpec{Name: "mass_flow", Dim: units.MassFlow, Optional: true, Range: positiveUpTo(1e3), Meaning: "mass of air compressed per unit time, for total_power; or give supply"},
		calc.InputSpec{Name: "supply", Type: calc.Link, Optional: true, LinkRoles: calc.Delivers, Meaning: "id of a compressor block whose free air delivery at its inlet conditions gives the mass flow, or of a machine block whose mass flow it is; or give mass_flow"},
	)...),
	Results: append(append([]calc.ResultSpec{
		{Name: "stage_pressure_ratio", Dim: units.Dimensionless, Unit: "", Meaning: "delivery over suction pressure of each stage, all equal"},
	}, interstageResults()...),
		calc.ResultSpec{Name: "discharge_temperature", Dim: units.Temperature, Unit: "degC", Meaning: "air temperature leaving the hottest stage (all equal with perfect intercooling)"},
		calc.ResultSpec{Name: "specific_work", Dim: units.SpecificEnergy, Unit: "kJ/kg", Meaning: "indicated work of all stages per kilogram of air"},
		calc.ResultSpec{Name: "single_stage_specific_work", Dim: units.SpecificEnergy, Unit: "kJ/kg", Meaning: "indicated work per kilogram to compress in one stage, for comparison"},
		calc.ResultSpec{Name: "single_stage_discharge_temperature", Dim: units.Temperature, Unit: "degC", Meaning: "air temperature leaving one stage doing the whole compression, for comparison"},
		calc.ResultSpec{Name: "total_power", Dim: units.Power, Unit: "W", Meaning: "indicated power of all stages: specific work times mass flow (with mass_flow or supply)"},
	),
	Charts:   []string{"stages"},
	Chart:    multistageChart,
	Evaluate: evaluateMultistage,
}

// maxStages bounds the number of stages; interstage_pressure_1 ..
// interstage_pressure_5 are declared for it.
const maxStages = 6

// airGasConstant is the specific gas constant of dry air, J/(kg K):
// ISO 2533:1975 (standard atmosphere) gives 287.05287 (from memory).
const airGasConstant = 287.05

const multistageDoc = `The multistage kind models compression of air from p1, T1 to p2 (absolute) in
N stages (2 to 6) with an intercooler after each stage but the last.

Assumptions
- Every stage compresses along p·V^n = const with the same n; clearance
  does not change the work per kilogram (the clearance gas re-expands along
  the same index), so the stages are ideal polytropic compressions.
- No pressure drop in the intercoolers; each cools the air at constant
  pressure to T_ic (default T1: perfect intercooling).
- Equal stage pressure ratios. With perfect intercooling this is the split
  that needs least total work (set the derivative of the total work with
  respect to each interstage pressure to zero). With T_ic ≠ T1 equal ratios
  are close to, but not exactly, the least work: for two stages the same
  derivative gives T1·r1^((n−1)/n) = T_ic·r2^((n−1)/n), that is
    r1/r2 = (T_ic/T1)^(n/(n−1))
  so a warm intercooler (T_ic > T1) moves ratio to the first stage and the
  best interstage pressure up.
- This is the ideal split study. The pressures built cylinders run at are
  where the first stage's delivered mass equals what the next draws in; the
  machine kind solves them from the stage blocks (specgen explain machine).
- Air is an ideal gas with R = 287.05 J/(kg K) (dry air, ISO 2533). Above
  about 50 bar real air departs from it by a few per cent and more (its
  compressibility factor; common practice), which is not modelled: the
  specific work's trace carries a NOTE there.

Model
  r = (p2/p1)^(1/N)                     stage pressure ratio
  p_k = p1·r^k, k = 1 .. N−1            interstage pressures
  T_d = T·r^((n−1)/n), T = T1 for the first stage, T_ic for the others
  w = n/(n−1)·R·(T1 + (N−1)·T_ic)·(r^((n−1)/n) − 1)
    = N·n/(n−1)·R·T1·(r^((n−1)/n) − 1) with perfect intercooling
  w_1 = n/(n−1)·R·T1·((p2/p1)^((n−1)/n) − 1)     in one stage
  (n = 1: R·T·ln r per stage)
  P = ṁ·w, with ṁ given as mass_flow, or from the supply compressor's free
  air delivery at its inlet conditions: ṁ = FAD·p_s/(R·T_s), or a supply
  machine's mass_flow.
  Chart: stages, the air temperature over pressure along the staged path
  (compression, then cooling at constant pressure) against one stage (dashed).`

// interstageResults declares interstage_pressure_1 .. _{maxStages−1}; a
// block reports those its stages have.
func interstageResults() []calc.ResultSpec {
	specs := make([]calc.ResultSpec, 0, maxStages-1)
	for k := 1; k < maxStages; k++ {
		specs = append(specs, calc.ResultSpec{Name: fmt.Sprintf("interstage_pressure_%d", k), Dim: units.Pressure, Unit: "bar",
			Meaning: fmt.Sprintf("delivery pressure of stage %d, suction of stage %d (with at least %d stages)", k, k+1, k+1)})
	}
	return specs
}

// multistageInput is a multistage block's inputs in SI, pressures absolute.
type multistageInput struct {
	stages   int
	p1, p2   float64
	t1, tic  float64
	n        float64
	flow     float64 // kg/s; 0 when neither mass_flow nor supply is given
	flowFrom string  // how the flow was found, for the trace
}

// readMultistageInput applies the checks that single-input ranges cannot.
func readMultistageInput(in *calc.Inputs) (multistageInput, error) {
	m := multistageInput{p1: in.Ambient, p2: in.Value("discharge_pressure"), t1: in.Value("inlet_temperature"), n: in.Value("polytropic_index")}
	z := in.Value("stages")
	if z != math.Trunc(z) {
		return m, &calc.InputError{Key: "stages", Message: fmt.Sprintf("%s is not a whole number of stages; allowed: 2, 3, 4, 5 or 6", display.Number(z, ""))}
	}
	m.stages = int(z)
	if in.Has("inlet_pressure") {
		m.p1 = in.Value("inlet_pressure")
	}
	cust := in.Customary()
	bara := display.TraceIn(cust, "bar(a)")
	if m.p2 <= m.p1 {
		return m, &calc.InputError{Key: "discharge_pressure", Message: fmt.Sprintf(
			"discharge pressure %s must be above the inlet pressure %s", bara(m.p2), bara(m.p1))}
	}
	m.tic = m.t1
	if in.Has("intercooled_temperature") {
		m.tic = in.Value("intercooled_temperature")
		if hot := dischargeTemperature(m.t1, m.ratio(), m.n); m.tic > hot {
			return m, &calc.InputError{Key: "intercooled_temperature", Message: fmt.Sprintf(
				"%s is above the %s at which air leaves the first stage: an intercooler cools the air; allowed: up to %s",
				display.TraceIn(cust, "degC")(m.tic), display.TraceIn(cust, "degC")(hot), display.TraceIn(cust, "degC")(hot))}
		}
	}
	supply := in.LinkOf("supply")
	switch {
	case in.Has("mass_flow") && supply != nil:
		return m, &calc.InputError{Key: "mass_flow", Message: "give either mass_flow or supply, not both: the supply's free air delivery is a mass flow"}
	case in.Has("mass_flow"):
		m.flow = in.Value("mass_flow")
		m.flowFrom = "ṁ given"
	case supply != nil && supply.Results["mass_flow"] > 0:
		m.flow = supply.Results["mass_flow"]
		m.flowFrom = "ṁ = mass_flow of supply " + supply.ID
	case supply != nil:
		fad := supply.Results["free_air_delivery"]
		ps, ts := supply.Ambient, supply.Inputs["inlet_temperature"]
		if p, ok := supply.Inputs["inlet_pressure"]; ok {
			ps = p
		}
		if !(fad > 0 && ps > 0 && ts > 0) {
			return m, &calc.InputError{Key: "supply", Message: fmt.Sprintf(
				"supply %s delivers no air (free air delivery %s): it gives no mass flow", supply.ID, display.Number(fad*6e4, "L/min"))}
		}
		m.flow = fad * ps / (airGasConstant * ts)
		m.flowFrom = fmt.Sprintf("ṁ = FAD·p_s/(R·T_s) = %s · %s / (287.05 J/(kg K) · %s), from supply %s",
			display.TraceIn(cust, "L/min")(fad), bara(ps), display.Number(ts, "K"), supply.ID)
	}
	return m, nil
}

// ratio is the equal stage pressure ratio.
func (m multistageInput) ratio() float64 {
	return math.Pow(m.p2/m.p1, 1/float64(m.stages))
}

// stageWork is the work per kilogram of one polytropic stage from
// temperature t through ratio r: polytropicWork with p·v = R·T.
func stageWork(t, r, n float64) float64 {
	return polytropicWork(airGasConstant, t, r, n)
}

// dischargeTemperature is the temperature after compressing from t
// through ratio r along p·V^n = const.
func dischargeTemperature(t, r, n float64) float64 {
	return t * math.Pow(r, (n-1)/n)
}

func evaluateMultistage(in *calc.Inputs) (*calc.Outcome, error) {
	m, err := readMultistageInput(in)
	if err != nil {
		return nil, err
	}
	var (
		nStages = float64(m.stages)
		r       = m.ratio()
		rAll    = m.p2 / m.p1
		work    = stageWork(m.t1, r, m.n) + (nStages-1)*stageWork(m.tic, r, m.n)
		single  = stageWork(m.t1, rAll, m.n)
		hottest = math.Max(m.t1, m.tic)
	)
	bara := display.TraceIn(in.Customary(), "bar(a)")
	num := func(x float64) string { return display.Number(x, "") }
	kelvin := func(t float64) string { return display.Number(t, "K") }
	nw, nm1 := num(m.n), num(m.n-1)
	// A ratio near 1 needs more figures for r^k − 1 and ln r to work out.
	rs, rAlls := display.NumberSig(r, "", display.FiguresFor(r, r-1)), display.NumberSig(rAll, "", display.FiguresFor(rAll, rAll-1))
	res := []calc.Result{{Name: "stage_pressure_ratio", Value: r, Dim: units.Dimensionless, Trace: calc.Trace{Formula: "r = (p2/p1)^(1/N)", Substituted: fmt.Sprintf("= (%s / %s)^(1/%d)", bara(m.p2), bara(m.p1), m.stages)}}}
	for k := 1; k < m.stages; k++ {
		res = append(res, calc.Result{Name: fmt.Sprintf("interstage_pressure_%d", k), Value: m.p1 * math.Pow(r, float64(k)), Dim: units.Pressure, Trace: calc.Trace{Formula: fmt.Sprintf("p_%d = p1 · r^%d", k, k), Substituted: fmt.Sprintf("= %s · %s^%d", bara(m.p1), num(r), k)}})
	}
	tTrace := calc.Trace{Formula: "T_d = T1 · r^((n−1)/n)", Substituted: fmt.Sprintf("= %s · %s^(%s/%s)", kelvin(m.t1), num(r), nm1, nw)}
	if m.tic > m.t1 {
		tTrace = calc.Trace{Formula: "T_d = T_ic · r^((n−1)/n) (stages after the first, from the intercooler)", Substituted: fmt.Sprintf("= %s · %s^(%s/%s)", kelvin(m.tic), num(r), nm1, nw)}

	}
	var wTrace, w1Trace calc.Trace
	switch {
	case m.n == 1:
		wTrace = calc.Trace{Formula: "w = R · (T1 + (N−1)·T_ic) · ln r (n = 1), R = 287.05 J/(kg K)", Substituted: fmt.Sprintf("= 287.05 J/(kg K) · (%s + %d·%s) · ln %s", kelvin(m.t1), m.stages-1, kelvin(m.tic), rs)}

		w1Trace = calc.Trace{Formula: "w_1 = R · T1 · ln(p2/p1) (n = 1), R = 287.05 J/(kg K)", Substituted: fmt.Sprintf("= 287.05 J/(kg K) · %s · ln %s", kelvin(m.t1), rAlls)}

	case m.tic == m.t1:
		wTrace = calc.Trace{Formula: "w = N · n/(n−1) · R · T1 · (r^((n−1)/n) − 1), R = 287.05 J/(kg K) (perfect intercooling)", Substituted: fmt.Sprintf("= %d · %s/%s · 287.05 J/(kg K) · %s · (%s^(%s/%s) − 1)", m.stages, nw, nm1, kelvin(m.t1), rs, nm1, nw)}

	default:
		wTrace = calc.Trace{Formula: "w = n/(n−1) · R · (T1 + (N−1)·T_ic) · (r^((n−1)/n) − 1), R = 287.05 J/(kg K)", Substituted: fmt.Sprintf("= %s/%s · 287.05 J/(kg K) · (%s + %d·%s) · (%s^(%s/%s) − 1)", nw, nm1, kelvin(m.t1), m.stages-1, kelvin(m.tic), rs, nm1, nw)}

	}
	if m.n != 1 {
		w1Trace = calc.Trace{Formula: "w_1 = n/(n−1) · R · T1 · ((p2/p1)^((n−1)/n) − 1), R = 287.05 J/(kg K)", Substituted: fmt.Sprintf("= %s/%s · 287.05 J/(kg K) · %s · (%s^(%s/%s) − 1)", nw, nm1, kelvin(m.t1), rAlls, nm1, nw)}

	}
	res = append(res,
		calc.Result{Name: "discharge_temperature", Value: dischargeTemperature(hottest, r, m.n), Dim: units.Temperature, Trace: tTrace},
		calc.Result{Name: "specific_work", Value: work, Dim: units.SpecificEnergy, Trace: idealGasNote(wTrace, m.p2, bara)},
		calc.Result{Name: "single_stage_specific_work", Value: single, Dim: units.SpecificEnergy, Trace: w1Trace},
		calc.Result{Name: "single_stage_discharge_temperature", Value: dischargeTemperature(m.t1, rAll, m.n), Dim: units.Temperature, Trace: calc.Trace{Formula: "T_d1 = T1 · (p2/p1)^((n−1)/n)", Substituted: fmt.Sprintf("= %s · %s^(%s/%s)", kelvin(m.t1), num(rAll), nm1, nw)}},
	)
	if m.flow > 0 {
		res = append(res, calc.Result{Name: "total_power", Value: m.flow * work, Dim: units.Power, Trace: calc.Trace{Formula: "P = ṁ · w", Substituted: fmt.Sprintf("= %s · %s; %s", display.Number(m.flow*1e3, "g/s"), display.Number(work/1e3, "kJ/kg"), m.flowFrom)}})
	}
	return &calc.Outcome{Results: res}, nil
}

// stagePoints is the number of intervals drawn along each compression.
const stagePoints = 40

func multistageChart(name string, in *calc.Inputs, _ *calc.Outcome) (*calc.Chart, error) {
	if name != "stages" {
		return nil, fmt.Errorf("no chart %q", name)
	}
	m, err := readMultistageInput(in)
	if err != nil {
		return nil, err
	}
	r := m.ratio()
	staged := calc.Series{Name: fmt.Sprintf("%d stages, intercooled", m.stages)}
	var marks []calc.Mark
	for k := range m.stages {
		pIn, tIn := m.p1*math.Pow(r, float64(k)), m.tic
		if k == 0 {
			tIn = m.t1
		}
		for i := range stagePoints + 1 {
			x := math.Pow(r, float64(i)/stagePoints)
			staged.X, staged.Y = append(staged.X, pIn*x), append(staged.Y, dischargeTemperature(tIn, x, m.n))
		}
		mid := math.Sqrt(r)
		staged.Labels = append(staged.Labels, calc.PointLabel{X: pIn * mid, Y: dischargeTemperature(tIn, mid, m.n), Text: fmt.Sprintf("stage %d", k+1), Below: true})
		if k < m.stages-1 {
			// The intercooler: constant pressure, down to T_ic.
			pOut := pIn * r
			staged.X, staged.Y = append(staged.X, pOut), append(staged.Y, m.tic)
			label := "interstage"
			if m.stages > 2 {
				label = fmt.Sprintf("interstage %d", k+1)
			}
			marks = append(marks, calc.Mark{Value: pOut, Vertical: true, Label: label})
		}
	}
	single := calc.Series{Name: "one stage", Style: calc.Dashed}
	all := m.p2 / m.p1
	for i := range stagePoints*m.stages + 1 {
		x := math.Pow(all, float64(i)/float64(stagePoints*m.stages))
		single.X, single.Y = append(single.X, m.p1*x), append(single.Y, dischargeTemperature(m.t1, x, m.n))
	}
	degC, barA := display.Described(in.Customary(), "degC"), display.Described(in.Customary(), "bar(a)")
	var ps []string
	for _, mk := range marks {
		ps = append(ps, barA(mk.Value))
	}
	return &calc.Chart{
		Title: "Air temperature over pressure, staged and in one stage",
		Desc: fmt.Sprintf("The air temperature as the pressure rises from %s to %s. In %d stages (solid) each stage compresses through the ratio %s "+
			"and heats the air to %s at most; an intercooler then cools it at constant pressure to %s before the next stage (vertical lines at %s). "+
			"In one stage (dashed) the air leaves at %s.",
			barA(m.p1), barA(m.p2), m.stages, units.Format(r, 3), degC(dischargeTemperature(math.Max(m.t1, m.tic), r, m.n)), degC(m.tic),
			strings.Join(ps, ", "), degC(dischargeTemperature(m.t1, all, m.n))),
		X: calc.Axis{Label: "Pressure", Dim: units.Pressure, Unit: "bar(a)"},
		Panels: []calc.Panel{{
			Y:      calc.Axis{Label: "Air temperature", Dim: units.Temperature, Unit: "degC"},
			Series: []calc.Series{staged, single},
			Marks:  marks,
		}},
	}, nil
}

// idealGasLimit is where real air departs from the ideal gas by a few per
// cent (common practice).
const idealGasLimit = 50e5 // Pa absolute

// idealGasNote adds a NOTE to a trace whose pressures reach idealGasLimit.
func idealGasNote(t calc.Trace, p float64, bara func(float64) string) calc.Trace {
	if p > idealGasLimit {
		t.Substituted += fmt.Sprintf(" (NOTE: at %s real air departs from the ideal gas by a few per cent or more; compressibility is not modelled)",
			bara(p))
	}
	return t
}
