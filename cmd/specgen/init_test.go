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
	ignore, err := os.ReadFile(filepath.Join(dir, ".gitignore"))
	if err != nil || !strings.Contains(string(ignore), "\n/dist/\n/.specgen-cache/\n") {
		t.Errorf(".gitignore leaves out the output or the cache folder: %q, %v", ignore, err)
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

// TestInitNeverWritesOverFiles: an empty folder name once wrote the new
// site into the current folder, over its content/index.md and specgen.toml;
// a file is refused by name.
func TestInitNeverWritesOverFiles(t *testing.T) {
	cwd := t.TempDir()
	t.Chdir(cwd)
	mine := filepath.Join("content", "index.md")
	if err := os.MkdirAll("content", 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(mine, []byte("# My own page\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile("notes.txt", []byte("mine\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct{ arg, want string }{
		{"", "the folder name is empty"},
		{"notes.txt", "notes.txt is a file"},
	} {
		var out, errb bytes.Buffer
		if code := run([]string{"init", c.arg}, &out, &errb); code != exitBadInput || !strings.Contains(errb.String(), c.want) {
			t.Errorf("init %q: exit %d, stderr %q; want exit 2 and %q", c.arg, code, errb.String(), c.want)
		}
	}
	if b, _ := os.ReadFile(mine); string(b) != "# My own page\n" {
		t.Errorf("content/index.md was written over: %q", b)
	}
	if _, err := os.Stat("specgen.toml"); err == nil {
		t.Error("init wrote specgen.toml into the current folder")
	}
}
