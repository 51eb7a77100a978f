package main

import (
	"bytes"
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

const diffPage = `# Stage

It sweeps about 20 cc.

` + "```calc" + `
id = "%ID%"
kind = "compressor"
bore = "%BORE%"
stroke = "32 mm"
rod_length = "70 mm"
clearance_ratio = 0.05
speed = "900 rpm"
discharge_pressure = "6 bar"

[expect]
swept_volume = "19.7 cm3 ± 2%"
` + "```\n"

func stagePage(id, bore string) string {
	return strings.NewReplacer("%ID%", id, "%BORE%", bore).Replace(diffPage)
}

// gitSite makes a git repository holding a site and returns its root and
// a function that writes a page and commits.
func gitSite(t *testing.T) (string, func(files map[string]string, msg string)) {
	t.Helper()
	if _, err := exec.LookPath("git"); err != nil {
		t.Skip("git not installed")
	}
	root := t.TempDir()
	run := func(args ...string) {
		cmd := exec.Command("git", append([]string{"-C", root}, args...)...)
		cmd.Env = append(os.Environ(), "GIT_AUTHOR_NAME=t", "GIT_AUTHOR_EMAIL=t@example.invalid",
			"GIT_COMMITTER_NAME=t", "GIT_COMMITTER_EMAIL=t@example.invalid")
		if out, err := cmd.CombinedOutput(); err != nil {
			t.Fatalf("git %v: %v\n%s", args, err, out)
		}
	}
	run("init", "-q")
	commit := func(files map[string]string, msg string) {
		for name, text := range files {
			p := filepath.Join(root, filepath.FromSlash(name))
			if text == "" {
				_ = os.Remove(p)
				continue
			}
			if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
				t.Fatal(err)
			}
		}
		run("add", "-A")
		run("commit", "-q", "-m", msg)
	}
	return root, commit
}

func TestDiffRevisions(t *testing.T) {
	root, commit := gitSite(t)
	commit(map[string]string{"content/index.md": stagePage("low", "28 mm"), "content/b.md": stagePage("other", "28 mm")}, "first")
	commit(map[string]string{"content/index.md": stagePage("low", "30 mm")}, "bigger bore")
	commit(map[string]string{"content/b.md": "", "content/c.md": stagePage("third", "28.1 mm")}, "swap a block")
	commit(map[string]string{"content/c.md": stagePage("renamed", "28.1 mm")}, "rename")

	cases := []struct {
		name  string
		args  []string
		code  int
		wants []string
	}{
		// π/4·28²·32 = 19.70 cm³ and π/4·30²·32 = 22.62 cm³: +14.8 % (by hand); the ± 2 % claim fails.
		{"input change and new failing claim", []string{"HEAD~3", "HEAD~2"}, exitFailed,
			[]string{"| bore | 28 mm | 30 mm |", "| swept_volume | 19.7 cm³ | 22.6 cm³ | +14.8 % |", "**NEWLY FAILS**", "newly failing"}},
		{"added and removed", []string{"HEAD~2", "HEAD~1"}, exitOK,
			[]string{"- Added `third`", "- Removed `other`"}},
		{"rename", []string{"HEAD~1", "HEAD"}, exitOK, []string{"- Renamed `third` → `renamed`"}},
		{"working tree is head", []string{"HEAD"}, exitOK, []string{"No calculation changed."}},
		{"unknown revision", []string{"no-such-branch"}, exitBadInput, []string{`"no-such-branch" is not a revision`}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var stdout, stderr bytes.Buffer
			code := run(append([]string{"diff", "-C", root}, c.args...), &stdout, &stderr)
			out := stdout.String() + stderr.String()
			if code != c.code {
				t.Errorf("exit %d, want %d:\n%s", code, c.code, out)
			}
			for _, w := range c.wants {
				if !strings.Contains(out, w) {
					t.Errorf("output lacks %q:\n%s", w, out)
				}
			}
		})
	}
	// The user's tree is untouched: no stray files, nothing staged.
	status, _ := exec.Command("git", "-C", root, "status", "--porcelain").Output()
	if len(status) != 0 {
		t.Errorf("diff changed the working tree: %s", status)
	}
}

