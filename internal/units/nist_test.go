package units

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/unit/constant"
)

// dimensionNamed returns the dimension whose String is name.
func dimensionNamed(t testing.TB, name string) Dimension {
	t.Helper()
	for d := range Dimension(len(dimensions)) {
		if d.String() == name {
			return d
		}
	}
	t.Fatalf("unknown dimension %q in test data", name)
	return 0
}

// closeTo reports whether got is within rel of want, relative to |want|
// (absolute when want is zero).
func closeTo(got, want, rel float64) bool {
	return math.Abs(got-want) <= rel*math.Max(math.Abs(want), 1e-300) || got == want
}

func TestNIST(t *testing.T) {
	var file struct {
		Case []struct {
			Text   string
			Dim    string
			SI     float64
			RelTol float64 `toml:"rel_tol"`
			Source string
		}
	}
	decodeCases(t, "nist_sp811.toml", &file)
	if len(file.Case) == 0 {
		t.Fatal("nist_sp811.toml: no cases")
	}
	for _, c := range file.Case {
		if c.Source == "" || c.RelTol <= 0 {
			t.Errorf("%q: every case needs a source and a positive rel_tol", c.Text)
			continue
		}
		q, err := Parse(c.Text, dimensionNamed(t, c.Dim))
		if err != nil {
			t.Errorf("Parse(%q, %s): %v", c.Text, c.Dim, err)
			continue
		}
		if !closeTo(q.Value, c.SI, c.RelTol) {
			t.Errorf("Parse(%q, %s) = %.10g, want %.10g ± %g (%s)", c.Text, c.Dim, q.Value, c.SI, c.RelTol, c.Source)
		}
	}
}

// TestGravity checks the standard gravity behind lbf and kgf against gonum,
// a general-purpose reference library (CGPM 1901: g_n = 9.80665 m/s2, exact).
func TestGravity(t *testing.T) {
	if gravity != float64(constant.StandardGravity) {
		t.Errorf("standard gravity %g, gonum has %g", gravity, float64(constant.StandardGravity))
	}
}
