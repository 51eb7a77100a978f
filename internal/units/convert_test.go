package units

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func TestFromSI(t *testing.T) {
	var file struct {
		Case []struct {
			SI      float64 `toml:"si"`
			Dim     string
			Unit    string
			Ambient float64
			Want    float64
			RelTol  float64 `toml:"rel_tol"`
			Source  string
		}
		Error []struct {
			SI    float64 `toml:"si"`
			Dim   string
			Unit  string
			Error string
		}
	}
	decodeCases(t, "fromsi.toml", &file)
	if len(file.Case) == 0 || len(file.Error) == 0 {
		t.Fatal("fromsi.toml: no cases")
	}
	for _, c := range file.Case {
		dim := dimensionNamed(t, c.Dim)
		tol := max(c.RelTol, 1e-12)
		got, err := FromSI(c.SI, dim, c.Unit, c.Ambient)
		if err != nil {
			t.Errorf("FromSI(%g, %s, %q): %v", c.SI, c.Dim, c.Unit, err)
			continue
		}
		if !closeTo(got, c.Want, tol) {
			t.Errorf("FromSI(%g, %s, %q, %g) = %.10g, want %.10g (%s)", c.SI, c.Dim, c.Unit, c.Ambient, got, c.Want, c.Source)
		}
		// ToSI is its inverse: the case's reading back to its SI value (a
		// gauge reading to within the digits it keeps of the ambient).
		if si, err := ToSI(c.Want, dim, c.Unit, c.Ambient); err != nil || math.Abs(si-c.SI) > max(tol, 1e-9)*max(math.Abs(c.SI), c.Ambient) {
			t.Errorf("ToSI(%.10g, %s, %q, %g) = %.10g, %v; want %.10g (%s)", c.Want, c.Dim, c.Unit, c.Ambient, si, err, c.SI, c.Source)
		}
		// Round trip: what FromSI shows must parse back to the SI value.
		text := Format(got, 15) + " " + c.Unit
		q, err := Parse(text, dim)
		if err != nil {
			t.Errorf("round trip Parse(%q, %s): %v", text, c.Dim, err)
			continue
		}
		// Gauge readings lose digits relative to the ambient they were taken from.
		if back := q.Absolute(c.Ambient); math.Abs(back-c.SI) > 1e-12*max(math.Abs(c.SI), c.Ambient) {
			t.Errorf("round trip %q: %.15g, want %.15g", text, back, c.SI)
		}
	}
	for _, c := range file.Error {
		got, err := FromSI(c.SI, dimensionNamed(t, c.Dim), c.Unit, 101325)
		var e *Error
		switch {
		case err == nil:
			t.Errorf("FromSI(%g, %s, %q) = %g, want error containing %q", c.SI, c.Dim, c.Unit, got, c.Error)
		case !errors.As(err, &e) || !strings.Contains(err.Error(), c.Error):
			t.Errorf("FromSI(%g, %s, %q): error %q, want *Error containing %q", c.SI, c.Dim, c.Unit, err, c.Error)
		}
	}
}
