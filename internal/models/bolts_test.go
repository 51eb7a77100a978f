package models

import (
	"bytes"
	"errors"
	"math"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/BurntSushi/toml"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/inputerr"
	"github.com/millrace-workshop/specgen/internal/units"
)

// iso898Table is one testdata/reference/tables/iso898-1-*.toml file:
// values ISO 898-1 tabulates.
type iso898Table struct {
	Source     string
	FromMemory bool `toml:"from_memory"`
	Note       string
	// Area rows: a thread and its tensile stress area in mm2, written with
	// the table's digits.
	Area []struct{ Thread, Value string }
	// Strength rows: a class, a thread, the proof strength and optionally
	// the tabulated proof load.
	Strength []struct {
		Class         string
		Thread        string
		ProofStrength string `toml:"proof_strength"`
		ProofLoad     string `toml:"proof_load"`
	}
}

func TestISO898Tables(t *testing.T) {
	files, err := filepath.Glob("../../testdata/reference/tables/iso898-1-*.toml")
	if err != nil || len(files) < 2 {
		t.Fatalf("want the stress-area and proof-strength tables, found %d files (%v)", len(files), err)
	}
	for _, f := range files {
		t.Run(filepath.Base(f), func(t *testing.T) {
			var c iso898Table
			md, err := toml.DecodeFile(f, &c)
			if err != nil {
				t.Fatal(err)
			}
			if un := md.Undecoded(); len(un) > 0 {
				t.Fatalf("unknown keys %v", un)
			}
			if c.Source == "" || c.Note == "" || len(c.Area)+len(c.Strength) == 0 {
				t.Fatal("a table needs a source, a note and area or strength rows")
			}
			for _, row := range c.Area {
				checkStressArea(t, row.Thread, row.Value, c.Source)
			}
			for _, row := range c.Strength {
				checkProofStrength(t, row.Class, row.Thread, row.ProofStrength, row.ProofLoad, c.Source)
			}
		})
	}
}

// checkStressArea compares A_s with a table value, within half a unit of
// the table's last written digit.
func checkStressArea(t *testing.T, thread, value, source string) {
	t.Helper()
	th, err := LookupThread(thread)
	if err != nil {
		t.Fatal(err)
	}
	want, err := strconv.ParseFloat(value, 64)
	if err != nil {
		t.Fatalf("%s: area %q: %v", thread, value, err)
	}
	decimals := 0
	if _, frac, ok := strings.Cut(value, "."); ok {
		decimals = len(frac)
	}
	tol := 0.5 * math.Pow(10, -float64(decimals))
	got := th.StressArea() * 1e6
	if math.Abs(got-want) > tol*(1+1e-9) {
		t.Errorf("%s: A_s = %.4f mm², table %s mm² ± %g (%s)", thread, got, value, tol, source)
	}
}

// checkProofStrength checks the class table and, when a proof load is
// given, the load a bolt carries at a safety factor of 1 as the kind
// computes it: safety_factor × load_per_bolt = S_p · A_s.
func checkProofStrength(t *testing.T, class, thread, strength, load, source string) {
	t.Helper()
	th, err := LookupThread(thread)
	if err != nil {
		t.Fatal(err)
	}
	c, _, ok := lookupClass(class, th.D)
	if !ok {
		t.Fatalf("class %s is not in the table", class)
	}
	want := mustParse(t, strength, units.Stress)
	if c.proof != want {
		t.Errorf("class %s %s: S_p = %g MPa, table %s (%s)", class, thread, c.proof/1e6, strength, source)
	}
	if load == "" {
		return
	}
	in := inputsIn(&Env{Materials: mustMaterials(t, map[string]MaterialRow{"test-steel": testSteel()}), Safety: DefaultSafety}, standardAtmosphere, map[string]float64{
		"count": 1, "pressure": standardAtmosphere + 1e6, "pressure_diameter": 0.01,
	})
	in.SetName("thread", thread, true)
	in.SetName("property_class", class, true)
	in.SetName("nut_material", "test-steel", false)
	out, err := boltsKind.Evaluate(in)
	if err != nil {
		t.Fatal(err)
	}
	got := resultMap(out)
	proofLoad := got["safety_factor"].Value * got["load_per_bolt"].Value
	wantLoad := mustParse(t, load, units.Force)
	if math.Abs(proofLoad-wantLoad) > 0.005*wantLoad {
		t.Errorf("class %s %s: proof load %.4g N, table %s ± 0.5 %% (%s)", class, thread, proofLoad, load, source)
	}
}

// testSteel is a material row for checks that do not depend on the nut.
func testSteel() MaterialRow {
	return MaterialRow{"class": "metal", "tensile_strength": "400 MPa", "elastic_modulus": "200 GPa",
		"density": "7.85 g/cm3", "service_temperature": "300 degC"}
}

