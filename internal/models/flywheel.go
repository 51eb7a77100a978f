package models

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// flywheelKind sizes a flywheel, a solid disc or a rim, to hold the speed
// fluctuation of a compressor or an air motor within a given coefficient.
var flywheelKind = calc.Kind{
	Name:    "flywheel",
	Summary: "inertia to hold a speed fluctuation: a solid disc or rim sized from a compressor's or motor's torque, with its rim speed, stress and safety factor",
	Doc:     flywheelDoc,
	Inputs: []calc.InputSpec{
		{Name: "source", Type: calc.LinkList, LinkRoles: calc.Crank, Meaning: "the compressor or motor block whose crankshaft the flywheel is on, or a list of the blocks on one crankshaft, taken evenly phased in the order listed"},
		{Name: "speed_fluctuation", Dim: units.Dimensionless, Optional: true, Range: calc.Between(1e-4, 0.5),
			Meaning: "coefficient of speed fluctuation Cs = (ω_max − ω_min)/ω_mean allowed, 0.0001 to 0.5 (0.05 or less is usual for belt-driven compressors: common practice), to size the flywheel; or give diameter"},
		{Name: "diameter", Dim: units.Length, Optional: true, Range: calc.Between(minPartSize, 10),
			Meaning: "outside diameter of the disc or rim the builder has, to check the speed fluctuation it holds; or give speed_fluctuation"},
		{Name: "density", Dim: units.Density, Optional: true, Range: calc.Between(minSolidDensity, 1e5), Meaning: "density of the flywheel material; give density or material"},
		{Name: "material", Type: calc.Name, Optional: true, Choices: materialChoices, Resolve: resolveMaterial, Label: materialLabel, Suggest: suggestMaterial, Meaning: "flywheel material, for its density, Poisson's ratio and strength; give material or density"},
		{Name: "thickness", Dim: units.Length, Range: calc.Between(minPartSize, 10), Meaning: "axial thickness of the disc, or axial width of the rim"},
		{Name: "shape", Type: calc.Name, Default: "disc", Choices: func(any) []string { return []string{"disc", "rim"} },
			Meaning: "disc: a solid disc of uniform thickness; rim: a ring of radial depth rim_depth with no web or hub"},
		{Name: "rim_depth", Dim: units.Length, Optional: true, Range: calc.Between(minPartSize, 10), Meaning: "radial depth of the ring (outer minus inner radius), for shape = \"rim\" only"},
		{Name: "poisson_ratio", Dim: units.Dimensionless, Optional: true, Range: calc.Range{Min: 0, Max: 0.5, HasMin: true, HasMax: true, MinOpen: true, MaxOpen: true},
			Meaning: "Poisson's ratio for the rotating stress, above 0 and below 0.5; default: the material's, or 0.3"},
	},
	Results: []calc.ResultSpec{
		{Name: "energy_fluctuation", Dim: units.Energy, Unit: "J", Meaning: "swing of the energy the flywheel stores and gives back over a revolution, from the source's torque"},
		{Name: "inertia", Dim: units.Inertia, Unit: "kg m2", Meaning: "moment of inertia that holds the speed within the coefficient"},
		{Name: "speed_fluctuation", Dim: units.Dimensionless, Unit: "", Meaning: "coefficient of speed fluctuation the flywheel holds: as given when sizing, from the diameter when checking"},
		{Name: "diameter", Dim: units.Length, Unit: "mm", Meaning: "outside diameter of the disc or rim with that inertia: sized, or as given when checking"},
		{Name: "mass", Dim: units.Mass, Unit: "kg", Meaning: "mass of the disc or rim"},
		{Name: "rim_speed", Dim: units.Velocity, Unit: "m/s", Meaning: "peripheral speed at the outside diameter, at the mean crank speed"},
		{Name: "rim_stress", Dim: units.Stress, Unit: "MPa", Meaning: "largest stress from rotation: at the centre of a disc, at the bore of a rim"},
		{Name: "safety_factor", Dim: units.Dimensionless, Unit: "", Factor: true, FactorMaterial: "material",
			Meaning: "design strength of the material over the rim stress (with material only)"},
	},
	Charts:   []string{"speed"},
	Chart:    flywheelChart,
	Evaluate: evaluateFlywheel,
}

// defaultPoisson is the Poisson's ratio taken when neither the block nor
// the material gives one: typical of steel and cast iron (common practice).
const defaultPoisson = 0.3

