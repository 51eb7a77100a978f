package units

import "strings"

// Pretty writes a canonical unit symbol for reading: "cm3" → "cm³",
// "degC" → "°C", "N m" → "N·m", "deg" → "°". Parse reads every spelling
// Pretty writes.
func Pretty(symbol string) string {
	switch symbol {
	case "degC":
		return "°C"
	case "degF":
		return "°F"
	case "degR":
		return "°R"
	case "deg":
		return "°"
	case "um":
		return "µm"
	case "psi(g)":
		return "psig" // the trade's spelling in the US
	case "psi(a)":
		return "psia"
	case "psi(d)":
		return "psid"
	case "inHg vac", "mmHg vac", "l/min ANR":
		return symbol // a word after the unit, not a product
	}
	return prettyParts.Replace(symbol)
}

var prettyParts = strings.NewReplacer(
	"m3", "m³", "m2", "m²", "s2", "s²", "ft3", "ft³", "ft2", "ft²", "in3", "in³", "in2", "in²",
	" ", "·",
)
