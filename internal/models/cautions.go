package models

import (
	"fmt"
	"slices"
	"strings"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/units"
)

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
	// bucklingFactor is the factor on a wall's elastic collapse pressure,
	// checked against the site's minimum for buckling.
	bucklingFactor = "external_safety_factor"
	// rodNear: a rod that passes the bottom of the cylinder wall closer than
	// this is a WARNING: bearing play, a bent rod and the tolerances of the
	// bore and the crank take up fractions of a millimetre (common practice).
	rodNear = 1e-3 // m
)

// rules is every caution rule, in the order they are applied.
var rules = []calc.Rule{
	{ID: "no-delivery", Level: calc.Danger, Summary: "a compressor stage whose discharge pressure is at or above its dead-head pressure delivers nothing (raised by the compressor model)"},
	{ID: "over-expansion", Level: calc.Notice, Summary: "an air motor whose air expands below ambient before the exhaust opens, so the end of each stroke takes work back (raised by the motor model)"},
	{ID: "hot-air", Level: calc.Caution, Summary: "discharge air above 220 °C, the limit of compressor oils (DIN 51506 VDL), whatever the parts are made of, from a compressor stage or a vacuum pump at its target: charred oil in the discharge line, burns", Check: hotAirRule},
	{ID: "hot-discharge", Level: calc.Danger, Summary: "discharge temperature within 10 K of, or above, the service limit or heat deflection temperature of the head or valve material", Check: hotDischarge, Supersedes: []string{"hot-air"}},
	{ID: "low-safety-factor", Level: calc.Danger, Summary: "a safety factor below the site's minimum for its material, or for buckling (WARNING), or below 1.5 (DANGER)", Check: lowSafetyFactor},
	{ID: "above-allowable", Level: calc.Danger, Summary: "a pressure part whose own working pressure is above its allowable pressure or, when lower, its code allowable pressure (WARNING), or above its burst pressure over 1.5 (DANGER)", Check: aboveAllowable},
	{ID: "no-relief", Level: calc.Danger, Summary: "a compressor that can dead-head above the allowable pressure (or the lower code allowable pressure) of a pressure part on its page or linked to it, with no relief valve set below that pressure", Check: noRelief, Supersedes: []string{"relief-unnamed"}},
	{ID: "relief-unnamed", Level: calc.Notice, Summary: "a compressor that delivers with no valve block naming it, or the receiver it fills, in protects: every compressor needs a relief valve", Check: reliefUnnamed},
	{ID: "relief-too-small", Level: calc.Danger, Summary: "a relief valve that passes less air at its relieving pressure than the compressors it protects (directly or through the receiver they fill) deliver there", Check: reliefTooSmall},
	{ID: "relief-below-target", Level: calc.Caution, Summary: "a relief valve that opens below the working pressure of a part it protects (a tank's target, a compressor's discharge pressure, a tube's pressure): the part never gets there and the valve blows off continuously", Check: reliefBelowTarget},
	{ID: "fill-above-rating", Level: calc.Caution, Summary: "a tank filled above the discharge pressure its supply's block is computed at: the stage's forces, temperature and power run above what its block shows", Check: fillAboveRating},
	{ID: "stored-energy", Level: calc.Warning, Summary: "energy stored in a receiver above 1 kJ (NOTICE) or 10 kJ (WARNING)", Check: storedEnergy},
	{ID: "printed-pressure-part", Level: calc.Warning, Summary: "a pressure part made of a 3D-printing plastic, including a printed head or cylinder that bolts thread into (nut_material)", Check: printedPart},
	{ID: "fast-flywheel", Level: calc.Warning, Summary: "a flywheel whose rim runs above 30 m/s with no strength check (only a density given) or in a brittle material such as cast iron", Check: fastFlywheel},
	{ID: "cold-exhaust", Level: calc.Caution, Summary: "an air motor whose exhaust air (mass-averaged, after the blowdown) leaves below 0 °C, where moisture freezes; not when the expansion ends below ambient, which over-expansion covers", Check: coldExhaust},
	{ID: "dead-centre", Level: calc.Caution, Summary: "an air motor that can stop where no inlet is open with leverage on the crank (a single cylinder at top dead centre or after cut-off): it will not start on air, and starts suddenly when moved", Check: deadCentre},
	{ID: "rod-strikes-liner", Level: calc.Danger, Summary: "a connecting rod that touches the bottom edge of the cylinder wall as it swings (DANGER), or passes it closer than 1 mm (WARNING)", Check: rodStrikesLiner},
	{ID: "vacuum-vessel", Level: calc.Caution, Summary: "a vessel under vacuum: thin walls and glass can implode; on a vacuum pump, naming the wall and lid blocks on its page that check them, or saying none does; on a glass or acrylic wall or lid, the shield it needs", Check: vacuumVessel},
	{ID: "motor-overload", Level: calc.Warning, Summary: "a drive whose load needs more power than the motor passes through the belt at its rating times its service factor (raised by the drive model)"},
	{ID: "start-stall", Level: calc.Danger, Summary: "a drive whose motor starting torque at the crank is under 1.2 times (WARNING) or under (DANGER) the load's torque against the highest pressure it can start against (raised by the drive model)"},
	{ID: "start-unchecked", Level: calc.Notice, Summary: "a drive without the motor's starting torque, or a load with no torque at start: the start is not checked (raised by the drive model)"},
	{ID: "start-relief-unnamed", Level: calc.Notice, Summary: "a drive whose start is checked against its load's discharge pressure while a relief valve on the load, its stages or its receiver opens higher, and no unloader is declared", Check: unnamedRelief},
	{ID: "fast-belt", Level: calc.Warning, Summary: "a belt faster than 30 m/s, the rating of classical V-belt sections (common practice; raised by the drive model)"},
	{ID: "off-design-stage", Level: calc.Notice, Summary: "a compressor block listed in a machine whose own inlet or discharge pressure lies more than 2 % (absolute) from the pressure the machine runs it at: its own results are for pressures it does not see", Check: offDesignStages},
}

