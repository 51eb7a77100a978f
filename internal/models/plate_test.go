package models

import (
	"math"
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// navierLoop sums Navier's series for the centre of a simply supported
// a × b plate under load q with rigidity d and Poisson's ratio nu, over
// every odd m and n up to 4001, by sin(mπ/2)·sin(nπ/2) directly: the test's
// own loop, written apart from the model's. It returns the deflection and
// the larger bending moment per unit width.
func navierLoop(a, b, q, d, nu float64) (w, moment float64) {
	var mx, my float64
	for m := 1; m <= 4001; m += 2 {
		for n := 1; n <= 4001; n += 2 {
			s := math.Sin(float64(m)*math.Pi/2) * math.Sin(float64(n)*math.Pi/2)
			k := math.Pow(float64(m)/a, 2) + math.Pow(float64(n)/b, 2)
			w += s / (float64(m*n) * k * k)
			mx += s * (math.Pow(float64(m)/a, 2) + nu*math.Pow(float64(n)/b, 2)) / (float64(m*n) * k * k)
			my += s * (nu*math.Pow(float64(m)/a, 2) + math.Pow(float64(n)/b, 2)) / (float64(m*n) * k * k)
		}
	}
	return 16 * q / (math.Pow(math.Pi, 6) * d) * w, 16 * q / math.Pow(math.Pi, 4) * math.Max(mx, my)
}

// plateReference computes "navier-deflection" and "navier-stress" from the
// block's inputs by the test's own loop.
func plateReference(t *testing.T, ch *caseCheck, _ *calc.Set, e *calc.Evaluated) float64 {
	t.Helper()
	get := func(name string) float64 { return mustInput(t, e, name) }
	m, err := DefaultEnv().Materials.Lookup(e.ModelInputs().NameOf("material"))
	if err != nil {
		t.Fatal(err)
	}
	th := get("thickness")
	d := m.ElasticModulus * th * th * th / (12 * (1 - m.PoissonRatio*m.PoissonRatio))
	w, moment := navierLoop(get("length"), get("width"), get("pressure_difference"), d, m.PoissonRatio)
	switch ch.Basis {
	case "navier-deflection":
		return w
	case "navier-stress":
		return 6 * moment / (th * th)
	}
	t.Fatalf("unknown basis %q", ch.Basis)
	return 0
}

// TestPlateLargeDeflectionNote: a plate that sags more than half its
// thickness says that its small-deflection figures overstate the stress.
// Acrylic Ø300 mm, 3 mm, simply supported, 1 bar: D = 3.2e9 · 0.003³/(12 ·
// (1 − 0.37²)) = 8.342 N·m, w = 5.37 · 1e5 · 0.15⁴/(64 · 8.342 · 1.37)
// = 372 mm, far past 1.5 mm; at 40 mm, (3/40)³ of that: 0.157 mm, under 20 mm.
func TestPlateLargeDeflectionNote(t *testing.T) {
	for _, c := range []struct {
		thickness string
		note      bool
	}{{"3 mm", true}, {"40 mm", false}} {
		set, err := evaluateBlocks(t, []map[string]any{{"id": "lid", "kind": "plate", "shape": "circular", "diameter": "300 mm",
			"thickness": c.thickness, "material": "acrylic", "pressure_difference": "1 bar"}})
		if err != nil {
			t.Fatal(err)
		}
		e, _ := set.Lookup("lid")
		w, _ := e.Result("max_deflection")
		if got := strings.Contains(w.Trace.Substituted, "NOTE: more than half the thickness"); got != c.note {
			t.Errorf("%s: deflection %g m, NOTE %v, want %v (%s)", c.thickness, w.Value, got, c.note, w.Trace.Substituted)
		}
	}
}
