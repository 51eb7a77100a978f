package calc

import (
	"fmt"
	"sort"
	"strings"

	"specgen/internal/units"
)

// Rule is one caution rule: it looks at the evaluated blocks of a site and
// raises cautions on some of them.
type Rule struct {
	ID      string
	Level   Level  // the highest level it raises
	Summary string // what it watches, for explain and the docs
	check   func(s *Set) []raised
}

// raised is a caution a rule puts on a block.
type raised struct {
	block *Evaluated
	note  CautionNote
}

// Thresholds of the rules, with their basis.
const (
	// hotMargin: a discharge within this of a part's temperature limit is a
	// WARNING (the figure; thermocouple and model error are of this order).
	hotMargin = 10.0 // K
	// hotAir: above this even oil made for air compressors chars in the
	// discharge line, where the deposits can ignite (from memory: DIN 51506
	// rates its VDL compressor oils for final compression temperatures up
	// to 220 °C).
	hotAir = 493.15 // K, 220 °C
	// dangerFactor: below this safety factor a part is a DANGER whatever the
	// site's minimum (common practice: no margin left for flaws or fatigue).
	dangerFactor = 1.5
	// Stored energy: above 1 kJ a NOTICE, above 10 kJ a WARNING. The basis is
	// the energy of an isentropic expansion to ambient; 1 kJ is about the
	// energy of a 1 kg mass dropped from 100 m (common practice for "enough to
	// hurt"; from memory, several pneumatic-test guides use thresholds of this order).
	storedEnergyNotice  = 1e3  // J
	storedEnergyWarning = 10e3 // J
	// fastRim: the rim speed long held as the limit for cast-iron flywheels,
	// whose casting flaws make a stress check alone unsafe (common practice;
	// from memory, machine-design handbooks give about 6000 ft/min, 30 m/s).
	fastRim = 30.0 // m/s
	// freezing: water in the air freezes below 0 °C.
	freezing = 273.15 // K
)

// rules is every caution rule, in the order they are applied.
var rules = []Rule{
	{ID: "no-delivery", Level: Danger, Summary: "a compressor stage whose discharge pressure is at or above its dead-head pressure delivers nothing (raised by the compressor model)"},
	{ID: "hot-air", Level: Caution, Summary: "discharge air above 220 °C, the limit of compressor oils (DIN 51506 VDL), whatever the parts are made of: charred oil in the discharge line, burns", check: hotAirRule},
	{ID: "hot-discharge", Level: Danger, Summary: "discharge temperature within 10 K of, or above, the service limit or heat deflection temperature of the head or valve material", check: hotDischarge},
	{ID: "low-safety-factor", Level: Danger, Summary: "a safety factor below the site's minimum (WARNING), or below 1.5 (DANGER)", check: lowSafetyFactor},
	{ID: "above-allowable", Level: Danger, Summary: "a pressure part whose own working pressure is above its allowable pressure (WARNING), or above its burst pressure over 1.5 (DANGER)", check: aboveAllowable},
	{ID: "no-relief", Level: Danger, Summary: "a compressor that can dead-head above the allowable pressure of a pressure part on its page or linked to it, with no relief valve set below that pressure", check: noRelief},
	{ID: "relief-unnamed", Level: Notice, Summary: "a compressor that delivers with no valve block naming it, or the receiver it fills, in protects: every compressor needs a relief valve", check: reliefUnnamed},
	{ID: "relief-below-target", Level: Caution, Summary: "a relief valve that opens below the working pressure of a part it protects (a tank's target, a compressor's discharge pressure, a tube's pressure): the part never gets there and the valve blows off continuously", check: reliefBelowTarget},
	{ID: "fill-above-rating", Level: Caution, Summary: "a tank filled above the discharge pressure its supply's block is computed at: the stage's forces, temperature and power run above what its block shows", check: fillAboveRating},
	{ID: "stored-energy", Level: Warning, Summary: "energy stored in a receiver above 1 kJ (NOTICE) or 10 kJ (WARNING)", check: storedEnergy},
	{ID: "printed-pressure-part", Level: Warning, Summary: "a pressure part made of a 3D-printing plastic, including a printed head or cylinder that bolts thread into (nut_material)", check: printedPart},
	{ID: "fast-flywheel", Level: Warning, Summary: "a flywheel whose rim runs above 30 m/s with no strength check (only a density given) or in a brittle material such as cast iron", check: fastFlywheel},
	{ID: "cold-exhaust", Level: Caution, Summary: "an air motor whose air leaves the cylinder below 0 °C, where moisture freezes", check: coldExhaust},
	{ID: "vacuum-vessel", Level: Caution, Summary: "a vessel under vacuum: thin walls and glass can implode", check: vacuumVessel},
}