// evaluateBoltsBlock runs inputs through the whole path a page's block
// takes: TOML decoding, defaults, name checks, the model, the caution rules.
func evaluateBoltsBlock(t *testing.T, inputs map[string]any, env *Env) (*calc.Evaluated, error) {
	t.Helper()
	var buf bytes.Buffer
	buf.WriteString("id = \"head\"\nkind = \"bolts\"\n")
	if err := toml.NewEncoder(&buf).Encode(inputs); err != nil {
		t.Fatal(err)
	}
	b, err := testCatalog.ParseBlock("case.md", 1, buf.String())
	if err != nil {
		return nil, err
	}
	set, err := catalogWith(t, env).Evaluate([]*calc.Block{b}, calc.Options{})
	if err != nil {
		return nil, err
	}
	e, _ := set.Lookup("head")
	return e, nil
}

// TestThreadProfile checks the stripping area's tooth fraction against the
// basic profile of ISO 68-1: at the major diameter the external thread's
// crest flat is P/8 wide, so the internal thread's tooth fills 7/8 of each
// pitch.
func TestThreadProfile(t *testing.T) {
	for _, th := range threads {
		if f := th.internalToothFraction(); math.Abs(f-7.0/8) > 1e-12 {
			t.Errorf("%s: tooth fraction %.15f, want 0.875 (ISO 68-1)", th.Name, f)
		}
		// ISO 724 (from memory): d2 = d − 0.6495·P, d1 = d − 1.0825·P.
		if d2 := th.D - 0.6495*th.Pitch; math.Abs(th.PitchDiameter()-d2) > 1e-4*th.Pitch {
			t.Errorf("%s: d2 = %g, ISO 724 gives %g", th.Name, th.PitchDiameter(), d2)
		}
	}
}

func TestLookupThread(t *testing.T) {
	for _, name := range ThreadNames() {
		if !strings.Contains(boltsKind.Doc, " "+name+" ") && !strings.Contains(boltsKind.Doc, " "+name+",") &&
			!strings.Contains(boltsKind.Doc, " "+name+".") {
			t.Errorf("the bolts doc does not list %s", name)
		}
	}
	for _, c := range []struct{ name, want string }{
		{"M8", "M8"}, {"M8x1", "M8x1"}, {"M8x1.25", "M8"}, {"M8x1.0", "M8x1"}, {"M2.5", "M2.5"}, {"M24x2", "M24x2"},
		{"M8.0", "M8"}, {"M10x1.250", "M10x1.25"},
	} {
		th, err := LookupThread(c.name)
		if err != nil || th.Name != c.want {
			t.Errorf("LookupThread(%q) = %q, %v; want %q", c.name, th.Name, err, c.want)
		}
	}
	for _, c := range []struct{ name, want string }{
		{"m8", `did you mean "M8"?`},
		{"M8 x 1", `did you mean "M8x1"?`},
		{"M7", `did you mean "M6" or "M8"?`},
		{"M30", `did you mean "M24"?`},
		{"M1", `did you mean "M2"?`},
		{"M10x0.75", `did you mean "M10", "M10x1.25" or "M10x1"?`},
		{"bolt", `write a metric thread as "M8" (coarse) or "M8x1" (fine), a Unified one as "1/4-20"`},
		// strconv would read these as sizes; ISO 261 writes plain decimals.
		{"M1e1", `an exponent is not a size; write M, the nominal diameter in mm and, for a fine thread, "x" and the pitch in mm, in plain decimals, as "M8" or "M8x1"`},
		{"M8x1e0", `an exponent is not a size`},
		{"M+8", `a size has no sign; write M`},
		{"M8x+1", `did you mean "M8x1"?`},
		{"M08", `a size has no leading zero; write M`},
		{"M8x01", `did you mean "M8x1"?`},
		{"M8.0x1.25x", `the designation ends in "x"; write M`},
		{"M8.0x1.25x", `did you mean "M8"?`},
		{"M8.", `did you mean "M8"?`},
		{"M.8", `a size starts with a digit, as 0.8`},
	} {
		th, err := LookupThread(c.name)
		switch {
		case err == nil || !strings.Contains(err.Error(), c.want) || !strings.Contains(err.Error(), "M24x2"):
			t.Errorf("LookupThread(%q) = %q, %v; want an error with %s and the table", c.name, th.Name, err, c.want)
		case strings.Contains(c.want, "exponent") && strings.Contains(err.Error(), "did you mean"):
			t.Errorf("LookupThread(%q): %v; an exponent hides the size, so no guess", c.name, err)
		}
	}
}

