package models

import (
	"fmt"
	"math"
	"strings"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// valveKind models a spring-loaded poppet or ball valve: a check valve, or,
// when it names what it protects, a relief valve.
var valveKind = calc.Kind{
	Name:    "valve",
	Summary: "spring-loaded check or relief valve: cracking pressure from spring rate, preload and seat diameter",
	Doc:     valveDoc,
	Roles:   calc.HoldsPressure | calc.Relieves,
	Inputs: []calc.InputSpec{
		{Name: "seat_diameter", Dim: units.Length, Range: calc.Between(minPartSize, 1), Meaning: "diameter of the seat the poppet or ball closes, where it seals, up to 1 m"},
		{Name: "spring_rate", Dim: units.Stiffness, Range: positiveUpTo(1e9), Meaning: "spring stiffness, force per unit compression"},
		{Name: "preload", Dim: units.Length, Range: calc.Between(0, 1), Meaning: "how far the spring is compressed with the valve closed, 0 to 1 m"},
		{Name: "protects", Type: calc.LinkList, Optional: true, LinkRoles: calc.Delivers | calc.PressurePart, Meaning: "ids of the compressors and pressure parts the valve relieves; makes it a relief valve"},
		{Name: "material", Type: calc.Name, Optional: true, Choices: materialChoices, Resolve: resolveMaterial, Label: materialLabel, Suggest: suggestMaterial, Meaning: "material of the seat or poppet, for the printed-part caution"},
		{Name: "lift", Dim: units.Length, Optional: true, Range: calc.Between(minTubeWall, 1), Meaning: "how far the stop lets the poppet lift, up to 1 m; the lift used is the lesser of this and what the spring allows at the relieving pressure (relief valves)"},
		{Name: "discharge_coefficient", Dim: units.Dimensionless, Default: "0.6", Range: calc.Range{Min: 0, Max: 1, HasMin: true, HasMax: true, MinOpen: true},
			Meaning: "discharge coefficient Cd of the open valve, above 0 up to 1; 0.6 for a plain poppet (common practice)"},
		{Name: "relieving_temperature", Dim: units.Temperature, Optional: true, Range: calc.Between(minGasTemperature, maxGasTemperature),
			Meaning: "air temperature at the valve while it relieves; default: the highest discharge temperature of the compressors it protects, else 20 °C"},
	},
	Results: []calc.ResultSpec{
		{Name: "spring_force", Dim: units.Force, Unit: "N", Meaning: "spring force on the closed valve: rate times preload"},
		{Name: "cracking_pressure", Dim: units.Stress, Unit: "bar", Meaning: "pressure difference across the seat at which the valve starts to open"},
		{Name: "set_pressure", Dim: units.Pressure, Unit: "bar", Meaning: "pressure at which a relief valve venting to atmosphere opens, a gauge pressure other blocks may quote (relief valves)"},
		{Name: "relieving_pressure", Dim: units.Pressure, Unit: "bar", Meaning: "set pressure plus the accumulation (10 % of it, at least 20 kPa or 3 psi) at which the capacity is rated (relief valves)"},
		{Name: "flow_area", Dim: units.Area, Unit: "mm2", Meaning: "area the air passes through: the lesser of the seat area and the curtain area π·d·lift (relief valves)"},
		{Name: "relieving_capacity", Dim: units.MassFlow, Unit: "g/s", Meaning: "mass flow of air the relief valve passes at the relieving pressure (relief valves)"},
	},
	Evaluate: evaluateValve,
}

const valveDoc = `The valve kind models a spring-loaded valve: a poppet or ball held on a round
seat of diameter d by a spring of rate k compressed by x (the preload).

  F = k·x                     spring force on the closed valve
  Δp = F / (π/4·d²)           cracking pressure

The valve starts to open when the pressure difference across the seat times
the seat area equals the spring force. Δp is a difference: a relief valve
that vents to atmosphere opens at ambient + Δp (absolute); a check valve
opens when the upstream pressure exceeds the downstream one by Δp.

Assumptions
- The pressure acts on the seat diameter, where the poppet seals; a wide
  sealing land or an O-ring face moves the effective diameter outward and
  lowers the cracking pressure.
- No friction, no flow forces, no weight of the poppet. Once open, the valve
  needs more pressure to pass more flow (the spring compresses further):
  relief valves are set some way below the pressure they must hold down.

With protects (a list of compressor, machine, tank or tube block ids), the
valve is a relief valve for those blocks. The no-relief caution rule
compares its opening pressure with each protected part's allowable pressure
and each compressor's or machine's dead-head pressure; the trace lists
them. The relief-below-target rule cautions when it opens below the working
pressure of a part it protects (a tank's target pressure, a compressor's
discharge pressure, a machine's discharge pressure, a tube's working
pressure), which then never gets there.

Relief capacity (relief valves)
  p_set = p_amb + Δp                          set_pressure, a gauge pressure
                                              other blocks may quote
  p0 = p_set + max(0.1·(p_set − p_amb), 20 kPa)   relieving_pressure: the
       accumulation for air (ASME VIII-1 UG-125, from memory); 3 psi in a
       block written in US units
  h = min(lift, (p0 − p_set)/Δp · x)          a plain spring valve lifts
       only as far as the accumulation compresses its spring further
  A = min(π/4·d², π·d·h)                      flow_area: seat or curtain
  ṁ = Cd·A·p0·sqrt(γ/(R·T0))·(2/(γ+1))^((γ+1)/(2(γ−1)))   when the back
       pressure p_b = p_amb ≤ 0.5283·p0 (choked), else
  ṁ = Cd·A·p0·sqrt(2γ/((γ−1)·R·T0)·(x^(2/γ) − x^((γ+1)/γ))), x = p_b/p0
       relieving_capacity, γ = 1.4, R = 287.05 J/(kg K); Cd 0.6 for a plain
       poppet unless discharge_coefficient says otherwise (common practice)
  T0 is relieving_temperature, by default the highest discharge temperature
  of the compressors the valve protects, else 20 °C. The working also gives
  the capacity as free air at the protected compressor's inlet. The
  relief-too-small rule compares ṁ with the mass flow the compressors it
  protects, and the supplies of the receivers it protects, deliver at p0
  (their ideal cycles at that discharge pressure). Real valves are rated by
  test; a certified valve's stamped capacity governs over this figure.`

// maxCrackingPressure is the highest cracking pressure taken as real: the
// upper bound of the pressures the other kinds accept.
const maxCrackingPressure = 1e9 // Pa

func evaluateValve(in *calc.Inputs) (*calc.Outcome, error) {
	d, k, x := in.Value("seat_diameter"), in.Value("spring_rate"), in.Value("preload")
	force := k * x
	area := math.Pi / 4 * d * d
	crack := force / area
	cust := in.Customary()
	mm, rate, newton := display.TraceIn(cust, "mm"), display.TraceIn(cust, "N/mm"), display.TraceIn(cust, "N")
	// A block named twice is a slip (often a copied line meant for another
	// part), and would be listed twice in the trace.
	seen := map[string]bool{}
	for _, l := range in.LinksOf("protects") {
		if seen[l.ID] {
			return nil, &calc.InputError{Key: "protects", Message: fmt.Sprintf(
				"names block %q twice; list each compressor, tank or tube the valve relieves once", l.ID)}
		}
		seen[l.ID] = true
	}
	if crack > maxCrackingPressure {
		return nil, &calc.InputError{Key: "spring_rate", Message: fmt.Sprintf(
			"a spring of %s compressed %s on a %s seat opens at %s, beyond any valve of an air machine; allowed: up to %s; check spring_rate, preload and seat_diameter",
			rate(k), mm(x), mm(d), display.TraceIn(cust, "MPa")(crack), display.TraceIn(cust, "MPa")(maxCrackingPressure))}
	}
	res := []calc.Result{
		{Name: "spring_force", Value: force, Dim: units.Force, Trace: calc.Trace{Formula: "F = k · x", Substituted: "= " + rate(k) + " · " + mm(x)}},
		{Name: "cracking_pressure", Value: crack, Dim: units.Stress, Trace: calc.Trace{Formula: "Δp = F / (π/4 · d²)", Substituted: "= " + newton(force) + " / (π/4 · (" + mm(d) + ")²)" + protectedText(in, crack)}},
	}
	if len(in.LinksOf("protects")) > 0 {
		if crack <= 0 {
			return nil, &calc.InputError{Key: "preload", Message: "is 0: a relief valve with no preload opens at ambient pressure and holds nothing; give the spring's compression with the valve shut"}
		}
		res = append(res, reliefResults(in, crack)...)
	} else {
		for _, key := range []string{"lift", "discharge_coefficient", "relieving_temperature"} {
			if in.Given(key) {
				return nil, &calc.InputError{Key: key, Message: "is given but protects is missing: the relieving capacity is worked out for a relief valve; name the compressors and pressure parts it protects"}
			}
		}
	}
	return &calc.Outcome{Results: res}, nil
}

// protectedText lists what a relief valve protects, beside the absolute
// pressure it opens at: the allowable pressure of each part and the
// dead-head pressure of each compressor.
func protectedText(in *calc.Inputs, crack float64) string {
	linked := in.LinksOf("protects")
	if len(linked) == 0 {
		return ""
	}
	bara := display.TraceIn(in.Customary(), "bar(a)")
	var parts []string
	for _, l := range linked {
		switch {
		case l.Roles&calc.Delivers != 0:
			parts = append(parts, fmt.Sprintf("%s dead-heads at %s", l.ID, bara(l.Results["max_pressure"])))
		default:
			if allow, name, _, ok := rating(func(n string) (float64, bool) { v, ok := l.Results[n]; return v, ok }); ok {
				parts = append(parts, fmt.Sprintf("%s allows %s (%s)", l.ID, bara(allow), name))
			} else {
				parts = append(parts, fmt.Sprintf("%s (no allowable pressure: give its wall)", l.ID))
			}
		}
	}
	return fmt.Sprintf("; relief: opens at %s (ambient %s + Δp); protects %s",
		bara(in.Ambient+crack), bara(in.Ambient), strings.Join(parts, ", "))
}
