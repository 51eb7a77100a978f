package display

import (
	"math/rand/v2"
	"regexp"
	"testing"
)

// signedHyphen is the rule Minus follows, as a pattern: a hyphen-minus at
// the start or after white space, a bracket, a relation, a sign or a
// slash, and before a digit or a point.
var signedHyphen = regexp.MustCompile(`(^|[\s(\[=±≤≥<>/])-([0-9.])`)

// TestMinusAsPattern checks Minus's scan against the pattern on chosen
// values and on random strings of the characters that matter.
func TestMinusAsPattern(t *testing.T) {
	cases := []string{"", "-3.2 °C", "1.2e-5 m", "−20 °C", "a-5", "(-5)", "[-0.5, -1]", "≥ -3 bar", "-.5", "--5",
		"x = -2 / -3", "-", "5-", "\t-7\n-8", "p-v", "±-1", "<-2>", "re-expansion -1"}
	r := rand.New(rand.NewPCG(1, 2))
	alphabet := []rune{'-', '5', '.', ' ', 'a', '(', '[', '=', '±', '≤', '/', 'e', '\t', '−', 'é', '>'}
	for range 20000 {
		s := make([]rune, r.IntN(9))
		for i := range s {
			s[i] = alphabet[r.IntN(len(alphabet))]
		}
		cases = append(cases, string(s))
	}
	for _, s := range cases {
		if got, want := Minus(s), signedHyphen.ReplaceAllString(s, "${1}\u2212${2}"); got != want {
			t.Fatalf("Minus(%q) = %q, want %q", s, got, want)
		}
	}
}
