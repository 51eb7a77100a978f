package render

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// appendChartCSV appends every series as rows of series, x, x unit, y,
// y unit, each value to 8 significant figures, as data for other
// programs rather than for reading. Fields are quoted as encoding/csv
// quotes them.
func appendChartCSV(out []byte, c *calc.Chart) ([]byte, error) {
	xConv, err := unitConversion(c.X, c.Ambient)
	if err != nil {
		return nil, err
	}
	xUnit := appendCSVField(nil, c.X.Unit)
	out = append(out, "series,"...)
	out = appendCSVField(out, c.X.Label)
	out = append(out, ",x unit,y,y unit\n"...)
	// Series over the same x values (the torques of one revolution) copy
	// the x fields the first of them wrote: spans are where each one is.
	var spans []int32
	for i, panel := range c.Panels {
		yConv, err := unitConversion(panel.Y, c.Ambient)
		if err != nil {
			return nil, err
		}
		for j, s := range panel.Series {
			if len(s.Y) != len(s.X) {
				return nil, fmt.Errorf("series %q has %d x and %d y values", s.Name, len(s.X), len(s.Y))
			}
			if err := checkFinite(s.X, c.X, xConv); err != nil {
				return nil, err
			}
			if err := checkFinite(s.Y, panel.Y, yConv); err != nil {
				return nil, err
			}
			copied := spans != nil && sameValues(s.X, previousX(c, i, j))
			if !copied {
				spans = nil
				if sameValues(s.X, nextX(c, i, j)) {
					spans = make([]int32, 0, 2*len(s.X))
				}
			}
			name := appendCSVField(nil, s.Name)
			yUnit := appendCSVField(nil, panel.Y.Unit)
			for k, v := range s.X {
				out = append(out, name...)
				out = append(out, ',')
				switch {
				case copied:
					out = append(out, out[spans[2*k]:spans[2*k+1]]...)
				case spans != nil:
					start := len(out)
					out = appendCSVNumber(out, xConv.apply(v))
					spans = append(spans, int32(start), int32(len(out)))
				default:
					out = appendCSVNumber(out, xConv.apply(v))
				}
				out = append(out, ',')
				out = append(out, xUnit...)
				out = append(out, ',')
				out = appendCSVNumber(out, yConv.apply(s.Y[k]))
				out = append(out, ',')
				out = append(out, yUnit...)
				out = append(out, '\n')
			}
		}
	}
	return out, nil
}

// previousX and nextX are the x values of the series before and after
// series j of panel i, in the order the CSV lists them, or nil.
func previousX(c *calc.Chart, i, j int) []float64 {
	switch {
	case j > 0:
		return c.Panels[i].Series[j-1].X
	case i > 0 && len(c.Panels[i-1].Series) > 0:
		return c.Panels[i-1].Series[len(c.Panels[i-1].Series)-1].X
	}
	return nil
}

func nextX(c *calc.Chart, i, j int) []float64 {
	switch {
	case j+1 < len(c.Panels[i].Series):
		return c.Panels[i].Series[j+1].X
	case i+1 < len(c.Panels) && len(c.Panels[i+1].Series) > 0:
		return c.Panels[i+1].Series[0].X
	}
	return nil
}

// sameValues reports whether a and b are one slice of values.
func sameValues(a, b []float64) bool {
	return len(a) > 0 && len(a) == len(b) && &a[0] == &b[0]
}

// checkFinite refuses values that are not finite numbers in an axis's
// unit, as toUnit does.
func checkFinite(si []float64, a calc.Axis, conv affine) error {
	if conv.identity {
		return nil
	}
	for _, v := range si {
		if u := conv.apply(v); math.IsNaN(u) || math.IsInf(u, 0) {
			return nonFiniteError(a)
		}
	}
	return nil
}

// appendCSVField appends one field of a record, quoted where
// encoding/csv's writer quotes it: when it holds a comma, a quote or a
// line break, starts with a space, or is `\.`.
func appendCSVField(b []byte, field string) []byte {
	r, _ := utf8.DecodeRuneInString(field)
	if field != `\.` && !strings.ContainsAny(field, ",\"\r\n") && (field == "" || !unicode.IsSpace(r)) {
		return append(b, field...)
	}
	b = append(b, '"')
	b = append(b, strings.ReplaceAll(field, `"`, `""`)...)
	return append(b, '"')
}

