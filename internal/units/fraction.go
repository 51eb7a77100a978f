package units

import (
	"fmt"
	"regexp"
	"strconv"
	"strings"
)

// fraction matches a number written as a fraction, as US drawings and
// catalogues write inches and horsepower: "3/4", "1-1/2" (ASME Y14.5
// writes the whole and the fraction joined by a hyphen; common practice).
var fraction = regexp.MustCompile(`^([+-]?)(?:([0-9]+)-)?([0-9]+)/([0-9]+)`)

// looseFraction matches a fraction written another way: a space, a dash
// or a decimal point where "2-1/4" has none.
var looseFraction = regexp.MustCompile(`^[+-]?([0-9]+(?:\.[0-9]+)?)(?:[\s\p{Zs}]*[-–—][\s\p{Zs}]*|[\s\p{Zs}]+)([0-9]+(?:\.[0-9]+)?)/([0-9]+(?:\.[0-9]+)?)|^[+-]?([0-9]+)/([0-9]+\.[0-9]+)`)

// splitFraction splits s into a leading fraction, as a decimal number, and
// the rest; the number is "" when s does not start with a fraction. A
// fraction written otherwise than "2-1/4" or "3/4" is a problem that says
// how to write it.
func splitFraction(s string) (number, rest, problem string) {
	if !strings.Contains(s, "/") {
		return "", "", "" // both patterns need a slash; most numbers have none
	}
	if m := fraction.FindStringSubmatchIndex(s); m != nil && !strings.ContainsAny(s[m[1]:min(m[1]+1, len(s))], "./0123456789") {
		sign, whole, num, den := s[m[2]:m[3]], s[max(m[4], 0):max(m[5], 0)], s[m[6]:m[7]], s[m[8]:m[9]]
		d, _ := strconv.ParseFloat(den, 64)
		if d == 0 {
			return "", "", ": a fraction's denominator is 0"
		}
		w, _ := strconv.ParseFloat("0"+whole, 64)
		n, _ := strconv.ParseFloat(num, 64)
		v := w + n/d
		if sign == "-" {
			v = -v
		}
		return strconv.FormatFloat(v, 'g', -1, 64), s[m[1]:], ""
	}
	m := looseFraction.FindStringSubmatch(s)
	if m == nil {
		return "", "", ""
	}
	unit := strings.TrimSpace(s[len(m[0]):])
	example := func(whole, num, den string) string {
		w, _ := strconv.ParseFloat(whole, 64)
		n, _ := strconv.ParseFloat(num, 64)
		d, _ := strconv.ParseFloat(den, 64)
		joined := num + "/" + den
		if whole != "0" {
			joined = whole + "-" + joined
		}
		if strings.Contains(whole+num+den, ".") || d == 0 {
			return `"2-1/4 in" or "2.25 in"`
		}
		return fmt.Sprintf("%q or %q", strings.TrimSpace(joined+" "+unit), strings.TrimSpace(strconv.FormatFloat(w+n/d, 'g', -1, 64)+" "+unit))
	}
	if m[1] != "" {
		return "", "", ": fractions are written " + example(m[1], m[2], m[3])
	}
	return "", "", ": fractions are written " + example("0", m[4], m[5])
}
