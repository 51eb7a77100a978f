package main

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"
)

// writeSite writes files (path relative to the root → content) into a new
// temporary site root.
func writeSite(t *testing.T, files map[string]string) string {
	t.Helper()
	root := t.TempDir()
	for rel, data := range files {
		p := filepath.Join(root, filepath.FromSlash(rel))
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, []byte(data), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return root
}

// runWithin runs specgen and fails t if it has not finished within limit,
// which is far above its normal time: it catches hangs, not slowness.
func runWithin(t *testing.T, limit time.Duration, args ...string) (code int, stdout, stderr string) {
	t.Helper()
	type result struct {
		code           int
		stdout, stderr string
	}
	done := make(chan result, 1)
	go func() {
		var o, e bytes.Buffer
		c := run(args, &o, &e)
		done <- result{c, o.String(), e.String()}
	}()
	select {
	case r := <-done:
		return r.code, r.stdout, r.stderr
	case <-time.After(limit):
		t.Fatalf("specgen %s did not finish within %s", strings.Join(args, " "), limit)
		return 0, "", ""
	}
}

// payloads are the hostile strings put in every user-controllable text.
var payloads = []string{`<script>alert(1)</script>`, `"><img src=x onerror=alert(1)>`, `javascript:alert(1)`}

// liveMarkup matches markup that a browser would run: a script element, an
// element with an event handler attribute, a script URL in a link or source.
// The payloads' own tags only ever appear escaped, so finding one raw means
// a string reached the output unescaped or broke out of an attribute.
var liveMarkup = regexp.MustCompile(`(?i)<script>alert|<img src=x onerror|<svg onload|\b(href|src|xlink:href|action)\s*=\s*["']?\s*(javascript|vbscript|data:text/html)`)

// TestHostileStringsEscaped builds a site whose every user-controllable
// string holds the payloads: the site title and description, materials'
// labels and sources, a page's file and folder name, front matter, headings,
// prose, links, a block's title and acknowledgement reason, a table cell, a
// code block's language. No output file may hold live markup.
func TestHostileStringsEscaped(t *testing.T) {
	all := strings.Join(payloads, " ")
	toml := strings.NewReplacer(`\`, `\\`, `"`, `\"`).Replace(all)
	block := func(id, title string) string {
		return "```calc\nid = \"" + id + "\"\nkind = \"compressor\"\ntitle = \"" + title + "\"\nbore = \"32 mm\"\nstroke = \"28 mm\"\n" +
			"rod_length = \"70 mm\"\nclearance_volume = \"1.8 cm3\"\nspeed = \"900 rpm\"\ndischarge_pressure = \"6 bar\"\n" +
			"[show]\ncharts = [\"pv\", \"torque\"]\n[acknowledge]\nno-relief = \"" + title + "\"\n```\n"
	}
	files := map[string]string{
		"specgen.toml": "title = \"" + toml + "\"\ndescription = \"" + toml + "\"\n" +
			"[materials.hostile]\nclass = \"plastic\"\ntensile_strength = \"40 MPa\"\nelastic_modulus = \"2 GPa\"\n" +
			"density = \"1.2 g/cm3\"\nservice_temperature = \"60 degC\"\nlabel = \"" + toml + "\"\nsource = \"" + toml + "\"\n",
		"content/index.md": "+++\ntitle = \"" + toml + "\"\ndescription = \"" + toml + "\"\n+++\n# " + all + "\n\n" + all + "\n\n" +
			"[a](javascript:alert(1)) [b](JaVaScRiPt:alert(1)) [c](vbscript:msgbox(1)) [d](data:text/html,x) " +
			"[e](%20javascript:alert(1)) [f](java&#x09;script:alert(1)) <javascript:alert(1)> ![g](javascript:alert(1)) " +
			"[h](x.md \"" + payloads[1] + "\") [i][ref]\n\n[ref]: javascript:alert(1)\n\n" +
			"| " + payloads[0] + " | " + payloads[1] + " |\n|---|---|\n| " + payloads[2] + " | x |\n\n" +
			"```" + `"><img` + "\n" + all + "\n```\n\n" + block("low", toml) + "\n" +
			"```calc\nid = \"wall\"\nkind = \"tube\"\ntitle = \"" + toml + "\"\ninner_diameter = \"20 mm\"\nouter_diameter = \"30 mm\"\n" +
			"pressure = \"=low.max_pressure\"\nmaterial = \"hostile\"\n[acknowledge]\nprinted-pressure-part = \"" + toml + "\"\n" +
			"low-safety-factor = \"" + toml + "\"\nabove-allowable = \"" + toml + "\"\n```\n\n" +
			"```chart\nlow.pv\n```\n\n```cautions\n```\n\nValue =[low.swept_volume cm3].\n",
		`content/"><img src=x onerror=alert(1)>/<svg onload=alert(1)>.md`: "# " + all + "\n\n[back](../index.md)\n",
		"content/spec.md": "+++\ntemplate = \"spec\"\ntitle = \"" + toml + "\"\n+++\n=[low.free_air_delivery L/min]\n\n```chart\nlow.torque\n```\n",
	}
	root := writeSite(t, files)
	code, stdout, stderr := runWithin(t, time.Minute, "build", "-C", root)
	if code != exitOK && code != exitFailed {
		t.Fatalf("build: exit %d\n%s%s", code, stdout, stderr)
	}
	var seen int
	err := filepath.WalkDir(filepath.Join(root, "dist"), func(p string, d os.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		data, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		seen++
		if m := liveMarkup.Find(data); m != nil {
			rel, _ := filepath.Rel(root, p)
			i := bytes.Index(data, m)
			t.Errorf("%s holds live markup %q in %q", rel, m, data[max(0, i-80):min(len(data), i+80)])
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	index, _ := os.ReadFile(filepath.Join(root, "dist", "index.html"))
	if n := bytes.Count(index, []byte("&lt;script&gt;alert(1)&lt;/script&gt;")); n < 8 {
		t.Errorf("index.html shows the escaped payload %d times: too few reached the page for the test to prove anything", n)
	}
	if seen < 6 {
		t.Errorf("only %d output files", seen)
	}
}

// TestHostileSizes feeds generated pages at the limits: each must finish
// (exit 0 or 2 with a message naming the file and line), never hang, and
// leave no output behind when it fails.
func TestHostileSizes(t *testing.T) {
	stage := "id = \"low\"\nkind = \"compressor\"\nbore = \"32 mm\"\nstroke = \"28 mm\"\nrod_length = \"70 mm\"\n" +
		"clearance_volume = \"1.8 cm3\"\nspeed = \"900 rpm\"\ndischarge_pressure = \"6 bar\"\n"
	var keys strings.Builder
	for i := range 100000 {
		fmt.Fprintf(&keys, "extra_%d = %d\n", i, i)
	}
	var deepList strings.Builder // 32 levels, the most allowed
	for i := range 32 {
		deepList.WriteString(strings.Repeat("  ", i) + "- level\n")
	}
	cases := []struct {
		name string
		page string
		exit int
		want string
	}{
		{"10 MB page", "# Big\n\n" + strings.Repeat("Prose with **bold**, `code` and a [link](x.md).\n\n", 10<<20/50), exitBadInput,
			"content/index.md:1: the page is "},
		{"calc block of 100,000 lines", "# H\n\n```calc\n" + stage + strings.Repeat("# a comment\n", 100000) + "```\n", exitBadInput,
			"content/index.md:3: the block is 100008 lines"},
		{"calc block of 100,000 unknown keys", "# H\n\n```calc\n" + stage + keys.String() + "```\n", exitBadInput,
			"content/index.md:3: the block is 100008 lines"},
		{"calc block of 5,000 lines", "# H\n\n```calc\n" + stage + strings.Repeat("# a comment\n", 5000) + "```\n", exitOK,
			"built 1 page"},
		{"100,000 nested quotes", "# H\n\n" + strings.Repeat(">", 100000) + " deep\n", exitBadInput,
			"content/index.md:3: this line opens 100000 levels of quotes or lists; allowed: up to 32"},
		{"100,000 nested list markers", "# H\n\n" + strings.Repeat("- ", 100000) + "deep\n", exitBadInput,
			"content/index.md:3: this line opens 100000 levels"},
		{"a list nested 2,000 deep by indentation", "# H\n\n" + deepList.String() + strings.Repeat(" ", 4000) + "- deeper\n", exitBadInput,
			"content/index.md:35: this line opens 2001 levels"},
		{"a list nested 32 deep", "# H\n\n" + deepList.String(), exitOK,
			"built 1 page"},
		{"50,000 open brackets and emphasis", "# H\n\n" + strings.Repeat("[", 50000) + strings.Repeat("*", 50000) + "x\n", exitOK,
			"built 1 page"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			root := writeSite(t, map[string]string{"content/index.md": c.page})
			code, stdout, stderr := runWithin(t, 2*time.Minute, "build", "-C", root)
			if code != c.exit || !strings.Contains(stdout+stderr, c.want) {
				t.Errorf("exit %d, want %d and %q; output:\n%.600s%.600s", code, c.exit, c.want, stdout, stderr)
			}
			if strings.Count(stderr, "\n") > 30 {
				t.Errorf("%d lines of messages; a flood hides the first problem", strings.Count(stderr, "\n"))
			}
			if _, err := os.Stat(filepath.Join(root, "dist")); (err == nil) != (c.exit == exitOK) {
				t.Errorf("exit %d, but dist/ exists: %v", code, err == nil)
			}
		})
	}
}

// TestHostileLinks checks symbolic links in and around a site: a loop in
// content/ is refused at once, never walked (a linked folder's pages would
// otherwise be left out without a word), static/ refuses links, and -out
// cannot reach the site root or above through a link or "..".
func TestHostileLinks(t *testing.T) {
	site := func(t *testing.T) string {
		return writeSite(t, map[string]string{"content/index.md": "# Home\n", "content/sub/page.md": "# Page\n"})
	}
	link := func(t *testing.T, target, name string) {
		t.Helper()
		if err := os.Symlink(target, name); err != nil {
			t.Skipf("no symbolic links here: %v", err)
		}
	}
	t.Run("loop in content", func(t *testing.T) {
		root := site(t)
		link(t, "..", filepath.Join(root, "content", "sub", "loop"))
		link(t, ".", filepath.Join(root, "content", "self"))
		code, stdout, stderr := runWithin(t, time.Minute, "build", "-C", root)
		if code != exitBadInput || !strings.Contains(stderr, "content/self: is a symbolic link to a folder") {
			t.Errorf("exit %d, want 2 and the link named:\n%s%s", code, stdout, stderr)
		}
	})
	t.Run("static link outside", func(t *testing.T) {
		root := site(t)
		secret := filepath.Join(t.TempDir(), "secret.txt")
		if err := os.WriteFile(secret, []byte("secret"), 0o600); err != nil {
			t.Fatal(err)
		}
		if err := os.MkdirAll(filepath.Join(root, "static", "img"), 0o755); err != nil {
			t.Fatal(err)
		}
		link(t, secret, filepath.Join(root, "static", "img", "s.txt"))
		code, _, stderr := runWithin(t, time.Minute, "build", "-C", root)
		if code != exitBadInput || !strings.Contains(stderr, "static/img/s.txt: is a symbolic link") {
			t.Errorf("exit %d:\n%s", code, stderr)
		}
		if _, err := os.Stat(filepath.Join(root, "dist")); err == nil {
			t.Error("a refused build left dist/")
		}
	})
	t.Run("static folder link", func(t *testing.T) {
		root := site(t)
		outside := t.TempDir()
		if err := os.WriteFile(filepath.Join(outside, "id_rsa"), []byte("secret"), 0o600); err != nil {
			t.Fatal(err)
		}
		link(t, outside, filepath.Join(root, "static"))
		code, _, stderr := runWithin(t, time.Minute, "build", "-C", root)
		if code != exitBadInput || !strings.Contains(stderr, "static/: is a symbolic link") {
			t.Errorf("exit %d:\n%s", code, stderr)
		}
	})
	for _, c := range []struct {
		name, out, why string
		target         string // a link at root/out pointing here ("" for none)
	}{
		{"out link to the root", "out", "it is the site root", "."},
		{"out link above the root", "up", "it lies above the site root", ".."},
		{"out through a link to the root", "up/" + "SITE", "it is the site root", ".."},
		{"out ..", "..", "it lies above the site root", ""},
		{"out ../..", "../..", "it lies above the site root", ""},
		{"out content", "content/x/..", "it lies inside the site's sources", ""},
	} {
		t.Run(c.name, func(t *testing.T) {
			root := site(t)
			out := strings.ReplaceAll(c.out, "SITE", filepath.Base(root))
			if c.target != "" {
				link(t, c.target, filepath.Join(root, strings.SplitN(c.out, "/", 2)[0]))
			}
			before := listing(t, filepath.Dir(root))
			code, _, stderr := runWithin(t, time.Minute, "build", "-C", root, "-out", out)
			if code != exitBadInput || !strings.Contains(stderr, c.why) {
				t.Errorf("-out %s: exit %d, want 2 and %q:\n%s", out, code, c.why, stderr)
			}
			if after := listing(t, filepath.Dir(root)); after != before {
				t.Errorf("-out %s changed the files around the site:\n%s\nwas\n%s", out, after, before)
			}
		})
	}
}

// listing names every file and folder under dir, links not followed.
func listing(t *testing.T, dir string) string {
	t.Helper()
	var b strings.Builder
	err := filepath.WalkDir(dir, func(p string, d os.DirEntry, err error) error {
		if err != nil {
			return err
		}
		fmt.Fprintln(&b, p, d.Type())
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return b.String()
}
