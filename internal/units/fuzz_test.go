package units

import (
	"errors"
	"math"
	"strconv"
	"strings"
	"testing"
)

// FuzzParse checks that Parse never panics, that a success is a finite
// value whose unit symbol looks up as the same unit and whose formatting is
// never "-0", and that a failure is an *Error quoting the text.
func FuzzParse(f *testing.F) {
	for _, s := range []string{"32 mm", "6 bar(g)", "20 °C", "-0 mm", "1e400 mm", "NaN", "1,5 m", "5 N·m",
		"85%", "-1e-320 psia", "0.000001 um", "1e308 ksi", "kPa (a)", "+.5e-3 lbf ft", "\xff"} {
		for d := range Dimension(len(dimensions)) {
			f.Add(s, uint8(d))
		}
	}
	f.Fuzz(func(t *testing.T, s string, dim uint8) {
		want := Dimension(int(dim) % len(dimensions))
		q, err := Parse(s, want)
		if err != nil {
			e, ok := err.(*Error)
			if !ok || !strings.HasPrefix(e.Error(), strconv.Quote(strings.TrimSpace(s))) {
				t.Fatalf("Parse(%q, %s): error %T %q does not quote the text", s, want, err, err)
			}
			return
		}
		if math.IsNaN(q.Value) || math.IsInf(q.Value, 0) {
			t.Fatalf("Parse(%q, %s) = %g", s, want, q.Value)
		}
		if u, err := LookupUnit(q.Unit.Symbol); err != nil || u != q.Unit {
			t.Fatalf("Parse(%q, %s): unit %+v does not look up as itself: %+v, %v", s, want, q.Unit, u, err)
		}
		for sig := 1; sig <= 17; sig++ {
			if out := Format(q.Value, sig); isNegativeZero(out) {
				t.Fatalf("Format(%g, %d) = %q", q.Value, sig, out)
			}
		}
	})
}

// FuzzFormat checks that Format's output reads back within its rounding
// and is never "-0".
func FuzzFormat(f *testing.F) {
	for _, v := range []float64{0, -0.0001, 19.7, 1e12, 999999999999.6, 5e-324, -1.7976931348623157e308} {
		f.Add(v, int8(3))
	}
	f.Fuzz(func(t *testing.T, v float64, sig int8) {
		out := Format(v, int(sig))
		if math.IsNaN(v) || math.IsInf(v, 0) {
			if out != "NaN" && out != "Inf" {
				t.Fatalf("Format(%g) = %q", v, out)
			}
			return
		}
		if isNegativeZero(out) {
			t.Fatalf("Format(%g, %d) = %q", v, sig, out)
		}
		back, err := strconv.ParseFloat(out, 64)
		n := min(max(int(sig), 1), 17)
		if errors.Is(err, strconv.ErrRange) && math.Abs(v) > math.MaxFloat64/(1+math.Pow10(1-n)) {
			return // rounded up past the largest float64, e.g. "1.80e308"
		}
		if err != nil || math.Abs(back-v) > math.Pow10(1-n)*math.Abs(v) {
			t.Fatalf("Format(%g, %d) = %q reads back as %g, %v", v, sig, out, back, err)
		}
	})
}

// isNegativeZero reports whether a formatted number is a minus sign with no
// non-zero digit before its exponent.
func isNegativeZero(s string) bool {
	mant, _, _ := strings.Cut(s, "e")
	return strings.HasPrefix(mant, "-") && strings.Trim(mant, "-0.") == ""
}
