package models

import (
	"slices"
	"testing"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// TestSetIndexAsScan checks the set's lookups by role, link and file, which
// the caution rules and charts use, against a scan of every block.
func TestSetIndexAsScan(t *testing.T) {
	cyl := "bore = \"32 mm\"\nstroke = \"28 mm\"\nrod_length = \"70 mm\"\nclearance_volume = \"1.8 cm3\"\nspeed = \"900 rpm\"\ndischarge_pressure = \"6 bar\"\n"
	valve := "seat_diameter = \"6 mm\"\nspring_rate = \"12 N/mm\"\npreload = \"2.4 mm\"\n"
	pages := map[string][]string{
		"content/a.md": {
			"id = \"c1\"\nkind = \"compressor\"\n" + cyl,
			"id = \"t1\"\nkind = \"tank\"\nvolume = \"40 L\"\npressure = \"6 bar\"\nsupply = \"c1\"\n",
			"id = \"v1\"\nkind = \"valve\"\n" + valve + "protects = [\"t1\", \"c1\"]\n",
		},
		"content/b.md": {
			"id = \"c2\"\nkind = \"compressor\"\n" + cyl,
			"id = \"t2\"\nkind = \"tank\"\nvolume = \"20 L\"\npressure = \"6 bar\"\nsupply = \"c2\"\n",
			"id = \"v2\"\nkind = \"valve\"\n" + valve + "protects = [\"t2\"]\n",
		},
	}
	set := evaluatePages(t, pages)
	scan := func(keep func(e *calc.Evaluated) bool) []*calc.Evaluated {
		var out []*calc.Evaluated
		for _, e := range set.Blocks {
			if keep(e) {
				out = append(out, e)
			}
		}
		return out
	}
	for _, r := range []calc.Role{calc.Relieves, calc.Receiver, calc.Delivers, calc.HoldsPressure, calc.Delivers | calc.HoldsPressure} {
		if got, want := set.Having(r), scan(func(e *calc.Evaluated) bool { return e.Block.Kind.Has(r) }); !slices.Equal(got, want) || len(want) == 0 {
			t.Errorf("Having(%b): %d blocks, a scan finds %d", r, len(got), len(want))
		}
	}
	for _, e := range set.Blocks {
		id := e.Block.ID
		if got, want := set.LinkedFrom(id), scan(func(o *calc.Evaluated) bool { return links(o, id) }); !slices.Equal(got, want) {
			t.Errorf("LinkedFrom(%s): %d blocks, a scan finds %d", id, len(got), len(want))
		}
	}
	if got := set.LinkedFrom("c1"); len(got) != 2 { // t1 fills from it, v1 protects it
		t.Errorf("LinkedFrom(c1): %d blocks, want 2", len(got))
	}
	for file := range pages {
		if got, want := set.InFile(file), scan(func(e *calc.Evaluated) bool { return e.Block.File == file }); !slices.Equal(got, want) || len(want) != 3 {
			t.Errorf("InFile(%s): %d blocks, a scan finds %d", file, len(got), len(want))
		}
	}
	// v2 protects t2, which c2 fills: it relieves c2 through the receiver.
	if !relieves(set, mustLookup(t, set, "v2"), "c2") || relieves(set, mustLookup(t, set, "v2"), "c1") {
		t.Error("relieves: v2 must relieve c2 (through t2) and not c1")
	}
}

func mustLookup(t *testing.T, set *calc.Set, id string) *calc.Evaluated {
	t.Helper()
	e, ok := set.Lookup(id)
	if !ok {
		t.Fatalf("no block %s", id)
	}
	return e
}
