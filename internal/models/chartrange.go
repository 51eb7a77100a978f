package models

import (
	"math"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// pressureRange is the span of discharge pressure (Pa absolute) that a
// stage's charts over discharge pressure cover: from its inlet pressure to
// about twice the design or relief pressure (gauge), whichever is higher,
// where the stage works; or to the dead-head pressure, where delivery
// stops, when that comes first or the block asks for the full range. cut
// tells that the chart stops short of dead-head.
func pressureRange(c cylinder, out *calc.Outcome) (top, relief float64, cut bool) {
	dead := deadHead(c)
	working := c.p2
	if r, ok := reliefOpening(out.Set, out.ID); ok {
		relief = r
		working = math.Max(working, r)
	}
	top = c.ambient + 2*(working-c.ambient)
	if out.FullRange || top >= dead {
		return dead, relief, false
	}
	return top, relief, true
}

// deadHead is the discharge pressure at which a stage delivers nothing:
// the clearance gas re-expands to fill the whole stroke.
func deadHead(c cylinder) float64 {
	swept := math.Pi / 4 * c.bore * c.bore * 2 * c.crankRadius
	return c.p1 * math.Pow((swept+c.clearanceVolume)/c.clearanceVolume, c.n)
}

// reliefOpening is the lowest pressure (absolute) at which a relief valve
// opens that protects block id, or a part the block fills (a receiver
// whose valve relieves its compressor too, as the relief rules count it).
func reliefOpening(s *calc.Set, id string) (float64, bool) {
	if s == nil {
		return 0, false
	}
	lowest, found := math.Inf(1), false
	for _, v := range s.Having(calc.Relieves) {
		set, ok := v.Result("cracking_pressure")
		if !ok {
			continue
		}
		if relieves(s, v, id) {
			// The valve vents to ambient: it opens at ambient + its setting.
			lowest, found = math.Min(lowest, set.Value+v.Ambient), true
		}
	}
	return lowest, found
}