// material returns the material a Name input of e names.
func material(e *calc.Evaluated, key string) (Material, bool) {
	in := e.ModelInputs()
	if in == nil {
		return Material{}, false
	}
	name := in.NameOf(key)
	if name == "" {
		return Material{}, false
	}
	m, err := envOf(in).Materials.Lookup(name)
	return m, err == nil
}

func hotDischarge(s *calc.Set) []calc.Raised {
	var out []calc.Raised
	for _, e := range s.Blocks {
		t2, ok := e.Result("discharge_temperature")
		if !ok {
			continue
		}
		for _, key := range []string{"head_material", "valve_material"} {
			m, ok := material(e, key)
			if !ok {
				continue
			}
			limit := m.TemperatureLimit()
			what := "service temperature limit"
			if limit == m.HeatDeflection {
				what = "heat deflection temperature"
			}
			msg := fmt.Sprintf("discharge temperature %s against the %s %s of %s %s (%s)",
				e.Show(t2.Value, units.Temperature, "degC"), strings.TrimSuffix(key, "_material"), what, m.Label,
				e.Show(limit, units.Temperature, "degC"), "typical value: verify for your material")
			switch {
			case t2.Value > limit:
				out = append(out, calc.Raised{Block: e, Note: calc.CautionNote{Level: calc.Danger, Result: "discharge_temperature", Message: "Above the limit: " + msg + ". The part will soften or creep under pressure; use a material rated above the discharge temperature, cool the stage, or lower its pressure ratio."}})
			case t2.Value > limit-hotMargin:
				margin := "10 K"
				if e.WriterUnit(units.Temperature, "degC") == "degF" {
					margin = "18 °F (10 K)" // a difference: 1 K is 1.8 °F
				}
				out = append(out, calc.Raised{Block: e, Note: calc.CautionNote{Level: calc.Warning, Result: "discharge_temperature", Message: "Within " + margin + " of the limit: " + msg + ". Allow for hot spots at the discharge valve, which run hotter than the mean."}})
			}
		}
	}
	return out
}