func TestBoltsInputErrors(t *testing.T) {
	env := &Env{Materials: mustMaterials(t, map[string]MaterialRow{"test-steel": testSteel()}), Safety: DefaultSafety}
	base := func() map[string]any {
		return map[string]any{"thread": "M8", "count": 6, "property_class": 8.8, "pressure": "10 bar",
			"pressure_diameter": "80 mm", "nut_material": "test-steel", "engagement_length": "8 mm"}
	}
	for _, c := range []struct {
		change map[string]any
		key    string
		want   string
	}{
		{map[string]any{"count": 2.5}, "count", "2.50000 is not a whole number of bolts"},
		{map[string]any{"count": 0}, "count", "out of range"},
		{map[string]any{"count": -3}, "count", "out of range"},
		{map[string]any{"property_class": 8.9}, "property_class", `"8.9" is not known; did you mean "8.8"?`},
		{map[string]any{"thread": "M7"}, "thread", `"M7" is not known; did you mean "M6" or "M8"?`},
		// ISO 898-1 (from memory): class 9.8 is made only up to 16 mm.
		{map[string]any{"property_class": 9.8, "thread": "M18", "engagement_length": "18 mm"}, "property_class", `"9.8" is made only up to 16 mm diameter`},
		{map[string]any{"pressure": "-0.2 bar"}, "pressure", "is not above ambient"},
		{map[string]any{"pressure": "1 bar(a)"}, "pressure", "is not above ambient"},
		{map[string]any{"engagement_length": "1 mm"}, "engagement_length", "less than one pitch of M8"},
		{map[string]any{"engagement_length": "0 mm"}, "engagement_length", "out of range"},
		{map[string]any{"engagement_length": nil}, "engagement_length", `missing: with nut_material = "test-steel"`},
		{map[string]any{"nut_material": "steal"}, "nut_material", "is not known"},
	} {
		inputs := base()
		for k, v := range c.change {
			if v == nil {
				delete(inputs, k)
			} else {
				inputs[k] = v
			}
		}
		_, err := evaluateBoltsBlock(t, inputs, env)
		var list inputerr.List
		if !errors.As(err, &list) || len(list) != 1 || list[0].Key != c.key || !strings.Contains(list[0].Msg, c.want) {
			t.Errorf("%v: got %v; want one error on %s with %q", c.change, err, c.key, c.want)
		}
	}
}

// TestBoltsModelChecksNames covers a caller that skips the block's name
// checks and calls the model directly.
func TestBoltsModelChecksNames(t *testing.T) {
	for key, bad := range map[string]string{"thread": "M9", "property_class": "9.9", "nut_material": "unobtainium"} {
		in := inputsIn(&Env{Materials: mustMaterials(t, map[string]MaterialRow{"test-steel": testSteel()}), Safety: DefaultSafety}, standardAtmosphere, map[string]float64{"count": 4, "pressure": 1e6, "pressure_diameter": 0.05, "engagement_length": 0.01})
		names := map[string]string{"thread": "M8", "property_class": "8.8", "nut_material": "test-steel"}
		names[key] = bad
		for k, v := range names {
			in.SetName(k, v, true)
		}
		_, err := boltsKind.Evaluate(in)
		var ie *calc.InputError
		if !errors.As(err, &ie) || ie.Key != key || !strings.Contains(ie.Message, strconv.Quote(bad)) {
			t.Errorf("%s = %q: got %v; want an input error naming it", key, bad, err)
		}
	}
}

// TestBoltsDefaultNut checks that the default nut material is in the
// built-in table and that the default engagement is 0.8·d.
func TestBoltsDefaultNut(t *testing.T) {
	m, err := DefaultEnv().Materials.Lookup(defaultNutMaterial)
	if err != nil {
		t.Fatal(err)
	}
	e, err := evaluateBoltsBlock(t, map[string]any{"thread": "M10", "count": 4, "property_class": "8.8",
		"pressure": "10 bar", "pressure_diameter": "100 mm"}, DefaultEnv())
	if err != nil {
		t.Fatal(err)
	}
	// Machinery's Handbook internal-thread area at basic size, 0.875·π·d·L_e,
	// with L_e = 0.8·d = 8 mm: 0.875·π·10·8 mm² = 219.911 mm².
	load, _ := e.Result("load_per_bolt")
	strip, _ := e.Result("strip_safety_factor")
	want := 0.6 * m.TensileStrength * 219.911e-6 / load.Value
	if math.Abs(strip.Value-want) > 1e-5*want {
		t.Errorf("strip_safety_factor = %.6g, want %.6g (0.8·d of %s)", strip.Value, want, defaultNutMaterial)
	}
}

