package units

import (
	"math"
	"strconv"
	"strings"
)

// Plain digits are used for magnitudes in [plainMin, plainMax); outside
// that range Format uses exponent notation.
const (
	plainMin = 1e-6
	plainMax = 1e12
)

// Format writes v rounded to sig significant figures (sig below 1 counts
// as 1, above 17 as 17).
//
// Rounding is done on the shortest decimal that reads back as v (what
// strconv and a person see), half away from zero, as by hand: 9.995 is
// "10.0" and 2.5 is "3", although the binary value nearest 9.995 lies
// just below it.
//
// Magnitudes in [1e-6, 1e12) are written in plain digits ("0.000123",
// "19.7", "1230000"); others in exponent notation ("1.23e-9", "4.56e15").
// Significant trailing zeros are kept ("20.0" for 20 at 3 figures), zero is
// "0" whatever its sign, and negative values never round to "-0".
// NaN is written "NaN" and both infinities "Inf", so that callers can
// detect them; they are never meant to be shown.
func Format(v float64, sig int) string {
	switch {
	case math.IsNaN(v):
		return "NaN"
	case math.IsInf(v, 0):
		return "Inf"
	case v == 0:
		return "0"
	}
	sig = min(max(sig, 1), 17)
	sign := ""
	if v < 0 {
		sign = "-"
	}
	digits, exp := roundDigits(math.Abs(v), sig)
	if r := math.Pow10(exp); r < plainMin || r >= plainMax {
		mant := digits[:1]
		if len(digits) > 1 {
			mant += "." + digits[1:]
		}
		return sign + mant + "e" + strconv.Itoa(exp)
	}
	var b strings.Builder
	b.WriteString(sign)
	switch {
	case exp >= len(digits)-1: // integer, padded with zeros
		b.WriteString(digits)
		b.WriteString(strings.Repeat("0", exp-(len(digits)-1)))
	case exp >= 0:
		b.WriteString(digits[:exp+1])
		b.WriteByte('.')
		b.WriteString(digits[exp+1:])
	default:
		b.WriteString("0.")
		b.WriteString(strings.Repeat("0", -exp-1))
		b.WriteString(digits)
	}
	return b.String()
}

// roundDigits returns the sig significant digits of v > 0, rounded half
// away from zero from its shortest decimal form, and the decimal exponent
// of the first digit.
func roundDigits(v float64, sig int) (string, int) {
	e := strconv.FormatFloat(v, 'e', -1, 64) // d.ddde±xx, shortest
	mant, expText, _ := strings.Cut(e, "e")
	exp, _ := strconv.Atoi(expText) // FormatFloat always writes a valid exponent
	digits := []byte(strings.Replace(mant, ".", "", 1))
	if len(digits) <= sig {
		return string(digits) + strings.Repeat("0", sig-len(digits)), exp
	}
	up := digits[sig] >= '5'
	digits = digits[:sig]
	for i := sig - 1; up && i >= 0; i-- {
		if digits[i] == '9' {
			digits[i] = '0'
			continue
		}
		digits[i]++
		up = false
	}
	if up { // 999 became 000: one more digit in front
		digits = append([]byte{'1'}, digits[:sig-1]...)
		exp++
	}
	return string(digits), exp
}
