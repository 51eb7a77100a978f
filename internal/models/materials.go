package models

import (
	_ "embed"
	"fmt"
	"maps"
	"regexp"
	"slices"
	"sort"
	"strings"

	"github.com/BurntSushi/toml"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/inputerr"
	"github.com/millrace-workshop/specgen/internal/units"
)

// MaterialClass sorts materials for safety factors and cautions.
type MaterialClass string

// The material classes.
const (
	Plastic MaterialClass = "plastic"
	Metal   MaterialClass = "metal"
	Glass   MaterialClass = "glass"
)

// Material is one engineering material with typical properties in SI.
type Material struct {
	Name      string // key, e.g. "petg"
	Label     string // for people, e.g. "PETG"
	Class     MaterialClass
	Printable bool // a 3D-printing plastic
	Brittle   bool // fails without yielding (cast iron, PMMA): the higher minimum factor
	// Strengths and stiffness, Pa. YieldStrength is 0 where a material has
	// no defined yield point.
	TensileStrength, YieldStrength, ElasticModulus float64
	Density                                        float64 // kg/m3
	PoissonRatio                                   float64
	// Temperature limits, K. HeatDeflection is 0 for metals.
	ServiceTemperature, HeatDeflection float64
	// AllowableStress is the row's own allowable stress for the code
	// figures of pressure parts, Pa; 0 to take it from the strengths.
	// AllowableStressTemperature is the highest metal temperature, K, at
	// which the ordinary-temperature allowable stress holds; 0 for the
	// service temperature.
	AllowableStress, AllowableStressTemperature float64
	Source                                      string // where the typical values come from
	// Aliases are other names users write for the material ("nylon" for
	// pa12); a block may name the material by any of them.
	Aliases []string
}

// DesignStrength is the strength safety factors are taken against: yield
// where the material has one, else tensile strength. It returns the value
// and its name for traces.
func (m Material) DesignStrength() (float64, string) {
	if m.YieldStrength > 0 {
		return m.YieldStrength, "yield strength"
	}
	return m.TensileStrength, "tensile strength"
}

// TemperatureLimit is the lowest of the service temperature and, for
// plastics, the heat deflection temperature.
func (m Material) TemperatureLimit() float64 {
	if m.HeatDeflection > 0 && m.HeatDeflection < m.ServiceTemperature {
		return m.HeatDeflection
	}
	return m.ServiceTemperature
}

// Materials is a table of materials by name.
type Materials struct {
	byName  map[string]Material
	byAlias map[string]string // normalised alias to material name
}

//go:embed materials.toml
var materialsTOML string

// MaterialRow is one table of materials.toml or of [materials] in
// specgen.toml, as written: property name to TOML value.
type MaterialRow map[string]any

var materialKeys = []string{
	"aliases", "allowable_stress", "allowable_stress_temperature", "brittle", "class", "density", "elastic_modulus",
	"heat_deflection_temperature", "label", "poisson_ratio", "printable", "service_temperature", "source",
	"tensile_strength", "yield_strength",
}

// builtinMaterials is materials.toml, read once; a test keeps it valid.
var builtinMaterials, builtinMaterialsErr = ParseMaterials(materialsTOML, nil)

// DefaultMaterials returns the built-in table.
func DefaultMaterials() (*Materials, error) {
	if builtinMaterialsErr != nil {
		return nil, fmt.Errorf("built-in materials table: %w", builtinMaterialsErr)
	}
	return builtinMaterials, nil
}

// ParseMaterials reads a materials table, each row over the same row of
// base (nil for none) so that a site can override single properties.
func ParseMaterials(src string, base *Materials) (*Materials, error) {
	var rows map[string]MaterialRow
	if _, err := toml.Decode(src, &rows); err != nil {
		return nil, err
	}
	return base.With(rows, calc.KeyLines(src), "")
}

