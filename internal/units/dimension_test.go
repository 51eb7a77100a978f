package units

import (
	"math"
	"strconv"
	"strings"
	"testing"
)

// TestDimensionWords checks that every dimension has a distinct name, that
// the units its messages offer are real units of it, and that its default
// unit is the SI unit.
func TestDimensionWords(t *testing.T) {
	names := map[string]Dimension{}
	for d := range Dimension(len(dimensions)) {
		name := d.String()
		if name == "" || strings.HasPrefix(name, "Dimension(") {
			t.Errorf("dimension %d has no name", int(d))
		}
		if prev, dup := names[name]; dup {
			t.Errorf("dimensions %d and %d are both %q", int(prev), int(d), name)
		}
		names[name] = d

		if d != Dimensionless { // its examples are words: "a plain number or %"
			for sym := range strings.SplitSeq(d.Examples(), ", ") {
				u, err := LookupUnit(sym)
				if err != nil || !fits(u, d) {
					t.Errorf("%s: example unit %q does not fit (%v)", d, sym, err)
				}
			}
		}
		u, err := LookupUnit(DefaultUnit(d))
		if err != nil || !fits(u, d) || u.Factor != 1 || u.Offset != 0 || u.Ref != Unmarked {
			t.Errorf("%s: DefaultUnit %q is not a plain SI unit of it: %+v, %v", d, DefaultUnit(d), u, err)
		}
	}
	bad := Dimension(len(dimensions))
	if bad.String() != "Dimension("+strconv.Itoa(len(dimensions))+")" || bad.Examples() != "" || DefaultUnit(bad) != "" {
		t.Errorf("undeclared dimension: %q, %q, %q", bad.String(), bad.Examples(), DefaultUnit(bad))
	}
	if _, err := Parse("1 m", bad); err == nil {
		t.Error("Parse with an undeclared dimension: no error")
	}
	if _, err := FromSI(1, -1, "m", 0); err == nil {
		t.Error("FromSI with an undeclared dimension: no error")
	}
}

// TestUnitTable checks the table itself: every spelling is reachable (it is
// its own normalized form) and unique, factors are positive and finite,
// offsets belong to temperatures and marks to pressures.
func TestUnitTable(t *testing.T) {
	seen := map[string]bool{}
	for _, e := range unitSpellings {
		if seen[e.key] {
			t.Errorf("spelling %q appears twice", e.key)
		}
		seen[e.key] = true
		if n := normalize(e.key); n != e.key {
			t.Errorf("spelling %q normalizes to %q and cannot be looked up", e.key, n)
		}
		u := e.unit
		if !(u.Factor > 0 || u.Vacuum()) || math.IsInf(u.Factor, 0) {
			t.Errorf("%q: factor %g", e.key, u.Factor)
		}
		if u.Offset != 0 && u.Dim != Temperature {
			t.Errorf("%q: offset on a %s", e.key, u.Dim)
		}
		if u.Ref != Unmarked && u.Dim != Pressure {
			t.Errorf("%q: pressure mark on a %s", e.key, u.Dim)
		}
		if got, err := LookupUnit(u.Symbol); err != nil || got != u {
			t.Errorf("%q: canonical symbol %q looks up as %+v, %v", e.key, u.Symbol, got, err)
		}
	}
}
