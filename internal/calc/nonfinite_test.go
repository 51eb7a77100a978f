package calc

import (
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/units"
)

// TestNonFiniteResultNamesInputs checks that a block whose inputs pass
// their ranges but drive a result to infinity is rejected with a message
// that names the block, the result and the inputs the block wrote.
func TestNonFiniteResultNamesInputs(t *testing.T) {
	cases := []struct {
		name  string
		src   string
		wants []string
	}{
		{
			// The inputs pass their ranges but the (test-only) model
			// overflows: x² for x = 1e200.
			name: "overflowing model",
			src: `id = "sq"
kind = "test-square"
x = 1e200
`,
			wants: []string{"block sq: result square is not a finite number", `x = "1e+200"`},
		},
	}
	square := &Kind{Name: "test-square",
		Inputs:  []InputSpec{{Name: "x", Dim: units.Dimensionless, Range: Positive}},
		Results: []ResultSpec{{Name: "square", Dim: units.Dimensionless}},
		Evaluate: func(in *Inputs) (*Outcome, error) {
			x := in.Value("x")
			return &Outcome{Results: []Result{{Name: "square", Value: x * x, Dim: units.Dimensionless}}}, nil
		}}
	testCatalog, err := NewCatalog([]*Kind{square}, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range cases {
		b, err := testCatalog.ParseBlock("content/index.md", 10, c.src)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		_, err = testCatalog.Evaluate([]*Block{b}, Options{})
		if err == nil {
			t.Fatalf("%s: evaluated without an error", c.name)
		}
		for _, w := range c.wants {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: error %q lacks %q", c.name, err, w)
			}
		}
		if !strings.HasPrefix(err.Error(), "content/index.md:10:") {
			t.Errorf("%s: error %q is not placed at the block's fence", c.name, err)
		}
	}
}

// TestNonFiniteOutcome checks that a curve or table point that is not a
// finite number is found as surely as a result.
func TestNonFiniteOutcome(t *testing.T) {
	nan := func() float64 { var z float64; return z / z }()
	cases := []struct {
		out  Outcome
		want string
	}{
		{Outcome{Results: []Result{{Name: "a", Value: 1}}}, ""},
		{Outcome{Results: []Result{{Name: "a", Value: nan}}}, "result a"},
		{Outcome{Curves: []Curve{{Name: "pv", X: []float64{1, 2}, Y: []float64{1, nan}}}}, "a point of its pv curve"},
		{Outcome{Tables: []Table{{Title: "fill", XS: []float64{nan}, YS: []float64{1}}}}, `a point of its table "fill"`},
	}
	for _, c := range cases {
		if got := nonFinite(&c.out); got != c.want {
			t.Errorf("nonFinite(%+v) = %q, want %q", c.out, got, c.want)
		}
	}
}