// With returns the table with rows added or overriding base rows key by
// key. lines and file place errors (lines of "name.key").
func (m *Materials) With(rows map[string]MaterialRow, lines map[string]int, file string) (*Materials, error) {
	out := &Materials{byName: map[string]Material{}}
	if m != nil {
		for k, v := range m.byName {
			out.byName[k] = v
		}
	}
	names := make([]string, 0, len(rows))
	for n := range rows {
		names = append(names, n)
	}
	sort.Strings(names)
	var errs inputerr.List
	for _, name := range names {
		mat, isBase := out.byName[name]
		if !isBase {
			mat = Material{Name: name}
		}
		fail := func(key, msg string) {
			errs = append(errs, &inputerr.Error{File: file, Line: lines["materials."+name+"."+key] + lines[name+"."+key], Key: "materials." + name + "." + key, Msg: msg})
		}
		row := rows[name]
		keys := make([]string, 0, len(row))
		for k := range row {
			keys = append(keys, k)
		}
		sort.Strings(keys)
		for _, key := range keys {
			if err := mat.set(key, row[key]); err != nil {
				fail(key, err.Error())
			}
		}
		if !isBase {
			var missing []string
			for _, required := range []string{"class", "tensile_strength", "elastic_modulus", "density", "service_temperature"} {
				if _, ok := row[required]; !ok {
					missing = append(missing, required)
				}
			}
			if len(missing) > 0 {
				errs = append(errs, &inputerr.Error{File: file, Line: lines["materials."+name] + lines[name], Key: "materials." + name,
					Msg: "a new material needs " + strings.Join(missing, ", ") + " (keys: " + strings.Join(materialKeys, ", ") + ")"})
			}
		}
		// A stress above the tensile strength is blamed on the key the row
		// sets, the stress or else the tensile strength.
		for _, c := range []struct {
			key, what, why string
			value          float64
		}{
			{"yield_strength", "yield strength", "a material yields before it breaks", mat.YieldStrength},
			{"allowable_stress", "allowable stress", "the code figures divide the tensile strength by a factor", mat.AllowableStress},
		} {
			if c.value <= mat.TensileStrength || mat.TensileStrength <= 0 {
				continue
			}
			key := c.key
			if _, ok := row[key]; !ok {
				key = "tensile_strength"
			}
			fail(key, fmt.Sprintf("%s %s is above tensile strength %s; %s",
				c.what, display.Number(c.value/1e6, "MPa"), display.Number(mat.TensileStrength/1e6, "MPa"), c.why))
		}
		if mat.Label == "" {
			mat.Label = name
		}
		out.byName[name] = mat
	}
	out.byAlias, errs = aliasIndex(out.byName, names, lines, file, errs)
	if err := errs.Sorted(); err != nil {
		return nil, err
	}
	return out, nil
}

// aliasIndex maps every material's aliases to its name. An alias that is
// also a material's name gives way to that material, so a site can define
// "nylon" itself; one alias on two materials is an error at the row that
// set it last (one of changed, the rows just read).
func aliasIndex(byName map[string]Material, changed []string, lines map[string]int, file string, errs inputerr.List) (map[string]string, inputerr.List) {
	owner := map[string]string{}
	isChanged := map[string]bool{}
	for _, n := range changed {
		isChanged[n] = true
	}
	for _, name := range slices.Sorted(maps.Keys(byName)) {
		for _, alias := range byName[name].Aliases {
			key := normalMaterialName(alias)
			if _, isName := byName[key]; isName {
				continue
			}
			if prev, taken := owner[key]; taken && prev != name {
				at := name
				if !isChanged[at] {
					at = prev
				}
				errs = append(errs, &inputerr.Error{File: file, Line: lines["materials."+at+".aliases"] + lines[at+".aliases"], Key: "materials." + at + ".aliases",
					Msg: fmt.Sprintf("alias %q already names %q; an alias names one material", alias, otherOf(prev, name, at))})
				continue
			}
			owner[key] = name
		}
	}
	return owner, errs
}

// otherOf returns whichever of a and b is not at.
func otherOf(a, b, at string) string {
	if a == at {
		return b
	}
	return a
}

// aliasPattern is what an alias looks like once normalised.
var aliasPattern = regexp.MustCompile(`^[a-z0-9][a-z0-9._-]*$`)

// normalMaterialName folds the ways people write a material name: case,
// spaces and underscores ("Stainless_304" is "stainless-304").
func normalMaterialName(s string) string {
	s = strings.ToLower(strings.TrimSpace(s))
	return strings.NewReplacer(" ", "-", "_", "-").Replace(s)
}

// Resolve returns the name of the material that text names: its name, its
// name written another way (case, spaces, underscores) or an alias.
func (m *Materials) Resolve(text string) (string, bool) {
	if _, ok := m.byName[text]; ok {
		return text, true
	}
	key := normalMaterialName(text)
	if _, ok := m.byName[key]; ok {
		return key, true
	}
	name, ok := m.byAlias[key]
	return name, ok
}

// resolveMaterial is the Resolve of material inputs.
func resolveMaterial(env any, text string) (string, bool) {
	return siteEnv(env).Materials.Resolve(text)
}

// materialLabel is the Label of material inputs.
func materialLabel(env any, name string) string {
	if m, err := siteEnv(env).Materials.Lookup(name); err == nil && m.Label != name {
		return m.Label
	}
	return ""
}

