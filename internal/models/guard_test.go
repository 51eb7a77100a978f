package models

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// The guards below fail, naming what is missing, when a kind or a rule is
// added without the tests and text every kind and rule carries. Reference
// cases are guarded by the reference harness.

// TestEveryKindIsExplained checks that `specgen explain KIND` has something
// to say about every kind, input and result.
func TestEveryKindIsExplained(t *testing.T) {
	for _, name := range testCatalog.KindNames() {
		k, _ := testCatalog.Kind(name)
		if strings.TrimSpace(k.Summary) == "" || len(strings.TrimSpace(k.Doc)) < 200 {
			t.Errorf("kind %s has no explain text: give it a Summary and a Doc that states the model, its assumptions and limits", name)
		}
		for _, in := range k.Inputs {
			if in.Meaning == "" {
				t.Errorf("kind %s: input %s has no Meaning for explain", name, in.Name)
			}
		}
		for _, r := range k.Results {
			if r.Meaning == "" {
				t.Errorf("kind %s: result %s has no Meaning for explain", name, r.Name)
			}
		}
	}
}

// TestEveryKindHasBadInputs checks that the bad-input corpus holds a case
// for every kind: a file testdata/bad/KIND-*.txtar, or a case whose block is
// of the kind and that exits 2.
func TestEveryKindHasBadInputs(t *testing.T) {
	files, err := filepath.Glob(filepath.Join("..", "..", "testdata", "bad", "*.txtar"))
	if err != nil || len(files) == 0 {
		t.Fatalf("no bad-input corpus (%v)", err)
	}
	covered := map[string]bool{}
	kindLine := regexp.MustCompile(`(?m)^kind\s*=\s*"([a-z0-9_-]+)"`)
	for _, f := range files {
		base := filepath.Base(f)
		for _, name := range testCatalog.KindNames() {
			if strings.HasPrefix(base, name+"-") {
				covered[name] = true
			}
		}
		src, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		if !regexp.MustCompile(`(?m)^exit 2$`).Match(src) {
			continue
		}
		for _, m := range kindLine.FindAllSubmatch(src, -1) {
			covered[string(m[1])] = true
		}
	}
	for _, name := range testCatalog.KindNames() {
		if !covered[name] {
			t.Errorf("kind %s has no bad-input case: add testdata/bad/%s-*.txtar (a tiny site, exit 2, the message it must print)", name, name)
		}
	}
}

// TestEveryRuleHasACautionCase checks that testdata/cautions holds a case
// expecting every rule of the table.
func TestEveryRuleHasACautionCase(t *testing.T) {
	files, err := filepath.Glob(filepath.Join("..", "..", "testdata", "cautions", "*.toml"))
	if err != nil || len(files) == 0 {
		t.Fatalf("no caution cases (%v)", err)
	}
	var all strings.Builder
	for _, f := range files {
		src, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		all.Write(src)
	}
	for _, id := range testCatalog.RuleIDs() {
		if !regexp.MustCompile(`(?m)^rule = "` + regexp.QuoteMeta(id) + `"$`).MatchString(all.String()) {
			t.Errorf("caution rule %s has no case: add testdata/cautions/%s.toml with blocks that raise it and the hand arithmetic", id, id)
		}
	}
}

// TestEveryRuleCanBeAcknowledged checks that [acknowledge] takes the id of
// every rule explain lists, and that explain lists every rule.
func TestEveryRuleCanBeAcknowledged(t *testing.T) {
	var explained strings.Builder
	ExplainCautions(&explained, testCatalog)
	for _, id := range testCatalog.RuleIDs() {
		if !strings.Contains(explained.String(), "  "+id+"  ") {
			t.Errorf("explain cautions does not list %s", id)
		}
		src := stageTOML + "\n[acknowledge]\n" + id + " = \"a reason\"\n"
		if _, err := testCatalog.ParseBlock("content/index.md", 1, src); err != nil {
			t.Errorf("[acknowledge] %s: %v", id, err)
		}
	}
}