func hotAirRule(s *calc.Set) []calc.Raised {
	var out []calc.Raised
	for _, e := range s.Blocks {
		t2, ok := e.Result("discharge_temperature")
		if !ok || t2.Value <= hotAir {
			continue
		}
		what, remedy := "The air leaves the cylinder at %s", "split the pressure ratio over stages with intercooling or lower it, guard the hot parts, and run metal pipe rated for the temperature to an aftercooler."
		if e.Block.Kind.Has(calc.HoldsVacuum) {
			// A vacuum pump compresses from the vessel to the atmosphere:
			// the lower the vessel, the hotter the little air it moves.
			what = "With the vessel at the target pressure the air leaves the cylinder at %s, and hotter still below it"
			remedy = "pump down in two stages or to a higher target, guard the head, and keep the exhaust line metal and its silencer clear of the hot air."
		}
		out = append(out, calc.Raised{Block: e, Note: calc.CautionNote{Level: calc.Caution, Result: "discharge_temperature", Message: fmt.Sprintf(
			what+", above the %s that compressor oils are rated for (DIN 51506 VDL). Oil chars in the discharge valve and line, and the deposits can ignite; the head and pipe burn at a touch, and hoses and plastic fittings downstream soften: "+remedy,
			e.Show(t2.Value, units.Temperature, "degC"), e.Show(hotAir, units.Temperature, "degC"))}})
	}
	return out
}

func lowSafetyFactor(s *calc.Set) []calc.Raised {
	var out []calc.Raised
	for _, e := range s.Blocks {
		for _, spec := range e.Block.Kind.Results {
			if !spec.Factor {
				continue
			}
			r, ok := e.Result(spec.Name)
			if !ok {
				continue
			}
			m, hasMaterial := material(e, spec.FactorMaterial)
			safety := envOf(e.ModelInputs()).Safety
			min, basis := safety.MinimumFactorMetal, "metal"
			remedy := "Thicken or strengthen the part, or lower the pressure."
			switch {
			case spec.Name == bucklingFactor:
				min, basis = safety.MinimumFactorBuckling, "elastic buckling"
				remedy = "Thicken the wall or add stiffening rings (a shorter length between them), or use a vessel rated for full vacuum."
			case hasMaterial:
				min, basis = safety.MinimumFor(m), m.Label
			}
			factor := units.Format(r.Value, e.SigFigs())
			switch {
			case r.Value < 1:
				out = append(out, calc.Raised{Block: e, Note: calc.CautionNote{Level: calc.Danger, Result: spec.Name, Message: fmt.Sprintf(
					"%s is %s, below 1: the part is expected to fail at its working load. Redesign it before it is pressurised.",
					spec.Name, factor)}})
			case r.Value < dangerFactor:
				out = append(out, calc.Raised{Block: e, Note: calc.CautionNote{Level: calc.Danger, Result: spec.Name, Message: fmt.Sprintf(
					"%s is %s, below %s: the part is close to failing at its working load. Redesign it before it is pressurised.",
					spec.Name, factor, units.Format(dangerFactor, 2))}})
			case r.Value < min:
				out = append(out, calc.Raised{Block: e, Note: calc.CautionNote{Level: calc.Warning, Result: spec.Name, Message: fmt.Sprintf(
					"%s is %s, below the site's minimum of %s for %s. %s",
					spec.Name, factor, units.Format(min, 2), basis, remedy)}})
			}
		}
	}
	return out
}

// rating is the pressure a part is rated for, absolute, given its results:
// its allowable pressure, or its code allowable pressure when that is
// lower; name names the figure and basis says what it rests on.
func rating(result func(name string) (float64, bool)) (p float64, name, basis string, ok bool) {
	p, ok = result("allowable_pressure")
	if !ok {
		return 0, "", "", false
	}
	name, basis = "allowable pressure", "the burst pressure over the site's minimum factor"
	if code, ok := result("code_allowable_pressure"); ok && code < p {
		p, name, basis = code, "code allowable pressure", "the ASME VIII-1 formulas with its joint efficiency"
	}
	return p, name, basis, true
}

// ratingOf is the rating of an evaluated block.
func ratingOf(e *calc.Evaluated) (p float64, name, basis string, ok bool) {
	return rating(func(name string) (float64, bool) {
		r, ok := e.Result(name)
		return r.Value, ok
	})
}

func aboveAllowable(s *calc.Set) []calc.Raised {
	var out []calc.Raised
	for _, e := range s.Blocks {
		allow, name, basis, ok := ratingOf(e)
		burst, hasBurst := e.Result("burst_pressure")
		in, working := e.ModelInputs(), e.Block.Kind.WorkingPressure
		if !ok || in == nil || working.Key == "" || !in.Has(working.Key) {
			continue
		}
		p := in.Value(working.Key)
		if p <= allow {
			continue
		}
		rated := fmt.Sprintf("%s %s (%s)", name, e.Show(allow, units.Pressure, "bar"), basis)
		level, why := calc.Warning, "above its "+rated
		// Both pressures are absolute; the margin is on gauge pressure.
		if hasBurst && p-e.Ambient > (burst.Value-e.Ambient)/dangerFactor {
			level, why = calc.Danger, "above its burst pressure over "+units.Format(dangerFactor, 2)+"; its "+rated
		}
		out = append(out, calc.Raised{Block: e, Note: calc.CautionNote{Level: level, Result: "allowable_pressure", Message: fmt.Sprintf(
			"The working pressure %s is %s. Lower the pressure or strengthen the part.", e.Show(p, units.Pressure, "bar"), why)}})
	}
	return out
}

