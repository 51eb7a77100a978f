package calc

import (
	"errors"
	"math"
	"path/filepath"
	"strings"
	"testing"

	"github.com/BurntSushi/toml"

	"github.com/millrace-workshop/specgen/internal/units"
)

// deriveCase is one case of testdata/derive: an expression over named
// inputs, and the value it must give or the error it must raise.
type deriveCase struct {
	Expr string
	// Inputs are quantities as a figures block writes them, read as the
	// dimension of their unit (plain pressure units gauge); "dimension: text"
	// reads them as that dimension ("temperature difference: 10 K").
	Inputs    map[string]string
	Customary bool
	Ambient   string  // default 101325 Pa
	Want      string  // the value, read as Dim
	Dim       string  // the dimension the result must have
	Unit      string  // the result's display unit, when checked
	RelTol    float64 `toml:"rel_tol"`
	Trace     string  // a fragment of the working (Substituted)
	Error     string  // a fragment of the message, instead of Want
	Col       int     // the column the error must point at, when checked
	Source    string
}

// TestDerive runs every case of testdata/derive.
func TestDerive(t *testing.T) {
	files, _ := filepath.Glob(filepath.Join("..", "..", "testdata", "derive", "*.toml"))
	if len(files) == 0 {
		t.Fatal("no testdata/derive/*.toml")
	}
	for _, path := range files {
		var file struct{ Case []deriveCase }
		md, err := toml.DecodeFile(path, &file)
		if err != nil {
			t.Fatalf("%s: %v", path, err)
		}
		if keys := md.Undecoded(); len(keys) > 0 {
			t.Fatalf("%s: unknown keys %v", path, keys)
		}
		if len(file.Case) == 0 {
			t.Errorf("%s: no cases", path)
		}
		for _, c := range file.Case {
			t.Run(filepath.Base(path)+"/"+c.Expr, func(t *testing.T) { runDeriveCase(t, c) })
		}
	}
}

func runDeriveCase(t *testing.T, c deriveCase) {
	if c.Source == "" {
		t.Fatal("every case names its source")
	}
	if (c.Error == "") == (c.Want == "") {
		t.Fatal("a case gives either want or error")
	}
	ambient := 101325.0
	if c.Ambient != "" {
		ambient = parseAbsolute(t, c.Ambient, units.Pressure, 0)
	}
	inputs := map[ExprRef]ExprValue{}
	for name, text := range c.Inputs {
		dim, q := readDeriveInput(t, text)
		ref := ExprRef{Name: name}
		if b, n, ok := strings.Cut(name, "."); ok {
			ref = ExprRef{Block: b, Name: n}
		}
		inputs[ref] = ExprValue{SI: q.Absolute(ambient), Dim: dim, Unit: q.Unit.Symbol}
	}
	lookup := func(r ExprRef) (ExprValue, bool) { v, ok := inputs[r]; return v, ok }
	v, trace, err := evalExpr(c.Expr, lookup, ambient, c.Customary)
	if c.Error != "" {
		var ee *ExprError
		switch {
		case err == nil:
			t.Fatalf("= %g %s (%s), want error containing %q", v.SI, v.Dim, trace.Substituted, c.Error)
		case !errors.As(err, &ee):
			t.Fatalf("error %T %v, want *ExprError", err, err)
		case !strings.Contains(err.Error(), c.Error):
			t.Errorf("error %q, want it to contain %q", err, c.Error)
		}
		if c.Col != 0 && ee.Col != c.Col {
			t.Errorf("error at column %d, want %d: %v", ee.Col, c.Col, err)
		}
		return
	}
	if err != nil {
		t.Fatalf("error: %v", err)
	}
	if c.Dim == "" || c.RelTol <= 0 {
		t.Fatal("a case with want gives dim and a positive rel_tol")
	}
	dim := dimensionNamed(t, c.Dim)
	want := parseAbsolute(t, c.Want, dim, ambient)
	if v.Dim != dim {
		t.Errorf("dimension %s, want %s", v.Dim, dim)
	}
	if math.Abs(v.SI-want) > c.RelTol*math.Abs(want) && v.SI != want {
		t.Errorf("= %.10g SI, want %.10g (%s) ± %g (%s)", v.SI, want, c.Want, c.RelTol, c.Source)
	}
	if c.Unit != "" && v.Unit != c.Unit {
		t.Errorf("display unit %q, want %q", v.Unit, c.Unit)
	}
	if !strings.Contains(trace.Substituted, c.Trace) {
		t.Errorf("working %q, want it to contain %q", trace.Substituted, c.Trace)
	}
	if trace.Formula != strings.TrimSpace(c.Expr) {
		t.Errorf("formula %q, want the expression as written", trace.Formula)
	}
}

