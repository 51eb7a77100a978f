package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/calcdiff"
)

// TestMain lets the test binary stand in for specgen when a test runs a
// script that calls it (SPECGEN_TEST_AS_MAIN=1).
func TestMain(m *testing.M) {
	if os.Getenv("SPECGEN_TEST_AS_MAIN") == "1" {
		os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
	}
	os.Exit(m.Run())
}

// recipePage is a page with one compressor stage at speed, claimFAD its
// claim on the free air delivery; extra adds inputs.
func recipePage(speed, claimFAD, extra string) string {
	return "# Stage\n\n```calc\nid = \"tiny\"\nkind = \"compressor\"\nbore = \"20 mm\"\nstroke = \"16 mm\"\nrod_length = \"45 mm\"\n" +
		"clearance_ratio = 0.03\nspeed = \"" + speed + "\"\ndischarge_pressure = \"8 bar\"\npolytropic_index = 1.35\n" + extra + "\n" +
		"[expect]\nfree_air_delivery = \"" + claimFAD + "\"\n```\n\nIt delivers =[tiny.free_air_delivery L/min].\n"
}

// runRecipe runs .ci/calc-diff.sh in the site root with the test binary as
// specgen; env adds to its environment. It returns the exit status and
// what the script printed.
func runRecipe(t *testing.T, root string, env ...string) (int, string) {
	t.Helper()
	exe, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	script, err := filepath.Abs(filepath.Join("..", "..", ".ci", "calc-diff.sh"))
	if err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command("bash", script, "HEAD~1")
	cmd.Dir = root
	cmd.Env = append(os.Environ(), append([]string{"SPECGEN=" + exe, "SPECGEN_TEST_AS_MAIN=1"}, env...)...)
	out, err := cmd.CombinedOutput()
	code := 0
	if ee, ok := err.(*exec.ExitError); ok {
		code = ee.ExitCode()
	} else if err != nil {
		t.Fatal(err)
	}
	return code, string(out)
}

// TestRecipeReportsFailingHead: when the pull request's head fails a claim
// and raises a DANGER, the recipe still writes and posts the report, with
// the failures first and the claim's old and new text, and only then fails
// the job.
func TestRecipeReportsFailingHead(t *testing.T) {
	if _, err := exec.LookPath("bash"); err != nil {
		t.Skip("bash not installed")
	}
	root, commit := gitSite(t)
	commit(map[string]string{"content/index.md": recipePage("1400 rpm", ">= 5 L/min", "")}, "base")
	commit(map[string]string{"content/index.md": recipePage("1500 rpm", ">= 50 L/min", "head_material = \"petg\"\n")},
		"head: faster, a stronger claim, a printed head")

	dir := t.TempDir()
	posted, summary := filepath.Join(dir, "posted.md"), filepath.Join(dir, "summary.md")
	post := filepath.Join(dir, "post.sh")
	if err := os.WriteFile(post, []byte("#!/bin/sh\ncp \"$1\" "+posted+"\n"), 0o755); err != nil {
		t.Fatal(err)
	}
	code, out := runRecipe(t, root, "POST_COMMENT="+post, "GH_PR=", "GITHUB_STEP_SUMMARY="+summary)
	if code != exitFailed {
		t.Errorf("exit %d, want %d (a failed claim and a DANGER); output:\n%s", code, exitFailed, out)
	}
	report, err := os.ReadFile(filepath.Join(root, "calc-diff.md"))
	if err != nil {
		t.Fatalf("no report written: %v\n%s", err, out)
	}
	text := string(report)
	for _, want := range []string{
		calcdiff.Marker + "\n",
		"**Failing in the `working tree`: 2 problems.**",
		"- Claim **FAILS**: `free_air_delivery` of `tiny` (compressor, content/index.md:3)",
		"- **DANGER** `hot-discharge` of `tiny` (compressor, content/index.md:3)",
		"Claim `free_air_delivery` **NEWLY FAILS**, strengthened: was `>= 5 L/min` (held), now `>= 50 L/min` (fails)",
		"- Caution appeared **DANGER** (`hot-discharge`)",
		"Prose quoting a changed value, to reread: content/index.md:19 (`free_air_delivery`)",
	} {
		if !strings.Contains(text, want) {
			t.Errorf("report lacks %q:\n%s", want, text)
		}
	}
	if i, j := strings.Index(text, "Failing in"), strings.Index(text, "#### "); i < 0 || j < i {
		t.Errorf("the failures do not come first:\n%s", text)
	}
	for _, f := range []string{summary, posted} {
		if got, err := os.ReadFile(f); err != nil || string(got) != text {
			t.Errorf("%s: %q (%v), want the report", filepath.Base(f), got, err)
		}
	}
	if _, err := os.Stat(filepath.Join(root, "calc-diff-full.md")); err != nil {
		t.Errorf("no whole report for the artifact: %v", err)
	}
}

// TestRecipeEditsItsComment: on GitHub the recipe keeps one comment per
// pull request: the first run writes it, later runs find it by its hidden
// first line and edit it (gh is stood in for by a script that logs its
// calls and knows the comments written).
func TestRecipeEditsItsComment(t *testing.T) {
	if _, err := exec.LookPath("bash"); err != nil {
		t.Skip("bash not installed")
	}
	root, commit := gitSite(t)
	commit(map[string]string{"content/index.md": recipePage("1400 rpm", ">= 5 L/min", "")}, "base")
	commit(map[string]string{"content/index.md": recipePage("1500 rpm", ">= 5 L/min", "")}, "head: faster")

	bin := t.TempDir()
	log, state := filepath.Join(bin, "calls.log"), filepath.Join(bin, "comment-id")
	gh := "#!/bin/sh\necho \"$*\" >>" + log + "\ncase \"$*\" in\n" +
		"  *--paginate*) [ -f " + state + " ] && cat " + state + " ;;\n" +
		"  *PATCH*) ;;\n" +
		"  *) echo 4242 >" + state + " ;;\nesac\nexit 0\n"
	if err := os.WriteFile(filepath.Join(bin, "gh"), []byte(gh), 0o755); err != nil {
		t.Fatal(err)
	}
	env := []string{"PATH=" + bin + string(os.PathListSeparator) + os.Getenv("PATH"), "GH_PR=7", "GITHUB_REPOSITORY=millrace/docs",
		"POST_COMMENT=", "GITHUB_STEP_SUMMARY="}
	for run := 1; run <= 2; run++ {
		if code, out := runRecipe(t, root, env...); code != exitOK {
			t.Fatalf("run %d: exit %d:\n%s", run, code, out)
		}
	}
	calls, err := os.ReadFile(log)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(calls)), "\n")
	want := []string{
		"api --paginate repos/millrace/docs/issues/7/comments --jq .[] | select(.body | startswith(\"" + calcdiff.Marker + "\")) | .id",
		"api repos/millrace/docs/issues/7/comments -F body=@calc-diff.md",
		"api --paginate repos/millrace/docs/issues/7/comments --jq .[] | select(.body | startswith(\"" + calcdiff.Marker + "\")) | .id",
		"api -X PATCH repos/millrace/docs/issues/comments/4242 -F body=@calc-diff.md",
	}
	if strings.Join(lines, "\n") != strings.Join(want, "\n") {
		t.Errorf("gh was called:\n%s\nwant:\n%s", strings.Join(lines, "\n"), strings.Join(want, "\n"))
	}
}