// pressureParts are the blocks with an allowable pressure.
func pressureParts(s *calc.Set) []*calc.Evaluated {
	var parts []*calc.Evaluated
	for _, e := range s.Blocks {
		if _, ok := e.Result("allowable_pressure"); ok {
			parts = append(parts, e)
		}
	}
	return parts
}

// relieves reports whether relief valve v relieves block id: it names id,
// or a block that names id (the receiver a compressor fills, say).
func relieves(s *calc.Set, v *calc.Evaluated, id string) bool {
	if links(v, id) {
		return true
	}
	for _, p := range s.LinkedFrom(id) {
		if p != v && links(v, p.Block.ID) {
			return true
		}
	}
	return false
}

// links reports whether e names id in any of its Link or LinkList inputs.
func links(e *calc.Evaluated, id string) bool {
	for _, in := range e.Inputs {
		if slices.Contains(in.Links, id) {
			return true
		}
	}
	return false
}

// exposedParts returns the pressure parts (partAt: their order) that
// compressor c can pressurise, in order: those on its page, those that
// name it, and those named by a relief valve that names it too.
func exposedParts(s *calc.Set, c *calc.Evaluated, partAt map[*calc.Evaluated]int) []*calc.Evaluated {
	seen := map[*calc.Evaluated]bool{}
	var out []*calc.Evaluated
	add := func(p *calc.Evaluated) {
		if _, isPart := partAt[p]; isPart && !seen[p] {
			seen[p] = true
			out = append(out, p)
		}
	}
	for _, p := range s.InFile(c.Block.File) {
		add(p)
	}
	for _, e := range s.LinkedFrom(c.Block.ID) {
		add(e)
		if _, ok := e.Result("cracking_pressure"); ok && e.Block.Kind.Has(calc.Relieves) {
			for _, in := range e.Inputs {
				for _, id := range in.Links {
					if p, ok := s.Lookup(id); ok {
						add(p)
					}
				}
			}
		}
	}
	slices.SortFunc(out, func(a, b *calc.Evaluated) int { return partAt[a] - partAt[b] })
	return out
}

func noRelief(s *calc.Set) []calc.Raised {
	var out []calc.Raised
	parts := pressureParts(s)
	partAt := make(map[*calc.Evaluated]int, len(parts))
	for i, p := range parts {
		partAt[p] = i
	}
	var valves []*calc.Evaluated
	for _, e := range s.Having(calc.Relieves) {
		if _, ok := e.Result("cracking_pressure"); ok {
			valves = append(valves, e)
		}
	}
	for _, c := range s.Having(calc.Delivers) {
		dead, ok := c.Result("max_pressure")
		if !ok {
			continue
		}
		for _, p := range exposedParts(s, c, partAt) {
			allow, name, _, _ := ratingOf(p)
			if dead.Value <= allow {
				continue
			}
			// The relief must open below the part's allowable pressure.
			relieved := false
			var tooHigh []string
			for _, v := range valves {
				if !links(v, c.Block.ID) && !links(v, p.Block.ID) {
					continue
				}
				set, _ := v.Result("cracking_pressure")
				// cracking_pressure is a difference across the seat; the
				// valve vents to ambient, so it opens at ambient + that.
				if set.Value+v.Ambient <= allow {
					relieved = true
					break
				}
				// Shown as the part's pressures are (gauge or absolute, its
				// unit), so the three numbers compare at a glance.
				tooHigh = append(tooHigh, fmt.Sprintf("%s opens at %s", v.Block.ID, p.Show(set.Value+v.Ambient, units.Pressure, "bar")))
			}
			if relieved {
				continue
			}
			msg := fmt.Sprintf("%s can dead-head at %s, above the %s %s of %s. Fit a relief valve set below %s: a valve block that protects %s.",
				c.Block.ID, c.Show(dead.Value, units.Pressure, "bar"), name, p.Show(allow, units.Pressure, "bar"), p.Block.ID,
				p.Show(allow, units.Pressure, "bar"), c.Block.ID)
			if len(tooHigh) > 0 {
				msg += " The named relief is set too high (" + strings.Join(tooHigh, "; ") + ")."
			}
			out = append(out, calc.Raised{Block: c, Note: calc.CautionNote{Level: calc.Danger, Result: "max_pressure", Message: msg}})
		}
	}
	return out
}

