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
		{Name: "material", Type: calc.Name, Optional: true, Choices: materialChoices, Resolve: resolveMaterial, Label: materialLabel, Meaning: "material of the seat or poppet, for the printed-part caution"},
	},
	Results: []calc.ResultSpec{
		{Name: "spring_force", Dim: units.Force, Unit: "N", Meaning: "spring force on the closed valve: rate times preload"},
		{Name: "cracking_pressure", Dim: units.Stress, Unit: "bar", Meaning: "pressure difference across the seat at which the valve starts to open"},
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

With protects (a list of compressor, tank or tube block ids), the valve is a
relief valve for those blocks. The no-relief caution rule compares its
opening pressure with each protected part's allowable pressure and each
compressor's dead-head pressure; the trace lists them. The
relief-below-target rule cautions when it opens below the working pressure
of a part it protects (a tank's target pressure, a compressor's discharge
pressure, a tube's working pressure), which then never gets there.`

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
			if allow, ok := l.Results["allowable_pressure"]; ok {
				parts = append(parts, fmt.Sprintf("%s allows %s", l.ID, bara(allow)))
			} else {
				parts = append(parts, fmt.Sprintf("%s (no allowable pressure: give its wall)", l.ID))
			}
		}
	}
	return fmt.Sprintf("; relief: opens at %s (ambient %s + Δp); protects %s",
		bara(in.Ambient+crack), bara(in.Ambient), strings.Join(parts, ", "))
}
