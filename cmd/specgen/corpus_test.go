package main

import (
	"bytes"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"
)

// corpusCase is one file of testdata/bad: a small site and what specgen
// must say about it. Layout:
//
//	# what the case is about
//	exit 2
//	want <a substring of the messages>   (any number of lines)
//	args <command line, default: build>  (optional; run in the site root,
//	                                      which -C names unless args do)
//	crlf                                 (optional: files get \r\n line ends)
//	-- path/in/site --
//	file content; \xHH (two hex digits) stands for that byte
//
// A want line is looked for in stderr, then in stdout.
type corpusCase struct {
	exit  int
	wants []string
	args  []string
	files map[string][]byte
}

// byteEscape is \xHH in a corpus file's content.
var byteEscape = regexp.MustCompile(`\\x[0-9a-fA-F]{2}`)

// unescape replaces every \xHH of a content line with its byte.
func unescape(line string) string {
	return byteEscape.ReplaceAllStringFunc(line, func(m string) string {
		b, _ := strconv.ParseUint(m[2:], 16, 8)
		return string([]byte{byte(b)})
	})
}

func readCase(t *testing.T, path string) corpusCase {
	t.Helper()
	src, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	c := corpusCase{exit: -1, files: map[string][]byte{}, args: []string{"build"}}
	var current string
	crlf := false
	for _, line := range strings.SplitAfter(string(src), "\n") {
		trimmed := strings.TrimRight(line, "\r\n")
		if strings.HasPrefix(trimmed, "-- ") && strings.HasSuffix(trimmed, " --") {
			current = strings.TrimSuffix(strings.TrimPrefix(trimmed, "-- "), " --")
			c.files[current] = nil
			continue
		}
		if current != "" {
			c.files[current] = append(c.files[current], unescape(line)...)
			continue
		}
		switch {
		case strings.HasPrefix(trimmed, "exit "):
			c.exit, err = strconv.Atoi(strings.TrimPrefix(trimmed, "exit "))
			if err != nil {
				t.Fatalf("%s: bad exit line", path)
			}
		case strings.HasPrefix(trimmed, "want "):
			c.wants = append(c.wants, strings.TrimPrefix(trimmed, "want "))
		case strings.HasPrefix(trimmed, "args "):
			c.args = strings.Fields(strings.TrimPrefix(trimmed, "args "))
		case trimmed == "crlf":
			crlf = true
		}
	}
	if crlf {
		for name, data := range c.files {
			c.files[name] = bytes.ReplaceAll(bytes.ReplaceAll(data, []byte("\r\n"), []byte("\n")), []byte("\n"), []byte("\r\n"))
		}
	}
	if c.exit < 0 || len(c.wants) == 0 || len(c.files) == 0 {
		t.Fatalf("%s: a case needs an exit line, want lines and files", path)
	}
	return c
}

// leak matches what must never reach a user: a Go panic or a non-number.
var leak = regexp.MustCompile(`panic|goroutine \d|\bNaN\b|[+-]?\bInf\b`)

