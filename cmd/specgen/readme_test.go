package main

import (
	"bytes"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// TestReadmeCalcExamplesRun checks that the calculation blocks the README
// shows run as written: its example page and every calc block of its
// calc-block section, together in one site, check with no failed claim.
func TestReadmeCalcExamplesRun(t *testing.T) {
	src, err := os.ReadFile(filepath.Join("..", "..", "README.md"))
	if err != nil {
		t.Fatal(err)
	}
	readme := string(src)
	start := strings.Index(readme, "## Calculation blocks")
	end := strings.Index(readme[start+1:], "\n## ")
	section := readme[start : start+1+end]
	page := regexp.MustCompile("(?s)````markdown\n(.*?)\n````").FindStringSubmatch(section)
	if page == nil {
		t.Fatal("the README's calc-block section has no example page")
	}
	site := page[1]
	// Indented examples in the list that follows, as written there.
	for _, m := range regexp.MustCompile("(?s)\n  ```calc\n(.*?)\n  ```").FindAllStringSubmatch(section, -1) {
		site += "\n\n```calc\n" + regexp.MustCompile("(?m)^  ").ReplaceAllString(m[1], "") + "\n```\n"
	}
	if strings.Count(site, "```calc") < 2 {
		t.Fatalf("found %d calc blocks in the README's section; want the example page's and the [derive] example", strings.Count(site, "```calc"))
	}
	root := t.TempDir()
	if err := os.MkdirAll(filepath.Join(root, "content"), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(root, "content", "index.md"), []byte(site), 0o644); err != nil {
		t.Fatal(err)
	}
	var stdout, stderr bytes.Buffer
	if code := run([]string{"check", "-C", root}, &stdout, &stderr); code != exitOK {
		t.Errorf("check exits %d:\n%s%s\nsite:\n%s", code, stderr.String(), stdout.String(), site)
	}
}