// materialSpans bound the properties of any solid a part is made of, so that
// a slip of units ("50 GPa" for a plastic's strength is possible, "50 TPa"
// is not) is caught. The bounds are wide on purpose: common practice, from
// handbook orders of magnitude (foams to hard metals, diamond's modulus).
var materialSpans = map[string]struct {
	min, max, scale float64
	unit, why       string
}{
	"tensile_strength": {0.1e6, 10e9, 1e6, "MPa", "from soft foams to the strongest steel wire"},
	"yield_strength":   {0.1e6, 10e9, 1e6, "MPa", "from soft foams to the strongest steel wire"},
	"allowable_stress": {0.1e6, 10e9, 1e6, "MPa", "from soft foams to the strongest steel wire"},
	"elastic_modulus":  {1e6, 1.2e12, 1e9, "GPa", "from elastomers to diamond"},
	"density":          {10, 25e3, 1e3, "g/cm3", "from foams to the densest metals"},
}

// maxMaterialTemperature bounds a material's temperature limits, K.
const maxMaterialTemperature = 2000

// set reads one property of a material row.
func (m *Material) set(key string, v any) error {
	quantity := func(dim units.Dimension, dst *float64) error {
		s, ok := v.(string)
		if !ok {
			return fmt.Errorf("%s is not a quantity; write a string such as \"50 MPa\"", calc.TOMLText(v))
		}
		q, err := units.Parse(s, dim)
		if err != nil {
			return err
		}
		if q.Value <= 0 {
			return fmt.Errorf("%q must be above zero", s)
		}
		if span, ok := materialSpans[key]; ok && (q.Value < span.min || q.Value > span.max) {
			return fmt.Errorf("%q is out of range; allowed: %s to %s (%s)", s, display.Number(span.min/span.scale, span.unit), display.Number(span.max/span.scale, span.unit), span.why)
		}
		*dst = q.Value
		return nil
	}
	// A part's temperature limit lies between where air would liquefy and
	// where every material here has long melted.
	temperature := func(dst *float64) error {
		var t float64
		if err := quantity(units.Temperature, &t); err != nil {
			return err
		}
		if t < minGasTemperature || t > maxMaterialTemperature {
			return fmt.Errorf("%q is out of range; allowed: %s to %s", v, display.Number(minGasTemperature, "K"), display.Number(maxMaterialTemperature, "K"))
		}
		*dst = t
		return nil
	}
	text := func(dst *string) error {
		s, ok := v.(string)
		if !ok {
			return fmt.Errorf("%s is not a string", calc.TOMLText(v))
		}
		*dst = s
		return nil
	}
	names := func(dst *[]string) error {
		list, ok := v.([]any)
		if !ok {
			return fmt.Errorf("%s is not a list; write a list of names such as [\"nylon\", \"pa-12\"]", calc.TOMLText(v))
		}
		out := make([]string, 0, len(list))
		for _, item := range list {
			s, ok := item.(string)
			if !ok || !aliasPattern.MatchString(normalMaterialName(s)) {
				return fmt.Errorf("%s is not an alias; allowed: letters, digits, '-', '_', '.' and spaces, starting with a letter or digit", calc.TOMLText(item))
			}
			out = append(out, normalMaterialName(s))
		}
		*dst = out
		return nil
	}
	flag := func(dst *bool) error {
		b, ok := v.(bool)
		if !ok {
			return fmt.Errorf("%s is not true or false", calc.TOMLText(v))
		}
		*dst = b
		return nil
	}
	switch key {
	case "label":
		return text(&m.Label)
	case "source":
		return text(&m.Source)
	case "class":
		var c string
		if err := text(&c); err != nil {
			return err
		}
		if c != string(Plastic) && c != string(Metal) && c != string(Glass) {
			return fmt.Errorf("%q is not a class; allowed: plastic, metal, glass", c)
		}
		m.Class = MaterialClass(c)
	case "aliases":
		return names(&m.Aliases)
	case "printable":
		return flag(&m.Printable)
	case "brittle":
		return flag(&m.Brittle)
	case "tensile_strength":
		return quantity(units.Stress, &m.TensileStrength)
	case "yield_strength":
		return quantity(units.Stress, &m.YieldStrength)
	case "elastic_modulus":
		return quantity(units.Stress, &m.ElasticModulus)
	case "density":
		return quantity(units.Density, &m.Density)
	case "service_temperature":
		return temperature(&m.ServiceTemperature)
	case "heat_deflection_temperature":
		return temperature(&m.HeatDeflection)
	case "allowable_stress":
		return quantity(units.Stress, &m.AllowableStress)
	case "allowable_stress_temperature":
		return temperature(&m.AllowableStressTemperature)
	case "poisson_ratio":
		f, ok := v.(float64)
		if !ok || f <= 0 || f >= 0.5 {
			return fmt.Errorf("%s is not allowed; Poisson's ratio is a number between 0 and 0.5", calc.TOMLText(v))
		}
		m.PoissonRatio = f
	default:
		msg := fmt.Sprintf("unknown material property; allowed: %s", strings.Join(materialKeys, ", "))
		if s := calc.Suggest(key, materialKeys); s != "" {
			msg = fmt.Sprintf("unknown material property; did you mean %q?", s)
		}
		return fmt.Errorf("%s", msg)
	}
	return nil
}