func reliefUnnamed(s *calc.Set) []calc.Raised {
	var out []calc.Raised
	for _, c := range s.Blocks {
		dead, ok := c.Result("max_pressure")
		ve, _ := c.Result("volumetric_efficiency")
		if !ok || !c.Block.Kind.Has(calc.Delivers) || ve.Value <= 0 {
			continue
		}
		// A relief on the receiver the compressor fills (the usual place)
		// relieves the compressor too, as the no-relief rule counts it.
		named := false
		for _, v := range s.Having(calc.Relieves) {
			named = named || relieves(s, v, c.Block.ID)
		}
		if named {
			continue
		}
		out = append(out, calc.Raised{Block: c, Note: calc.CautionNote{Level: calc.Notice, Result: "max_pressure", Message: fmt.Sprintf(
			"No relief valve is named for %s, which can dead-head at %s with its outlet blocked. Every compressor needs a relief valve set below the rating of the weakest part it can pressurise (common practice); describe it in a valve block with protects = [\"%s\"].",
			c.Block.ID, c.Show(dead.Value, units.Pressure, "bar"), c.Block.ID)}})
	}
	return out
}

// reliefTooSmall raises a DANGER on a relief valve whose capacity at its
// relieving pressure is less than the mass flow the compressors it
// protects deliver there: those it names, and the supplies of the
// receivers it names, each counted once.
func reliefTooSmall(s *calc.Set) []calc.Raised {
	var out []calc.Raised
	for _, v := range s.Blocks {
		capacity, ok := v.Result("relieving_capacity")
		p0, _ := v.Result("relieving_pressure")
		vin := v.ModelInputs()
		if !ok || vin == nil {
			continue
		}
		var sources []*calc.Linked
		seen := map[string]bool{}
		add := func(l *calc.Linked) {
			if l != nil && l.Roles&calc.Delivers != 0 && !seen[l.ID] {
				seen[l.ID] = true
				sources = append(sources, l)
			}
		}
		for _, l := range vin.LinksOf("protects") {
			add(l)
			if p, ok := s.Lookup(l.ID); ok && p.Block.Kind.Has(calc.Receiver) && p.ModelInputs() != nil {
				add(p.ModelInputs().LinkOf("supply"))
			}
		}
		demand := 0.0
		var ids []string
		for _, l := range sources {
			m, err := deliveredMass(l, p0.Value)
			if err != nil {
				continue
			}
			demand += m
			ids = append(ids, l.ID)
		}
		if len(ids) == 0 || capacity.Value >= demand {
			continue
		}
		p1, t1 := supplyInlet(sources[0])
		verb := "delivers"
		if len(ids) > 1 {
			verb = "deliver"
		}
		free := func(m float64) string {
			return v.Show(m*airGasConstant*t1/p1, units.VolumeFlow, "L/min")
		}
		out = append(out, calc.Raised{Block: v, Note: calc.CautionNote{Level: calc.Danger, Message: fmt.Sprintf(
			"%s passes %s (%s of free air) at its relieving pressure %s, less than the %s (%s) that %s %s there. Once it lifts the pressure goes on rising past its set point: fit a valve with a larger seat or lift, or a second valve.",
			v.Block.ID, v.Show(capacity.Value, units.MassFlow, "g/s"), free(capacity.Value), v.Show(p0.Value, units.Pressure, "bar"),
			v.Show(demand, units.MassFlow, "g/s"), free(demand), strings.Join(ids, " and "), verb)}})
	}
	return out
}

