package main

import (
	"encoding/json"
	"slices"
	"strings"
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

// A failed claim's message keeps its "<=" as written: JSON for people and
// tools alike, not "\u003c=".
func TestCheckJSONKeepsSigns(t *testing.T) {
	page := "# Stage\n\n```calc\nid = \"low\"\nkind = \"compressor\"\nbore = \"32 mm\"\nstroke = \"28 mm\"\n" +
		"rod_length = \"70 mm\"\nclearance_volume = \"1.8 cm3\"\nspeed = \"900 rpm\"\ndischarge_pressure = \"6 bar\"\n" +
		"[expect]\nswept_volume = \"<= 10 cm3\"\n```\n"
	root := writeSite(t, map[string]string{"content/index.md": page})
	code, stdout, stderr := runWithin(t, time.Minute, "check", "-C", root, "-format", "json")
	if code != exitFailed {
		t.Fatalf("exit %d, want %d:\n%s", code, exitFailed, stderr)
	}
	if strings.Contains(stdout, `\u003c`) || !strings.Contains(stdout, `<= 10 cm3`) {
		t.Errorf("the claim is not kept as written:\n%s", stdout)
	}
}
