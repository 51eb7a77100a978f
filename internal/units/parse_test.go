package units

import (
	"errors"
	"strconv"
	"strings"
	"testing"
)

func TestSpellings(t *testing.T) {
	var file struct {
		Case []struct {
			Text   string
			Dim    string
			Unit   string
			SI     float64
			Source string // where the value comes from; the file's header covers the first cases
		}
	}
	decodeCases(t, "spellings.toml", &file)
	if len(file.Case) == 0 {
		t.Fatal("spellings.toml: no cases")
	}
	for _, c := range file.Case {
		q, err := Parse(c.Text, dimensionNamed(t, c.Dim))
		if err != nil {
			t.Errorf("Parse(%q, %s): %v", c.Text, c.Dim, err)
			continue
		}
		if q.Unit.Symbol != c.Unit || !closeTo(q.Value, c.SI, 1e-9) {
			t.Errorf("Parse(%q, %s) = %.12g %q, want %.12g %q (%s)", c.Text, c.Dim, q.Value, q.Unit.Symbol, c.SI, c.Unit, c.Source)
		}
		if q.Text != strings.TrimSpace(c.Text) || q.Dim.String() != c.Dim {
			t.Errorf("Parse(%q, %s): Text %q, Dim %s", c.Text, c.Dim, q.Text, q.Dim)
		}
	}
}

func TestParseErrors(t *testing.T) {
	var file struct {
		Case []struct {
			Text  string
			Dim   string
			Error string
		}
	}
	decodeCases(t, "parse_errors.toml", &file)
	if len(file.Case) == 0 {
		t.Fatal("parse_errors.toml: no cases")
	}
	for _, c := range file.Case {
		q, err := Parse(c.Text, dimensionNamed(t, c.Dim))
		var e *Error
		switch {
		case err == nil:
			t.Errorf("Parse(%q, %s) = %g, want error containing %q", c.Text, c.Dim, q.Value, c.Error)
		case !errors.As(err, &e):
			t.Errorf("Parse(%q, %s): error %T, want *Error", c.Text, c.Dim, err)
		case !strings.Contains(err.Error(), c.Error):
			t.Errorf("Parse(%q, %s): error %q, want it to contain %q", c.Text, c.Dim, err, c.Error)
		case e.Text != strings.TrimSpace(c.Text):
			t.Errorf("Parse(%q, %s): Error.Text %q", c.Text, c.Dim, e.Text)
		}
	}
}

func TestPressureRef(t *testing.T) {
	refs := map[string]PressureRef{"unmarked": Unmarked, "gauge": Gauge, "absolute": Absolute, "unsettled": Unsettled}
	var file struct {
		Case []struct {
			Text     string
			Ambient  float64
			Ref      string
			Vacuum   bool // a vacuum gauge's reading, down from ambient
			Value    float64
			Absolute float64
			RelTol   float64 `toml:"rel_tol"`
			Source   string
		}
	}
	decodeCases(t, "pressure_ref.toml", &file)
	if len(file.Case) == 0 {
		t.Fatal("pressure_ref.toml: no cases")
	}
	for _, c := range file.Case {
		ref, ok := refs[c.Ref]
		if !ok || c.Source == "" {
			t.Errorf("%q: bad ref %q or no source", c.Text, c.Ref)
			continue
		}
		tol := max(c.RelTol, 1e-12)
		q, err := Parse(c.Text, Pressure)
		if err != nil {
			t.Errorf("Parse(%q, pressure): %v", c.Text, err)
			continue
		}
		if q.Unit.Ref != ref || q.Unit.Vacuum() != c.Vacuum {
			t.Errorf("Parse(%q): Ref %d, vacuum %v; want %s, %v", c.Text, q.Unit.Ref, q.Unit.Vacuum(), c.Ref, c.Vacuum)
		}
		if !closeTo(q.Value, c.Value, tol) {
			t.Errorf("Parse(%q).Value = %.10g, want %.10g (%s)", c.Text, q.Value, c.Value, c.Source)
		}
		if got := q.Absolute(c.Ambient); !closeTo(got, c.Absolute, tol) {
			t.Errorf("Parse(%q).Absolute(%g) = %.10g, want %.10g (%s)", c.Text, c.Ambient, got, c.Absolute, c.Source)
		}
	}
}

// TestAbsoluteOtherDimensions checks that Absolute leaves non-pressures alone,
// stresses included.
func TestAbsoluteOtherDimensions(t *testing.T) {
	for _, c := range []struct {
		text string
		dim  Dimension
	}{{"200 MPa", Stress}, {"20 degC", Temperature}, {"32 mm", Length}} {
		q, err := Parse(c.text, c.dim)
		if err != nil {
			t.Fatalf("Parse(%q): %v", c.text, err)
		}
		if got := q.Absolute(101325); got != q.Value {
			t.Errorf("Parse(%q).Absolute(101325) = %g, want %g", c.text, got, q.Value)
		}
	}
}

// TestStandardFlow: a flow of standard air (ISO 8778 reference atmosphere)
// reads as free air at the ambient pressure, and shows back as written.
func TestStandardFlow(t *testing.T) {
	var file struct {
		Case []struct {
			Text    string
			Ambient float64
			Unit    string
			FreeAir float64 `toml:"free_air"`
			Source  string
		}
	}
	decodeCases(t, "standard_flow.toml", &file)
	if len(file.Case) == 0 {
		t.Fatal("standard_flow.toml: no cases")
	}
	for _, c := range file.Case {
		q, err := Parse(c.Text, VolumeFlow)
		if err != nil || c.Source == "" {
			t.Errorf("Parse(%q): %v (source %q)", c.Text, err, c.Source)
			continue
		}
		if !q.Unit.Standard() || q.Unit.Symbol != c.Unit {
			t.Errorf("Parse(%q): unit %+v, want standard %s", c.Text, q.Unit, c.Unit)
		}
		if got := q.Absolute(c.Ambient); !closeTo(got, c.FreeAir, 1e-9) {
			t.Errorf("Parse(%q).Absolute(%g) = %.10g m3/s of free air, want %.10g (%s)", c.Text, c.Ambient, got, c.FreeAir, c.Source)
		}
		back, err := FromSI(c.FreeAir, VolumeFlow, c.Unit, c.Ambient)
		if want, _ := strconv.ParseFloat(q.Number, 64); err != nil || !closeTo(back, want, 1e-9) {
			t.Errorf("FromSI(%g, %s, %g) = %g, %v; want %g", c.FreeAir, c.Unit, c.Ambient, back, err, want)
		}
	}
}