// RuleIDs lists the rule ids, sorted.
func RuleIDs() []string {
	ids := make([]string, len(rules))
	for i, r := range rules {
		ids[i] = r.ID
	}
	sort.Strings(ids)
	return ids
}

func knownRule(id string) bool {
	for _, r := range rules {
		if r.ID == id {
			return true
		}
	}
	return false
}

// applyRules raises every rule's cautions on the set's blocks, marks the
// ones a block acknowledges, and sorts each block's cautions by level.
func applyRules(s *Set) {
	for _, r := range rules {
		if r.check == nil {
			continue
		}
		for _, c := range r.check(s) {
			c.note.Rule = r.ID
			c.block.Cautions = append(c.block.Cautions, c.note)
		}
	}
	for _, e := range s.Blocks {
		for i := range e.Cautions {
			e.Cautions[i].Acknowledged = e.Block.Acknowledge[e.Cautions[i].Rule]
		}
		sort.SliceStable(e.Cautions, func(i, j int) bool { return e.Cautions[i].Level > e.Cautions[j].Level })
	}
}

// material returns the material a Name input of e names.
func (e *Evaluated) material(key string) (Material, bool) {
	if e.in == nil {
		return Material{}, false
	}
	name := e.in.NameOf(key)
	if name == "" {
		return Material{}, false
	}
	m, err := e.in.Env().Materials.Lookup(name)
	return m, err == nil
}

// show formats a value for a caution in the units the block's writer uses
// (see unitFor), else in unit.
func (e *Evaluated) show(si float64, dim units.Dimension, unit string) string {
	s, err := FormatValue(si, dim, e.unitFor(dim, unit), e.Ambient, e.sigFigs)
	if err != nil {
		return units.Format(si, e.sigFigs)
	}
	return s
}

// unitFor is the unit of dimension dim that the block's writer chose: of a
// [show] output, else of an input written in the block, else fallback (its
// customary counterpart in a customary block, which may leave a temperature
// at its default). A block written in psi and degF gets its cautions in psi
// and degF.
func (e *Evaluated) unitFor(dim units.Dimension, fallback string) string {
	for _, o := range e.Block.Show.Outputs {
		if spec, ok := e.Block.Kind.result(o.Name); ok && o.Unit != "" && spec.Dim == dim {
			return o.Unit
		}
	}
	for _, in := range e.Inputs {
		if in.Default || in.From != "" || in.Dim != dim {
			continue
		}
		if q, err := units.Parse(in.Text, dim); err == nil && q.Unit.Symbol != "" {
			return q.Unit.Symbol
		}
	}
	if e.customary {
		return units.CustomaryFor(fallback)
	}
	return fallback
}

func hotDischarge(s *Set) []raised {
	var out []raised
	for _, e := range s.Blocks {
		t2, ok := e.Result("discharge_temperature")
		if !ok {
			continue
		}
		for _, key := range []string{"head_material", "valve_material"} {
			m, ok := e.material(key)
			if !ok {
				continue
			}
			limit := m.TemperatureLimit()
			what := "service temperature limit"
			if limit == m.HeatDeflection {
				what = "heat deflection temperature"
			}
			msg := fmt.Sprintf("discharge temperature %s against the %s %s of %s %s (%s)",
				e.show(t2.Value, units.Temperature, "degC"), strings.TrimSuffix(key, "_material"), what, m.Label,
				e.show(limit, units.Temperature, "degC"), "typical value: verify for your material")
			switch {
			case t2.Value > limit:
				out = append(out, raised{e, CautionNote{Level: Danger, Message: "Above the limit: " + msg + ". The part will soften or creep under pressure; use a material rated above the discharge temperature, cool the stage, or lower its pressure ratio."}})
			case t2.Value > limit-hotMargin:
				margin := "10 K"
				if e.unitFor(units.Temperature, "degC") == "degF" {
					margin = "18 °F (10 K)" // a difference: 1 K is 1.8 °F
				}
				out = append(out, raised{e, CautionNote{Level: Warning, Message: "Within " + margin + " of the limit: " + msg + ". Allow for hot spots at the discharge valve, which run hotter than the mean."}})
			}
		}
	}
	return out
}