// reliefBelowTarget raises a CAUTION on a relief valve that opens below the
// working pressure of a part it protects (a tank's target, say): not a
// hazard, since the valve holds the pressure down, but the part never
// reaches it, the compressor runs on with the valve blowing off, and a
// tank's fill_time is for a pressure it cannot reach.
func reliefBelowTarget(s *calc.Set) []calc.Raised {
	var out []calc.Raised
	for _, v := range s.Blocks {
		set, ok := v.Result("cracking_pressure")
		vin := v.ModelInputs()
		if !ok || !v.Block.Kind.Has(calc.Relieves) || vin == nil {
			continue
		}
		opens := set.Value + v.Ambient // absolute: the valve vents to ambient
		for _, l := range vin.LinksOf("protects") {
			p, ok := s.Lookup(l.ID)
			if !ok || p.ModelInputs() == nil {
				continue
			}
			working := p.Block.Kind.WorkingPressure
			if working.Key == "" || !p.ModelInputs().Has(working.Key) {
				continue
			}
			target := p.ModelInputs().Value(working.Key)
			if opens >= target {
				continue
			}
			out = append(out, calc.Raised{Block: v, Note: calc.CautionNote{Level: calc.Caution, Result: "cracking_pressure", Message: fmt.Sprintf(
				"%s opens at %s, below the %s %s of %s, which it protects: %s never reaches it, and the valve lifts and blows off for as long as the compressor runs. Set the valve above %s, commonly about 10%% above the working pressure (common practice), and below the allowable pressure of the parts it protects; or lower the %s.",
				v.Block.ID, p.Show(opens, units.Pressure, "bar"), working.Name, p.Show(target, units.Pressure, "bar"), p.Block.ID,
				p.Block.ID, p.Show(target, units.Pressure, "bar"), working.Name)}})
		}
	}
	return out
}

func fillAboveRating(s *calc.Set) []calc.Raised {
	var out []calc.Raised
	for _, t := range s.Blocks {
		tin, working := t.ModelInputs(), t.Block.Kind.WorkingPressure
		if !t.Block.Kind.Has(calc.Receiver) || tin == nil || !tin.Has(working.Key) {
			continue
		}
		l := tin.LinkOf("supply")
		if l == nil {
			continue
		}
		c, ok := s.Lookup(l.ID)
		if !ok || c.ModelInputs() == nil {
			continue
		}
		rating := c.Block.Kind.WorkingPressure
		if rating.Key == "" || !c.ModelInputs().Has(rating.Key) {
			continue
		}
		target, rated := tin.Value(working.Key), c.ModelInputs().Value(rating.Key)
		if target <= rated {
			continue
		}
		out = append(out, calc.Raised{Block: t, Note: calc.CautionNote{Level: calc.Caution, Message: fmt.Sprintf(
			"%s is filled to %s, above the discharge pressure %s that its supply %s is computed at. Near the end of the fill the stage runs beyond its block: its piston force, head load, discharge temperature and power are higher than %s shows. "+
				"Compute the supply at the receiver's cut-out pressure, or fill to the pressure it is computed at: pressure = \"=%s.discharge_pressure\".",
			t.Block.ID, t.Show(target, units.Pressure, "bar"), t.Show(rated, units.Pressure, "bar"), c.Block.ID, c.Block.ID, c.Block.ID)}})
	}
	return out
}

func storedEnergy(s *calc.Set) []calc.Raised {
	var out []calc.Raised
	for _, e := range s.Blocks {
		r, ok := e.Result("stored_energy")
		if !ok || r.Value <= storedEnergyNotice {
			continue
		}
		level := calc.Notice
		if r.Value > storedEnergyWarning {
			level = calc.Warning
		}
		msg := fmt.Sprintf("The receiver stores %s (isentropic expansion to ambient). A rupture releases it at once: keep the receiver guarded, drained and inspected, and never modify, weld or drill it.",
			e.Show(r.Value, units.Energy, "kJ"))
		// Shown in the results' own units: a tank's lengths are in mm or
		// inches, its test distance in metres or feet.
		test, errE := e.Format("test_energy", "")
		tnt, errT := e.Format("tnt_equivalent", "")
		distance, errD := e.Format("test_distance", "")
		if errE == nil && errT == nil && errD == nil {
			msg += fmt.Sprintf(" Prove it with a hydrostatic test, with water, not with air: a pneumatic test would store %s, as much as %s of TNT, and ASME PCC-2 keeps everyone at least %s away while one runs.",
				test, tnt, distance)
		}
		out = append(out, calc.Raised{Block: e, Note: calc.CautionNote{Level: level, Result: "stored_energy", Message: msg}})
	}
	return out
}