const flywheelDoc = `The flywheel kind sizes a flywheel on the crankshaft of the compressor or
motor block named in source, turning at its speed ω, so that the speed
swings by no more than Cs = (ω_max − ω_min)/ω_mean over a revolution.
Source may list several blocks on one crankshaft (the stages of a
two-stage machine, say): they must turn at one speed, and block k of n is
taken to reach top dead centre 360°·k/n after the first, as opposed throws
of two stages do; their torques add.

Two modes
- Sizing (speed_fluctuation given): the inertia that holds Cs, and the
  diameter of the disc or rim that has it.
- Checking (diameter given: the disc or rim the builder has): its
  inertia from the same shape formulas, and the speed fluctuation it
  holds, Cs = ΔE / (I·ω²). The other results, trace and chart are the
  same.

Energy and inertia
- The drive (or, for a motor, the load) is a constant torque equal to the
  mean of the source's torque T(θ). The source's torque curve is its
  gas_torque, or total_torque (gas plus the inertia of the reciprocating
  mass) when it has one. ΔE, the swing of ∫(T_m − T(θ))dθ over a
  revolution, is the source's energy_fluctuation result when it is taken
  from the gas torque alone, else recomputed from the curve (0.5° steps).
- From I·ω·dω = (T_m − T)·dθ, ω_max² − ω_min² = 2·ΔE/I; with
  ω_mean = (ω_max + ω_min)/2 this is exactly
    I = ΔE / (Cs·ω²)
  (J. E. Shigley and C. R. Mischke, Mechanical Engineering Design, the
  flywheel section; R. L. Norton, Design of Machinery, ch. 11).
- The inertia of the rest of the crank train is ignored: the flywheel is
  sized to do the whole job.

Shapes (ρ density, t axial thickness or width)
  disc: a solid disc of diameter D
    I = ρ·π·t·D⁴/32      D = (32·I/(ρ·π·t))^(1/4)
  rim: a ring of radial depth h, mean diameter Dm (no web, spokes or hub;
    they add inertia, so the ring alone errs on the heavy side)
    I = ρ·π·t·h·Dm·(Dm² + h²)/4
    solved for Dm (a cubic with one real root), D = Dm + h; the bore
    Dm − h must be positive, or a solid disc would do.
  rim_speed v = ω·D/2 at the outside diameter.

Stress (a freely rotating disc of uniform thickness, plane stress,
S. Timoshenko and J. N. Goodier, Theory of Elasticity, rotating disks;
Roark's Formulas for Stress and Strain, rotating disks)
  disc: σ = (3 + ν)/8 · ρ·ω²·R², at the centre, where the radial and hoop
        stresses are equal and largest (R = D/2).
  rim:  σ = (3 + ν)/4 · ρ·ω²·(b² + (1 − ν)/(3 + ν)·a²), the hoop stress at
        the bore (a, b inner and outer radius); a thin ring gives ρ·v².
  ν is poisson_ratio, else the material's, else 0.3.
  safety_factor = design strength (yield, or tensile strength without a
  yield point) / σ, given with material only. Keys, bolts, welds and
  spokes are not checked, nor bursting at overspeed: stress rises with the
  square of the speed. A rim faster than 30 m/s raises the fast-flywheel
  caution when no material is named or the material is brittle.

Chart: speed, the crank speed over a revolution,
  ω(θ)² = ω0² + 2·∫(T_m − T)dθ / I, with ω0 such that (ω_max + ω_min)/2 = ω,
  drawn as ω(θ) − ω with the mean and the limits ±Cs·ω/2 marked.`

// flywheelInput is a flywheel block's inputs in SI.
type flywheelInput struct {
	sources  []*calc.Linked
	names    string     // the sources' ids, for traces
	cs       float64    // given, when sizing
	diameter float64    // given, when checking
	omega    float64    // mean crank speed, rad/s
	torque   calc.Curve // the source's load torque over one revolution
	density  float64
	poisson  float64
	material *Material
	rim      bool
	width    float64 // axial thickness
	depth    float64 // radial depth of a rim
}