func hotAirRule(s *Set) []raised {
	var out []raised
	// A block whose head or valve material is already too hot says more.
	named := map[*Evaluated]bool{}
	for _, r := range hotDischarge(s) {
		named[r.block] = true
	}
	for _, e := range s.Blocks {
		t2, ok := e.Result("discharge_temperature")
		if !ok || t2.Value <= hotAir || named[e] {
			continue
		}
		out = append(out, raised{e, CautionNote{Level: Caution, Message: fmt.Sprintf(
			"The air leaves the cylinder at %s, above the %s that compressor oils are rated for (DIN 51506 VDL). Oil chars in the discharge valve and line, and the deposits can ignite; the head and pipe burn at a touch, and hoses and plastic fittings downstream soften: "+
				"split the pressure ratio over stages with intercooling or lower it, guard the hot parts, and run metal pipe rated for the temperature to an aftercooler.",
			e.show(t2.Value, units.Temperature, "degC"), e.show(hotAir, units.Temperature, "degC"))}})
	}
	return out
}

func lowSafetyFactor(s *Set) []raised {
	var out []raised
	for _, e := range s.Blocks {
		for _, spec := range e.Block.Kind.Results {
			if !spec.Factor {
				continue
			}
			r, ok := e.Result(spec.Name)
			if !ok {
				continue
			}
			m, hasMaterial := e.material(spec.FactorMaterial)
			min := e.in.Env().Safety.MinimumFactorMetal
			basis := "metal"
			if hasMaterial {
				min = e.in.Env().Safety.MinimumFor(m)
				basis = m.Label
			}
			factor := units.Format(r.Value, e.sigFigs)
			switch {
			case r.Value < 1:
				out = append(out, raised{e, CautionNote{Level: Danger, Message: fmt.Sprintf(
					"%s is %s, below 1: the part is expected to fail at its working load. Redesign it before it is pressurised.",
					spec.Name, factor)}})
			case r.Value < dangerFactor:
				out = append(out, raised{e, CautionNote{Level: Danger, Message: fmt.Sprintf(
					"%s is %s, below %s: the part is close to failing at its working load. Redesign it before it is pressurised.",
					spec.Name, factor, units.Format(dangerFactor, 2))}})
			case r.Value < min:
				out = append(out, raised{e, CautionNote{Level: Warning, Message: fmt.Sprintf(
					"%s is %s, below the site's minimum of %s for %s. Thicken or strengthen the part, or lower the pressure.",
					spec.Name, factor, units.Format(min, 2), basis)}})
			}
		}
	}
	return out
}

func aboveAllowable(s *Set) []raised {
	var out []raised
	for _, e := range s.Blocks {
		allow, ok := e.Result("allowable_pressure")
		burst, hasBurst := e.Result("burst_pressure")
		if !ok || e.in == nil || !e.in.Has("pressure") {
			continue
		}
		p := e.in.Value("pressure")
		if p <= allow.Value {
			continue
		}
		level, why := Warning, "above its allowable pressure"
		// Both pressures are absolute; the margin is on gauge pressure.
		if hasBurst && p-e.Ambient > (burst.Value-e.Ambient)/dangerFactor {
			level, why = Danger, "above its burst pressure over "+units.Format(dangerFactor, 2)
		}
		out = append(out, raised{e, CautionNote{Level: level, Message: fmt.Sprintf(
			"The working pressure %s is %s (allowable %s, the burst pressure over the site's minimum factor). Lower the pressure or strengthen the part.",
			e.show(p, units.Pressure, "bar"), why, e.show(allow.Value, units.Pressure, "bar"))}})
	}
	return out
}

