package calc

import "specgen/internal/units"

// Suggest returns the candidate closest to s by edit distance, or "" when
// none is close enough to be a likely typo.
func Suggest(s string, candidates []string) string {
	best, bestDist := "", len(s)/2+2
	for _, c := range candidates {
		if d := units.EditDistance(s, c); d < bestDist {
			best, bestDist = c, d
		}
	}
	return best
}
