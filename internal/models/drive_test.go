package models

import (
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// driveReference computes "load fraction", the load's shaft_power over
// belt_efficiency · motor_power, and the starting margin from the drive's inputs
// and the load's own results: k_s · (P/ω_m) · (d2/d1) · η_b over the load's
// gas torque at start plus its running friction, shaft_power/ω −
// mean_torque. The gas torque is the load's peak_torque ("load peak
// torque", a start against its own discharge pressure), the peak_torque of
// block "twin", the load computed at the relief valve's opening pressure
// ("twin peak torque"), or none ("friction only": an unloaded start from
// ambient, where the gas does no work on the crank).
func driveReference(t *testing.T, ch *caseCheck, set *calc.Set, e *calc.Evaluated) float64 {
	t.Helper()
	basis := ch.Basis
	load := linkedBlock(t, set, e, "load")
	in := func(b *calc.Evaluated, name string) float64 {
		v, ok := inputValue(t, b, name)
		if !ok {
			t.Fatalf("%s has no input %s", b.Block.ID, name)
		}
		return v
	}
	res := func(b *calc.Evaluated, name string) float64 {
		r, ok := b.Result(name)
		if !ok {
			t.Fatalf("%s has no result %s", b.Block.ID, name)
		}
		return r.Value
	}
	// A machine turns at its stages' speed.
	turning := load
	if _, ok := inputValue(t, load, "speed"); !ok {
		turning = linkedBlock(t, set, load, "stages")
	}
	friction := res(load, "shaft_power")/in(turning, "speed") - res(load, "mean_torque")
	motor := in(e, "starting_torque") * in(e, "motor_power") / in(e, "motor_speed") *
		in(e, "driven_pulley") / in(e, "motor_pulley") * in(e, "belt_efficiency")
	switch basis {
	case "load fraction":
		return res(load, "shaft_power") / (in(e, "belt_efficiency") * in(e, "motor_power"))
	case "load peak torque":
		return motor / (res(load, "peak_torque") + friction)
	case "twin peak torque":
		twin, ok := set.Lookup("twin")
		if !ok {
			t.Fatal("no block twin")
		}
		return motor / (res(twin, "peak_torque") + friction)
	case "friction only":
		return motor / friction
	}
	t.Fatalf("unknown basis %q", basis)
	return 0
}

// driveSite is a bench compressor and its drive; changes replace drive
// keys, or remove them (nil); "low." keys change the compressor.
func driveSite(changes map[string]any) []map[string]any {
	low := map[string]any{"id": "low", "kind": "compressor", "bore": "28 mm", "stroke": "32 mm", "rod_length": "70 mm",
		"clearance_volume": "1.8 cm3", "speed": "900 rpm", "discharge_pressure": "6 bar"}
	rx := map[string]any{"id": "rx", "kind": "tank", "volume": "20 L", "pressure": "6 bar"}
	check := map[string]any{"id": "check", "kind": "valve", "seat_diameter": "6 mm", "spring_rate": "1 N/mm", "preload": "1 mm"}
	d := map[string]any{"id": "d", "kind": "drive", "motor_power": "370 W", "motor_speed": "1440 rpm",
		"motor_pulley": "50 mm", "driven_pulley": "78.4 mm", "load": "low", "starting_torque": 2}
	for k, v := range changes {
		target := d
		if name, ok := strings.CutPrefix(k, "low."); ok {
			target, k = low, name
		}
		if v == nil {
			delete(target, k)
		} else {
			target[k] = v
		}
	}
	return []map[string]any{low, rx, check, d}
}

// TestDriveInputErrors: each mistake a drive block can hold is one error
// on the key to blame, saying what is allowed.
func TestDriveInputErrors(t *testing.T) {
	for _, c := range []struct {
		changes map[string]any
		key     string
		says    []string
	}{
		// 1440 rpm · 50/78.4 · 0.98 = 900 rpm; at 1000 rpm the load is 11 % off.
		{map[string]any{"low.speed": "1000 rpm"}, "load", []string{"low turns at 1000 rpm, but the drive turns the crank at 900 rpm", "within 0.5 %"}},
		{map[string]any{"load": "rx"}, "load", []string{`block "rx" is a tank; load takes a compressor or machine block`}},
		{map[string]any{"motor_pulley": "0 mm"}, "motor_pulley", []string{"out of range"}},
		{map[string]any{"driven_pulley": "0 in"}, "driven_pulley", []string{"out of range"}},
		{map[string]any{"relief": "check"}, "relief", []string{"valve check protects nothing"}},
		{map[string]any{"relief": "check", "unloaded_start": true}, "relief", []string{"give unloaded_start = true or relief, not both"}},
		{map[string]any{"starting_torque": 0}, "starting_torque", []string{"out of range"}},
	} {
		wantInputError(t, c.changes, c.key, c.says, driveSite)
	}
}