// pressureParts are the blocks with an allowable pressure.
func pressureParts(s *Set) []*Evaluated {
	var parts []*Evaluated
	for _, e := range s.Blocks {
		if _, ok := e.Result("allowable_pressure"); ok {
			parts = append(parts, e)
		}
	}
	return parts
}

// links reports whether e names id in any of its Link or LinkList inputs.
func (e *Evaluated) links(id string) bool {
	for _, in := range e.Inputs {
		if contains(in.Links, id) {
			return true
		}
	}
	return false
}

func noRelief(s *Set) []raised {
	var out []raised
	parts := pressureParts(s)
	var valves []*Evaluated
	for _, e := range s.Blocks {
		if _, ok := e.Result("cracking_pressure"); ok && e.Block.Kind.Name == "valve" {
			valves = append(valves, e)
		}
	}
	for _, c := range s.Blocks {
		dead, ok := c.Result("max_pressure")
		if !ok || c.Block.Kind.Name != "compressor" {
			continue
		}
		for _, p := range parts {
			exposed := p.Block.File == c.Block.File || p.links(c.Block.ID)
			for _, v := range valves {
				if v.links(c.Block.ID) && v.links(p.Block.ID) {
					exposed = true
				}
			}
			allow, _ := p.Result("allowable_pressure")
			if !exposed || dead.Value <= allow.Value {
				continue
			}
			// The relief must open below the part's allowable pressure.
			relieved := false
			var tooHigh []string
			for _, v := range valves {
				if !v.links(c.Block.ID) && !v.links(p.Block.ID) {
					continue
				}
				set, _ := v.Result("cracking_pressure")
				// cracking_pressure is a difference across the seat; the
				// valve vents to ambient, so it opens at ambient + that.
				if set.Value+v.Ambient <= allow.Value {
					relieved = true
					break
				}
				// Shown as the part's pressures are (gauge or absolute, its
				// unit), so the three numbers compare at a glance.
				tooHigh = append(tooHigh, fmt.Sprintf("%s opens at %s", v.Block.ID, p.show(set.Value+v.Ambient, units.Pressure, "bar")))
			}
			if relieved {
				continue
			}
			msg := fmt.Sprintf("%s can dead-head at %s, above the allowable pressure %s of %s. Fit a relief valve set below %s: a valve block that protects %s.",
				c.Block.ID, c.show(dead.Value, units.Pressure, "bar"), p.show(allow.Value, units.Pressure, "bar"), p.Block.ID,
				p.show(allow.Value, units.Pressure, "bar"), c.Block.ID)
			if len(tooHigh) > 0 {
				msg += " The named relief is set too high (" + strings.Join(tooHigh, "; ") + ")."
			}
			out = append(out, raised{c, CautionNote{Level: Danger, Message: msg}})
		}
	}
	return out
}

func reliefUnnamed(s *Set) []raised {
	var out []raised
	// A compressor with a no-relief DANGER already says so.
	warned := map[*Evaluated]bool{}
	for _, r := range noRelief(s) {
		warned[r.block] = true
	}
	for _, c := range s.Blocks {
		if warned[c] {
			continue
		}
		dead, ok := c.Result("max_pressure")
		ve, _ := c.Result("volumetric_efficiency")
		if !ok || c.Block.Kind.Name != "compressor" || ve.Value <= 0 {
			continue
		}
		// A relief on the receiver the compressor fills (the usual place)
		// relieves the compressor too, as the no-relief rule counts it.
		named := false
		for _, v := range s.Blocks {
			if v.Block.Kind.Name != "valve" {
				continue
			}
			named = named || v.links(c.Block.ID)
			for _, p := range s.Blocks {
				named = named || (p != v && v.links(p.Block.ID) && p.links(c.Block.ID))
			}
		}
		if named {
			continue
		}
		out = append(out, raised{c, CautionNote{Level: Notice, Message: fmt.Sprintf(
			"No relief valve is named for %s, which can dead-head at %s with its outlet blocked. Every compressor needs a relief valve set below the rating of the weakest part it can pressurise (common practice); describe it in a valve block with protects = [\"%s\"].",
			c.Block.ID, c.show(dead.Value, units.Pressure, "bar"), c.Block.ID)}})
	}
	return out
}

