package models

import (
	"math"
	"reflect"
	"slices"
	"strings"
	"testing"

	"github.com/BurntSushi/toml"

	"github.com/millrace-workshop/specgen/internal/units"
)

func TestBuiltinMaterials(t *testing.T) {
	mats, err := DefaultMaterials()
	if err != nil {
		t.Fatal(err)
	}
	want := []string{"abs", "aluminium-6061-t6", "asa", "brass", "cast-iron", "glass", "pa12", "pc", "petg", "pla", "pmma", "s235", "stainless-304"}
	if got := mats.Names(); !slices.Equal(got, want) {
		t.Fatalf("materials %v, want %v", got, want)
	}
	printable := []string{"abs", "asa", "pa12", "petg", "pla"} // the FDM and SLS plastics
	brittle := []string{"cast-iron", "glass", "pla", "pmma"}
	for _, name := range want {
		m, err := mats.Lookup(name)
		if err != nil {
			t.Fatal(err)
		}
		if m.Label == name || m.Label == "" {
			t.Errorf("%s: no label", name)
		}
		if !strings.Contains(m.Source, "typical, verify for your material") || len(m.Source) < 40 {
			t.Errorf("%s: source %q does not name its basis and say it is typical", name, m.Source)
		}
		if m.Class != Plastic && m.Class != Metal && m.Class != Glass {
			t.Errorf("%s: class %q", name, m.Class)
		}
		for prop, v := range map[string]float64{"tensile_strength": m.TensileStrength, "elastic_modulus": m.ElasticModulus,
			"density": m.Density, "poisson_ratio": m.PoissonRatio, "service_temperature": m.ServiceTemperature} {
			if !(v > 0) {
				t.Errorf("%s: %s missing", name, prop)
			}
		}
		// Continuous-use limits of the table's materials lie between 40 °C
		// and 500 °C (common practice); 0 °C = 273.15 K (NIST SP 811 §4.2.1.1).
		if c := m.ServiceTemperature - 273.15; c < 40 || c > 500 {
			t.Errorf("%s: service temperature %g degC is implausible", name, c)
		}
		if m.YieldStrength > m.TensileStrength {
			t.Errorf("%s: yield %g above tensile strength %g", name, m.YieldStrength, m.TensileStrength)
		}
		if (m.Class == Plastic) != (m.HeatDeflection > 0) {
			t.Errorf("%s: heat deflection temperature %g K for a %s", name, m.HeatDeflection, m.Class)
		}
		if got := slices.Contains(printable, name); m.Printable != got {
			t.Errorf("%s: printable = %v, want %v", name, m.Printable, got)
		}
		if got := slices.Contains(brittle, name); m.Brittle != got {
			t.Errorf("%s: brittle = %v, want %v", name, m.Brittle, got)
		}
		if m.Brittle && m.Class == Metal && m.YieldStrength != 0 {
			t.Errorf("%s: a brittle metal has no yield point, got %g", name, m.YieldStrength)
		}
		// Broad physical bounds (common practice): plastics are lighter than
		// 2 g/cm3 and softer than 10 GPa; structural metals are neither.
		if plastic := m.Class == Plastic; plastic != (m.Density < 2000) || plastic != (m.ElasticModulus < 10e9) {
			t.Errorf("%s: density %g kg/m3, modulus %g Pa do not fit a %s", name, m.Density, m.ElasticModulus, m.Class)
		}
	}
}

