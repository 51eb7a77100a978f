package models

import (
	"fmt"
	"math"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// compressorCharts are the charts a compressor block can show.
var compressorCharts = []string{"delivery", "kinematics", "pv", "temperature", "torque"}

// sweepPoints is the number of intervals in charts over discharge pressure.
const sweepPoints = 120

func compressorChart(name string, in *calc.Inputs, out *calc.Outcome) (*calc.Chart, error) {
	c, err := readCompressor(in)
	if err != nil {
		return nil, err
	}
	switch name {
	case "pv":
		return pvChart(c, out, in.Customary())
	case "torque":
		return torqueChart(c, out), nil
	case "delivery":
		return deliveryChart(c, out, in.Customary()), nil
	case "temperature":
		return temperatureChart(c, in, out), nil
	case "kinematics":
		swing, hasSwing, err := readRodSwing(in, c)
		if err != nil {
			return nil, err
		}
		return kinematicsChart(c, swing, hasSwing, in.Customary()), nil
	}
	return nil, fmt.Errorf("no chart %q", name)
}

func pvChart(c cylinder, out *calc.Outcome, customary bool) (*calc.Chart, error) {
	barA := display.Described(customary, "bar(a)")
	pv, ok := out.Curve("pv")
	iso, ok2 := out.Curve("isothermal")
	if !ok || !ok2 {
		return nil, fmt.Errorf("the model gave no p-V curve")
	}
	swept := math.Pi / 4 * c.bore * c.bore * 2 * c.crankRadius
	vc, vb := c.clearanceVolume, c.clearanceVolume+swept
	top := math.Min(c.p2, c.p1*math.Pow(vb/vc, c.n))
	cycle := calc.Series{Name: "indicator cycle", X: pv.X, Y: pv.Y}
	if top >= c.p2 {
		// Where each process is halfway, by pressure or by volume.
		pm := math.Sqrt(c.p1 * c.p2)
		reexpEnd := vc * math.Pow(c.p2/c.p1, 1/c.n)
		deliveryStart := vb * math.Pow(c.p1/c.p2, 1/c.n)
		cycle.Labels = []calc.PointLabel{
			{X: vc * math.Pow(c.p2/pm, 1/c.n), Y: pm, Text: "re-expansion"},
			{X: (reexpEnd + vb) / 2, Y: c.p1, Text: "suction", Below: true},
			{X: vb * math.Pow(c.p1/pm, 1/c.n), Y: pm, Text: "compression"},
			{X: (vc + deliveryStart) / 2, Y: c.p2, Text: "delivery"},
		}
	}
	return &calc.Chart{
		Title: "Pressure over cylinder volume",
		Desc: fmt.Sprintf("The indicator cycle of one cylinder: clearance gas re-expands from %s, air is drawn in at %s, compressed along p·V^%s and delivered at %s; the dashed line is isothermal compression from the same start, the ideal.",
			barA(top), barA(c.p1), units.Format(c.n, 3), barA(top)),
		X: calc.Axis{Label: "Cylinder volume", Dim: units.Volume, Unit: "cm3"},
		Panels: []calc.Panel{{
			Y:      calc.Axis{Label: "Cylinder pressure", Dim: units.Pressure, Unit: "bar(a)"},
			Series: []calc.Series{cycle, {Name: "isothermal compression", X: iso.X, Y: iso.Y, Style: calc.Dashed}},
		}},
	}, nil
}

func torqueChart(c cylinder, out *calc.Outcome) *calc.Chart {
	gas, _ := out.Curve("gas_torque")
	deg := gas.X // radians; the axis shows degrees
	p := calc.Panel{
		Y:      calc.Axis{Label: "Torque on the crankshaft", Dim: units.Torque, Unit: "N m"},
		Series: []calc.Series{{Name: "gas torque", X: deg, Y: gas.Y}},
		Marks:  []calc.Mark{{Value: out.ResultValue("mean_torque"), Label: "mean"}},
	}
	desc := "The load torque of the gas on the crankshaft over one revolution from top dead centre, with its mean"
	if inertia, ok := out.Curve("inertia_torque"); ok {
		total, _ := out.Curve("total_torque")
		p.Series = append(p.Series,
			calc.Series{Name: "inertia torque", X: deg, Y: inertia.Y, Style: calc.Dashed},
			calc.Series{Name: "total", X: deg, Y: total.Y, Style: calc.DashDot})
		desc += "; the dashed line is the torque that accelerates the reciprocating mass and the dash-dot line the sum"
	}
	return &calc.Chart{Title: "Crankshaft torque over one revolution", Desc: desc + ".",
		X: calc.Axis{Label: "Crank angle from top dead centre", Dim: units.Angle, Unit: "deg"}, Panels: []calc.Panel{p}}
}

// pressureSweep lists discharge pressures from the inlet pressure to top.
func pressureSweep(c cylinder, top float64) []float64 {
	out := make([]float64, sweepPoints+1)
	for i := range out {
		out[i] = c.p1 + (top-c.p1)*float64(i)/sweepPoints
	}
	return out
}

// pressureAxis is the x axis of the charts over discharge pressure: their
// pressures, the marks every panel carries (the design point and the
// relief valve's opening), the words for the description, and the note at
// the axis's end when the chart stops short of dead-head.
type pressureAxis struct {
	ps    []float64
	marks []calc.Mark
	span  string // "from the inlet pressure to ..."
	note  string
}

func newPressureAxis(c cylinder, out *calc.Outcome, customary bool) pressureAxis {
	gauge := func(p float64) string {
		unit := "bar"
		if customary {
			unit = units.CustomaryFor(unit)
		}
		s, _ := display.Value(p, units.Pressure, unit, c.ambient, 3)
		return s
	}
	top, relief, cut := pressureRange(c, out)
	a := pressureAxis{ps: pressureSweep(c, top), marks: []calc.Mark{{Value: c.p2, Vertical: true, Label: "design"}}}
	if relief > 0 && relief <= top {
		a.marks = append(a.marks, calc.Mark{Value: relief, Vertical: true, Label: "relief"})
	}
	a.span = "from the inlet pressure to the dead-head pressure " + gauge(top) + ", where delivery stops"
	if cut {
		a.span = fmt.Sprintf("from the inlet pressure to %s, twice the working pressure; delivery would stop at the dead-head pressure %s, beyond the chart",
			gauge(top), gauge(deadHead(c)))
		a.note = "dead-head " + gauge(deadHead(c)) + " →"
	}
	if relief > 0 && relief <= top {
		a.span += "; the second vertical line marks where the relief valve opens, " + gauge(relief)
	}
	return a
}

func deliveryChart(c cylinder, out *calc.Outcome, customary bool) *calc.Chart {
	swept := math.Pi / 4 * c.bore * c.bore * 2 * c.crankRadius
	z := float64(c.cylinders)
	revs := c.omega / (2 * math.Pi)
	axis := newPressureAxis(c, out, customary)
	fad := make([]float64, len(axis.ps))
	power := make([]float64, len(axis.ps))
	for i, p2 := range axis.ps {
		r := p2 / c.p1
		ve := math.Max(0, 1-c.clearanceRatio*(math.Pow(r, 1/c.n)-1))
		fad[i] = ve * z * swept * revs
		power[i] = z * polytropicWork(c.p1, ve*swept, r, c.n) * revs / c.etaMech
	}
	return &calc.Chart{
		Title: "Delivery and shaft power over discharge pressure",
		Desc: fmt.Sprintf("Free air delivery (top) and shaft power (bottom) as the discharge pressure rises %s; the first vertical line marks the design discharge pressure %s.",
			axis.span, display.Described(customary, "bar(a)")(c.p2)),
		X:        calc.Axis{Label: "Discharge pressure", Dim: units.Pressure, Unit: "bar"},
		EdgeNote: axis.note,
		Panels: []calc.Panel{
			{Y: calc.Axis{Label: "Free air delivery", Dim: units.VolumeFlow, Unit: "L/min"}, Series: []calc.Series{{Name: "free air delivery", X: axis.ps, Y: fad}}, Marks: axis.marks},
			{Y: calc.Axis{Label: "Shaft power", Dim: units.Power, Unit: "W"}, Series: []calc.Series{{Name: "shaft power", X: axis.ps, Y: power, Style: calc.Dashed}}, Marks: axis.marks},
		},
	}
}

func temperatureChart(c cylinder, in *calc.Inputs, out *calc.Outcome) *calc.Chart {
	axis := newPressureAxis(c, out, in.Customary())
	t := make([]float64, len(axis.ps))
	for i, p2 := range axis.ps {
		t[i] = c.t1 * math.Pow(p2/c.p1, (c.n-1)/c.n)
	}
	p := calc.Panel{
		Y:      calc.Axis{Label: "Discharge temperature", Dim: units.Temperature, Unit: "degC"},
		Series: []calc.Series{{Name: "discharge temperature", X: axis.ps, Y: t}},
		Marks:  axis.marks,
	}
	desc := "The temperature of the air at the end of compression as the discharge pressure rises " + axis.span
	for _, key := range []string{"head_material", "valve_material"} {
		name := in.NameOf(key)
		if name == "" {
			continue
		}
		if m, err := envOf(in).Materials.Lookup(name); err == nil {
			label := fmt.Sprintf("%s limit (%s)", key[:len(key)-len("_material")], m.Label)
			p.Marks = append(p.Marks, calc.Mark{Value: m.TemperatureLimit(), Label: label})
			desc += fmt.Sprintf("; a horizontal line marks the %s at %s", label, display.Described(in.Customary(), "degC")(m.TemperatureLimit()))
		}
	}
	return &calc.Chart{Title: "Discharge temperature over discharge pressure", Desc: desc + ".", EdgeNote: axis.note,
		X: calc.Axis{Label: "Discharge pressure", Dim: units.Pressure, Unit: "bar"}, Panels: []calc.Panel{p}}
}

// kinematicsChart draws the piston's motion; with a rod swing it marks the
// crank angle of the least clearance between the rod and the bottom of the
// cylinder wall.
func kinematicsChart(c cylinder, swing rodSwing, hasSwing, customary bool) *calc.Chart {
	g := sliderCrank{r: c.crankRadius, l: c.rod}
	const n = 360
	theta, x, v, a := make([]float64, n+1), make([]float64, n+1), make([]float64, n+1), make([]float64, n+1)
	for i := range theta {
		th := 2 * math.Pi * float64(i) / n
		theta[i] = th
		x[i] = g.position(th)
		v[i] = g.velocity(th) * c.omega
		a[i] = g.acceleration(th) * c.omega * c.omega
	}
	angle := calc.Axis{Label: "Crank angle from top dead centre", Dim: units.Angle, Unit: "deg"}
	desc := "The piston's travel from top dead centre, its velocity and its acceleration over one revolution at constant crank speed, from the exact slider-crank geometry."
	var marks []calc.Mark
	if hasSwing {
		clear, at, _ := swing.least()
		marks = []calc.Mark{{Value: at, Vertical: true, Label: "least rod clearance"}}
		desc += fmt.Sprintf(" The vertical line at %s° marks where the swinging rod passes closest to the bottom edge of the cylinder wall, %s away.",
			display.Number(at*180/math.Pi, ""), display.Described(customary, "mm")(clear))
	}
	return &calc.Chart{
		Title: "Piston position, velocity and acceleration",
		Desc:  desc,
		X:     angle,
		Panels: []calc.Panel{
			{Y: calc.Axis{Label: "Position", Dim: units.Length, Unit: "mm"}, Series: []calc.Series{{Name: "position", X: theta, Y: x}}, Marks: marks},
			{Y: calc.Axis{Label: "Velocity", Dim: units.Velocity, Unit: "m/s"}, Series: []calc.Series{{Name: "velocity", X: theta, Y: v, Style: calc.Dashed}}, Marks: marks},
			{Y: calc.Axis{Label: "Acceleration", Dim: units.Acceleration, Unit: "m/s2"}, Series: []calc.Series{{Name: "acceleration", X: theta, Y: a, Style: calc.DashDot}}, Marks: marks},
		},
	}
}
