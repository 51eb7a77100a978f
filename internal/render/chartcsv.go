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

// chartCSV writes every series as rows of series, x, x unit, y, y unit,
// each value to 8 significant figures, as data for other programs rather
// than for reading. Fields are quoted as encoding/csv quotes them.
func chartCSV(c *calc.Chart) ([]byte, error) {
	xConv, err := unitConversion(c.X, c.Ambient)
	if err != nil {
		return nil, err
	}
	xUnit := appendCSVField(nil, c.X.Unit)
	size := 64 + len(c.X.Label)
	for _, panel := range c.Panels {
		for _, s := range panel.Series {
			// 15 bytes hold any value to 8 figures: "-1.2345678e-100".
			size += len(s.X) * (len(s.Name) + len(xUnit) + len(panel.Y.Unit) + 2*15 + 8)
		}
	}
	out := make([]byte, 0, size)
	out = append(out, "series,"...)
	out = appendCSVField(out, c.X.Label)
	out = append(out, ",x unit,y,y unit\n"...)
	for _, panel := range c.Panels {
		yConv, err := unitConversion(panel.Y, c.Ambient)
		if err != nil {
			return nil, err
		}
		for _, s := range panel.Series {
			if len(s.Y) != len(s.X) {
				return nil, fmt.Errorf("series %q has %d x and %d y values", s.Name, len(s.X), len(s.Y))
			}
			if err := checkFinite(s.X, c.X, xConv); err != nil {
				return nil, err
			}
			if err := checkFinite(s.Y, panel.Y, yConv); err != nil {
				return nil, err
			}
			name := appendCSVField(nil, s.Name)
			yUnit := appendCSVField(nil, panel.Y.Unit)
			for i, v := range s.X {
				out = append(out, name...)
				out = append(out, ',')
				out = strconv.AppendFloat(out, xConv.apply(v), 'g', 8, 64)
				out = append(out, ',')
				out = append(out, xUnit...)
				out = append(out, ',')
				out = strconv.AppendFloat(out, yConv.apply(s.Y[i]), 'g', 8, 64)
				out = append(out, ',')
				out = append(out, yUnit...)
				out = append(out, '\n')
			}
		}
	}
	return out, nil
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