// TestBadInputCorpus runs every case of testdata/bad: each must exit with
// its status, say what it promises, never panic, never show NaN, and leave
// no output folder behind.
func TestBadInputCorpus(t *testing.T) {
	paths, err := filepath.Glob(filepath.Join("..", "..", "testdata", "bad", "*.txtar"))
	if err != nil || len(paths) == 0 {
		t.Fatalf("no corpus: %v", err)
	}
	for _, path := range paths {
		name := strings.TrimSuffix(filepath.Base(path), ".txtar")
		t.Run(name, func(t *testing.T) {
			c := readCase(t, path)
			root := t.TempDir()
			for rel, data := range c.files {
				p := filepath.Join(root, filepath.FromSlash(rel))
				if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
					t.Fatal(err)
				}
				if err := os.WriteFile(p, data, 0o644); err != nil {
					t.Fatal(err)
				}
			}
			// Run from the site root, so that args may name its files
			// (-C notes.txt, -out ../x) as a user in that folder would.
			t.Chdir(root)
			args := append([]string{}, c.args...)
			if !slices.Contains(args, "-C") {
				args = append(args, "-C", root)
			}
			var stdout, stderr bytes.Buffer
			code := run(args, &stdout, &stderr)
			msg := stderr.String()
			if code != c.exit {
				t.Errorf("exit %d, want %d; stderr:\n%s", code, c.exit, msg)
			}
			for _, w := range c.wants {
				if !strings.Contains(msg, w) && !strings.Contains(stdout.String(), w) {
					t.Errorf("stderr lacks %q; got:\n%s", w, msg)
				}
			}
			if m := leak.FindString(msg + stdout.String()); m != "" {
				t.Errorf("output holds %q:\n%s", m, msg)
			}
			if c.exit == exitBadInput {
				if _, err := os.Stat(filepath.Join(root, "dist")); err == nil {
					t.Error("a failed build left an output folder")
				}
			}
			if left, _ := filepath.Glob(filepath.Join(root, ".dist.building-*")); len(left) > 0 {
				t.Errorf("the build left its staging folder behind: %v", left)
			}
		})
	}
}

func TestUsage(t *testing.T) {
	cases := []struct {
		args []string
		code int
		want string
	}{
		{nil, exitBadInput, "Commands:"},
		{[]string{"frobnicate"}, exitBadInput, `unknown command "frobnicate"`},
		{[]string{"help"}, exitOK, "build"},
		{[]string{"help", "build"}, exitOK, "-out"},
		{[]string{"build", "-nosuchflag"}, exitBadInput, "flag provided but not defined"},
		{[]string{"build", "stray"}, exitBadInput, `unexpected argument "stray"`},
		{[]string{"version"}, exitOK, "specgen "},
		{[]string{"--version"}, exitOK, "specgen "},
		{[]string{"-version"}, exitOK, "specgen "},
		{[]string{"help", "help"}, exitOK, "Usage: specgen help [COMMAND]"},
		{[]string{"help", "diff"}, exitOK, "BASE and HEAD"},
		{[]string{"help", "init"}, exitOK, "Usage: specgen init DIR"},
		{[]string{"help", "calc"}, exitOK, "-sig"},
		{[]string{"explain", "-h"}, exitOK, "Usage: specgen explain [KIND|materials|cautions]"},
		{[]string{"diff"}, exitBadInput, "specgen diff: give BASE"},
		{[]string{"diff", "a", "b", "c"}, exitBadInput, `unexpected argument "c"`},
	}
	for _, c := range cases {
		var stdout, stderr bytes.Buffer
		code := run(c.args, &stdout, &stderr)
		if code != c.code || !strings.Contains(stdout.String()+stderr.String(), c.want) {
			t.Errorf("specgen %v: exit %d, output %q; want exit %d and %q", c.args, code, stdout.String()+stderr.String(), c.code, c.want)
		}
	}
}

// TestUsageWithoutOptions: a command with no options shows no empty
// "Options:" heading.
func TestUsageWithoutOptions(t *testing.T) {
	var stdout, stderr bytes.Buffer
	if code := run([]string{"help", "version"}, &stdout, &stderr); code != exitOK || strings.Contains(stdout.String(), "Options:") {
		t.Errorf("exit %d, output %q", code, stdout.String())
	}
}

// TestCalcOfPage: calc given a page says to use check, rather than that
// the "block" has no id (a Markdown heading is a TOML comment).
func TestCalcOfPage(t *testing.T) {
	page := filepath.Join(t.TempDir(), "stage.md")
	if err := os.WriteFile(page, []byte("# Stage\n\nText.\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	var stdout, stderr bytes.Buffer
	code := run([]string{"calc", page}, &stdout, &stderr)
	if code != exitBadInput || !strings.Contains(stderr.String(), "is a Markdown page") || !strings.Contains(stderr.String(), "specgen check") {
		t.Errorf("exit %d, stderr %q", code, stderr.String())
	}
}
