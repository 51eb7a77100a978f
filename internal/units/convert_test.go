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

// TestNormalFlow takes a flow by mass to the reference states of the normal
// units. Hand arithmetic (ideal gas, V ∝ T/p): 100 L/min of free air at
// 1 atm and 20 °C is 100 · 273.15/293.15 = 93.178 Nl/min (DIN 1343: 0 °C,
// 1013.25 mbar) and 100 · 1.01325 = 101.325 l/min ANR (ISO 8778: 20 °C,
// 1 bar(a)); at 7 bar(a) and 20 °C, 10 L/min is 10 · 7/1.01325 · 273.15/293.15
// = 69.0846 · 0.931776 = 64.3714 Nl/min.
func TestNormalFlow(t *testing.T) {
	for _, c := range []struct {
		lpm  float64
		at   GasState
		unit string
		want float64
	}{
		{100, GasState{Pressure: 101325, Temperature: 293.15}, "Nl/min", 93.17755415},
		{100, GasState{Pressure: 101325, Temperature: 293.15}, "l/min ANR", 101.325},
		{10, GasState{Pressure: 7e5, Temperature: 293.15}, "Nl/min", 64.37137},
		{100, GasState{Pressure: 101325, Temperature: 293.15}, "Nm3/h", 5.590653},
	} {
		u, err := LookupUnit(c.unit)
		if err != nil {
			t.Fatal(err)
		}
		got, err := FromSI(NormalFlow(c.lpm*1e-3/60, c.at, u), VolumeFlow, c.unit, 0)
		if err != nil || !closeTo(got, c.want, 1e-6) {
			t.Errorf("%g L/min at %+v in %s: %.9g, %v; want %.9g", c.lpm, c.at, c.unit, got, err, c.want)
		}
	}
}