func printedPart(s *calc.Set) []calc.Raised {
	var out []calc.Raised
	for _, e := range s.Blocks {
		// A rated pressure part, or a wall or lid under a pressure difference.
		_, isPart := e.Result("allowable_pressure")
		isPart = isPart || e.Block.Kind.Has(calc.Wall)
		// nut_material is the part a head's bolts thread into: printed, its
		// threads carry the whole head load.
		for _, key := range []string{"material", "head_material", "valve_material", "nut_material"} {
			m, ok := material(e, key)
			if !ok || !m.Printable || (key == "material" && !isPart && !e.Block.Kind.Has(calc.Relieves)) {
				continue
			}
			what := strings.ReplaceAll(key, "_", " ")
			if key == "nut_material" {
				what = "nut or tapped part the bolts thread into"
			}
			out = append(out, calc.Raised{Block: e, Note: calc.CautionNote{Level: calc.Warning, Message: fmt.Sprintf(
				"The %s is %s, a 3D-printing plastic. Printed parts leak and split along their layers, and creep under load and heat. Test it hydrostatically with water, never with air, behind a shield; keep its volume small.",
				what, m.Label)}})
		}
	}
	return out
}

func fastFlywheel(s *calc.Set) []calc.Raised {
	var out []calc.Raised
	for _, e := range s.Blocks {
		v, ok := e.Result("rim_speed")
		if !ok || v.Value <= fastRim {
			continue
		}
		why := "only a density is given, so no strength check is made; name a material"
		if m, named := material(e, "material"); named {
			if !m.Brittle {
				continue
			}
			why = "its material (" + m.Label + ") is brittle and can burst from casting flaws well below its computed strength"
		}
		out = append(out, calc.Raised{Block: e, Note: calc.CautionNote{Level: calc.Warning, Result: "rim_speed", Message: fmt.Sprintf(
			"The flywheel's rim runs at %s, above the %s long held as the limit for cast-iron flywheels, and %s. A bursting flywheel throws fragments like shrapnel: guard it all round, or make it smaller and slower at the rim.",
			e.Show(v.Value, units.Velocity, "m/s"), e.Show(fastRim, units.Velocity, "m/s"), why)}})
	}
	return out
}

func coldExhaust(s *calc.Set) []calc.Raised {
	var out []calc.Raised
	for _, e := range s.Blocks {
		t, ok := e.Result("exhaust_temperature")
		pe, hasPe := e.Result("expansion_pressure")
		te, _ := e.Result("expansion_temperature")
		// Expanded below ambient, air flows in when the exhaust opens: the
		// over-expansion NOTICE says what to change.
		if !ok || t.Value >= freezing || (hasPe && pe.Value < e.Ambient) {
			continue
		}
		out = append(out, calc.Raised{Block: e, Note: calc.CautionNote{Level: calc.Caution, Result: "exhaust_temperature", Message: fmt.Sprintf(
			"The exhaust air leaves at about %s, mass-averaged over the blowdown when the exhaust opens and the exhaust stroke (the air in the cylinder is %s at bottom dead centre; warm cylinder walls make both less cold). Moisture in it freezes in the exhaust port and silencer, where ice can stall the motor, and the metal there gets cold enough to hurt bare skin. Dry the supply air, or warm it; changing the cut-off warms the exhaust little.",
			e.Show(t.Value, units.Temperature, "degC"), e.Show(te.Value, units.Temperature, "degC"))}})
	}
	return out
}

func deadCentre(s *calc.Set) []calc.Raised {
	var out []calc.Raised
	for _, e := range s.Blocks {
		t, ok := e.Result("start_torque")
		in := e.ModelInputs()
		if !ok || t.Value > 0 || in == nil {
			continue
		}
		where := "at some crank angles no inlet is open with leverage on the crank: the cut-off leaves gaps between the cylinders' admissions"
		if in.Value("cylinders") == 1 {
			where = "a single cylinder has dead centres: at top dead centre the rod gives no leverage, and from cut-off to bottom dead centre the inlet is shut"
		}
		out = append(out, calc.Raised{Block: e, Note: calc.CautionNote{Level: calc.Caution, Result: "start_torque", Message: "The motor can stop where it will not start on air: " + where + ". " +
			"Moved past that point by hand, it starts at once and with full torque: turn it by its load or a bar, never by the crank or belt, with guards in place, or shut and vent the supply first. A flywheel carries it past in running; more cylinders with overlapping admission let it start anywhere."}})
	}
	return out
}