// TestMaterialMinimums checks the rows that quote a standard's minimum
// strengths against testdata/reference/tables/material-minimums.toml.
func TestMaterialMinimums(t *testing.T) {
	mats, err := DefaultMaterials()
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		Row []struct {
			Material, Source string
			TensileStrength  string `toml:"tensile_strength"`
			YieldStrength    string `toml:"yield_strength"` // "" for none
			Tolerance        string
		}
	}
	md, err := toml.DecodeFile("../../testdata/reference/tables/material-minimums.toml", &ref)
	if err != nil {
		t.Fatal(err)
	}
	if un := md.Undecoded(); len(un) > 0 || len(ref.Row) == 0 {
		t.Fatalf("unknown keys %v or no rows", un)
	}
	for _, row := range ref.Row {
		m, err := mats.Lookup(row.Material)
		if err != nil {
			t.Fatal(err)
		}
		for _, c := range []struct {
			name, want string
			got        float64
		}{{"tensile strength", row.TensileStrength, m.TensileStrength}, {"yield strength", row.YieldStrength, m.YieldStrength}} {
			want := 0.0
			if c.want != "" {
				q, err := units.Parse(c.want, units.Stress)
				if err != nil {
					t.Fatalf("%s: %v", row.Material, err)
				}
				want = q.Value
			}
			if tol := tolerance(t, row.Tolerance, units.Stress, want); math.Abs(c.got-want) > tol {
				t.Errorf("%s: %s %g Pa, want %s ± %s (%s)", row.Material, c.name, c.got, c.want, row.Tolerance, row.Source)
			}
		}
	}
}

func TestParseMaterialsOverride(t *testing.T) {
	base, err := DefaultMaterials()
	if err != nil {
		t.Fatal(err)
	}
	src := `
[petg]
tensile_strength = "58 MPa"

[pom]
label = "Acetal"
class = "plastic"
tensile_strength = "65 MPa"
elastic_modulus = "2.8 GPa"
density = "1.41 g/cm3"
service_temperature = "90 degC"
source = "our supplier's sheet"
`
	mats, err := ParseMaterials(src, base)
	if err != nil {
		t.Fatal(err)
	}
	petg, err := mats.Lookup("petg")
	if err != nil {
		t.Fatal(err)
	}
	was, _ := base.Lookup("petg")
	if petg.TensileStrength != 58e6 {
		t.Errorf("petg tensile strength %g, want 58e6", petg.TensileStrength)
	}
	// Only the one property changes.
	was.TensileStrength = 58e6
	if !reflect.DeepEqual(petg, was) {
		t.Errorf("override changed more than one property:\n got %+v\nwant %+v", petg, was)
	}
	pom, err := mats.Lookup("pom")
	if err != nil {
		t.Fatal(err)
	}
	// 90 degC = 363.15 K (NIST SP 811 §4.2.1.1: T/K = t/°C + 273.15).
	if pom.Class != Plastic || pom.Label != "Acetal" || pom.Density != 1410 || math.Abs(pom.ServiceTemperature-363.15) > 1e-9 {
		t.Errorf("pom = %+v", pom)
	}
	if s, _ := pom.DesignStrength(); s != 65e6 {
		t.Errorf("pom design strength %g, want the tensile strength 65e6 (no yield given)", s)
	}
	// The base table is unchanged.
	if again, _ := base.Lookup("petg"); again.TensileStrength == 38e6 {
		t.Error("override changed the built-in table")
	}
	if _, err := base.Lookup("pom"); err == nil {
		t.Error("new material leaked into the built-in table")
	}
}