// TestBoltsCautions checks that both factors reach the safety-factor rule,
// the strip factor against its nut material.
func TestBoltsCautions(t *testing.T) {
	plastic := MaterialRow{"class": "plastic", "tensile_strength": "50 MPa", "elastic_modulus": "3 GPa",
		"density": "1.2 g/cm3", "service_temperature": "60 degC"}
	env := &Env{Materials: mustMaterials(t, map[string]MaterialRow{"test-plastic": plastic}), Safety: DefaultSafety}
	// 4 × M6 class 8.8 at 8 bar over 60 mm: F_b = 565.5 N, S = 20.6 (as in
	// hand-m6-tapped-aluminium.toml). Into 6 mm of a 50 MPa plastic:
	// S_strip = 0.6 · 50 MPa · 0.875·π·6·6 mm² / 565.5 N = 5.25, above
	// 4; 3 mm of it: 2.62, below the plastics minimum of 4.
	for _, c := range []struct {
		engagement string
		level      calc.Level
	}{{"6 mm", 0}, {"3 mm", calc.Warning}} {
		e, err := evaluateBoltsBlock(t, map[string]any{"thread": "M6", "count": 4, "property_class": "8.8",
			"pressure": "8 bar", "pressure_diameter": "60 mm", "nut_material": "test-plastic", "engagement_length": c.engagement}, env)
		if err != nil {
			t.Fatal(err)
		}
		var got calc.Level
		for _, n := range e.Cautions {
			if n.Rule == "low-safety-factor" {
				got = max(got, n.Level)
				if !strings.Contains(n.Message, "strip_safety_factor") {
					t.Errorf("%s: caution on the wrong factor: %s", c.engagement, n.Message)
				}
			}
		}
		if got != c.level {
			t.Errorf("engagement %s: low-safety-factor at %v, want %v", c.engagement, got, c.level)
		}
	}
}

// TestBoltsClass98UpTo16: class 9.8 holds up to and including 16 mm
// (ISO 898-1, from memory), and the working names the range.
func TestBoltsClass98UpTo16(t *testing.T) {
	env := &Env{Materials: mustMaterials(t, map[string]MaterialRow{"test-steel": testSteel()}), Safety: DefaultSafety}
	out, err := evaluateBoltsBlock(t, map[string]any{"thread": "M16", "count": 6, "property_class": 9.8, "pressure": "10 bar",
		"pressure_diameter": "80 mm", "nut_material": "test-steel", "engagement_length": "16 mm"}, env)
	if err != nil {
		t.Fatal(err)
	}
	r, _ := out.Result("safety_factor")
	if want := "650 MPa (class 9.8, d ≤ 16 mm)"; !strings.Contains(r.Trace.Substituted, want) {
		t.Errorf("working %q lacks %q", r.Trace.Substituted, want)
	}
}

// TestLookupUnifiedThread: Unified designations as people write them, and
// mistakes answered with inch threads only, never a metric size (nor a
// metric designation with an inch one).
func TestLookupUnifiedThread(t *testing.T) {
	for _, c := range []struct{ name, want, series string }{
		{"1/4-20", "1/4-20", "UNC"}, {"1/4-28", "1/4-28", "UNF"}, {"1/4-20 UNC", "1/4-20", "UNC"}, {"1/4-28unf", "1/4-28", "UNF"},
		{"#10-24", "#10-24", "UNC"}, {"10-32", "#10-32", "UNF"}, {"No. 10-32", "#10-32", "UNF"}, {"1-8", "1-8", "UNC"}, {"1-12", "1-12", "UNF"},
	} {
		th, err := LookupThread(c.name)
		if err != nil || th.Name != c.want || th.Series != c.series {
			t.Errorf("LookupThread(%q) = %q %s, %v; want %q %s", c.name, th.Name, th.Series, err, c.want, c.series)
		}
	}
	for _, c := range []struct{ name, want string }{
		{"1/4-24", `did you mean "1/4-20" or "1/4-28"?`},
		{"3/16-24", `did you mean "#8-32" or "#10-24"?`}, // 3/16 = 0.1875 in lies between #8 (0.164) and #10 (0.190)
		{"1/4-20 UNF", `1/4-20 is the UNC series, not UNF`},
		{"1/4x20", `is not a Unified designation; write the size, a hyphen and the threads per inch`},
		{"#7-32", `did you mean "#6-32" or "#8-32"?`},
	} {
		_, err := LookupThread(c.name)
		switch {
		case err == nil || !strings.Contains(err.Error(), c.want) || !strings.Contains(err.Error(), "1-12"):
			t.Errorf("LookupThread(%q): %v; want an error with %s and the Unified table", c.name, err, c.want)
		case regexp.MustCompile(`"M[0-9]`).MatchString(err.Error()) || strings.Contains(err.Error(), "M24"):
			t.Errorf("LookupThread(%q): %v; an inch designation is answered with a metric thread", c.name, err)
		}
	}
	for _, name := range []string{"M7", "M30", "m8"} {
		if _, err := LookupThread(name); err == nil || strings.Contains(err.Error(), "1/4-20") || strings.Contains(err.Error(), "#10") {
			t.Errorf("LookupThread(%q): %v; a metric designation is answered with an inch thread", name, err)
		}
	}
}
