package calc

import (
	"fmt"
	"strings"

	"github.com/millrace-workshop/specgen/internal/inputerr"
	"github.com/millrace-workshop/specgen/internal/units"
)

// anyDimension is the dimension of a free input that quotes another
// block's value: it takes the dimension of what it quotes.
const anyDimension units.Dimension = -1

// freeInput makes the input spec of a key of a block whose kind takes any
// key as an input (Kind.FreeInputs), its dimension read from the value:
// the unit written ("1.5 kW" is a power), a plain number, or a quote. A
// temperature in K or degR is an interval: degC and degF mean points.
func (b *Block) freeInput(key string, v any) (InputSpec, *inputerr.Error) {
	spec := InputSpec{Name: key, Meaning: "given in the block"}
	bad := func(format string, args ...any) (InputSpec, *inputerr.Error) {
		return spec, &inputerr.Error{File: b.File, Line: b.lineOf(key), Key: key, Msg: fmt.Sprintf(format, args...)}
	}
	text, isString := v.(string)
	switch {
	case !isString:
		spec.Dim = units.Dimensionless
		return spec, nil
	case strings.HasPrefix(strings.TrimSpace(text), "="):
		spec.Dim = anyDimension
		return spec, nil
	}
	_, unit := units.SplitNumber(strings.TrimSpace(text))
	unit = strings.TrimSpace(unit)
	if unit == "" {
		spec.Dim = units.Dimensionless
		return spec, nil
	}
	u, err := units.LookupUnit(unit)
	if err != nil {
		return bad("%q: %v; a %s block's values are a number and a unit, such as \"1.5 kW\" or \"8 bar\"", text, err, b.Kind.Name)
	}
	spec.Dim = u.Dim
	if u.Dim == units.Temperature && (u.Symbol == "K" || u.Symbol == "degR") {
		spec.Dim = units.TemperatureDifference
	}
	return spec, nil
}
