package calcdiff

import (
	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/units"
)

// rewrite tells how a claim's new text bounds the result against its old
// text: "weakened", "strengthened" or "changed". siUnit is the result's
// unit in results.json, which gives its dimension; gauge pressures are
// read at a standard atmosphere, alike on both sides.
func rewrite(before, now, result, siUnit string) string {
	u, err := units.LookupUnit(siUnit)
	if err != nil {
		return "changed"
	}
	return calc.CompareClaims(result, before, now, u.Dim, calc.DefaultAmbient)
}
