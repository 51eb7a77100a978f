package models

import (
	"errors"
	"maps"
	"slices"
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/inputerr"
)

// wantInputError evaluates the blocks site(changes) builds and checks that
// they fail with exactly one error, on key, whose message says every one
// of says.
func wantInputError(t *testing.T, changes map[string]any, key string, says []string, site func(map[string]any) []map[string]any) {
	t.Helper()
	_, err := evaluateBlocks(t, site(changes))
	var list inputerr.List
	if !errors.As(err, &list) || len(list) != 1 {
		t.Errorf("%v: got %v, want one error", changes, err)
		return
	}
	if list[0].Key != key {
		t.Errorf("%v: error blames %q, want %q (%v)", changes, list[0].Key, key, list[0])
	}
	for _, s := range says {
		if !strings.Contains(list[0].Msg, s) {
			t.Errorf("%v: message %q does not say %q", changes, list[0].Msg, s)
		}
	}
}

// NewInputs returns inputs with the given SI values, all marked as given,
// in the default environment.
func NewInputs(ambient float64, values map[string]float64) *calc.Inputs {
	return inputsIn(DefaultEnv(), ambient, values)
}

// inputsIn returns inputs with the given SI values, all marked as given,
// in the site settings env.
func inputsIn(env *Env, ambient float64, values map[string]float64) *calc.Inputs {
	in := calc.NewInputs(ambient, env)
	for k, v := range values {
		in.Set(k, v, true)
	}
	return in
}

// evaluateSources parses each TOML source as a block of file, 20 lines
// apart, and evaluates them together.
func evaluateSources(t *testing.T, file string, srcs []string) *calc.Set {
	t.Helper()
	return evaluatePages(t, map[string][]string{file: srcs})
}

// evaluatePages is evaluateSources for the blocks of several pages,
// evaluated together.
func evaluatePages(t *testing.T, pages map[string][]string) *calc.Set {
	t.Helper()
	var blocks []*calc.Block
	for _, file := range slices.Sorted(maps.Keys(pages)) {
		for i, src := range pages[file] {
			b, err := testCatalog.ParseBlock(file, 20*i, src)
			if err != nil {
				t.Fatal(err)
			}
			blocks = append(blocks, b)
		}
	}
	set, err := testCatalog.Evaluate(blocks, calc.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return set
}

// testCatalog is every kind and rule with the built-in materials.
var testCatalog = func() *calc.Catalog {
	c, err := NewCatalog(nil)
	if err != nil {
		panic(err)
	}
	return c
}()

// catalogWith is every kind and rule with the site settings env.
func catalogWith(t testing.TB, env *Env) *calc.Catalog {
	t.Helper()
	c, err := NewCatalog(env)
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// mustMaterials returns the built-in table with rows over it.
func mustMaterials(t *testing.T, rows map[string]MaterialRow) *Materials {
	t.Helper()
	base, err := DefaultMaterials()
	if err != nil {
		t.Fatal(err)
	}
	m, err := base.With(rows, nil, "")
	if err != nil {
		t.Fatal(err)
	}
	return m
}
