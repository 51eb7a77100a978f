package units

import (
	"math"
	"strings"
)

// suggest returns the accepted spelling closest to the normalized unit key,
// or "" when none is close. Only units for which accept returns true are
// considered (all when accept is nil). A spelling that differs only in case
// wins; otherwise the smallest edit distance, at most 1 for keys of up to
// three letters and 2 for longer ones, ties going to the earlier table row.
// Known slips ("sec" for "s") come first. A pressure mark on a unit that takes none ("atm(g)", "degC(a)") suggests
// the unit without it. A key that reads as prefixed units ("dm3/min",
// "mN") is never answered with a unit of another size (more than a factor
// of 2 off) or quantity; a unit of the same size is proposed instead
// ("L/min").
func suggest(key string, accept func(Unit) bool) string {
	if key == "" {
		return ""
	}
	factor, exps, readable := reading(key)
	// near: a unit of about the size the key reads as, if it reads as one.
	near := func(u Unit) bool {
		return !readable || ExponentsOf(u.Dim) == exps && u.Factor >= factor/2 && u.Factor <= 2*factor
	}
	ok := func(e indexEntry) bool { return e.key != "" && (accept == nil || accept(e.unit)) }
	if hint, found := hints[key]; found && ok(indexEntry{hint, unitIndex[hint]}) {
		return hint
	}
	for _, mark := range []string{"(a)", "(g)"} {
		if base, found := strings.CutSuffix(key, mark); found {
			if u, known := unitIndex[base]; known && ok(indexEntry{base, u}) {
				return base
			}
		}
	}
	// "bar abs", "psi (gauge)": the reference spelled out.
	for _, w := range markWords {
		if base, found := strings.CutSuffix(key, w.word); found {
			if u, known := unitIndex[base+w.mark]; known && ok(indexEntry{base + w.mark, u}) {
				return base + w.mark
			}
		}
	}
	for _, e := range unitSpellings {
		if ok(e) && near(e.unit) && strings.EqualFold(e.key, key) {
			return e.key
		}
	}
	limit := 1
	if len([]rune(key)) > 3 {
		limit = 2
	}
	// One character is at distance 1 from every other: only a unit that
	// starts with it is a guess ("C" for "cm", never "㎤" for "%").
	single := len([]rune(key)) == 1
	best, bestDist := "", limit+1
	lower := strings.ToLower(key)
	for _, e := range unitSpellings {
		if !ok(e) || !near(e.unit) || single && !strings.HasPrefix(strings.ToLower(e.key), lower) {
			continue
		}
		if d := EditDistance(lower, strings.ToLower(e.key)); d < bestDist {
			best, bestDist = e.key, d
		}
	}
	if best != "" || !readable {
		return best
	}
	for _, e := range unitSpellings {
		if ok(e) && e.key == e.unit.Symbol && ExponentsOf(e.unit.Dim) == exps && math.Abs(e.unit.Factor/factor-1) < 1e-9 {
			return e.key
		}
	}
	return ""
}

// markWords are a pressure's reference spelled out after the unit, as
// normalized keys, with the mark meant.
var markWords = []struct{ word, mark string }{
	{" abs", "(a)"}, {" absolute", "(a)"}, {"(abs)", "(a)"}, {"(absolute)", "(a)"},
	{" gauge", "(g)"}, {" gage", "(g)"}, {"(gauge)", "(g)"}, {"(gage)", "(g)"},
}

// hints are near misses beyond edit distance's reach ("sec" is two letters
// from "s"), and Unicode's squared unit symbols spelled out.
var hints = map[string]string{"sec": "s", "hrs": "h",
	"㎤": "cm3", "㎣": "mm3", "㎥": "m3", "㎜": "mm", "㎝": "cm", "㎞": "km", "㎏": "kg", "㎎": "mg",
	"㎩": "Pa", "㎪": "kPa", "㎫": "MPa", "㎬": "GPa", "㎖": "mL", "ℓ": "L", "㎛": "um",
	// Trade spellings whose nearest spelling by letters is another
	// quantity or a factor off: "l/m" is not "L/s", "kp" not "kN".
	"l/m": "L/min", "L/m": "L/min", "kp": "kgf",
	"degrees": "deg", "kelvin": "K", "Kelvin": "K", "percent": "%"}

// EditDistance is the Levenshtein distance between a and b, counted in
// runes. specgen uses it for "did you mean" everywhere.
func EditDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(rb)]
}
