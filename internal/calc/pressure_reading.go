package calc

import (
	"fmt"
	"strings"

	"github.com/millrace-workshop/specgen/internal/units"
)

// pressureReadingProblem says why a pressure as written does not suit the
// input spec at the ambient pressure (Pa), or "" when it does: a plain
// (gauge-reading) unit where an absolute pressure is asked, which is a
// likely slip there (an explicit gauge or vacuum reading, "-900 mbar(g)" or
// "27 inHg vac", is taken and converted with the ambient); a bare column of
// mercury where the pressure is below ambient (US vacuum gauges read inHg
// downward from ambient, barometers upward from zero: common practice); a
// vacuum deeper than the ambient pressure; plain hPa, which the trade reads
// either way, where no absolute pressure is asked.
func pressureReadingProblem(spec InputSpec, q units.Quantity, ambient float64) string {
	if spec.Dim != units.Pressure {
		return ""
	}
	u := q.Unit
	if (spec.Absolute || spec.BelowAmbient) && u.Ref == units.Unmarked && strings.HasSuffix(u.Symbol, "Hg") {
		gauge := ""
		if !spec.Absolute {
			gauge = fmt.Sprintf(", or \"-%s %s(g)\" for a gauge reading", q.Number, u.Symbol)
		}
		return fmt.Sprintf("%q: a bare %s could be read down from ambient, as a vacuum gauge reads, or up from zero, as a barometer does, and %s is below ambient; write \"%s %s vac\" for %s %s below ambient, or \"%s %s(a)\" for absolute%s",
			q.Text, u.Symbol, spec.Name, q.Number, u.Symbol, q.Number, u.Symbol, q.Number, u.Symbol, gauge)
	}
	switch {
	case u.Ref == units.Unsettled && !spec.Absolute:
		return fmt.Sprintf("%q is in plain %s, which is read absolute in weather reports and gauge on some dials; write %s(a) or %s(g)", q.Text, u.Symbol, u.Symbol, u.Symbol)
	case u.Vacuum() && q.Absolute(ambient) < 0:
		deepest, _ := units.FromSI(0, units.Pressure, u.Symbol, ambient)
		return fmt.Sprintf("%q is a vacuum deeper than the ambient pressure; a vacuum gauge reads at most %s %s", q.Text, units.Format(deepest, 4), u.Symbol)
	case spec.Absolute && u.Ref == units.Unmarked:
		return fmt.Sprintf("%q is a plain %s, which reads gauge; %s takes an absolute pressure: write it marked absolute (mbar(a), kPa(a), bar(a), psia, inHg(a), torr), e.g. \"20 mbar(a)\", or as a gauge reading below ambient, e.g. \"-900 mbar(g)\" or \"27 inHg vac\"", q.Text, u.Symbol, spec.Name)
	}
	return ""
}