// evalExpr parses and evaluates src.
func evalExpr(src string, lookup func(ExprRef) (ExprValue, bool), ambient float64, customary bool) (ExprValue, Trace, error) {
	x, err := ParseExpr(src)
	if err != nil {
		return ExprValue{}, Trace{}, err
	}
	return x.Eval(lookup, ambient, customary)
}

// readDeriveInput reads an input of a case: "2 kW", or "stress: 200 MPa".
func readDeriveInput(t *testing.T, text string) (units.Dimension, units.Quantity) {
	t.Helper()
	var dim units.Dimension
	if name, rest, ok := strings.Cut(text, ": "); ok {
		dim, text = dimensionNamed(t, name), rest
	} else {
		_, unit, _ := strings.Cut(strings.TrimSpace(text), " ")
		u, err := units.LookupUnit(unit)
		if err != nil {
			t.Fatalf("input %q: %v", text, err)
		}
		dim = u.Dim
	}
	q, err := units.Parse(text, dim)
	if err != nil {
		t.Fatalf("input %q: %v", text, err)
	}
	return dim, q
}

// parseAbsolute reads text as dim, in SI with a pressure absolute.
func parseAbsolute(t *testing.T, text string, dim units.Dimension, ambient float64) float64 {
	t.Helper()
	q, err := units.Parse(text, dim)
	if err != nil {
		t.Fatalf("%q: %v", text, err)
	}
	return q.Absolute(ambient)
}

// TestExprRefs checks that Refs lists each name once, in order, and reads
// block ids with '-' in them.
func TestExprRefs(t *testing.T) {
	x, err := ParseExpr("max(a, lp-stage.shaft_power) / a + b.c - d-e")
	if err != nil {
		t.Fatal(err)
	}
	got := x.Refs()
	want := []ExprRef{{Name: "a"}, {Block: "lp-stage", Name: "shaft_power"}, {Block: "b", Name: "c"}, {Name: "d"}, {Name: "e"}}
	if len(got) != len(want) {
		t.Fatalf("Refs = %v, want %v", got, want)
	}
	for i := range want {
		if got[i] != want[i] {
			t.Errorf("Refs[%d] = %v, want %v", i, got[i], want[i])
		}
	}
	if s := want[1].String(); s != "lp-stage.shaft_power" {
		t.Errorf("String = %q", s)
	}
}

// TestExprUnknown checks that an unknown name is reported with its column
// and the name itself, for the caller's "did you mean".
func TestExprUnknown(t *testing.T) {
	x, err := ParseExpr("2 × lp.shaft_powr")
	if err != nil {
		t.Fatal(err)
	}
	_, _, err = x.Eval(func(ExprRef) (ExprValue, bool) { return ExprValue{}, false }, 101325, false)
	var ee *ExprError
	if !errors.As(err, &ee) || ee.Unknown == nil || *ee.Unknown != (ExprRef{Block: "lp", Name: "shaft_powr"}) || ee.Col != 5 {
		t.Fatalf("error %#v, want unknown lp.shaft_powr at column 5", err)
	}
}