// readFlywheelInput applies the checks that single-input ranges cannot.
func readFlywheelInput(in *calc.Inputs) (flywheelInput, error) {
	f := flywheelInput{sources: in.LinksOf("source"), cs: in.Value("speed_fluctuation"), diameter: in.Value("diameter"),
		width: in.Value("thickness"), rim: in.NameOf("shape") == "rim", poisson: defaultPoisson}
	if len(f.sources) == 0 {
		return f, &calc.InputError{Key: "source", Message: "missing: name the compressor or motor block the flywheel is on, e.g. source = \"low\""}
	}
	switch {
	case in.Has("speed_fluctuation") && in.Has("diameter"):
		return f, &calc.InputError{Key: "diameter", Message: "give either speed_fluctuation (to size the flywheel) or diameter (to check the one you have), not both"}
	case !in.Has("speed_fluctuation") && !in.Has("diameter"):
		return f, &calc.InputError{Key: "speed_fluctuation", Message: "missing: give speed_fluctuation (e.g. 0.05) to size the flywheel, or diameter (e.g. \"250 mm\") to check the one you have"}
	}
	switch {
	case in.Has("density") && in.Has("material"):
		return f, &calc.InputError{Key: "density", Message: "give either density or material, not both (a material brings its own density)"}
	case in.Has("material"):
		m, err := envOf(in).Materials.Lookup(in.NameOf("material"))
		if err != nil {
			return f, &calc.InputError{Key: "material", Message: err.Error()}
		}
		f.material, f.density = &m, m.Density
		if m.PoissonRatio > 0 {
			f.poisson = m.PoissonRatio
		}
	case in.Has("density"):
		f.density = in.Value("density")
	default:
		return f, &calc.InputError{Key: "density", Message: "missing: give material (e.g. \"s235\"; specgen explain lists them) or density (e.g. \"7850 kg/m3\")"}
	}
	if in.Has("poisson_ratio") {
		f.poisson = in.Value("poisson_ratio")
	}
	switch {
	case f.rim && !in.Has("rim_depth"):
		return f, &calc.InputError{Key: "shape", Message: "a rim needs rim_depth, its radial depth (e.g. \"15 mm\")"}
	case !f.rim && in.Has("rim_depth"):
		return f, &calc.InputError{Key: "rim_depth", Message: "rim_depth is for shape = \"rim\"; a disc is solid"}
	}
	f.depth = in.Value("rim_depth")
	var ids []string
	for k, src := range f.sources {
		// A block on the crank twice is a copied line: it would silently
		// double the machine.
		if slices.Contains(ids, src.ID) {
			return f, &calc.InputError{Key: "source", Message: fmt.Sprintf(
				"names block %q twice; list each block on the crankshaft once (identical cylinders of one stage are its cylinders input)", src.ID)}
		}
		ids = append(ids, src.ID)
		torque, ok := sourceTorque(src)
		speed := src.Inputs["speed"]
		switch {
		case !(speed > 0) || !ok:
			return f, &calc.InputError{Key: "source", Message: fmt.Sprintf("block %s (%s) gives no crank speed or torque curve to size a flywheel from", src.ID, src.Kind)}
		case k == 0:
			f.omega, f.torque = speed, torque
			f.torque.Y = append([]float64(nil), torque.Y...)
		case math.Abs(speed-f.omega) > 1e-9*f.omega:
			return f, &calc.InputError{Key: "source", Message: fmt.Sprintf("blocks %s and %s turn at different speeds; blocks on one crankshaft turn together", f.sources[0].ID, src.ID)}
		case len(torque.Y) != len(f.torque.Y):
			return f, &calc.InputError{Key: "source", Message: fmt.Sprintf("the torque curves of %s and %s cannot be phased on one crank", f.sources[0].ID, src.ID)}
		case (len(torque.Y)-1)%len(f.sources) != 0:
			// Each block's phase must fall on a sample of the curves.
			m := len(torque.Y) - 1
			var fit []string
			for n := 1; n <= 12; n++ {
				if m%n == 0 {
					fit = append(fit, strconv.Itoa(n))
				}
			}
			return f, &calc.InputError{Key: "source", Message: fmt.Sprintf(
				"%d blocks cannot be spaced evenly on the revolution's %d torque samples; allowed: %s blocks (a number that divides %d)",
				len(f.sources), m, strings.Join(fit, ", "), m)}
		default:
			// Block k reaches top dead centre 360°·k/n later: its torque at
			// crank angle θ is its own at θ − 360°·k/n.
			m := len(torque.Y) - 1
			shift := m * k / len(f.sources)
			for i := range f.torque.Y {
				f.torque.Y[i] += torque.Y[((i-shift)%m+m)%m]
			}
			f.torque.Name = "summed torque"
		}
	}
	f.names = strings.Join(ids, " + ")
	return f, nil
}

