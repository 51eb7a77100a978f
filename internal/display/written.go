package display

import (
	"regexp"
	"strings"

	"github.com/millrace-workshop/specgen/internal/units"
)

// hyphenMinus finds a hyphen-minus that is the sign of a number: at the
// start, or after a space, bracket or sign, and before a digit.
var hyphenMinus = regexp.MustCompile(`(^|[\s(\[=±≤≥<>/])-([0-9.])`)

// Minus writes the sign of each negative number in a shown value as the
// minus sign U+2212 of typeset text (ISO 80000-2), which the formulas of a
// working use too: "-3.2 °C" reads "−3.2 °C". A hyphen within a word or an
// exponent ("1.2e-5") stays.
func Minus(s string) string {
	if !strings.Contains(s, "-") {
		return s // nothing to change, and no pattern to run
	}
	return hyphenMinus.ReplaceAllString(s, "${1}\u2212${2}")
}

// claimSigns are the ASCII spellings of the signs a claim is written with.
var claimSigns = strings.NewReplacer(">=", "≥", "<=", "≤", "+/-", "±", "+-", "±")

// leadingNumber is a number written against its unit ("4.5cm3").
var leadingNumber = regexp.MustCompile(`^[+\-−]?(?:[0-9]+\.?[0-9]*|\.[0-9]+)(?:[eE][+\-]?[0-9]+)?`)

// maxUnitWords is the most words a unit symbol spans ("kg m2", "N m").
const maxUnitWords = 3

// Written shows a quantity or a claim as its author wrote it, in the
// display form of its signs and units: "4.5 cm3" reads "4.5 cm³", "<= 120
// degC" reads "≤ 120 °C", "-20 degC" reads "−20 °C". The numbers keep the
// figures written; words that are no unit stay as they are.
func Written(text string) string {
	var words []string
	for _, w := range strings.Fields(claimSigns.Replace(text)) {
		if n := leadingNumber.FindString(w); n != "" && n != w {
			if _, ok := units.Known(w[len(n):]); ok {
				words = append(words, n, w[len(n):])
				continue
			}
		}
		words = append(words, w)
	}
	var out []string
	for i := 0; i < len(words); {
		taken := 1
		word := words[i]
		for j := min(len(words), i+maxUnitWords); j > i; j-- {
			if leadingNumber.MatchString(words[i]) {
				break
			}
			if u, ok := units.Known(strings.Join(words[i:j], " ")); ok && u.Symbol != "" {
				taken, word = j-i, units.Pretty(u.Symbol)
				break
			}
		}
		out = append(out, word)
		i += taken
	}
	return Minus(strings.Join(out, " "))
}
