package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestInitBuildsCleanly: a new site builds and checks with no warning,
// shows its chart and the standard caution; init refuses a non-empty folder.
func TestInitBuildsCleanly(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "docs")
	var out, errb bytes.Buffer
	if code := run([]string{"init", dir}, &out, &errb); code != exitOK {
		t.Fatalf("init: exit %d: %s", code, errb.String())
	}
	for _, args := range [][]string{{"build", "-strict", "-C", dir}, {"check", "-C", dir}} {
		out.Reset()
		errb.Reset()
		if code := run(args, &out, &errb); code != exitOK || errb.Len() > 0 {
			t.Fatalf("%v: exit %d, stderr %q", args, code, errb.String())
		}
	}
	page, err := os.ReadFile(filepath.Join(dir, "dist", "first-stage.html"))
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{`class="sg-chart"`, "sg-standard-caution", "licensed practice", `class="sg-claim-held"`} {
		if !strings.Contains(string(page), want) {
			t.Errorf("first-stage.html lacks %s", want)
		}
	}
	if code := run([]string{"init", dir}, &out, &errb); code != exitBadInput || !strings.Contains(errb.String(), "not empty") {
		t.Errorf("init into a non-empty folder: exit %d, %q", code, errb.String())
	}
}
