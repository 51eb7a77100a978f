package render

import (
	"regexp"
	"testing"
)

// TestKeepWithUnit checks the no-break spaces against the regular
// expression they were first written with, (\d) (\S) → $1 NBSP $2, which
// the loop replaces for speed (every page's caution boxes pass through it).
func TestKeepWithUnit(t *testing.T) {
	reference := regexp.MustCompile(`(\d) (\S)`)
	for _, s := range []string{
		"", "1", "1 ", "1 2", "1 2 3", "415 °C", "at 6 bar(g) and 900 rpm", "a 1\t2", "1  2", "12 mm 3 4 5",
		"x 9 é 8 \xff", "ends with 7 ", "−3.2 °C; 10 L and 2 N m", "1 1 1 1 1",
	} {
		want := reference.ReplaceAllString(s, "$1\u00a0$2")
		if got := keepWithUnit(s); got != want {
			t.Errorf("keepWithUnit(%q) = %q, want %q", s, got, want)
		}
	}
}
