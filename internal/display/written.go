package display

import (
	"regexp"
	"strings"
	"unicode/utf8"

	"github.com/millrace-workshop/specgen/internal/units"
)

// Minus writes the sign of each negative number in a shown value as the
// minus sign U+2212 of typeset text (ISO 80000-2), which the formulas of a
// working use too: "-3.2 °C" reads "−3.2 °C". A hyphen is a sign at the
// start, or after white space, a bracket, a sign or a slash, and before a
// digit or a point; one within a word or an exponent ("1.2e-5") stays.
func Minus(s string) string {
	var b strings.Builder
	from := 0
	for i := strings.IndexByte(s, '-'); i >= 0 && i < len(s); {
		if i+1 < len(s) && (s[i+1] >= '0' && s[i+1] <= '9' || s[i+1] == '.') && signPlace(s[:i]) {
			b.WriteString(s[from:i])
			b.WriteString("\u2212")
			from = i + 1
		}
		next := strings.IndexByte(s[i+1:], '-')
		if next < 0 {
			break
		}
		i += 1 + next
	}
	if from == 0 {
		return s
	}
	b.WriteString(s[from:])
	return b.String()
}

// signPlace reports whether a hyphen after before is the sign of a number:
// before is empty or ends in white space, an opening bracket, a relation
// or sign, or a slash.
func signPlace(before string) bool {
	if before == "" {
		return true
	}
	r, _ := utf8.DecodeLastRuneInString(before)
	return strings.ContainsRune("\t\n\f\r ([=±≤≥<>/", r)
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
