package models

import (
	"fmt"
	"math"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// The cylinder, crank and gas that the compressor, vacuum and motor kinds
// share: their common inputs, the bounds that keep every formula finite,
// reading a cylinder from a block, and polytropic work.

// cylinderSpecs are the inputs of a piston cylinder on a crank and the gas
// it draws, as every kind built on one takes them.
var cylinderSpecs = []calc.InputSpec{
	{Name: "bore", Dim: units.Length, Range: calc.Between(1e-4, 10), Meaning: "cylinder bore (piston diameter), 0.1 mm to 10 m"},
	{Name: "stroke", Dim: units.Length, Optional: true, Range: calc.Between(1e-4, 10), Meaning: "piston stroke, twice the crank radius, 0.1 mm to 10 m; give stroke or crank_radius"},
	{Name: "crank_radius", Dim: units.Length, Optional: true, Range: calc.Between(5e-5, 5), Meaning: "crank throw, half the stroke, 0.05 mm to 5 m; give stroke or crank_radius"},
	{Name: "rod_length", Dim: units.Length, Range: calc.Between(1e-4, 50), Meaning: "connecting rod length between centres, up to 50 m; must exceed the crank radius"},
	{Name: "clearance_volume", Dim: units.Volume, Optional: true, Range: positiveUpTo(100), Meaning: "gas volume left in one cylinder at top dead centre; give clearance_volume or clearance_ratio"},
	{Name: "clearance_ratio", Dim: units.Dimensionless, Optional: true, Range: calc.Between(minClearanceRatio, 100), Meaning: "clearance volume over swept volume, 1e-6 to 100; give clearance_volume or clearance_ratio"},
	{Name: "cylinders", Dim: units.Dimensionless, Default: "1", Range: calc.Between(1, maxCylinders), Meaning: "number of identical cylinders on the crankshaft, evenly phased, 1 to 32"},
	{Name: "speed", Dim: units.RotationalSpeed, Range: calc.Between(minCrankSpeed, 1e5), Meaning: "crankshaft speed, 1 rpm to 1e5 rad/s, and at most 40 m/s of mean piston speed"},
	{Name: "inlet_pressure", Dim: units.Pressure, Optional: true, Range: calc.Between(1, 1e9), Meaning: "pressure in the cylinder during suction, 1 Pa(a) to 1 GPa; default: ambient"},
	{Name: "inlet_temperature", Dim: units.Temperature, Default: "20 degC", Range: calc.Between(minGasTemperature, maxGasTemperature), Meaning: "air temperature at the inlet"},
	{Name: "polytropic_index", Dim: units.Dimensionless, Default: "1.3", Range: calc.Between(1, 1.67), Meaning: "n in p·V^n = const for compression and re-expansion, 1 (isothermal) to 1.67; 1.4 is adiabatic air"},
	{Name: "mechanical_efficiency", Dim: units.Dimensionless, Default: "0.85", Range: calc.Between(0.01, 1), Meaning: "indicated power over shaft power, 0.01 to 1"},
	{Name: "head_material", Type: calc.Name, Optional: true, Choices: materialChoices, Resolve: resolveMaterial, Label: materialLabel, Suggest: suggestMaterial, Meaning: "material of the cylinder head, checked against the discharge temperature (specgen explain materials lists them)"},
	{Name: "valve_material", Type: calc.Name, Optional: true, Choices: materialChoices, Resolve: resolveMaterial, Label: materialLabel, Suggest: suggestMaterial, Meaning: "material of the valve reeds or plates, checked against the discharge temperature"},
	{Name: "reciprocating_mass", Dim: units.Mass, Optional: true, Range: positiveUpTo(1e3), Meaning: "piston, pin, rings and the small-end share of the rod, per cylinder; adds the inertia torque curves"},
}

// cylinderInputs returns the cylinder input specs named names, in that
// order.
func cylinderInputs(names ...string) []calc.InputSpec {
	specs := make([]calc.InputSpec, 0, len(names))
	for _, name := range names {
		for _, spec := range cylinderSpecs {
			if spec.Name == name {
				specs = append(specs, spec)
			}
		}
	}
	return specs
}

// The input bounds are generous for small machines; they keep every
// formula finite.
const (
	maxCylinders      = 32
	minClearanceRatio = 1e-6 // "negligible clearance"; CR^n stays finite
	// minRodExcess is how much longer than the crank the rod must be, as a
	// fraction of the crank radius, for the slider-crank formulas to stay
	// finite at 90° of crank angle.
	minRodExcess = 1e-9
)

// Physical floors for inputs that only need to be positive in the
// formulas: a value below them describes no machine these models are for
// and gives absurd but finite results (common practice, our choice).
const (
	minPartSize       = 1e-4             // m: 0.1 mm, the smallest dimension of a part
	minCrankSpeed     = 2 * math.Pi / 60 // rad/s: 1 rpm, a slow hand crank
	minGasTemperature = 150              // K: well above where air liquefies, so an ideal gas
	maxGasTemperature = 1000             // K: beyond any inlet or intercooler of an air machine
	minSolidDensity   = 100              // kg/m³: below the lightest woods
	minVesselVolume   = 1e-8             // m³: 10 mm³
	// maxMeanPistonSpeed: fast racing engines run at about 25 m/s (common
	// practice); no air machine comes near 40 m/s.
	maxMeanPistonSpeed = 40.0 // m/s
)

// positiveUpTo allows values above zero up to max.
func positiveUpTo(max float64) calc.Range {
	return calc.Range{Min: 0, Max: max, HasMin: true, HasMax: true, MinOpen: true}
}

// cycleSteps is the least number of crank-angle steps per revolution
// (0.1° each) at which the torque curves are sampled: fine enough that the
// cycle integral matches the closed-form indicated work to 1e-6 (tested).
const cycleSteps = 3600

// curvePoints is the number of intervals per revolution in the published
// crank-angle and p-V curves (0.5°); it divides cycleSteps.
const curvePoints = 720

// cylinder is a compressor block's inputs in SI, absolute pressures.
type cylinder struct {
	bore, crankRadius, rod float64
	clearanceVolume        float64
	clearanceRatio         float64
	clearanceGiven         bool // the ratio was derived from a given volume
	cylinders              int
	omega                  float64 // rad/s
	p1, p2, ambient        float64
	t1, n, etaMech         float64
	mass                   float64 // 0 when not given
}

// readCylinder reads the cylinder of a block of any kind built on it:
// geometry, clearance, cylinders, speed, polytropic index, mechanical
// efficiency and reciprocating mass, with the checks that single-input
// ranges cannot make. The pressures are the caller's.
func readCylinder(in *calc.Inputs) (cylinder, error) {
	c := cylinder{
		bore:    in.Value("bore"),
		rod:     in.Value("rod_length"),
		omega:   in.Value("speed"),
		ambient: in.Ambient,
		p1:      in.Ambient,
		t1:      in.Value("inlet_temperature"),
		n:       in.Value("polytropic_index"),
		etaMech: in.Value("mechanical_efficiency"),
		mass:    in.Value("reciprocating_mass"),
	}
	switch {
	case in.Has("stroke") && in.Has("crank_radius"):
		return c, &calc.InputError{Key: "stroke", Message: "give either stroke or crank_radius, not both (stroke = 2 × crank radius)"}
	case in.Has("stroke"):
		c.crankRadius = in.Value("stroke") / 2
	case in.Has("crank_radius"):
		c.crankRadius = in.Value("crank_radius")
	default:
		return c, &calc.InputError{Key: "stroke", Message: "missing: give stroke or crank_radius (a length, e.g. \"32 mm\")"}
	}
	// Messages in the units the block is written in.
	cust := in.Customary()
	mm, speed := display.TraceIn(cust, "mm"), display.TraceIn(cust, "m/s")
	if cm := 4 * c.crankRadius * c.omega / (2 * math.Pi); cm > maxMeanPistonSpeed {
		return c, &calc.InputError{Key: "speed", Message: fmt.Sprintf(
			"at %s a %s stroke gives a mean piston speed of %s, beyond any piston machine; allowed: up to %s (%s with this stroke)",
			display.Number(c.omega*60/(2*math.Pi), "rpm"), mm(2*c.crankRadius), speed(cm), speed(maxMeanPistonSpeed),
			display.Number(maxMeanPistonSpeed*60/(4*c.crankRadius), "rpm"))}
	}
	if c.rod <= c.crankRadius*(1+minRodExcess) {
		return c, &calc.InputError{Key: "rod_length", Message: fmt.Sprintf(
			"rod length %s must exceed the crank radius %s (half the stroke)",
			mm(c.rod), mm(c.crankRadius))}
	}
	swept := math.Pi / 4 * c.bore * c.bore * 2 * c.crankRadius
	switch {
	case in.Has("clearance_volume") && in.Has("clearance_ratio"):
		return c, &calc.InputError{Key: "clearance_volume", Message: "give either clearance_volume or clearance_ratio, not both"}
	case in.Has("clearance_volume"):
		c.clearanceVolume = in.Value("clearance_volume")
		c.clearanceRatio = c.clearanceVolume / swept
		c.clearanceGiven = true
		if c.clearanceRatio < minClearanceRatio {
			return c, &calc.InputError{Key: "clearance_volume", Message: fmt.Sprintf(
				"clearance volume %s is less than a millionth of the swept volume %s; for negligible clearance use clearance_ratio = %g",
				display.TraceIn(cust, "mm3")(c.clearanceVolume), display.TraceIn(cust, "cm3")(swept), minClearanceRatio)}
		}
	case in.Has("clearance_ratio"):
		c.clearanceRatio = in.Value("clearance_ratio")
		c.clearanceVolume = c.clearanceRatio * swept
	default:
		return c, &calc.InputError{Key: "clearance_volume", Message: "missing: give clearance_volume (a volume, e.g. \"1.8 cm3\") or clearance_ratio (e.g. 0.05)"}
	}
	z := in.Value("cylinders")
	if z != math.Trunc(z) {
		return c, &calc.InputError{Key: "cylinders", Message: fmt.Sprintf("%s is not a whole number of cylinders", units.Format(z, 6))}
	}
	c.cylinders = int(z)
	return c, nil
}

// cycleAt is the cylinder's ideal indicator cycle from suction p1 to
// discharge p2 (absolute), its crankcase at ambient.
func (c cylinder) cycleAt(p1, p2 float64) *indicatorCycle {
	return newIndicatorCycle(indicatorCycle{crank: sliderCrank{r: c.crankRadius, l: c.rod}, area: math.Pi / 4 * c.bore * c.bore,
		clearance: c.clearanceVolume, p1: p1, p2: p2, n: c.n, ambient: c.ambient})
}

// polytropicWork returns the work to compress a volume v drawn in at p1
// through a pressure ratio r along p·V^n = const, with delivery:
// n/(n−1)·p1·v·(r^((n−1)/n) − 1), or p1·v·ln r when n = 1. Expm1 keeps
// it accurate as n approaches 1.
func polytropicWork(p1, v, r, n float64) float64 {
	if n == 1 {
		return p1 * v * math.Log(r)
	}
	return n / (n - 1) * p1 * v * math.Expm1((n-1)/n*math.Log(r))
}
