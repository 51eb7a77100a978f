package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"path/filepath"
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

// TestAllErrorsAtOnce: one run of check reports every independent mistake
// of testdata/bad/all-errors-*.txtar (in all-errors-at-once, four in four
// files), each once, sorted by file and line, and nothing that only
// follows from one of them (prose quoting a broken block, a link to a
// page that cannot be read).
func TestAllErrorsAtOnce(t *testing.T) {
	for _, name := range []string{"all-errors-at-once", "all-errors-unreadable-page", "all-errors-derive-of-broken"} {
		t.Run(name, func(t *testing.T) { checkAllErrors(t, name) })
	}
}

func checkAllErrors(t *testing.T, name string) {
	c := readCase(t, filepath.Join("..", "..", "testdata", "bad", name+".txtar"))
	files := map[string]string{}
	for rel, data := range c.files {
		files[rel] = string(data)
	}
	root := writeSite(t, files)
	var stdout, stderr bytes.Buffer
	if code := run([]string{"check", "-C", root}, &stdout, &stderr); code != exitBadInput {
		t.Fatalf("exit %d, want %d", code, exitBadInput)
	}
	lines := strings.Split(strings.TrimSpace(stderr.String()), "\n")
	if len(lines) != len(c.wants) {
		t.Errorf("%d problems reported, want %d:\n%s", len(lines), len(c.wants), stderr.String())
	}
	for i, w := range c.wants {
		if i < len(lines) && !strings.HasPrefix(lines[i], w) {
			t.Errorf("problem %d is %q, want it to start %q", i+1, lines[i], w)
		}
	}
}

// TestErrorsCapped: a site with more mistakes than one run reports lists
// the first 50 by place and counts the rest.
func TestErrorsCapped(t *testing.T) {
	files := map[string]string{}
	for i := range 60 {
		files[fmt.Sprintf("content/p%02d.md", i)] = "# Page\n\n[gone](nowhere.md)\n"
	}
	root := writeSite(t, files)
	var stdout, stderr bytes.Buffer
	if code := run([]string{"check", "-C", root}, &stdout, &stderr); code != exitBadInput {
		t.Fatalf("exit %d, want %d", code, exitBadInput)
	}
	lines := strings.Split(strings.TrimSpace(stderr.String()), "\n")
	if len(lines) != 51 || !strings.HasPrefix(lines[0], "content/p00.md:3: ") || !strings.HasPrefix(lines[49], "content/p49.md:3: ") ||
		lines[50] != "content/p49.md:3: ... and 10 more problems in this site, not shown" {
		t.Errorf("%d lines:\n%s", len(lines), stderr.String())
	}
}

// TestCalcReportsEveryProblem: calc reports a block's unknown key and its
// wrong unit in one run, though the one stops the block being evaluated.
func TestCalcReportsEveryProblem(t *testing.T) {
	root := writeSite(t, map[string]string{"stage.toml": "id = \"x\"\nkind = \"compressor\"\nbore = \"28 psi\"\nstrok = \"32 mm\"\n" +
		"rod_length = \"70 mm\"\nclearance_ratio = 0.05\nspeed = \"900 rpm\"\ndischarge_pressure = \"6 bar\"\n"})
	file := filepath.Join(root, "stage.toml")
	var stdout, stderr bytes.Buffer
	code := run([]string{"calc", file}, &stdout, &stderr)
	want := file + ":3: bore: \"28 psi\" is a pressure; takes a length (mm, cm, m, in, ft)\n" +
		file + ":4: strok: unknown key for kind compressor; did you mean \"stroke\"?\n"
	if code != exitBadInput || stderr.String() != want {
		t.Errorf("exit %d, stderr:\n%s\nwant:\n%s", code, stderr.String(), want)
	}
}

// TestBuildEndsWithCheckSummary: a plain build ends with the line check
// ends with, cautions counted, on a fresh build and an unchanged rebuild.
func TestBuildEndsWithCheckSummary(t *testing.T) {
	root := writeSite(t, map[string]string{"content/index.md": recipePage("1400 rpm", ">= 50 L/min", "")})
	var out, errb bytes.Buffer
	run([]string{"check", "-C", root}, &out, &errb)
	lines := strings.Split(strings.TrimSpace(out.String()), "\n")
	want := lines[len(lines)-1]
	if !strings.Contains(want, "1 claim (1 failed), 2 cautions") {
		t.Fatalf("check ends with %q", want)
	}
	for _, pass := range []string{"build", "rebuild"} {
		out.Reset()
		if code := run([]string{"build", "-C", root}, &out, &errb); code != exitOK {
			t.Fatalf("%s: exit %d: %s", pass, code, errb.String())
		}
		lines := strings.Split(strings.TrimSpace(out.String()), "\n")
		if got := lines[len(lines)-1]; got != want {
			t.Errorf("%s ends with %q, want %q", pass, got, want)
		}
	}
}
