package calc

import (
	"fmt"
	"strings"

	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// pressureReadingProblem says why a pressure as written does not suit the
// input spec at the ambient pressure (Pa), or "" when it does: a gauge
// reading where an absolute one is needed, a bare column of mercury where
// the pressure is below ambient (US vacuum gauges read inHg downward from
// ambient, barometers upward from zero: common practice), or a vacuum
// reading deeper than the ambient pressure.
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
	if u.Vacuum() && q.Absolute(ambient) < 0 {
		deepest, _ := display.Value(0, units.Pressure, u.Symbol, ambient, 4)
		return fmt.Sprintf("%q is a vacuum deeper than the ambient pressure; a vacuum gauge reads at most %s", q.Text, deepest)
	}
	if spec.Absolute && u.Ref != units.Absolute && !u.Vacuum() {
		return fmt.Sprintf("%q is a gauge pressure; %s takes an absolute pressure: write mbar(a), kPa(a), bar(a), psia, inHg(a), mmHg(a) or torr, e.g. \"20 mbar(a)\", or a vacuum gauge's reading, e.g. \"28 inHg vac\"", q.Text, spec.Name)
	}
	return ""
}