// reliefBelowTarget raises a CAUTION on a relief valve that opens below the
// working (target) pressure of a tank it protects: not a hazard, since the
// valve holds the pressure down, but the receiver never reaches its target,
// the compressor runs on with the valve blowing off, and the tank's
// fill_time is for a pressure it cannot reach.
// workingPressureKey names, per kind, the input that is a part's working
// pressure: the pressure a relief valve protecting it must stay shut at.
var workingPressureKey = map[string]struct{ key, name string }{
	"tank":       {"pressure", "target pressure"},
	"tube":       {"pressure", "working pressure"},
	"compressor": {"discharge_pressure", "discharge pressure"},
}

func reliefBelowTarget(s *Set) []raised {
	var out []raised
	for _, v := range s.Blocks {
		set, ok := v.Result("cracking_pressure")
		if !ok || v.Block.Kind.Name != "valve" || v.in == nil {
			continue
		}
		opens := set.Value + v.Ambient // absolute: the valve vents to ambient
		for _, l := range v.in.LinksOf("protects") {
			p, ok := s.Lookup(l.ID)
			if !ok || p.in == nil {
				continue
			}
			working, ok := workingPressureKey[p.Block.Kind.Name]
			if !ok || !p.in.Has(working.key) {
				continue
			}
			target := p.in.Value(working.key)
			if opens >= target {
				continue
			}
			out = append(out, raised{v, CautionNote{Level: Caution, Message: fmt.Sprintf(
				"%s opens at %s, below the %s %s of %s, which it protects: %s never reaches it, and the valve lifts and blows off for as long as the compressor runs. Set the valve above %s, commonly about 10%% above the working pressure (common practice), and below the allowable pressure of the parts it protects; or lower the %s.",
				v.Block.ID, p.show(opens, units.Pressure, "bar"), working.name, p.show(target, units.Pressure, "bar"), p.Block.ID,
				p.Block.ID, p.show(target, units.Pressure, "bar"), working.name)}})
		}
	}
	return out
}

func fillAboveRating(s *Set) []raised {
	var out []raised
	for _, t := range s.Blocks {
		if t.Block.Kind.Name != "tank" || t.in == nil || !t.in.Has("pressure") {
			continue
		}
		l := t.in.LinkOf("supply")
		if l == nil {
			continue
		}
		c, ok := s.Lookup(l.ID)
		if !ok || c.in == nil || !c.in.Has("discharge_pressure") {
			continue
		}
		target, rated := t.in.Value("pressure"), c.in.Value("discharge_pressure")
		if target <= rated {
			continue
		}
		out = append(out, raised{t, CautionNote{Level: Caution, Message: fmt.Sprintf(
			"%s is filled to %s, above the discharge pressure %s that its supply %s is computed at. Near the end of the fill the stage runs beyond its block: its piston force, head load, discharge temperature and power are higher than %s shows. "+
				"Compute the supply at the receiver's cut-out pressure, or fill to the pressure it is computed at: pressure = \"=%s.discharge_pressure\".",
			t.Block.ID, t.show(target, units.Pressure, "bar"), t.show(rated, units.Pressure, "bar"), c.Block.ID, c.Block.ID, c.Block.ID)}})
	}
	return out
}

func storedEnergy(s *Set) []raised {
	var out []raised
	for _, e := range s.Blocks {
		r, ok := e.Result("stored_energy")
		if !ok || r.Value <= storedEnergyNotice {
			continue
		}
		level := Notice
		if r.Value > storedEnergyWarning {
			level = Warning
		}
		out = append(out, raised{e, CautionNote{Level: level, Message: fmt.Sprintf(
			"The receiver stores %s (isentropic expansion to ambient). A rupture releases it at once: keep the receiver guarded, drained and inspected, and never modify, weld or drill it.",
			e.show(r.Value, units.Energy, "kJ"))}})
	}
	return out
}