// TestDiffRevisionWithoutSite: the pull request that adds the
// documentation compares against a revision without content/; every block
// is added (a failing claim among them still fails), not "does not build".
func TestDiffRevisionWithoutSite(t *testing.T) {
	root, commit := gitSite(t)
	commit(map[string]string{"README": "no docs yet\n"}, "before the docs")
	commit(map[string]string{"content/index.md": stagePage("low", "30 mm")}, "docs")
	var stdout, stderr bytes.Buffer
	code := run([]string{"diff", "-C", root, "HEAD~1", "HEAD"}, &stdout, &stderr)
	out := stdout.String() + stderr.String()
	// The page claims 19.7 cm³ ± 2 %; a 30 mm bore gives 22.6 cm³, so the claim fails.
	if code != exitFailed {
		t.Errorf("exit %d, want 1 (a newly failing claim):\n%s", code, out)
	}
	for _, w := range []string{"no content/ folder in", "every block counts as added", "- Added `low`"} {
		if !strings.Contains(out, w) {
			t.Errorf("output lacks %q:\n%s", w, out)
		}
	}
}

// TestDiffWithoutGit: on a machine without git, diff of revisions says
// git is missing, not that the folder is outside a repository.
func TestDiffWithoutGit(t *testing.T) {
	root, commit := gitSite(t)
	commit(map[string]string{"content/index.md": stagePage("low", "28 mm")}, "first")
	t.Setenv("PATH", t.TempDir())
	var stdout, stderr bytes.Buffer
	code := run([]string{"diff", "-C", root, "HEAD"}, &stdout, &stderr)
	if code != exitBadInput || !strings.Contains(stderr.String(), "git is not installed") {
		t.Errorf("exit %d, stderr %q", code, stderr.String())
	}
}

func TestDiffResultsFilesAndJSON(t *testing.T) {
	dir := t.TempDir()
	write := func(name, bore string) string {
		site := filepath.Join(dir, name)
		if err := os.MkdirAll(filepath.Join(site, "content"), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(site, "content", "index.md"), []byte(stagePage("low", bore)), 0o644); err != nil {
			t.Fatal(err)
		}
		var out, errb bytes.Buffer
		if code := run([]string{"build", "-C", site}, &out, &errb); code != exitOK {
			t.Fatalf("build: %s", errb.String())
		}
		return filepath.Join(site, "dist", "results.json")
	}
	a, b := write("a", "28 mm"), write("b", "28.2 mm")
	var stdout, stderr bytes.Buffer
	code := run([]string{"diff", "-format", "json", a, b}, &stdout, &stderr)
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr.String())
	}
	var got struct {
		Changed []struct {
			ID      string `json:"id"`
			Results []struct {
				Name   string   `json:"name"`
				Change *float64 `json:"relative_change"`
			} `json:"results"`
		} `json:"changed"`
		Failed bool `json:"failed"`
	}
	if err := json.Unmarshal(stdout.Bytes(), &got); err != nil {
		t.Fatal(err)
	}
	if len(got.Changed) != 1 || got.Changed[0].ID != "low" || got.Failed {
		t.Fatalf("diff = %s", stdout.String())
	}
	for _, r := range got.Changed[0].Results {
		// Swept volume scales with bore²: (28.2/28)² − 1 = 1.4337 % (by hand).
		if r.Name == "swept_volume" && (r.Change == nil || *r.Change < 0.014336 || *r.Change > 0.014338) {
			t.Errorf("swept_volume change %v, want 0.014337", r.Change)
		}
	}
	code = run([]string{"diff", "-C", dir, "nonexistent.json"}, &stdout, &stderr)
	if code != exitBadInput {
		t.Errorf("diff against a missing file outside git: exit %d", code)
	}
}

