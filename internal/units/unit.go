package units

import "strings"

// PressureRef tells what a pressure unit is measured from.
type PressureRef int

const (
	// Unmarked is a plain pressure unit such as "bar" or "psi"; it reads gauge.
	Unmarked PressureRef = iota
	// Gauge is marked gauge: "bar(g)", "psig", "barg".
	Gauge
	// Absolute is marked absolute ("bar(a)", "psia") or absolute by nature ("atm", "torr").
	Absolute
	// Unsettled is an unmarked unit the trade reads either way: "hPa" is
	// absolute in weather reports and gauge on some dials. The caller
	// decides: absolute where only an absolute pressure makes sense, else
	// it needs its mark. Quantity.Absolute reads it gauge.
	Unsettled
)

// GasState is a pressure (Pa, absolute) and a temperature (K) that a volume
// of air is measured at.
type GasState struct {
	Pressure, Temperature float64
}

// Unit is one spelling of a unit.
type Unit struct {
	Symbol string      // canonical spelling, e.g. "cm3", "bar(a)", "degC", "N m"
	Dim    Dimension   // what it measures; Pressure for every pressure unit
	Factor float64     // SI = value*Factor + Offset
	Offset float64     // non-zero only for degC and degF
	Ref    PressureRef // for pressure units: what the value is measured from
	// Reference is, for a flow of standard or normal air (SCFM, Nl/min,
	// l/min ANR), the state its volume is measured at; its SI value is that
	// of free air at the ambient pressure and 20 °C, by mass (see
	// Quantity.Absolute). Zero for other units.
	Reference GasState
}

// Standard reports whether u is a flow of standard or normal air.
func (u Unit) Standard() bool { return u.Reference != GasState{} }

// Vacuum reports whether u is a vacuum gauge's unit ("inHg vac"): a gauge
// unit read downward from ambient, which its negative factor does.
func (u Unit) Vacuum() bool { return u.Dim == Pressure && u.Factor < 0 }

// toSI converts v written in u to SI. A difference (of temperature) drops
// the offset.
func (u Unit) toSI(v float64, difference bool) float64 {
	if difference {
		return v * u.Factor
	}
	return v*u.Factor + u.Offset
}

// fromSI converts the SI value si to u; see toSI.
func (u Unit) fromSI(si float64, difference bool) float64 {
	if difference {
		return si / u.Factor
	}
	return (si - u.Offset) / u.Factor
}

// LookupUnit returns the unit spelled s. Besides the canonical symbols it
// accepts superscripts ("m³", "m²"), carets ("cm^3"), degree signs ("°C",
// "°"), products written with "·", "*", "-" or a space ("N·m", "N*m",
// "lbf-ft", "N m") or run together ("Nm"), spaces around "/" and before a
// pressure mark ("L / min", "kPa (a)"), and "µ" or "μ" for micro. Case
// matters ("mm", not "MM") except for a few upper-case spellings the trade
// uses ("PSI", "CFM", "RPM"). A failure is an *Error that suggests a
// near-miss spelling when there is one.
func LookupUnit(s string) (Unit, error) {
	return LookupUnitAs(s, -1)
}

// normalize rewrites a unit spelling into the form used as a key of
// unitIndex: ASCII digits for superscripts, "degC" for "°C", one space for a
// product, no space next to "/" or parentheses.
func normalize(s string) string {
	fields := strings.Fields(unicodeSpelling.Replace(s))
	var b strings.Builder
	for i, f := range fields {
		if i > 0 && !tight(fields[i-1][len(fields[i-1])-1]) && !tight(f[0]) {
			b.WriteByte(' ')
		}
		b.WriteString(f)
	}
	return b.String()
}

// tight reports whether c takes no space beside it in a unit key.
func tight(c byte) bool { return c == '/' || c == '(' || c == ')' }

var unicodeSpelling = strings.NewReplacer(
	"²", "2", "³", "3", "^", "",
	"µ", "u", "μ", "u",
	"°C", "degC", "℃", "degC", "°F", "degF", "℉", "degF", "°R", "degR", "°", "deg",
	// Look-alikes of the degree sign that a keyboard or font may give.
	"ºC", "degC", "ºF", "degF", "º", "deg", "˚C", "degC", "˚F", "degF", "˚", "deg",
	"⁻¹", " 1",
	"·", " ", "⋅", " ", "*", " ", "-", " ",
)
