package units

import (
	"math"
	"strings"
)

// siPrefixes are the SI prefixes a misspelt unit may carry (SI Brochure,
// 9th ed., Table 7), longest first so that "da" is not read as "d".
var siPrefixes = []struct {
	symbol string
	factor float64
}{
	{"da", 1e1}, {"p", 1e-12}, {"n", 1e-9}, {"u", 1e-6}, {"m", 1e-3}, {"c", 1e-2}, {"d", 1e-1},
	{"h", 1e2}, {"k", 1e3}, {"M", 1e6}, {"G", 1e9}, {"T", 1e12},
}

// prefixable are the SI units the prefixes attach to, with their powers of
// the base unit: "dm3" is (0.1 m)³.
var prefixable = []struct {
	symbol string
	power  int8
}{{"m", 1}, {"g", 1}, {"s", 1}, {"L", 1}, {"l", 1}, {"Pa", 1}, {"bar", 1}, {"N", 1}, {"W", 1}, {"J", 1}, {"Wh", 1}}

// reading is what a unit spelling the table lacks plainly means: a product
// and quotient of table units and prefixed SI units ("dm3/min", "mN",
// "kgf m"), its factor to SI and its base-unit exponents. ok is false for
// a spelling with no such reading ("mmm", "xyz").
func reading(key string) (factor float64, exps Exponents, ok bool) {
	num, den, _ := strings.Cut(key, "/")
	if strings.Contains(den, "/") {
		return 0, Exponents{}, false
	}
	factor = 1
	for i, part := range []string{num, den} {
		if i == 1 && den == "" {
			break
		}
		sign := int8(1 - 2*i)
		for _, word := range strings.Fields(part) {
			f, e, known := wordReading(word)
			if !known {
				return 0, Exponents{}, false
			}
			factor *= math.Pow(f, float64(sign))
			for j := range exps {
				exps[j] += sign * e[j]
			}
		}
	}
	return factor, exps, true
}

// wordReading reads one word of a unit: a table unit without offset or
// mark, or a prefixed SI unit with an optional power ("dm3", "kN").
func wordReading(word string) (float64, Exponents, bool) {
	if u, ok := unitIndex[word]; ok && u.Offset == 0 && u.Ref == Unmarked && !u.Standard() && u.Dim != Pressure {
		return u.Factor, ExponentsOf(u.Dim), true
	}
	for _, p := range siPrefixes {
		rest, found := strings.CutPrefix(word, p.symbol)
		if !found {
			continue
		}
		for _, base := range prefixable {
			powerText, found := strings.CutPrefix(rest, base.symbol)
			if !found || len(powerText) > 1 || (powerText != "" && (powerText[0] < '2' || powerText[0] > '3')) {
				continue
			}
			power := base.power
			if powerText != "" {
				power = int8(powerText[0] - '0')
			}
			u := unitIndex[base.symbol]
			if base.symbol == "bar" || base.symbol == "Pa" {
				u = Unit{Factor: u.Factor, Dim: Stress}
			}
			e := ExponentsOf(u.Dim)
			for j := range e {
				e[j] *= power
			}
			return math.Pow(p.factor, float64(power)) * u.Factor, e, true
		}
	}
	return 0, Exponents{}, false
}