func TestParseMaterialsErrors(t *testing.T) {
	base, err := DefaultMaterials()
	if err != nil {
		t.Fatal(err)
	}
	wantMaterialErrors(t, base, []materialErrorCase{
		{"unknown property", "[petg]\ntensile_strenght = \"40 MPa\"\n",
			[]string{"line 2: materials.petg.tensile_strenght", `did you mean "tensile_strength"?`}},
		{"bad class", "[petg]\nclass = \"ceramic\"\n",
			[]string{"materials.petg.class", `"ceramic" is not a class; allowed: plastic, metal`}},
		{"missing key", "[pom]\nclass = \"plastic\"\ntensile_strength = \"65 MPa\"\ndensity = \"1.41 g/cm3\"\nservice_temperature = \"90 degC\"\n",
			[]string{"line 1: materials.pom", "a new material needs elastic_modulus"}},
		{"missing keys, one message", "[pom]\nclass = \"plastic\"\n",
			[]string{"line 1: materials.pom: a new material needs tensile_strength, elastic_modulus, density, service_temperature (keys:"}},
		{"wrong dimension", "[petg]\nyield_strength = \"40 mm\"\n",
			[]string{"materials.petg.yield_strength", "mm"}},
		{"negative strength", "[petg]\nyield_strength = \"-40 MPa\"\n",
			[]string{"materials.petg.yield_strength", "must be above zero"}},
		{"poisson", "[petg]\npoisson_ratio = 0.7\n",
			[]string{"materials.petg.poisson_ratio", "between 0 and 0.5"}},
		{"bool as text", "[petg]\nprintable = \"yes\"\n",
			[]string{"materials.petg.printable", "not true or false"}},
		{"yield above tensile", "[cast-iron]\nyield_strength = \"1000 MPa\"\n",
			[]string{"line 2: materials.cast-iron.yield_strength", "above tensile strength"}},
		{"tensile below yield", "[s235]\ntensile_strength = \"200 MPa\"\n",
			[]string{"line 2: materials.s235.tensile_strength", "yield strength 235 MPa is above tensile strength 200 MPa"}},
		{"strength beyond any solid", "[petg]\ntensile_strength = \"1e300 MPa\"\n",
			[]string{"materials.petg.tensile_strength", `"1e300 MPa" is out of range; allowed: 0.1 MPa to 10000 MPa`}},
		{"modulus in the wrong unit", "[pla]\nelastic_modulus = \"3500 GPa\"\n",
			[]string{"materials.pla.elastic_modulus", "out of range", "diamond"}},
		{"density of a gas", "[abs]\ndensity = \"1.2 kg/m3\"\n",
			[]string{"materials.abs.density", "out of range; allowed: 0.01 g/cm3 to 25 g/cm3"}},
		{"limit near absolute zero", "[pla]\nservice_temperature = \"1e-300 K\"\n",
			[]string{"materials.pla.service_temperature", "out of range; allowed: 150 K to 2000 K"}},
		{"limit above melting", "[pla]\nheat_deflection_temperature = \"5000 degC\"\n",
			[]string{"materials.pla.heat_deflection_temperature", "out of range"}},
	})
}

func TestMaterialLookupSuggests(t *testing.T) {
	mats, err := DefaultMaterials()
	if err != nil {
		t.Fatal(err)
	}
	_, err = mats.Lookup("stainles-304")
	if err == nil || !strings.Contains(err.Error(), `did you mean "stainless-304"?`) {
		t.Errorf("Lookup(stainles-304) = %v", err)
	}
	_, err = mats.Lookup("unobtainium")
	if err == nil || !strings.Contains(err.Error(), "pla") || !strings.Contains(err.Error(), "[materials]") {
		t.Errorf("Lookup(unobtainium) = %v", err)
	}
}

func TestMaterialResolve(t *testing.T) {
	mats, err := DefaultMaterials()
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct{ text, want string }{
		{"pa12", "pa12"},
		{"nylon", "pa12"},
		{"Nylon", "pa12"},
		{"PA-12", "pa12"},
		{"PETG", "petg"},
		{"Stainless_304", "stainless-304"},
		{"stainless 304", "stainless-304"},
		{"304", "stainless-304"},
		{"6061-T6", "aluminium-6061-t6"},
		{"aluminum-6061-t6", "aluminium-6061-t6"},
		{"mild steel", "s235"},
		{"acrylic", "pmma"},
		{"polycarbonate", "pc"},
	} {
		got, ok := mats.Resolve(c.text)
		if !ok || got != c.want {
			t.Errorf("Resolve(%q) = %q, %v; want %q", c.text, got, ok, c.want)
		}
		if m, err := mats.Lookup(c.text); err != nil || m.Name != c.want {
			t.Errorf("Lookup(%q) = %q, %v; want %q", c.text, m.Name, err, c.want)
		}
	}
	for _, text := range []string{"unobtainium", "nylon-6", "", "steel"} {
		if got, ok := mats.Resolve(text); ok {
			t.Errorf("Resolve(%q) = %q, want no material", text, got)
		}
	}
}

