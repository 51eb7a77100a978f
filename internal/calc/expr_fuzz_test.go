package calc

import (
	"errors"
	"math"
	"path/filepath"
	"testing"
	"unicode/utf8"

	"github.com/BurntSushi/toml"

	"github.com/millrace-workshop/specgen/internal/units"
)

// FuzzParseExpr feeds arbitrary text through ParseExpr and, when it parses,
// Eval over values of several dimensions: neither may panic, every error is
// an *ExprError whose column lies within the text, and every result is a
// finite number of a named dimension with a working.
func FuzzParseExpr(f *testing.F) {
	files, _ := filepath.Glob(filepath.Join("..", "..", "testdata", "derive", "*.toml"))
	for _, path := range files {
		var file struct{ Case []struct{ Expr string } }
		if _, err := toml.DecodeFile(path, &file); err != nil {
			f.Fatalf("%s: %v", path, err)
		}
		for _, c := range file.Case {
			f.Add(c.Expr)
		}
	}
	for _, s := range []string{"(((", ")", "-", "--1", "a.b.c", "x-y.z-w", "1e", "1e+", ".e1", "max(,)", "ln()", "é", "\xff"} {
		f.Add(s)
	}
	values := map[string]ExprValue{
		"a": {SI: 2, Dim: units.Length, Unit: "mm"},
		"b": {SI: 0, Dim: units.Dimensionless},
		"p": {SI: 7e5, Dim: units.Pressure, Unit: "bar"},
		"t": {SI: 293.15, Dim: units.Temperature, Unit: "degC"},
		"w": {SI: -3, Dim: units.Power, Unit: "kW"},
	}
	lookup := func(r ExprRef) (ExprValue, bool) {
		v, ok := values[r.Name]
		return v, ok
	}
	f.Fuzz(func(t *testing.T, src string) {
		x, err := ParseExpr(src)
		if err != nil {
			checkExprError(t, src, err)
			return
		}
		_ = x.Refs()
		for _, customary := range []bool{false, true} {
			v, trace, err := x.Eval(lookup, 101325, customary)
			if err != nil {
				checkExprError(t, src, err)
				continue
			}
			if math.IsNaN(v.SI) || math.IsInf(v.SI, 0) || units.DefaultUnit(v.Dim) == "" && v.Dim != units.Dimensionless {
				t.Fatalf("%q = %v", src, v)
			}
			if trace.Substituted == "" {
				t.Fatalf("%q: no working", src)
			}
		}
	})
}

func checkExprError(t *testing.T, src string, err error) {
	t.Helper()
	var ee *ExprError
	if !errors.As(err, &ee) {
		t.Fatalf("%q: error %T %v, want *ExprError", src, err, err)
	}
	if ee.Col < 0 || ee.Col > utf8.RuneCountInString(src)+1 || ee.Msg == "" {
		t.Fatalf("%q: error %#v", src, ee)
	}
}
