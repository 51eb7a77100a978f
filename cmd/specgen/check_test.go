package main

import (
	"encoding/json"
	"slices"
	"testing"
	"time"
)

// TestCheckJSONShape: check -format json prints one object with the same
// keys whether the site is fine, fails a claim or is bad input, so that a
// tool can read it without knowing the exit status first.
func TestCheckJSONShape(t *testing.T) {
	good := "# Fine\n\nNo calculations.\n"
	bad := "# Bad\n\n```calc\nid = \"x\"\nkind = \"nosuchkind\"\n```\n"
	for _, c := range []struct {
		page string
		code int
	}{{good, exitOK}, {bad, exitBadInput}} {
		root := writeSite(t, map[string]string{"content/index.md": c.page})
		code, stdout, stderr := runWithin(t, time.Minute, "check", "-C", root, "-format", "json")
		if code != c.code {
			t.Fatalf("exit %d, want %d:\n%s", code, c.code, stderr)
		}
		var got map[string]json.RawMessage
		if err := json.Unmarshal([]byte(stdout), &got); err != nil {
			t.Fatalf("exit %d: stdout is not one JSON object: %v\n%q", code, err, stdout)
		}
		var keys []string
		for k := range got {
			keys = append(keys, k)
		}
		slices.Sort(keys)
		if want := []string{"errors", "notices", "ok", "problems", "tally", "version"}; !slices.Equal(keys, want) {
			t.Errorf("exit %d: keys %v, want %v", code, keys, want)
		}
	}
}