func TestMaterialAliasesInSiteTable(t *testing.T) {
	base, err := DefaultMaterials()
	if err != nil {
		t.Fatal(err)
	}
	// A site material named like a built-in alias takes the name over.
	mats, err := ParseMaterials(`
[nylon]
label = "Cast nylon PA6"
class = "plastic"
tensile_strength = "80 MPa"
elastic_modulus = "3 GPa"
density = "1.15 g/cm3"
service_temperature = "90 degC"
aliases = ["PA6", "cast nylon"]
`, base)
	if err != nil {
		t.Fatal(err)
	}
	for text, want := range map[string]string{"nylon": "nylon", "pa6": "nylon", "Cast Nylon": "nylon", "pa-12": "pa12"} {
		if got, _ := mats.Resolve(text); got != want {
			t.Errorf("Resolve(%q) = %q, want %q", text, got, want)
		}
	}
	wantMaterialErrors(t, base, []materialErrorCase{
		{"alias on two materials", "[brass]\naliases = [\"304\"]\n",
			[]string{"line 2: materials.brass.aliases", `alias "304" already names "stainless-304"`}},
		{"not a list", "[brass]\naliases = \"yellow\"\n",
			[]string{"materials.brass.aliases", "is not a list"}},
		{"not a name", "[brass]\naliases = [\"#1\"]\n",
			[]string{"materials.brass.aliases", "is not an alias"}},
	})
}

// A block may name a material by an alias; the model and the cautions see
// the material itself.
func TestBlockMaterialAlias(t *testing.T) {
	set, err := evaluateBlocks(t, []map[string]any{{
		"id": "pipe", "kind": "tube", "inner_diameter": "40 mm", "wall_thickness": "4 mm",
		"pressure": "8 bar", "material": "Nylon",
	}})
	if err != nil {
		t.Fatal(err)
	}
	e, _ := set.Lookup("pipe")
	var material string
	for _, in := range e.Inputs {
		if in.Name == "material" {
			material = in.Text
		}
	}
	if material != "pa12" {
		t.Errorf("material input reads %q, want pa12", material)
	}
	printed := false
	for _, c := range e.Cautions {
		printed = printed || strings.Contains(c.Message, "3D-print") || strings.Contains(c.Message, "printed")
	}
	if !printed {
		t.Errorf("a nylon tube raises no printed-part caution: %+v", e.Cautions)
	}
}

func TestExplainMaterialsListsAliases(t *testing.T) {
	var b strings.Builder
	ExplainMaterials(&b, DefaultEnv())
	for _, want := range []string{"pa12: nylon, nylon-12", "stainless-304: 304, ss304"} {
		if !strings.Contains(b.String(), want) {
			t.Errorf("explain materials lacks %q:\n%s", want, b.String())
		}
	}
}

// materialErrorCase is a materials table that must fail, and what its
// error must say.
type materialErrorCase struct {
	name, src string
	want      []string
}

func wantMaterialErrors(t *testing.T, base *Materials, cases []materialErrorCase) {
	t.Helper()
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := ParseMaterials(c.src, base)
			if err == nil {
				t.Fatal("no error")
			}
			for _, w := range c.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q does not contain %q", err, w)
				}
			}
		})
	}
}

// TestMaterialSuggestionsStayInClass: a name the table lacks gets a
// suggestion of the class it is written for, never a plastic for a steel
// grade ("a36" is one letter from "abs") nor a metal for a plastic.
func TestMaterialSuggestionsStayInClass(t *testing.T) {
	m, err := DefaultMaterials()
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name  string
		class MaterialClass
		want  string
	}{
		{"a36", Metal, ""}, {"1018", Metal, ""}, {"ms", Metal, ""}, {"sa-516", Metal, "s235"}, {"st37", Metal, "s235"},
		{"alu", Metal, "aluminium-6061-t6"}, {"stainless-316", Metal, "stainless-304"}, {"bronze", Metal, "brass"},
		{"pvc", Plastic, "pc"}, {"petg-cf", Plastic, "petg"}, {"pa11", Plastic, "pa12"},
	} {
		got := m.Suggest(c.name)
		if got != c.want {
			t.Errorf("Suggest(%q) = %q, want %q", c.name, got, c.want)
		}
		if got != "" && m.byName[got].Class != c.class {
			t.Errorf("Suggest(%q) = %q, a %s for a %s name", c.name, got, m.byName[got].Class, c.class)
		}
	}
}
