package calc

import (
	"strings"

	"github.com/millrace-workshop/specgen/internal/units"
)

// Suggest returns the candidate closest to s by edit distance, or "" when
// none is close enough to be a likely typo. Failing that, a candidate that
// is the only one to start with s ("aluminium" for "aluminium-6061-t6") is
// what the user most likely meant.
func Suggest(s string, candidates []string) string {
	best, bestDist := "", len(s)/2+2
	for _, c := range candidates {
		if d := units.EditDistance(s, c); d < bestDist {
			best, bestDist = c, d
		}
	}
	if best != "" || len(s) < 3 {
		return best
	}
	for _, c := range candidates {
		if strings.HasPrefix(c, s) {
			if best != "" {
				return ""
			}
			best = c
		}
	}
	return best
}