// sourceTorque is a source's load torque over one revolution: total_torque
// (gas and reciprocating inertia) when it has one, else gas_torque.
func sourceTorque(src *calc.Linked) (calc.Curve, bool) {
	var gas, total calc.Curve
	for _, c := range src.Curves {
		switch c.Name {
		case "gas_torque":
			gas = c
		case "total_torque":
			total = c
		}
	}
	if len(total.Y) >= 3 {
		return total, true
	}
	return gas, len(gas.Y) >= 3
}

// excessEnergy integrates T_m − T(θ) along the source's sampled torque
// (trapezoidal rule; the last sample is the first one revolution on) and
// returns the running energy at each sample, starting from zero.
func (f flywheelInput) excessEnergy() []float64 {
	x, y := f.torque.X, f.torque.Y
	mean := 0.0
	for i := 1; i < len(y); i++ {
		mean += (y[i] + y[i-1]) / 2 * (x[i] - x[i-1])
	}
	mean /= x[len(x)-1] - x[0]
	e := make([]float64, len(y))
	for i := 1; i < len(y); i++ {
		e[i] = e[i-1] + (2*mean-y[i]-y[i-1])/2*(x[i]-x[i-1])
	}
	return e
}

// energyFluctuation returns ΔE and how it was found.
func (f flywheelInput) energyFluctuation() (float64, calc.Trace) {
	if v, ok := f.sources[0].Results["energy_fluctuation"]; ok && len(f.sources) == 1 && f.torque.Name == "gas_torque" {
		return v, calc.Trace{Formula: "ΔE = energy_fluctuation of the source (gas torque)", Substituted: "= " + display.Number(v, "J") + " (" + f.names + ")"}
	}
	e := f.excessEnergy()
	low, high := extent(e)
	return high - low, calc.Trace{Formula: "ΔE = max − min of ∫(T_m − T(θ)) dθ, T the source's " + f.torque.Name, Substituted: "= " + display.Number(high, "J") + " − (" + display.Number(low, "J") + ") (" + f.names + ", 0.5° steps)"}

}

// extent returns the least and greatest of xs.
func extent(xs []float64) (low, high float64) {
	low, high = xs[0], xs[0]
	for _, x := range xs {
		low, high = math.Min(low, x), math.Max(high, x)
	}
	return low, high
}

// rimDiameter solves I = ρ·π·t·h·Dm·(Dm² + h²)/4 for the mean diameter
// Dm: the depressed cubic Dm³ + h²·Dm − q = 0, q = 4·I/(ρ·π·t·h), has one
// real root, 2·sqrt(p/3)·sinh(asinh(3·q/(2·p)·sqrt(3/p))/3) with p = h².
func rimDiameter(inertia, density, width, depth float64) float64 {
	p := depth * depth
	q := 4 * inertia / (density * math.Pi * width * depth)
	return 2 * math.Sqrt(p/3) * math.Sinh(math.Asinh(1.5*q/p*math.Sqrt(3/p))/3)
}