func printedPart(s *Set) []raised {
	var out []raised
	for _, e := range s.Blocks {
		isPart := false
		if _, ok := e.Result("allowable_pressure"); ok {
			isPart = true
		}
		// nut_material is the part a head's bolts thread into: printed, its
		// threads carry the whole head load.
		for _, key := range []string{"material", "head_material", "valve_material", "nut_material"} {
			m, ok := e.material(key)
			if !ok || !m.Printable || (key == "material" && !isPart && e.Block.Kind.Name != "valve") {
				continue
			}
			what := strings.ReplaceAll(key, "_", " ")
			if key == "nut_material" {
				what = "nut or tapped part the bolts thread into"
			}
			out = append(out, raised{e, CautionNote{Level: Warning, Message: fmt.Sprintf(
				"The %s is %s, a 3D-printing plastic. Printed parts leak and split along their layers, and creep under load and heat. Test it hydrostatically with water, never with air, behind a shield; keep its volume small.",
				what, m.Label)}})
		}
	}
	return out
}

func fastFlywheel(s *Set) []raised {
	var out []raised
	for _, e := range s.Blocks {
		v, ok := e.Result("rim_speed")
		if !ok || v.Value <= fastRim {
			continue
		}
		why := "only a density is given, so no strength check is made; name a material"
		if m, named := e.material("material"); named {
			if !m.Brittle {
				continue
			}
			why = "its material (" + m.Label + ") is brittle and can burst from casting flaws well below its computed strength"
		}
		out = append(out, raised{e, CautionNote{Level: Warning, Message: fmt.Sprintf(
			"The flywheel's rim runs at %s, above the %s long held as the limit for cast-iron flywheels, and %s. A bursting flywheel throws fragments like shrapnel: guard it all round, or make it smaller and slower at the rim.",
			e.show(v.Value, units.Velocity, "m/s"), e.show(fastRim, units.Velocity, "m/s"), why)}})
	}
	return out
}

func coldExhaust(s *Set) []raised {
	var out []raised
	for _, e := range s.Blocks {
		t, ok := e.Result("expansion_temperature")
		if !ok || t.Value >= freezing {
			continue
		}
		out = append(out, raised{e, CautionNote{Level: Caution, Message: fmt.Sprintf(
			"The air leaves the cylinder at about %s (polytropic expansion; warm cylinder walls make it less cold). Moisture in it freezes in the exhaust port and silencer, where ice can stall the motor, and the metal there gets cold enough to hurt bare skin. Dry the supply air or cut off later in the stroke.",
			e.show(t.Value, units.Temperature, "degC"))}})
	}
	return out
}

func vacuumVessel(s *Set) []raised {
	var out []raised
	for _, e := range s.Blocks {
		if e.Block.Kind.Name != "vacuum" {
			continue
		}
		out = append(out, raised{e, CautionNote{Level: Caution, Message: "A vessel under vacuum carries the full atmosphere on its walls. Thin sheet, plastic boxes and glass can implode and throw fragments: use vessels rated for vacuum and keep glass shielded."}})
	}
	return out
}

// StandardCaution is shown on every page with a pressure calculation.
const StandardCaution = "Compressed air stores energy that can burst vessels, throw parts and inject air through skin. " +
	"The figures on this page come from simplified models and are not a certification. " +
	"Local codes, pressure-equipment rules and licensed practice govern the design, testing and use of pressure equipment; they take precedence over anything stated here."

// StandardVacuumCaution replaces StandardCaution on a page whose pressure
// calculations are all vacuum ones, which hold no compressed air.
const StandardVacuumCaution = "A vessel under vacuum carries the full weight of the atmosphere on its walls, about 10 tonnes on every square metre. " +
	"Thin sheet, plastic boxes and glass can implode and throw fragments. " +
	"The figures on this page come from simplified models and are not a certification. " +
	"Local codes, pressure-equipment rules and licensed practice govern the design, testing and use of pressure equipment; they take precedence over anything stated here."

// PressureKinds are the kinds whose pages carry the standard caution.
var PressureKinds = []string{"bolts", "compressor", "motor", "multistage", "tank", "tube", "vacuum", "valve"}