// csvFigures is how many significant figures the CSV gives a value.
const csvFigures = 8

// pow10 are the powers of ten a float64 holds exactly.
var pow10 = [...]float64{1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11,
	1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22}

// appendCSVNumber appends v as strconv.AppendFloat(b, v, 'g', 8, 64)
// does, which was most of the time a chart's CSV took. A value from
// 1e-14 to 1e15 is scaled by an exact power of ten to eight whole digits,
// with one rounding, some 1e-8 at most; where the scaled value's fraction
// lies clear of a half, rounding it gives the digits strconv's exact
// conversion gives. Other values, and those near a half, go to strconv.
func appendCSVNumber(b []byte, v float64) []byte {
	a := math.Abs(v)
	if !(a >= 1e-14 && a < 1e15) {
		return strconv.AppendFloat(b, v, 'g', csvFigures, 64)
	}
	// From the binary exponent, the decimal one or one less: 78913/2^18
	// is log10(2) to six figures.
	exp2 := int(math.Float64bits(a)>>52) - 1023
	exp10 := exp2 * 78913 >> 18
	scaled := scalePow10(a, csvFigures-1-exp10)
	if scaled >= 1e8 {
		exp10++
		scaled = scalePow10(a, csvFigures-1-exp10)
	}
	whole := uint32(scaled)
	frac := scaled - float64(whole)
	if scaled < 1e7 || math.Abs(frac-0.5) < 1e-6 {
		return strconv.AppendFloat(b, v, 'g', csvFigures, 64)
	}
	if frac > 0.5 {
		whole++
	}
	if whole >= 1e8 {
		return strconv.AppendFloat(b, v, 'g', csvFigures, 64)
	}
	var digits [csvFigures]byte
	hi, lo := whole/10000, whole%10000
	for i, pair := range [4]uint32{hi / 100, hi % 100, lo / 100, lo % 100} {
		digits[2*i], digits[2*i+1] = digitPairs[2*pair], digitPairs[2*pair+1]
	}
	nd := csvFigures
	for digits[nd-1] == '0' {
		nd--
	}
	if v < 0 {
		b = append(b, '-')
	}
	return appendGeneral(b, digits[:nd], exp10+1)
}

// digitPairs are the numbers 00 to 99, two digits each.
const digitPairs = "00010203040506070809101112131415161718192021222324252627282930313233343536373839" +
	"40414243444546474849505152535455565758596061626364656667686970717273747576777879" +
	"8081828384858687888990919293949596979899"

// scalePow10 returns a × 10^k for k from -22 to 22, with one rounding.
func scalePow10(a float64, k int) float64 {
	if k < 0 {
		return a / pow10[-k]
	}
	return a * pow10[k]
}

// appendGeneral writes the digits of a value whose decimal point is dp
// digits from their start as strconv's 'g' format with csvFigures
// figures does: plain, or with an exponent when it is below -4 or at
// least the figures shown.
func appendGeneral(b, digits []byte, dp int) []byte {
	nd := len(digits)
	eprec := csvFigures
	if eprec > nd && nd >= dp {
		eprec = nd
	}
	if exp := dp - 1; exp < -4 || exp >= eprec {
		b = append(b, digits[0])
		if nd > 1 {
			b = append(b, '.')
			b = append(b, digits[1:]...)
		}
		b = append(b, 'e')
		if exp < 0 {
			b = append(b, '-')
			exp = -exp
		} else {
			b = append(b, '+')
		}
		if exp < 10 {
			b = append(b, '0')
		}
		return strconv.AppendInt(b, int64(exp), 10)
	}
	if dp > 0 {
		b = append(b, digits[:min(nd, dp)]...)
		for range dp - nd {
			b = append(b, '0')
		}
	} else {
		b = append(b, '0')
	}
	if nd > dp {
		b = append(b, '.')
		for range -dp {
			b = append(b, '0')
		}
		b = append(b, digits[max(dp, 0):]...)
	}
	return b
}
