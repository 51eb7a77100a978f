package units

import (
	"strings"
	"testing"
)

// TestKnownAgreesWithLookup checks that Known names the unit LookupUnit
// finds, and refuses what it refuses, for every accepted spelling, other
// cases of them, and words that are no unit.
func TestKnownAgreesWithLookup(t *testing.T) {
	var words []string
	for key := range spellingUnits {
		words = append(words, key, strings.ToUpper(key), strings.ToLower(key), " "+key+" ")
	}
	words = append(words, "", "±", "2%", "mmm", "psiq", "degC(a)", "of", "C", "bar(d)", "inHg vac")
	for _, w := range words {
		want, err := LookupUnit(w)
		got, ok := Known(w)
		if ok != (err == nil) || got != want {
			t.Errorf("Known(%q) = %+v, %v; LookupUnit gives %+v, %v", w, got, ok, want, err)
		}
	}
}