func rodStrikesLiner(s *calc.Set) []calc.Raised {
	var out []calc.Raised
	for _, e := range s.Blocks {
		r, ok := e.Result("rod_clearance")
		if !ok || r.Value >= rodNear {
			continue
		}
		clear := e.Show(r.Value, units.Length, "mm")
		level, what := calc.Warning, fmt.Sprintf("passes the bottom edge of the cylinder wall with %s to spare, less than %s", clear, e.Show(rodNear, units.Length, "mm"))
		if r.Value <= 0 {
			level, what = calc.Danger, fmt.Sprintf("strikes the bottom edge of the cylinder wall as it swings (least clearance %s)", clear)
		}
		out = append(out, calc.Raised{Block: e, Note: calc.CautionNote{Level: level, Message: "The connecting rod " + what +
			". A rod that hits the cylinder breaks the liner or itself and can throw the piston: chamfer or notch the bottom of the bore, narrow the rod where it passes, or lengthen the rod."}})
	}
	return out
}

func vacuumVessel(s *calc.Set) []calc.Raised {
	var out []calc.Raised
	for _, e := range s.Blocks {
		switch {
		case e.Block.Kind.Has(calc.Wall):
			if note, ok := brittleLid(e); ok {
				out = append(out, calc.Raised{Block: e, Note: note})
			}
		case e.Block.Kind.Has(calc.HoldsVacuum):
			out = append(out, calc.Raised{Block: e, Note: calc.CautionNote{Level: calc.Caution, Message: "A vessel under vacuum carries the full atmosphere on its walls. Thin sheet, plastic boxes and glass can implode and throw fragments: use vessels rated for vacuum and keep glass shielded. " + wallsChecked(s, e)}})
		}
	}
	return out
}

// vacuumWall reports whether w is a wall or lid that may carry a vacuum: a
// wall pumped below ambient, or a lid given only the difference across it.
func vacuumWall(w *calc.Evaluated) bool {
	return w.Block.Kind.Has(calc.Wall) && (w.HoldsVacuum() || w.Block.Kind.WorkingPressure.Key == "")
}

// wallsChecked names the wall and lid blocks on the page of the vacuum
// block e, with their safety factors, or says that none checks them.
func wallsChecked(s *calc.Set, e *calc.Evaluated) string {
	var named []string
	for _, w := range s.InFile(e.Block.File) {
		if !vacuumWall(w) {
			continue
		}
		var factors []string
		for _, spec := range w.Block.Kind.Results {
			if r, ok := w.Result(spec.Name); ok && spec.Factor {
				factors = append(factors, strings.ReplaceAll(spec.Name, "_", " ")+" "+units.Format(r.Value, w.SigFigs()))
			}
		}
		named = append(named, fmt.Sprintf("%s (%s: %s)", w.Block.ID, w.Block.Kind.Name, strings.Join(factors, ", ")))
	}
	if len(named) == 0 {
		return "No wall or lid block on this page checks them: give the vessel's walls a tube block with its pressure below ambient and its lids or windows plate blocks, or name the rating the vessel was bought to."
	}
	return "The walls and lids this page checks: " + strings.Join(named, "; ") + "."
}

// brittleLid is the implosion caution of a wall or lid of glass or a
// brittle plastic (acrylic) that may carry a vacuum.
func brittleLid(w *calc.Evaluated) (calc.CautionNote, bool) {
	m, ok := material(w, "material")
	if !ok || !m.Brittle || m.Class == Metal || !vacuumWall(w) {
		return calc.CautionNote{}, false
	}
	return calc.CautionNote{Level: calc.Caution, Message: fmt.Sprintf(
		"%s is %s, which breaks without warning at a scratch or a flaw: under vacuum it implodes and throws sharp fragments at speed. Shield it with a polycarbonate cover or a fine mesh guard, keep faces away from it while it is pumped down, let the air back in slowly, and replace it when it is scratched or crazed.",
		w.Block.ID, m.Label)}, true
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

// StandardCautionStrip is StandardCaution in one line, for a page that
// quotes figures of a pressure calculation held on another page.
const StandardCautionStrip = "Compressed air can burst vessels and throw parts; these figures are no certification."

// StandardVacuumCautionStrip is StandardVacuumCaution in one line.
const StandardVacuumCautionStrip = "A vessel under vacuum can implode and throw fragments; these figures are no certification."
