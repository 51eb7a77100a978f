package models

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/inputerr"
)

// stageTOML is a valid compressor block: bore 28 mm, stroke 32 mm.
const stageTOML = `id = "low"
kind = "compressor"
title = "Low-pressure stage"
bore = "28 mm"
stroke = "32 mm"
rod_length = "70 mm"
clearance_volume = "1.8 cm3"
speed = "900 rpm"
discharge_pressure = "6 bar"
polytropic_index = 1.3

[expect]
swept_volume = "19.7 cm3 ± 2%"
free_air_delivery = ">= 5 L/min"

[show]
outputs = ["swept_volume cm3", "free_air_delivery L/min", "discharge_temperature degC"]
`

// FuzzParseBlock feeds arbitrary TOML through ParseBlock and, when it
// decodes, Evaluate: neither may panic, every error is placed at a line of
// the block (from its fence to its closing fence), and every input, result
// and checked claim of an evaluated block is a finite number.
func FuzzParseBlock(f *testing.F) {
	seeds := []string{
		stageTOML,
		strings.Replace(stageTOML, `stroke = "32 mm"`, `crank_radius = "16 mm"`, 1),
		strings.Replace(stageTOML, `clearance_volume = "1.8 cm3"`, `clearance_ratio = 0.05`, 1),
		strings.Replace(stageTOML, `"28 mm"`, `"28 psi"`, 1),
		strings.Replace(stageTOML, `"28 mm"`, `"nan mm"`, 1),
		strings.Replace(stageTOML, `1.3`, `nan`, 1),
		strings.Replace(stageTOML, `1.3`, `1e400`, 1),
		strings.Replace(stageTOML, `"70 mm"`, `"15 mm"`, 1),
		strings.Replace(stageTOML, `"900 rpm"`, `"0 rpm"`, 1),
		strings.Replace(stageTOML, `"6 bar"`, `"=low.max_pressure"`, 1),
		strings.Replace(stageTOML, `"6 bar"`, `"600 bar"`, 1),
		strings.Replace(stageTOML, `"28 mm"`, `"28 mm`, 1),
		strings.Replace(stageTOML, "[show]", "ambient_pressure = \"1 bar\"\n[show]", 1),
		strings.Replace(stageTOML, "[show]", "cylinders = 3\nreciprocating_mass = \"0.2 kg\"\n[show]", 1),
		strings.Replace(stageTOML, `"1.8 cm3"`, `"1e-12 mm3"`, 1),
		"id = \"x\"\nkind = \"compresor\"\n",
		"kind = \"compressor\"\n",
		"id = 7\n",
		"",
		"[expect]\n[expect]\n",
		"a = \"\"\"\nb = 1\n\"\"\"\nid = \"q\"\n",
	}
	for i, s := range seeds {
		f.Add(s, uint16(3+i))
	}
	f.Fuzz(func(t *testing.T, src string, fence uint16) {
		fenceLine := int(fence)
		last := fenceLine + strings.Count(src, "\n") + 1 // the closing fence
		checkLines := func(what string, err error) {
			var list inputerr.List
			if !errors.As(err, &list) {
				t.Fatalf("%s: error %T %q is not an Errors list", what, err, err)
			}
			for _, e := range list {
				if e.Line < fenceLine || e.Line > last {
					t.Fatalf("%s: %q is at line %d, outside the block's lines %d..%d", what, e, e.Line, fenceLine, last)
				}
				if e.Msg == "" {
					t.Fatalf("%s: an error without a message at line %d", what, e.Line)
				}
			}
		}
		b, err := testCatalog.ParseBlock("content/index.md", fenceLine, src)
		if err != nil {
			checkLines("ParseBlock", err)
			if b != nil {
				if !b.Broken || b.ID == "" {
					t.Fatal("ParseBlock returned a block with its error, not marked Broken or without an id")
				}
				// A broken block's inputs are checked; it is never evaluated.
				set, err := testCatalog.Evaluate([]*calc.Block{b}, calc.Options{})
				if err != nil {
					checkLines("Evaluate of a broken block", err)
				}
				if _, ok := set.Lookup(b.ID); ok {
					t.Fatal("a broken block was evaluated")
				}
			}
			return
		}
		for _, c := range b.Expect {
			checkClaim(t, c)
		}
		set, err := testCatalog.Evaluate([]*calc.Block{b}, calc.Options{})
		if err != nil {
			checkLines("Evaluate", err)
			return
		}
		e, ok := set.Lookup(b.ID)
		if !ok {
			t.Fatalf("evaluated set lacks block %q", b.ID)
		}
		for _, in := range e.Inputs {
			if !finite(in.Value) {
				t.Fatalf("input %s = %g", in.Name, in.Value)
			}
		}
		for _, r := range e.Results {
			if !finite(r.Value) {
				t.Fatalf("result %s = %g", r.Name, r.Value)
			}
		}
		for _, c := range e.Claims {
			if !finite(c.Computed) || c.Message == "" {
				t.Fatalf("claim %q: computed %g, message %q", c.Claim.Text, c.Computed, c.Message)
			}
		}
	})
}

// checkClaim fails t when a parsed claim holds a non-finite number or a
// negative tolerance.
func checkClaim(t *testing.T, c calc.Claim) {
	t.Helper()
	if !finite(c.Value) || !finite(c.Tolerance) || !finite(c.RelTol) || c.Tolerance < 0 || c.RelTol < 0 {
		t.Fatalf("claim %q: value %g, tolerance %g, relative %g", c.Text, c.Value, c.Tolerance, c.RelTol)
	}
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
