package models

import (
	"fmt"
	"math"
	"strings"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// The code figures of a pressure part: the thin-shell formulas of the
// common pressure-vessel rules (ASME Section VIII Division 1, UG-27, UG-32
// and UG-34, from memory) with a joint efficiency and a corrosion
// allowance, which the tube and tank kinds report beside their
// tensile-based figures as code_allowable_pressure.

// Bases of the allowable stress and the heads (ASME VIII-1, from memory).
const (
	// codeTensileFactor and codeYieldFraction: at ordinary temperatures the
	// allowable stress is the lesser of the specified minimum tensile
	// strength over 3.5 and two thirds of the specified minimum yield
	// strength.
	codeTensileFactor = 3.5
	codeYieldFraction = 2.0 / 3
	// defaultFlatHeadFactor is C of a welded flat head unless given
	// (UG-34), and minFlatHeadFactor the least taken.
	defaultFlatHeadFactor = 0.33
	minFlatHeadFactor     = 0.20
	// ordinaryTemperature is the design temperature of a part that names
	// none and has no supply to take one from.
	ordinaryTemperature = 293.15 // K, 20 °C
)

// vesselInputs are the inputs of the code figures that the tube and tank
// kinds share; the tank's defaults are its own (tankWallInputs).
var vesselInputs = []calc.InputSpec{
	{Name: "joint_efficiency", Dim: units.Dimensionless, Default: "1.0", Range: calc.Range{Min: 0, Max: 1, HasMin: true, HasMax: true, MinOpen: true},
		Meaning: "joint efficiency E of the welded seams for code_allowable_pressure, above 0 up to 1: 1.0 seamless or double-welded butt joints fully radiographed, 0.85 spot-radiographed, 0.70 not radiographed (ASME VIII-1 Table UW-12, from memory)"},
	{Name: "corrosion_allowance", Dim: units.Length, Default: "0 mm", Range: calc.Between(0, 0.1), Meaning: "wall the code figures take away for corrosion, inside, up to 100 mm; less than the wall"},
	{Name: "design_temperature", Dim: units.Temperature, Optional: true, Range: calc.Between(minGasTemperature, maxMaterialTemperature),
		Meaning: "metal temperature the code figure is for; default 20 °C (a tank: its supply's discharge temperature)"},
}

// codeWall is a wall as the code formulas see it, lengths in the corroded
// condition: the wall less the corrosion allowance, inside radii plus it.
type codeWall struct {
	s, e        float64 // allowable stress, joint efficiency
	sWorking    string  // how S was found, for traces
	t, r        float64 // corroded shell thickness and inside radius
	ca          float64 // corrosion allowance
	ro          float64 // outside radius, which corrosion leaves alone
	closed      bool    // the shell carries its end load
	temperature float64 // design temperature, K
	customary   bool
}

// codeFigure is one part's code allowable pressure, gauge, with its working.
type codeFigure struct {
	part    string // "shell, circumferential stress"
	formula string // symbolic, with its clause
	working string // the numbers and the result
	p       float64
}

// readCodeWall reads the joint efficiency, corrosion allowance and design
// temperature of a wall, at the temperature given or else at fallback.
// noFigure says why a wall gets no code figure ("" when it does).
func readCodeWall(in *calc.Inputs, c tubeInput, fallback float64) (w codeWall, noFigure string, err error) {
	w = codeWall{e: in.Value("joint_efficiency"), ca: in.Value("corrosion_allowance"), ro: c.ro, closed: c.closed,
		temperature: fallback, customary: in.Customary()}
	if in.Has("design_temperature") {
		w.temperature = in.Value("design_temperature")
	}
	mm := display.TraceIn(w.customary, "mm")
	if w.ca >= c.t {
		return w, "", &calc.InputError{Key: "corrosion_allowance", Message: fmt.Sprintf(
			"%s leaves no wall of the %s shell; allowed: less than the wall thickness", mm(w.ca), mm(c.t))}
	}
	w.t, w.r = c.t-w.ca, c.ri+w.ca
	m := c.material
	degC := display.TraceIn(w.customary, "degC")
	if m.Class == Plastic {
		return w, fmt.Sprintf("no code figure: %s is a plastic, and the pressure-vessel rules' formulas hold for metals at the allowable stresses they list; plastics creep, and unreinforced plastic vessels have no such rules (fibre-reinforced ones have their own, ASME Section X, from memory)", m.Label), nil
	}
	limit := m.AllowableStressTemperature
	if limit == 0 {
		limit = m.ServiceTemperature
	}
	if w.temperature > limit {
		return w, fmt.Sprintf("no code figure at a design temperature of %s: above %s the allowable stress of %s no longer holds at its ordinary-temperature basis (aluminium and copper alloys lose strength from about 100 °C; the code's tables give lower values, from memory)",
			degC(w.temperature), degC(limit), m.Label), nil
	}
	w.s, w.sWorking = allowableStress(m, display.TraceIn(w.customary, "MPa"))
	return w, "", nil
}

// codeStress is the allowable stress of a metal at ordinary temperatures:
// the row's own, or the lesser of tensile/3.5 and 2/3 of yield.
func codeStress(m Material) float64 {
	switch {
	case m.AllowableStress > 0:
		return m.AllowableStress
	case m.YieldStrength == 0:
		return m.TensileStrength / codeTensileFactor
	}
	return math.Min(m.TensileStrength/codeTensileFactor, codeYieldFraction*m.YieldStrength)
}

// allowableStress is codeStress with its working.
func allowableStress(m Material, mpa func(float64) string) (float64, string) {
	s := codeStress(m)
	switch {
	case m.AllowableStress > 0:
		return s, fmt.Sprintf("S = %s (%s: the material row's own)", mpa(s), m.Label)
	case m.YieldStrength == 0:
		return s, fmt.Sprintf("S = S_u/3.5 = %s/3.5 = %s (%s, no yield point)", mpa(m.TensileStrength), mpa(s), m.Label)
	}
	return s, fmt.Sprintf("S = min(S_u/3.5, 2/3·S_y) = min(%s/3.5, 2/3 · %s) = %s (%s)",
		mpa(m.TensileStrength), mpa(m.YieldStrength), mpa(s), m.Label)
}

// shell returns the cylindrical shell's figures: circumferential stress,
// and longitudinal stress when the shell carries its end load. Beyond a
// thin formula's limit the thick-wall (Lamé) figure of Appendix 1-2
// stands in for it.
func (w codeWall) shell() []codeFigure {
	mm, bar := display.TraceIn(w.customary, "mm"), display.TraceIn(w.customary, "bar")
	se := w.s * w.e
	sub := fmt.Sprintf("%s · %s · %s", display.TraceIn(w.customary, "MPa")(w.s), display.Number(w.e, ""), mm(w.t))
	z := math.Pow((w.r+w.t)/w.r, 2)
	zText := fmt.Sprintf("Z = ((%s + %s)/%s)² = %s", mm(w.r), mm(w.t), mm(w.r), display.Number(z, ""))
	circ := codeFigure{part: "shell, circumferential stress", formula: "S·E·t/(R + 0.6·t) (UG-27(c)(1))",
		p: se * w.t / (w.r + 0.6*w.t)}
	circ.working = fmt.Sprintf("%s/(%s + 0.6 · %s) = %s", sub, mm(w.r), mm(w.t), bar(circ.p))
	if circ.p > 0.385*se {
		thin := circ.p
		circ.formula = "S·E·(Z − 1)/(Z + 1), Z = ((R + t)/R)² (thick wall, Appendix 1-2(a)(1))"
		circ.p = se * (z - 1) / (z + 1)
		circ.working = fmt.Sprintf("the thin formula does not apply: it gives %s, above 0.385·S·E (t > R/2); thick wall: %s · (%s − 1)/(%s + 1), %s = %s",
			bar(thin), display.TraceIn(w.customary, "MPa")(se), display.Number(z, ""), display.Number(z, ""), zText, bar(circ.p))
	}
	figures := []codeFigure{circ}
	if !w.closed {
		return figures
	}
	long := codeFigure{part: "shell, longitudinal stress", formula: "2·S·E·t/(R − 0.4·t) (UG-27(c)(2))",
		p: 2 * se * w.t / (w.r - 0.4*w.t)}
	long.working = fmt.Sprintf("2 · %s/(%s − 0.4 · %s) = %s", sub, mm(w.r), mm(w.t), bar(long.p))
	if long.p > 1.25*se {
		thin := long.p
		long.formula = "S·E·(Z − 1), Z = ((R + t)/R)² (thick wall, Appendix 1-2(a)(2))"
		long.p = se * (z - 1)
		long.working = fmt.Sprintf("the thin formula does not apply: it gives %s, above 1.25·S·E (t > R/2); thick wall: %s · (%s − 1), %s = %s",
			bar(thin), display.TraceIn(w.customary, "MPa")(se), display.Number(z, ""), zText, bar(long.p))
	}
	return append(figures, long)
}

// vesselHeads are the heads a tank's shell may be closed with.
var vesselHeads = []string{"ellipsoidal", "hemispherical", "torispherical", "flat", "bolted"}

// head returns the figure of a head of kind name and thickness th (as
// built; the corrosion allowance comes off it), with c the flat-head
// factor C.
func (w codeWall) head(name string, th, c float64) codeFigure {
	mm, bar, mpa := display.TraceIn(w.customary, "mm"), display.TraceIn(w.customary, "bar"), display.TraceIn(w.customary, "MPa")
	t := th - w.ca
	se := w.s * w.e
	sub := fmt.Sprintf("%s · %s", mpa(w.s), display.Number(w.e, ""))
	d := 2 * w.r
	var f codeFigure
	switch name {
	case "ellipsoidal":
		f = codeFigure{part: "2:1 ellipsoidal head", formula: "2·S·E·t/(D + 0.2·t) (UG-32(d))", p: 2 * se * t / (d + 0.2*t)}
		f.working = fmt.Sprintf("2 · %s · %s/(%s + 0.2 · %s)", sub, mm(t), mm(d), mm(t))
	case "hemispherical":
		f = codeFigure{part: "hemispherical head", formula: "2·S·E·t/(R + 0.2·t) (UG-32(f))", p: 2 * se * t / (w.r + 0.2*t)}
		f.working = fmt.Sprintf("2 · %s · %s/(%s + 0.2 · %s)", sub, mm(t), mm(w.r), mm(t))
		if f.p > 0.665*se {
			y := math.Pow((w.r+t)/w.r, 3)
			f.formula = "2·S·E·(Y − 1)/(Y + 2), Y = ((R + t)/R)³ (thick wall, Appendix 1-3)"
			f.working = fmt.Sprintf("the thin formula does not apply: it gives %s, above 0.665·S·E (t > 0.356·R); thick wall: 2 · %s · (%s − 1)/(%s + 2), Y = ((%s + %s)/%s)³",
				bar(f.p), mpa(se), display.Number(y, ""), display.Number(y, ""), mm(w.r), mm(t), mm(w.r))
			f.p = 2 * se * (y - 1) / (y + 2)
		}
	case "torispherical":
		// Crown radius the shell's outside diameter, knuckle 6 % of it;
		// the crown's inside radius grows by the corrosion allowance.
		l := 2*w.ro + w.ca
		f = codeFigure{part: "torispherical head", formula: "S·E·t/(0.885·L + 0.1·t), crown radius L the shell's outside diameter, knuckle 6 % of L (UG-32(e))",
			p: se * t / (0.885*l + 0.1*t)}
		f.working = fmt.Sprintf("%s · %s/(0.885 · %s + 0.1 · %s)", sub, mm(t), mm(l), mm(t))
	case "flat":
		f = codeFigure{part: "welded flat head", formula: "S·E·(t/d)²/C (UG-34)", p: se * (t / d) * (t / d) / c}
		f.working = fmt.Sprintf("%s · (%s/%s)²/%s", sub, mm(t), mm(d), display.Number(c, ""))
	}
	f.working += " = " + bar(f.p)
	return f
}

// vesselCode is a wall's code figures, or why it has none.
type vesselCode struct {
	wall     codeWall
	figures  []codeFigure
	noFigure string
}

// codeAllowableResult is the least of the figures, as an absolute pressure,
// with every figure and the basis in its working.
func codeAllowableResult(w codeWall, figures []codeFigure, ambient float64) calc.Result {
	least := figures[0]
	formulas := make([]string, len(figures))
	workings := make([]string, len(figures))
	for i, f := range figures {
		if f.p < least.p {
			least = f
		}
		formulas[i] = f.part + ": " + f.formula
		workings[i] = f.part + ": " + f.working
	}
	mm := display.TraceIn(w.customary, "mm")
	corroded := "no corrosion allowance"
	if w.ca > 0 {
		corroded = fmt.Sprintf("corroded: t = wall − %s, R = inside radius + %s", mm(w.ca), mm(w.ca))
	}
	basis := fmt.Sprintf("%s; E = %s (joint efficiency of double-welded butt joints: 1.0 fully radiographed, 0.85 spot-radiographed, 0.70 not radiographed, ASME VIII-1 Table UW-12, from memory); %s; at %s",
		w.sWorking, display.Number(w.e, ""), corroded, display.TraceIn(w.customary, "degC")(w.temperature))
	return calc.Result{Name: "code_allowable_pressure", Value: least.p + ambient, Dim: units.Pressure, Trace: calc.Trace{
		Formula:     "P = the least of (ASME VIII-1, from memory) " + strings.Join(formulas, "; "),
		Substituted: "= " + strings.Join(workings, "; ") + "; the " + least.part + " governs (" + basis + ")",
	}}
}
