package site

import (
	"math/rand/v2"
	"strings"
	"testing"
	"unicode"
)

// TestDistinctWordsAsFields checks the search index's word list against
// the plain way: every field of the lower-cased text, the first n kept.
func TestDistinctWordsAsFields(t *testing.T) {
	plain := func(text string, n int) string {
		seen := map[string]bool{}
		var words []string
		for _, w := range strings.FieldsFunc(strings.ToLower(text), func(r rune) bool {
			return !unicode.IsLetter(r) && !unicode.IsDigit(r)
		}) {
			if !seen[w] {
				seen[w] = true
				words = append(words, w)
			}
			if len(words) == n {
				break
			}
		}
		return strings.Join(words, " ")
	}
	r := rand.New(rand.NewPCG(5, 6))
	pieces := []string{"Bore", "bore", " ", "32", "mm", "—", "İstanbul", "ÉTÉ", "\xff", "\u0307", "x", ".", "\n", "Ø", "ß", "2-1/4"}
	cases := []string{"", "   ", "Bore 32 mm, bore 32 MM.", "İ İ i"}
	for range 5000 {
		var b strings.Builder
		for range r.IntN(12) {
			b.WriteString(pieces[r.IntN(len(pieces))])
		}
		cases = append(cases, b.String())
	}
	for _, text := range cases {
		for _, n := range []int{1, 3, 100} {
			if got, want := distinctWords(text, n), plain(text, n); got != want {
				t.Fatalf("distinctWords(%q, %d) = %q, want %q", text, n, got, want)
			}
		}
	}
}
