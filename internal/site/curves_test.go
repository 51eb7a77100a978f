package site

import (
	"bytes"
	"maps"
	"path/filepath"
	"slices"
	"testing"
)

// TestCurvesSampledAgain: a site whose charted blocks keep no curves past
// the budget draws every chart byte for byte as one that keeps them all;
// once a block's charts are drawn its curves go, and drawing the pages
// again samples them anew, the same.
func TestCurvesSampledAgain(t *testing.T) {
	demo := filepath.Join("..", "..")
	render := func(budget int64) (*Site, map[string][]byte) {
		t.Helper()
		saved := curveBudget
		curveBudget = budget
		defer func() { curveBudget = saved }()
		s, err := Load(demo)
		if err != nil {
			t.Fatal(err)
		}
		files, err := s.Render()
		if err != nil {
			t.Fatal(err)
		}
		return s, files
	}
	_, kept := render(1 << 40)
	s, sampled := render(1)
	compare := func(what string, got map[string][]byte) {
		t.Helper()
		if names := slices.Sorted(maps.Keys(got)); !slices.Equal(names, slices.Sorted(maps.Keys(kept))) {
			t.Fatalf("%s: files differ: %q", what, names)
		}
		for name, b := range kept {
			if !bytes.Equal(got[name], b) {
				t.Errorf("%s: %s differs from the build that keeps every curve", what, name)
			}
		}
	}
	compare("curves sampled again", sampled)
	charted := 0
	for id, left := range s.drawsLeft {
		e, ok := s.Calc.Lookup(id)
		if !ok {
			continue
		}
		charted++
		if left.Load() != 0 || e.Curves != nil {
			t.Errorf("block %s: %d charts left to draw, %d curves kept after the pages are written; want none", id, left.Load(), len(e.Curves))
		}
	}
	if charted < 3 {
		t.Fatalf("the demo charts %d blocks; the test needs a few", charted)
	}
	again, err := s.Render()
	if err != nil {
		t.Fatal(err)
	}
	compare("pages drawn again", again)
}