// Lookup returns the material named name, or an error that lists the
// names (with a suggestion for a near miss).
func (m *Materials) Lookup(name string) (Material, error) {
	if resolved, ok := m.Resolve(name); ok {
		return m.byName[resolved], nil
	}
	names := m.Names()
	if s := m.Suggest(name); s != "" {
		return Material{}, fmt.Errorf("unknown material %q; did you mean %q? (materials: %s)", name, s, strings.Join(names, ", "))
	}
	return Material{}, fmt.Errorf("unknown material %q; materials: %s (add your own under [materials] in specgen.toml)", name, strings.Join(names, ", "))
}

// Suggest proposes the material nearest in spelling to a name the table
// lacks, among those of the class the name is written for: a steel's name
// ("a36", "1018") gets a metal, never a plastic, and a plastic's a plastic.
func (m *Materials) Suggest(name string) string {
	class, known := writtenClass(name)
	var names []string
	for _, n := range m.Names() {
		if !known || m.byName[n].Class == class {
			names = append(names, n)
		}
	}
	return calc.Suggest(name, names)
}

// metalName and plasticName match what people write for metals (steel
// grades such as S235, St37, A36 and 1018, alloys, "ms" for mild steel)
// and for plastics.
var (
	metalName   = regexp.MustCompile(`(?i)steel|stainless|iron|alu|brass|bronze|copper|metal|aisi|astm|^en-|^sa-?[0-9]|^a-?[0-9]|^st?-?[0-9]|^ss|^ms$|^cw|^[0-9]+([.-]|$)`)
	plasticName = regexp.MustCompile(`(?i)pla|petg|pet|abs|asa|nylon|^pa-?[0-9]|^pc|pmma|acrylic|pvc|pe$|hdpe|pom|acetal|delrin|ptfe|peek|resin|tpu|plastic|polymer|poly`)
)

// writtenClass is the class of material name is written for, when it says.
func writtenClass(name string) (MaterialClass, bool) {
	switch {
	case metalName.MatchString(name) && !plasticName.MatchString(name):
		return Metal, true
	case plasticName.MatchString(name) && !metalName.MatchString(name):
		return Plastic, true
	}
	return "", false
}

// suggestMaterial is the Suggest of material inputs.
func suggestMaterial(env any, text string) string {
	return siteEnv(env).Materials.Suggest(text)
}

// Names lists the materials, sorted.
func (m *Materials) Names() []string {
	names := make([]string, 0, len(m.byName))
	for n := range m.byName {
		names = append(names, n)
	}
	sort.Strings(names)
	return names
}

// Env is the site-wide setting a block is evaluated in.
type Env struct {
	Materials *Materials
	Safety    Safety
}

// Safety holds the site's minimum safety factors.
type Safety struct {
	// MinimumFactorMetal applies to ductile metals; MinimumFactorBrittle to
	// plastics and brittle materials, which fail with less warning.
	MinimumFactorMetal, MinimumFactorBrittle float64
	// MinimumFactorBuckling applies to the elastic collapse of a wall under
	// outside pressure, whatever its material.
	MinimumFactorBuckling float64
}

// DefaultSafety is common practice for small pressure parts built without
// a code: 2.5 on the design strength of a ductile metal, 4 for plastics and
// brittle materials, and 3 on the elastic collapse pressure of a wall under
// vacuum, which out-of-roundness lowers (common practice; check your local
// rules).
var DefaultSafety = Safety{MinimumFactorMetal: 2.5, MinimumFactorBrittle: 4, MinimumFactorBuckling: 3}

// MinimumFor is the minimum safety factor for a part of material m.
func (s Safety) MinimumFor(m Material) float64 {
	if m.Class == Plastic || m.Brittle {
		return s.MinimumFactorBrittle
	}
	return s.MinimumFactorMetal
}

// DefaultEnv is the environment of a site with no settings.
func DefaultEnv() *Env {
	mats := builtinMaterials
	if mats == nil {
		mats = &Materials{byName: map[string]Material{}}
	}
	return &Env{Materials: mats, Safety: DefaultSafety}
}

// materialChoices lists the material names, for Name inputs.
func materialChoices(env any) []string { return siteEnv(env).Materials.Names() }

// siteEnv is the Env a catalog carries (DefaultEnv when it carries none).
func siteEnv(env any) *Env {
	if e, ok := env.(*Env); ok && e != nil {
		return e
	}
	return DefaultEnv()
}

// envOf is the site settings a block is evaluated in.
func envOf(in *calc.Inputs) *Env { return siteEnv(in.Env()) }
