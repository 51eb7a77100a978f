package models

import (
	"fmt"
	"math"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// The stored energy of a pneumatic test, its TNT equivalent and the least
// distance to keep people at, by the equations of ASME PCC-2 Article 501
// (Mandatory Appendices II and III), each unit system's form with its own
// constants as the published text gives them. The two forms' TNT constants
// differ by about 4 %, so a block in inches and one in millimetres get
// figures that differ by about that much.

// testInputs are the inputs of the pneumatic-test figures.
var testInputs = []calc.InputSpec{
	{Name: "test_pressure", Dim: units.Pressure, Optional: true, Range: positiveUpTo(1e9),
		Meaning: "pneumatic test pressure, above ambient, up to 1 GPa; default 1.1 × the code allowable pressure, else 1.1 × the working pressure (ASME VIII-1 UG-100, from memory)"},
}

// testResults are the results of the pneumatic-test figures.
var testResults = []calc.ResultSpec{
	{Name: "test_energy", Dim: units.Energy, Unit: "kJ", Meaning: "energy the air stores at the pneumatic test pressure, by ASME PCC-2 Article 501 Mandatory Appendix II"},
	{Name: "tnt_equivalent", Dim: units.Mass, Unit: "kg", Meaning: "mass of TNT that releases the test energy (PCC-2 Appendix II)"},
	{Name: "test_distance", Dim: units.Length, Unit: "m", Meaning: "least distance to keep people at during a pneumatic test (PCC-2 Appendix III)"},
}

// pneumaticTestFactor is the pneumatic test pressure over the allowable
// pressure (ASME VIII-1 UG-100, from memory).
const pneumaticTestFactor = 1.1

// pcc2Form is one unit system's form of the PCC-2 equations, each number
// in that system's units.
type pcc2Form struct {
	pressure, volume, energy, mass, length string  // the units of p, V, E, TNT and R
	energyText                             string  // E's unit as the published text writes it
	atmosphere                             float64 // p_a, absolute
	coefficient                            float64 // E = coefficient·p_at·V·[...]
	tnt                                    float64 // energy of a unit mass of TNT
	scaled                                 float64 // R_scaled, length per mass^(1/3)
	// Below the energy of the first step the distance is at least the
	// first least distance; below the second, the second.
	steps     [2]float64
	distances [2]float64
}

// The two forms (ASME PCC-2 Article 501, Mandatory Appendices II and III).
// The US least distances of 100 ft and 200 ft at 100 000 000 and
// 200 000 000 ft·lbf are from memory.
var (
	pcc2SI = pcc2Form{pressure: "Pa", volume: "m3", energy: "J", energyText: "J", mass: "kg", length: "m",
		atmosphere: 101000, coefficient: 2.5, tnt: 4266920, scaled: 20,
		steps: [2]float64{135.5e6, 271e6}, distances: [2]float64{30, 60}}
	pcc2US = pcc2Form{pressure: "psi", volume: "ft3", energy: "lbf ft", energyText: "ft·lbf", mass: "lb", length: "ft",
		atmosphere: 14.7, coefficient: 360, tnt: 1488617, scaled: 50,
		steps: [2]float64{100e6, 200e6}, distances: [2]float64{100, 200}}
)

// testAtmosphere is added to the gauge test pressure for p_at: the
// standard atmosphere, whatever the block's ambient.
const testAtmosphere = 101325.0 // Pa

// factors are the SI values of one of each unit the form's constants are
// in: pressure, volume, energy, mass and length, rows of the unit table.
func (f pcc2Form) factors() ([5]float64, error) {
	var out [5]float64
	for i, symbol := range []string{f.pressure, f.volume, f.energy, f.mass, f.length} {
		u, err := units.LookupUnit(symbol)
		if err != nil {
			return out, fmt.Errorf("the pneumatic-test formula's unit %q: %v", symbol, err)
		}
		out[i] = u.Factor
	}
	return out, nil
}

// pneumaticTestResults are a vessel's test_energy, tnt_equivalent and
// test_distance for a volume v, with the test pressure given, or else
// 1.1 × the code allowable pressure (code, gauge; hasCode false when there
// is none) or 1.1 × the working pressure (gauge).
func pneumaticTestResults(in *calc.Inputs, v, working, code float64, hasCode bool) ([]calc.Result, error) {
	cust := in.Customary()
	gauge := func(p float64) string { return display.Gauge(p, cust) }
	var p float64
	var why string
	switch {
	case in.Has("test_pressure"):
		p = in.Value("test_pressure") - in.Ambient
		if p <= 0 {
			return nil, &calc.InputError{Key: "test_pressure", Message: fmt.Sprintf(
				"%s is not above ambient; a pressure test is above it", display.Gauge(p, cust))}
		}
		why = "p_test as given"
	case hasCode:
		p = pneumaticTestFactor * code
		why = fmt.Sprintf("p_test = 1.1 × the code allowable pressure %s (pneumatic test, ASME VIII-1 UG-100, from memory)", gauge(code))
	default:
		p = pneumaticTestFactor * working
		why = fmt.Sprintf("p_test = 1.1 × the working pressure %s (pneumatic test, ASME VIII-1 UG-100, from memory; no code allowable pressure)", gauge(working))
	}
	f := pcc2SI
	if cust {
		f = pcc2US
	}
	factor, err := f.factors()
	if err != nil {
		return nil, err
	}
	pu, vu, eu, mu, lu := factor[0], factor[1], factor[2], factor[3], factor[4]
	pat := (p + testAtmosphere) / pu
	vol := v / vu
	// Within a few pascals of ambient, p_a above p_at (101 325 Pa against
	// the US form's 14.7 psia) would make E negative: there is nothing.
	energy := math.Max(0, f.coefficient*pat*vol*(1-math.Pow(f.atmosphere/pat, 0.286)))
	tnt := energy / f.tnt
	least := 0.0
	switch {
	case energy <= f.steps[0]:
		least = f.distances[0]
	case energy <= f.steps[1]:
		least = f.distances[1]
	}
	scaled := f.scaled * math.Cbrt(tnt)
	distance := math.Max(least, scaled)

	num := func(x float64, unit string) string { return display.Number(x, units.Pretty(unit)) }
	pa, standard, abs := "101 000 Pa", "101 325 Pa", "Pa"
	if cust {
		pa, standard, abs = num(f.atmosphere, "psi(a)"), num(testAtmosphere/pu, "psi")+" (101 325 Pa)", "psi(a)"
	}
	energyTrace := calc.Trace{
		Formula: fmt.Sprintf("E = %s · p_at · V · [1 − (p_a/p_at)^0.286], p_at = p_test + %s, p_a = %s (ASME PCC-2 Article 501, Mandatory Appendix II; E in %s with p in %s and V in %s)",
			display.Number(f.coefficient, ""), standard, pa, f.energyText, units.Pretty(abs), units.Pretty(f.volume)),
		Substituted: fmt.Sprintf("= %s · %s · %s · [1 − (%s / %s)^0.286] = %s; %s",
			display.Number(f.coefficient, ""), num(pat, abs), num(vol, f.volume), pa, num(pat, abs), display.Number(energy, f.energyText), why),
	}
	tntText := "4 266 920 J/kg"
	if cust {
		tntText = "1 488 617 ft·lbf/lb"
	}
	stepText := fmt.Sprintf("%s for E ≤ %s, %s up to %s", num(f.distances[0], f.length), num(f.steps[0]/1e6, "MJ"), num(f.distances[1], f.length), num(f.steps[1]/1e6, "MJ"))
	if cust {
		stepText = fmt.Sprintf("%s for E ≤ 100 000 000 ft·lbf, %s up to 200 000 000 ft·lbf", num(f.distances[0], f.length), num(f.distances[1], f.length))
	}
	return []calc.Result{
		{Name: "test_energy", Value: energy * eu, Dim: units.Energy, Trace: energyTrace},
		{Name: "tnt_equivalent", Value: tnt * mu, Dim: units.Mass, Trace: calc.Trace{
			Formula:     "TNT = E / " + tntText + " (PCC-2 Article 501, Mandatory Appendix II)",
			Substituted: fmt.Sprintf("= %s / %s", display.Number(energy, f.energyText), tntText)}},
		{Name: "test_distance", Value: distance * lu, Dim: units.Length, Trace: calc.Trace{
			Formula: fmt.Sprintf("R = the greater of %s, and R_scaled · TNT^(1/3), R_scaled = %s/%s^(1/3) (PCC-2 Article 501, Mandatory Appendix III)",
				stepText, num(f.scaled, f.length), units.Pretty(f.mass)),
			Substituted: fmt.Sprintf("= max(%s, %s · (%s)^(1/3) = %s)", num(least, f.length), num(f.scaled, f.length), num(tnt, f.mass), num(scaled, f.length))}},
	}, nil
}