// TestDiffAbsoluteScales: a percentage of a temperature or a pressure is
// only meaningful on an absolute scale; the diff says which scale it used.
func TestDiffAbsoluteScales(t *testing.T) {
	dir := t.TempDir()
	build := func(name, clearance, pressure string) string {
		site := filepath.Join(dir, name)
		page := strings.NewReplacer(`clearance_ratio = 0.05`, "clearance_ratio = "+clearance,
			`discharge_pressure = "6 bar"`, `discharge_pressure = "`+pressure+`"`).Replace(stagePage("low", "28 mm"))
		if err := os.MkdirAll(filepath.Join(site, "content"), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(site, "content", "index.md"), []byte(page), 0o644); err != nil {
			t.Fatal(err)
		}
		var out, errb bytes.Buffer
		if code := run([]string{"build", "-C", site}, &out, &errb); code != exitOK {
			t.Fatalf("build: %s", errb.String())
		}
		return filepath.Join(site, "dist", "results.json")
	}
	a, b := build("a", "0.05", "6 bar"), build("b", "0.04", "7 bar")
	var stdout, stderr bytes.Buffer
	if code := run([]string{"diff", a, b}, &stdout, &stderr); code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr.String())
	}
	out := stdout.String()
	for _, want := range []string{
		// T2 = 293.15 K · (p2/1.01325 bar(a))^(0.3/1.3): 458.1 K (185 °C) at 7.01325 bar(a), 472.4 K (199 °C)
		// at 8.01325 bar(a); (8.01325/7.01325)^(0.3/1.3) − 1 = +3.12 % of kelvin, where °C would give +7.7 %.
		"| discharge_temperature | 185 °C | 199 °C | +3.12 % (kelvin) |",
		// Dead head p1·((1 + c)/c)^1.3: (26/21)^1.3 − 1 = +32.0 % absolute, where gauge would give +32.7 %.
		"| max_pressure | 52.0 bar(g) | 69.0 bar(g) | +32 % (absolute) |",
		"(absolute) is the change of the absolute pressure, not of the gauge reading",
		"(kelvin) is the change of the temperature in kelvin, not in °C or °F",
		// A plain ratio carries no mark: 7.91/6.92 (8.01325/7.01325 − 1 = +14.3 %).
		"| pressure_ratio | 6.92 | 7.91 | +14.3 % |\n",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("diff lacks %q:\n%s", want, out)
		}
	}

	stdout.Reset()
	if code := run([]string{"diff", "-format", "json", a, b}, &stdout, &stderr); code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr.String())
	}
	var got struct {
		Changed []struct {
			Results []struct {
				Name     string `json:"name"`
				Absolute bool   `json:"absolute"`
				Unit     string `json:"unit"`
			} `json:"results"`
		} `json:"changed"`
	}
	if err := json.Unmarshal(stdout.Bytes(), &got); err != nil || len(got.Changed) != 1 {
		t.Fatalf("diff = %s (%v)", stdout.String(), err)
	}
	want := map[string]string{"discharge_temperature": "K", "max_pressure": "Pa(a)"}
	for _, r := range got.Changed[0].Results {
		if unit, marked := want[r.Name]; r.Absolute != marked || marked && r.Unit != unit {
			t.Errorf("%s: absolute %v, unit %q; want absolute %v, unit %q", r.Name, r.Absolute, r.Unit, marked, unit)
		}
	}
}

// TestDiffBadResultsFiles: a file that is not a results.json is refused
// with what is wrong in JSON's words, never Go's type names.
func TestDiffBadResultsFiles(t *testing.T) {
	dir := t.TempDir()
	good := filepath.Join(dir, "good.json")
	if err := os.WriteFile(good, []byte(`{"version":1,"blocks":[]}`), 0o644); err != nil {
		t.Fatal(err)
	}
	goName := regexp.MustCompile(`Go (value|struct)|\bsite\.|\b(float|u?int)(32|64)\b|interface \{\}`)
	cases := []struct{ name, text, want string }{
		{"empty", ``, "bad.json: not a specgen results.json: the file is empty"},
		{"cut short", `{"version":1`, "the file ends in the middle of its JSON"},
		{"array", `[]`, "the file holds a JSON array; results.json holds an object"},
		{"no version", `{}`, "it has no version; specgen build writes one as dist/results.json"},
		{"later version", `{"version":2,"blocks":[]}`, "results.json version 2; this specgen reads version 1"},
		{"wrong type", `{"version":1,"blocks":[{"id":"x","kind":5}]}`, "blocks.kind: a JSON number where a string belongs"},
		{"wrong value type", `{"version":1,"blocks":[{"id":"x","results":{"a":{"value":"1"}}}]}`, "blocks.results.value: a JSON string where a number belongs"},
		{"no id", `{"version":1,"blocks":[{"kind":"tank"}]}`, "block 1 of its list has no id"},
		{"unknown field", `{"version":1,"blocks":[],"extra":1}`, `unknown field "extra"`},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			bad := filepath.Join(dir, "bad.json")
			if err := os.WriteFile(bad, []byte(c.text), 0o644); err != nil {
				t.Fatal(err)
			}
			var stdout, stderr bytes.Buffer
			code := run([]string{"diff", bad, good}, &stdout, &stderr)
			msg := stderr.String()
			if code != exitBadInput || !strings.Contains(msg, c.want) {
				t.Errorf("exit %d, message %q; want exit %d and %q", code, msg, exitBadInput, c.want)
			}
			if m := goName.FindString(msg); m != "" {
				t.Errorf("message names a Go type (%q): %s", m, msg)
			}
		})
	}
}
