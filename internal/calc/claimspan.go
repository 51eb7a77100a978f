package calc

import (
	"math"

	"github.com/millrace-workshop/specgen/internal/units"
)

// Span is the band of SI values (pressures absolute, at ambient Pa) that
// the claim allows, ends included; an open side is infinite.
func (c Claim) Span(dim units.Dimension, ambient float64) (lo, hi float64, err error) {
	lo, hi = math.Inf(-1), math.Inf(1)
	switch c.Op {
	case OpAbout:
		tol := c.Tolerance + c.RelTol*math.Abs(c.Value)
		lo, hi = c.Value-tol, c.Value+tol
	case OpAtLeast, OpAbove:
		lo = c.Value
	case OpAtMost, OpBelow:
		hi = c.Value
	}
	for _, end := range []*float64{&lo, &hi} {
		if math.IsInf(*end, 0) {
			continue
		}
		if *end, err = units.ToSI(*end, dim, c.Unit, ambient); err != nil {
			return 0, 0, err
		}
	}
	return lo, hi, nil
}

// CompareClaims tells how the claim now bounds a result against the claim
// before, both as written ("22.5 cm3 ± 2%", ">= 80 L/min") about a result
// of dimension dim: "weakened" when it allows every value the old one did
// and more, "strengthened" when it allows only some of them, "changed"
// otherwise (or when either cannot be read).
func CompareClaims(result, before, now string, dim units.Dimension, ambient float64) string {
	spans := make([][2]float64, 2)
	for i, text := range []string{before, now} {
		c, err := ParseClaim(result, text, dim)
		if err != nil {
			return "changed"
		}
		lo, hi, err := c.Span(dim, ambient)
		if err != nil {
			return "changed"
		}
		spans[i] = [2]float64{lo, hi}
	}
	old, cur := spans[0], spans[1]
	// Ends a rounding apart (80 L/min, 4.8 m3/h) are the same end.
	below := func(a, b float64) bool { return a <= b || !math.IsInf(b, 0) && a-b <= 1e-9*math.Abs(b) }
	wider := below(cur[0], old[0]) && below(old[1], cur[1])
	narrower := below(old[0], cur[0]) && below(cur[1], old[1])
	switch {
	case wider && narrower:
		return "changed" // the same band, written another way
	case wider:
		return "weakened"
	case narrower:
		return "strengthened"
	}
	return "changed"
}