func evaluateFlywheel(in *calc.Inputs) (*calc.Outcome, error) {
	f, err := readFlywheelInput(in)
	if err != nil {
		return nil, err
	}
	de, deTrace := f.energyFluctuation()
	if !(de > 0) {
		return nil, &calc.InputError{Key: "source", Message: fmt.Sprintf("%s: a steady torque (no energy fluctuation) needs no flywheel", f.names)}
	}
	w := f.omega
	cust := in.Customary()
	mm, kgm2 := display.TraceIn(cust, "mm"), display.TraceIn(cust, "kg m2")
	rho := display.TraceIn(cust, "kg/m3")(f.density)
	rads := display.Number(w, "rad/s")
	nu := display.Number(f.poisson, "")
	var (
		diameter, mass, stress, inertia, cs float64
		dTrace, mTrace, sTrace, iTrace      calc.Trace
	)
	csTrace := calc.Trace{Formula: "Cs (given)", Substituted: "= " + display.Number(f.cs, "")}
	if f.diameter > 0 {
		var err error
		if inertia, iTrace, err = f.inertiaOf(mm, rho); err != nil {
			return nil, err
		}
		cs = de / (inertia * w * w)
		csTrace = calc.Trace{Formula: "Cs = ΔE / (I·ω²)", Substituted: "= " + display.Number(de, "J") + " / (" + kgm2(inertia) + " · (" + rads + ")²)"}
	} else {
		cs = f.cs
		inertia = de / (cs * w * w)
		iTrace = calc.Trace{Formula: "I = ΔE / (Cs·ω²)", Substituted: "= " + display.Number(de, "J") + " / (" + display.Number(cs, "") + " · (" + rads + ")²)"}
	}
	if f.rim {
		dm := rimDiameter(inertia, f.density, f.width, f.depth)
		if f.diameter > 0 {
			dm = f.diameter - f.depth
		}
		if dm <= f.depth {
			return nil, &calc.InputError{Key: "rim_depth", Message: fmt.Sprintf(
				"a rim %s deep and %s wide would need a mean diameter of %s, no more than its depth: it has no bore; use shape = \"disc\" or a shallower rim",
				mm(f.depth), mm(f.width), mm(dm))}
		}
		diameter = dm + f.depth
		a, b := (dm-f.depth)/2, diameter/2
		mass = f.density * math.Pi * f.width * f.depth * dm
		stress = (3 + f.poisson) / 4 * f.density * w * w * (b*b + (1-f.poisson)/(3+f.poisson)*a*a)
		dTrace = calc.Trace{Formula: "D = Dm + h, Dm from I = ρ·π·t·h·Dm·(Dm² + h²)/4 (ring, no web or hub)", Substituted: "= " + mm(dm) + " + " + mm(f.depth) + "; I = " + kgm2(inertia) + ", ρ = " + rho + ", t = " + mm(f.width)}

		mTrace = calc.Trace{Formula: "m = ρ·π·t·h·Dm", Substituted: "= " + rho + " · π · " + mm(f.width) + " · " + mm(f.depth) + " · " + mm(dm)}
		sTrace = calc.Trace{Formula: "σ = (3 + ν)/4 · ρ·ω²·(b² + (1 − ν)/(3 + ν)·a²), hoop stress at the bore (rotating ring, Timoshenko)", Substituted: "= (3 + " + nu + ")/4 · " + rho + " · (" + rads + ")² · ((" + mm(b) + ")² + (1 − " + nu + ")/(3 + " + nu + ") · (" + mm(a) + ")²)"}

	} else {
		diameter = f.diameter
		if diameter == 0 {
			diameter = math.Pow(32*inertia/(f.density*math.Pi*f.width), 0.25)
		}
		r := diameter / 2
		mass = f.density * math.Pi * r * r * f.width
		stress = (3 + f.poisson) / 8 * f.density * w * w * r * r
		dTrace = calc.Trace{Formula: "D = (32·I / (ρ·π·t))^(1/4) (solid disc)", Substituted: "= (32 · " + kgm2(inertia) + " / (" + rho + " · π · " + mm(f.width) + "))^(1/4)"}
		mTrace = calc.Trace{Formula: "m = ρ·π·D²·t/4", Substituted: "= " + rho + " · π · (" + mm(diameter) + ")² · " + mm(f.width) + " / 4"}
		sTrace = calc.Trace{Formula: "σ = (3 + ν)/8 · ρ·ω²·R², at the centre (rotating solid disc, Timoshenko)", Substituted: "= (3 + " + nu + ")/8 · " + rho + " · (" + rads + ")² · (" + mm(r) + ")²"}

	}
	if f.diameter > 0 {
		diameter, dTrace = f.diameter, calc.Trace{Formula: "D (given)", Substituted: "= " + mm(f.diameter)}
	}
	res := []calc.Result{
		{Name: "energy_fluctuation", Value: de, Dim: units.Energy, Trace: deTrace},
		{Name: "inertia", Value: inertia, Dim: units.Inertia, Trace: iTrace},
		{Name: "speed_fluctuation", Value: cs, Dim: units.Dimensionless, Trace: csTrace},
		{Name: "diameter", Value: diameter, Dim: units.Length, Trace: dTrace},
		{Name: "mass", Value: mass, Dim: units.Mass, Trace: mTrace},
		{Name: "rim_speed", Value: w * diameter / 2, Dim: units.Velocity, Trace: calc.Trace{Formula: "v = ω·D/2", Substituted: "= " + rads + " · " + mm(diameter) + " / 2"}},
		{Name: "rim_stress", Value: stress, Dim: units.Stress, Trace: sTrace},
	}
	if f.material != nil {
		strength, name := f.material.DesignStrength()
		res = append(res, calc.Result{Name: "safety_factor", Value: strength / stress, Dim: units.Dimensionless, Trace: calc.Trace{Formula: "n = S / σ", Substituted: "= " + display.Number(strength/1e6, "MPa") + " / " + display.Number(stress/1e6, "MPa") + " (" + name + ", " + f.material.Label + ")"}})
	}
	return &calc.Outcome{Results: res}, nil
}

