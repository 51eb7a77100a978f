package site

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/millrace-workshop/specgen/internal/inputerr"
)

// pageSeeds are pages that exercise front matter, calc blocks, claims,
// value references, charts and raw HTML.
var pageSeeds = []string{
	"# Home\n\nPlain text.\n",
	"+++\ntitle = \"T\"\norder = 2\ndescription = \"d\"\n+++\n# Home\n",
	"+++\r\ntitle = \"CRLF\"\r\n+++\r\n# Home\r\n",
	"\ufeff+++\ntitle = \"BOM\"\n+++\nx\n",
	"+++\ntitle = \"unclosed\"\n",
	"+++\n+++\n",
	"+++",
	"+++\ntitle = 1\n+++\n",
	"+++\ntitel = \"x\"\ntitle = \"a\"\ntitle = \"b\"\n+++\n",
	"+++\ntemplate = \"../../etc/passwd\"\n+++\n",
	"# H\n\n```calc\nid = \"low\"\nkind = \"compressor\"\nbore = \"32 mm\"\nstroke = \"28 mm\"\nrod_length = \"70 mm\"\n" +
		"clearance_volume = \"1.8 cm3\"\nspeed = \"900 rpm\"\ndischarge_pressure = \"6 bar\"\n[expect]\nswept_volume = \"22.5 cm3 ± 1%\"\n" +
		"[show]\ncharts = [\"pv\"]\n```\n\nIt sweeps =[low.swept_volume cm3].\n\n```chart\nlow.pv\n```\n\n```cautions\n```\n",
	"> ```calc\n> id = \"q\"\n> kind = \"valve\"\n> seat_diameter = \"1e-300 m\"\n> spring_rate = \"1 N/mm\"\n> preload = \"1 mm\"\n> ```\n",
	"- x\n  - y\n    > z\n\n<script>alert(1)</script> [a](javascript:alert(1)) <JaVaScRiPt:x>\n",
	"```calc\nid = \"a\"\nkind = \"tank\"\nvolume = \"1 L\"\npressure = \"=a.fill_time\"\n```\n",
}

// FuzzFrontMatter checks that parseFrontMatter never panics, that an error
// is an input error (inputerr.Error or List) placed on a line of the page, and that a
// page that parses keeps its body: the body is a suffix of the page and the
// line offset counts the lines before it.
func FuzzFrontMatter(f *testing.F) {
	for _, s := range pageSeeds {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, src []byte) {
		const file = "content/index.md"
		fm, lines, body, offset, err := parseFrontMatter(file, src)
		if err != nil {
			checkPlaced(t, err, file, bytes.Count(src, []byte("\n"))+1)
			return
		}
		trimmed := bytes.TrimPrefix(src, []byte(byteOrderMark))
		if !bytes.HasSuffix(trimmed, body) {
			t.Fatalf("body %q is not the end of the page %q", body, src)
		}
		head := trimmed[:len(trimmed)-len(body)]
		if got := bytes.Count(head, []byte("\n")); got != offset && !(offset > 0 && got == offset-1) {
			t.Fatalf("offset %d, but %d lines precede the body %q", offset, got, body)
		}
		if offset == 0 && (len(lines) > 0 || fm != (FrontMatter{})) {
			t.Fatalf("no front matter, yet %+v and lines %v", fm, lines)
		}
	})
}

// FuzzPagePipeline builds a one-page site in memory: Load (front matter,
// Markdown, calc blocks, evaluation, references) and render (charts,
// tables, layouts, results.json). Nothing may panic; an error is an input
// error placed on a line of the page; a built site holds no NaN or Inf in
// results.json, valid UTF-8 for valid input, and no live script or
// javascript: link besides the layout's own search script.
func FuzzPagePipeline(f *testing.F) {
	for _, s := range pageSeeds {
		f.Add(s)
	}
	live := regexp.MustCompile(`(?i)<script|\bhref="\s*(javascript|vbscript|data):|\bsrc="\s*(javascript|vbscript):|<[a-z][^>]*\son[a-z]+=`)
	nonFinite := regexp.MustCompile(`\b(NaN|[+-]?Inf)\b`)
	ownScript := regexp.MustCompile(`<script src="(\.\./)*assets/search\.js" defer></script>`)
	f.Fuzz(func(t *testing.T, page string) {
		root := t.TempDir()
		p := filepath.Join(root, ContentDir, "index.md")
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, []byte(page), 0o644); err != nil {
			t.Fatal(err)
		}
		s, err := Load(root)
		if err != nil {
			checkPlaced(t, err, "content/index.md", strings.Count(page, "\n")+1)
			return
		}
		files, err := s.Render()
		if err != nil {
			if !inputerr.Is(err) {
				t.Fatalf("render: %T %v", err, err)
			}
			return
		}
		if m := nonFinite.Find(files["results.json"]); m != nil {
			t.Fatalf("results.json holds %s", m)
		}
		for name, data := range files {
			if utf8.ValidString(page) && strings.HasSuffix(name, ".html") && !utf8.Valid(data) {
				t.Fatalf("%s is not valid UTF-8", name)
			}
			if strings.HasSuffix(name, ".html") || strings.HasSuffix(name, ".csv") || name == "results.json" {
				if m := live.Find(ownScript.ReplaceAll(data, nil)); m != nil {
					t.Fatalf("%s holds live markup %q", name, m)
				}
			}
		}
	})
}

// checkPlaced fails t unless err is an input error whose every problem is
// in file at a line from 0 (the whole file) to last, with a message.
func checkPlaced(t *testing.T, err error, file string, last int) {
	t.Helper()
	var list inputerr.List
	var one *inputerr.Error
	switch {
	case errors.As(err, &list):
	case errors.As(err, &one):
		list = inputerr.List{one}
	default:
		t.Fatalf("error %T %q is not an input error", err, err)
	}
	for _, e := range list {
		if e.Msg == "" {
			t.Fatalf("an error without a message: %+v", e)
		}
		if e.File == file && (e.Line < 0 || e.Line > last) {
			t.Fatalf("%q is at line %d; the page has %d lines", e, e.Line, last)
		}
	}
}
