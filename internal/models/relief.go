package models

import (
	"fmt"
	"math"
	"strings"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// A relief valve's capacity: the pressure it opens at as a gauge pressure,
// the pressure its capacity is rated at, how far a plain spring valve
// lifts there, and the mass flow of air it passes, by the ideal-gas nozzle
// relations; and what the compressors it protects deliver at that
// pressure, which the relief-too-small rule compares with it.

// Accumulation: the rise above the set pressure at which a relief valve's
// capacity is rated, the greater of a tenth of the set gauge pressure and
// 20 kPa (3 psi in a block written in US units) (ASME VIII-1 UG-125, from
// memory).
const (
	accumulationFraction = 0.10
	accumulationMetric   = 20e3         // Pa
	accumulationUS       = 3 * 6894.757 // Pa: 3 psi (NIST SP 811 App. B: 1 psi = 6894.757 Pa)
)

// criticalRatio is the back pressure over stagnation pressure below which
// air flows through the valve at the speed of sound, (2/(γ+1))^(γ/(γ−1)).
var criticalRatio = math.Pow(2/(airGamma+1), airGamma/(airGamma-1))

// relief is a relief valve's capacity at its relieving pressure.
type relief struct {
	set, p0, back float64 // set and relieving pressure, back pressure; absolute
	accumulation  float64 // p0 − set
	seat, curtain float64 // seat area, curtain area at the lift used
	lift          float64 // the lift used
	springLift    float64 // the lift the spring allows at p0
	cd, t0        float64 // discharge coefficient, air temperature at the valve
	t0From        string  // where t0 comes from
	mass          float64 // kg/s
}

// area is the flow area, the lesser of the seat and the curtain.
func (r relief) area() float64 { return math.Min(r.seat, r.curtain) }

// critical reports whether the flow through the valve is choked.
func (r relief) critical() bool { return r.back <= criticalRatio*r.p0 }

// nozzleMassFlow is the ideal-gas mass flow of air through a nozzle of
// area a with discharge coefficient cd from stagnation pressure p0 and
// temperature t0 into back pressure pb: choked at or below the critical
// ratio, else the subsonic expression.
func nozzleMassFlow(cd, a, p0, t0, pb float64) float64 {
	g, rt := airGamma, airGasConstant*t0
	if pb <= criticalRatio*p0 {
		return cd * a * p0 * math.Sqrt(g/rt) * math.Pow(2/(g+1), (g+1)/(2*(g-1)))
	}
	x := pb / p0
	return cd * a * p0 * math.Sqrt(2*g/((g-1)*rt)*(math.Pow(x, 2/g)-math.Pow(x, (g+1)/g)))
}

// readRelief works out the capacity of the relief valve whose cracking
// pressure is crack.
func readRelief(in *calc.Inputs, crack float64) relief {
	d, x := in.Value("seat_diameter"), in.Value("preload")
	r := relief{set: in.Ambient + crack, back: in.Ambient, cd: in.Value("discharge_coefficient"), seat: math.Pi / 4 * d * d}
	least := accumulationMetric
	if in.Customary() {
		least = accumulationUS
	}
	r.accumulation = math.Max(accumulationFraction*crack, least)
	r.p0 = r.set + r.accumulation
	// The spring compresses by the accumulation's share of its force at set:
	// (Δp_acc/Δp_set)·k·x more force takes (Δp_acc/Δp_set)·x more travel.
	r.springLift = r.accumulation / crack * x
	r.lift = r.springLift
	if in.Has("lift") {
		r.lift = math.Min(in.Value("lift"), r.springLift)
	}
	r.curtain = math.Pi * d * r.lift
	r.t0, r.t0From = ordinaryTemperature, "it protects no compressor"
	if in.Has("relieving_temperature") {
		r.t0, r.t0From = in.Value("relieving_temperature"), "given"
	} else if t, id, ok := hottestDischarge(in.LinksOf("protects")); ok {
		r.t0, r.t0From = t, "the discharge temperature of "+id
	}
	r.mass = nozzleMassFlow(r.cd, r.area(), r.p0, r.t0, r.back)
	return r
}

// hottestDischarge is the highest discharge temperature of the delivering
// blocks among linked, and the block's id.
func hottestDischarge(linked []*calc.Linked) (t float64, id string, ok bool) {
	for _, l := range linked {
		if l.Roles&calc.Delivers == 0 {
			continue
		}
		for name, v := range l.Results {
			if (name == "discharge_temperature" || strings.HasPrefix(name, "discharge_temperature_")) && (!ok || v > t) {
				t, id, ok = v, l.ID, true
			}
		}
	}
	return t, id, ok
}

// inletOf is the inlet pressure and temperature free air is counted at:
// those of the first compressor among linked, else ambient and 20 °C.
func inletOf(linked []*calc.Linked, ambient float64) (p, t float64) {
	for _, l := range linked {
		if l.Roles&calc.Delivers != 0 {
			return supplyInlet(l)
		}
	}
	return ambient, ordinaryTemperature
}

// supplyInlet is a compressor's inlet pressure and temperature.
func supplyInlet(l *calc.Linked) (p, t float64) {
	p, t = l.Ambient, ordinaryTemperature
	if v, ok := l.Inputs["inlet_pressure"]; ok {
		p = v
	}
	if v, ok := l.Inputs["inlet_temperature"]; ok {
		t = v
	}
	return p, t
}

// deliveredMass is the mass flow a compressor delivers against pressure p
// (absolute): its free air delivery at p, FAD = V̇d·(1 + c − c·(p/p1)^(1/n)),
// none at or above its dead-head pressure, at its inlet density.
func deliveredMass(l *calc.Linked, p float64) (float64, error) {
	s, err := readSupply(l)
	if err != nil {
		return 0, err
	}
	fad := s.rate
	if p > s.p1 {
		fad = s.rate * math.Max(0, 1+s.c-s.c*math.Pow(p/s.p1, 1/s.n))
	}
	p1, t1 := supplyInlet(l)
	return fad * p1 / (airGasConstant * t1), nil
}

// reliefResults are a relief valve's set_pressure, relieving_pressure,
// flow_area and relieving_capacity.
func reliefResults(in *calc.Inputs, crack float64) []calc.Result {
	r := readRelief(in, crack)
	cust := in.Customary()
	mm, mm2, bara := display.TraceIn(cust, "mm"), display.TraceIn(cust, "mm2"), display.TraceIn(cust, "bar(a)")
	gauge := func(p float64) string { return display.Gauge(p, cust) }
	accText := "max(0.1 · p_set, 20 kPa)"
	if cust {
		accText = "max(0.1 · p_set, 3 psi)"
	}
	liftText := fmt.Sprintf("the spring's %s", mm(r.springLift))
	if in.Has("lift") {
		liftText = fmt.Sprintf("min(stop %s, spring %s)", mm(in.Value("lift")), mm(r.springLift))
	}
	d := in.Value("seat_diameter")
	p1, t1 := inletOf(in.LinksOf("protects"), in.Ambient)
	free := r.mass * airGasConstant * t1 / p1
	flow := "critical flow, p_b ≤ 0.5283 · p0: ṁ = Cd · A · p0 · sqrt(γ/(R·T0)) · (2/(γ+1))^((γ+1)/(2(γ−1)))"
	sub := fmt.Sprintf("= %s · %s · %s · sqrt(1.4/(287.05 J/(kg K) · %s)) · 0.5787",
		display.Number(r.cd, ""), mm2(r.area()), bara(r.p0), display.Number(r.t0, "K"))
	if !r.critical() {
		flow = "subsonic flow, p_b > 0.5283 · p0: ṁ = Cd · A · p0 · sqrt(2γ/((γ−1)·R·T0) · (x^(2/γ) − x^((γ+1)/γ))), x = p_b/p0"
		sub = fmt.Sprintf("= %s · %s · %s · sqrt(2 · 1.4/(0.4 · 287.05 J/(kg K) · %s) · (x^(2/1.4) − x^(2.4/1.4))), x = %s / %s = %s",
			display.Number(r.cd, ""), mm2(r.area()), bara(r.p0), display.Number(r.t0, "K"), bara(r.back), bara(r.p0), display.Number(r.back/r.p0, ""))
	}
	return []calc.Result{
		{Name: "set_pressure", Value: r.set, Dim: units.Pressure, Trace: calc.Trace{
			Formula:     "p_set = p_amb + Δp (the valve vents to atmosphere: its cracking pressure as a gauge pressure)",
			Substituted: fmt.Sprintf("= %s + %s", bara(in.Ambient), display.TraceIn(cust, "bar")(crack))}},
		{Name: "relieving_pressure", Value: r.p0, Dim: units.Pressure, Trace: calc.Trace{
			Formula:     "p0 = p_set + " + accText + " (accumulation for air, ASME VIII-1 UG-125, from memory)",
			Substituted: fmt.Sprintf("= %s + %s", gauge(r.set-in.Ambient), display.TraceIn(cust, "bar")(r.accumulation))}},
		{Name: "flow_area", Value: r.area(), Dim: units.Area, Trace: calc.Trace{
			Formula: "A = min(π/4 · d², π · d · h), h = min(lift, (p0 − p_set)/(p_set − p_amb) · x): a plain spring valve lifts only as far as the accumulation compresses its spring",
			Substituted: fmt.Sprintf("= min(π/4 · (%s)², π · %s · %s) = min(%s, %s); h = %s, x = %s",
				mm(d), mm(d), mm(r.lift), mm2(r.seat), mm2(r.curtain), liftText, mm(in.Value("preload")))}},
		{Name: "relieving_capacity", Value: r.mass, Dim: units.MassFlow, Trace: calc.Trace{
			Formula: flow + ", γ = 1.4, R = 287.05 J/(kg K)",
			Substituted: fmt.Sprintf("%s; T0 = %s (%s); as free air at %s and %s: %s",
				sub, display.TraceIn(cust, "degC")(r.t0), r.t0From, bara(p1), display.TraceIn(cust, "degC")(t1), display.TraceIn(cust, "L/min")(free))}},
	}
}