// inertiaOf is the inertia of the disc or rim of the given diameter, for
// checking it.
func (f flywheelInput) inertiaOf(mm func(float64) string, rho string) (float64, calc.Trace, error) {
	if !f.rim {
		return f.density * math.Pi * f.width * math.Pow(f.diameter, 4) / 32, calc.Trace{Formula: "I = ρ·π·t·D⁴/32 (solid disc)",
			Substituted: "= " + rho + " · π · " + mm(f.width) + " · (" + mm(f.diameter) + ")⁴ / 32"}, nil
	}
	dm, h := f.diameter-f.depth, f.depth
	if dm <= h {
		return 0, calc.Trace{}, &calc.InputError{Key: "rim_depth", Message: fmt.Sprintf(
			"a rim %s deep leaves no bore in a %s diameter (the bore D − 2h must be positive); use shape = \"disc\" or a shallower rim", mm(h), mm(f.diameter))}
	}
	return f.density * math.Pi * f.width * h * dm * (dm*dm + h*h) / 4, calc.Trace{Formula: "I = ρ·π·t·h·Dm·(Dm² + h²)/4, Dm = D − h (ring, no web or hub)",
		Substituted: "= " + rho + " · π · " + mm(f.width) + " · " + mm(h) + " · " + mm(dm) + " · ((" + mm(dm) + ")² + (" + mm(h) + ")²) / 4"}, nil
}

// crankSpeed returns the crank speed at each sample of the source's torque
// curve with the flywheel's inertia: ω² = ω0² + 2·E(θ)/I, ω0 chosen so that
// the mean of the fastest and slowest speed is the source's speed.
func (f flywheelInput) crankSpeed(inertia float64) []float64 {
	e := f.excessEnergy()
	low, high := extent(e)
	a, b := 2*high/inertia, 2*low/inertia
	// sqrt(u + a) + sqrt(u + b) = 2ω and (u + a) − (u + b) = a − b.
	fast := f.omega + (a-b)/(4*f.omega)
	u := fast*fast - a
	out := make([]float64, len(e))
	for i, ei := range e {
		out[i] = math.Sqrt(u + 2*ei/inertia)
	}
	return out
}

func flywheelChart(name string, in *calc.Inputs, out *calc.Outcome) (*calc.Chart, error) {
	if name != "speed" {
		return nil, fmt.Errorf("no chart %q", name)
	}
	f, err := readFlywheelInput(in)
	if err != nil {
		return nil, err
	}
	inertia, cs := out.ResultValue("inertia"), out.ResultValue("speed_fluctuation")
	speed := f.crankSpeed(inertia)
	low, high := extent(speed)
	// The swing is a few per cent of the speed: drawn about the mean, it
	// fills the panel.
	excess := make([]float64, len(speed))
	for i, w := range speed {
		excess[i] = w - f.omega
	}
	rpm := func(v float64) string { return display.Number(v*30/math.Pi, "rpm") }
	half := cs * f.omega / 2
	return &calc.Chart{
		Title: "Crank speed over one revolution",
		Desc: fmt.Sprintf("The crank speed of %s with the flywheel's %s kg m² over one revolution from top dead centre, against a constant torque, drawn as its difference from the mean %s: it swings from %s to %s, a fluctuation of %s against the %s asked for, whose limits are marked.",
			f.names, units.Format(inertia, 3), rpm(f.omega), rpm(low), rpm(high), units.Format((high-low)/f.omega, 3), units.Format(cs, 3)),
		X: calc.Axis{Label: "Crank angle from top dead centre", Dim: units.Angle, Unit: "deg"},
		Panels: []calc.Panel{{
			Y:      calc.Axis{Label: "Speed above mean", Dim: units.RotationalSpeed, Unit: "rpm"},
			Series: []calc.Series{{Name: "crank speed", X: f.torque.X, Y: excess}},
			Marks:  []calc.Mark{{Value: 0, Label: "mean"}, {Value: half, Label: "upper limit"}, {Value: -half, Label: "lower limit"}},
		}},
	}, nil
}
