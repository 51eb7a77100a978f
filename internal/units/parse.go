package units

import (
	"errors"
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Parse reads s, a number and a unit ("32 mm", "6 bar(g)", "20 degC"; the
// space is optional) or, for Dimensionless, a plain number or a percentage,
// as the dimension want. See LookupUnit for the unit spellings.
//
// The dimension settles what the unit alone leaves open: a pressure unit
// read as a Stress must carry no (a) or (g) mark, and a temperature read as
// a TemperatureDifference is a difference ("18 degF" is 10 K). Negative
// absolute temperatures and negative absolute pressures are rejected.
//
// A failure is an *Error whose message starts with the quoted text, e.g.
// `"28 psi" is a pressure; takes a length (mm, cm, m, in, ft)`.
func Parse(s string, want Dimension) (Quantity, error) {
	text := strings.TrimSpace(s)
	if !want.valid() {
		return Quantity{}, newError(text, ": cannot be read as unknown "+want.String())
	}
	if text == "" {
		return Quantity{}, newError(text, ": empty; expected "+want.Article()+" ("+want.Examples()+")")
	}
	// U+2212 is the minus sign of typeset text (ISO 80000-1); no unit holds it.
	numText, rest, problem := splitFraction(strings.ReplaceAll(text, "\u2212", "-"))
	if problem != "" {
		return Quantity{}, newError(text, problem)
	}
	if numText == "" {
		numText, rest = SplitNumber(strings.ReplaceAll(text, "\u2212", "-"))
	}
	if numText == "" {
		return Quantity{}, newError(text, notNumber(text, want))
	}
	if len(rest) > 1 && rest[0] == ',' && isDigit(rest[1]) {
		return Quantity{}, newError(text, ": comma in a number; use a decimal point and no thousands separator")
	}
	if powerOfTen.MatchString(rest) {
		return Quantity{}, newError(text, ": write a power of ten with e, as in \"2.5e-3 m3\" for 2.5 × 10⁻³ m3")
	}
	if groupSeparator.MatchString(rest) {
		return Quantity{}, newError(text, ": a digit group separator inside the number; write it without one (\"1000 mm\", not \"1 000 mm\")")
	}
	v, err := strconv.ParseFloat(numText, 64)
	if errors.Is(err, strconv.ErrRange) {
		return Quantity{}, newError(text, ": number out of range")
	} else if err != nil {
		return Quantity{}, newError(text, ": not a number")
	}

	unitText := strings.TrimSpace(rest)
	if want == Dimensionless && ratioOfOne.MatchString(unitText) {
		return Quantity{}, newError(text, ": a ratio is a plain number; write \""+numText+"\" for "+numText+":1")
	}
	if unitText == "" && want != Dimensionless {
		return Quantity{}, newError(text, ": "+want.Article()+" needs a unit ("+want.Examples()+")")
	}
	u, ok, why := lookup(normalize(unitText), want)
	if why != "" {
		return Quantity{}, newError(text, ": "+quote(unitText)+": "+why)
	}
	if !ok {
		e := newError(text, ": unknown unit "+quote(unitText))
		e.Suggest = suggest(normalize(unitText), func(u Unit) bool { return fits(u, want) })
		if e.Suggest != "" {
			e.msg += "; did you mean " + quote(e.Suggest) + "?"
		} else {
			e.msg += "; " + want.Article() + " takes " + want.Examples()
		}
		return Quantity{}, e
	}
	difference, problem := readAs(u, want)
	if problem != "" {
		return Quantity{}, newError(text, problem)
	}
	value := u.toSI(v, difference)
	switch {
	case math.IsInf(value, 0):
		return Quantity{}, newError(text, ": number out of range")
	case want == Temperature && value < 0:
		return Quantity{}, newError(text, ": below absolute zero")
	case want == Pressure && u.Ref == Absolute && value < 0:
		return Quantity{}, newError(text, ": an absolute pressure cannot be negative")
	case want == Pressure && u.Vacuum() && v < 0:
		return Quantity{}, newError(text, ": a vacuum reading counts down from ambient and is not negative; write a pressure above ambient as gauge, e.g. \"2 psig\"")
	}
	return Quantity{Value: value, Dim: want, Unit: u, Text: text, Number: numText}, nil
}

// powerOfTen matches what follows the number when it was written in
// scientific notation by hand: "× 10³", "x10^-3", "·10⁻⁶", "*10**3".
var powerOfTen = regexp.MustCompile(`^[\s\p{Zs}]*[×xX*·⋅][\s\p{Zs}]*10[\s\p{Zs}]*(\^|\*\*|[⁺⁻⁰¹²³⁴⁵⁶⁷⁸⁹])`)

// ratioOfOne matches the ":1" of a ratio written "7:1".
var ratioOfOne = regexp.MustCompile(`^:[\s\p{Zs}]*1(\.0*)?$`)

// groupSeparator matches what follows the number when it was written with
// its digits grouped in threes by a space, thin space, apostrophe or
// underscore ("1 000", "1'000"), which would otherwise read as a unit.
var groupSeparator = regexp.MustCompile(`^[\s\p{Zs}'’_][0-9]{3}([^0-9]|$)`)

// SplitNumber splits s into a leading decimal number (sign, digits with at
// most one point, optional exponent) and the rest. The number is "" when s
// does not start with one.
func SplitNumber(s string) (number, rest string) {
	i := 0
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		i++
	}
	digits := 0
	for ; i < len(s) && isDigit(s[i]); i++ {
		digits++
	}
	if i < len(s) && s[i] == '.' {
		i++
		for ; i < len(s) && isDigit(s[i]); i++ {
			digits++
		}
	}
	if digits == 0 {
		return "", s
	}
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		j := i + 1
		if j < len(s) && (s[j] == '+' || s[j] == '-') {
			j++
		}
		if j < len(s) && isDigit(s[j]) {
			for j < len(s) && isDigit(s[j]) {
				j++
			}
			i = j
		}
	}
	return s[:i], s[i:]
}

func isDigit(c byte) bool { return '0' <= c && c <= '9' }

// notNumber returns the message for text that does not start with a number,
// saying what a number looks like when the text starts with something that
// only resembles one (full-width or other non-ASCII digits, an invisible
// character).
func notNumber(text string, want Dimension) string {
	t := strings.ToLower(strings.TrimLeft(text, "+-"))
	if strings.HasPrefix(t, "nan") || strings.HasPrefix(t, "inf") {
		return ": not a finite number"
	}
	r, _ := utf8.DecodeRuneInString(t)
	switch {
	case strings.ContainsRune("–—‐‑‒﹣－", r):
		return fmt.Sprintf(": not a number; it starts with %q, a dash: write a minus sign as - or −", r)
	case unicode.IsDigit(r) || unicode.Is(unicode.No, r):
		return fmt.Sprintf(": not a number; %q is not one of the digits 0-9 (write numbers with ASCII digits)", r)
	case r >= utf8.RuneSelf && !unicode.IsLetter(r):
		return fmt.Sprintf(": not a number; it starts with %q, which is not a digit (an invisible or special character?)", r)
	case want == Dimensionless || want.Examples() == "":
		return ": not a number"
	}
	unit, _, _ := strings.Cut(want.Examples(), ",")
	return ": not a number; expected " + want.Article() + " such as " + strconv.Quote("2 "+unit)
}
