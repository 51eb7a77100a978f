package site

import (
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"flag"
	"html"
	"io/fs"
	"maps"
	"net/url"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"sort"
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/inputerr"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata/")

// copyTree copies a folder, so tests never write into testdata/.
func copyTree(t testing.TB, src, dst string) {
	t.Helper()
	err := filepath.WalkDir(src, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(src, p)
		target := filepath.Join(dst, rel)
		if d.IsDir() {
			return os.MkdirAll(target, 0o755)
		}
		b, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		return os.WriteFile(target, b, 0o644)
	})
	if err != nil {
		t.Fatal(err)
	}
}

// readTree returns every file under dir, keyed by slash path.
func readTree(t testing.TB, dir string) map[string][]byte {
	t.Helper()
	files := map[string][]byte{}
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		rel, _ := filepath.Rel(dir, p)
		b, err := os.ReadFile(p)
		files[filepath.ToSlash(rel)] = b
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	return files
}

func treeHash(t testing.TB, dir string) string {
	files := readTree(t, dir)
	names := slices.Sorted(maps.Keys(files))
	h := sha256.New()
	for _, n := range names {
		h.Write([]byte(n + "\x00"))
		h.Write(files[n])
		h.Write([]byte{0})
	}
	return hex.EncodeToString(h.Sum(nil))
}

func buildCopy(t *testing.T, fixture string) (root string) {
	t.Helper()
	root = t.TempDir()
	copyTree(t, filepath.Join("..", "..", "testdata", "site", fixture), root)
	return root
}

// TestGoldenPages compares every output file of the small test site with
// testdata/site/basic.golden/. Run with -update to accept new output.
func TestGoldenPages(t *testing.T) {
	root := buildCopy(t, "basic")
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	got := readTree(t, filepath.Join(root, DefaultOut))
	// The stylesheets are copies of templates/assets; the pages are the point.
	for name := range got {
		if strings.HasPrefix(name, "assets/") {
			delete(got, name)
		}
	}
	golden := filepath.Join("..", "..", "testdata", "site", "basic.golden")
	if *update {
		if err := os.RemoveAll(golden); err != nil {
			t.Fatal(err)
		}
		for name, data := range got {
			p := filepath.Join(golden, filepath.FromSlash(name))
			if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile(p, data, 0o644); err != nil {
				t.Fatal(err)
			}
		}
		return
	}
	want := readTree(t, golden)
	for _, name := range slices.Sorted(maps.Keys(want)) {
		if !bytes.Equal(got[name], want[name]) {
			t.Errorf("%s differs from the golden file (run go test ./internal/site -run TestGoldenPages -update to accept)", name)
		}
	}
	for _, name := range slices.Sorted(maps.Keys(got)) {
		if _, ok := want[name]; !ok {
			t.Errorf("%s is new output without a golden file", name)
		}
	}
}

func TestPageLayout(t *testing.T) {
	root := buildCopy(t, "basic")
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(root, DefaultOut)
	checkLinks(t, readTree(t, out))
	read := func(name string) string {
		b, err := os.ReadFile(filepath.Join(out, name))
		if err != nil {
			t.Fatal(err)
		}
		return string(b)
	}
	setup := read("guide/setup.html")
	for _, want := range []string{
		`&lt;b&gt;raw&lt;/b&gt;`,           // inline raw HTML escaped
		`&lt;div class=&quot;x&quot;&gt;`,  // block raw HTML escaped
		`<a href="../index.html">Home</a>`, // breadcrumb and navigation, relative
		`rel="prev"`, `rel="next"`,         // previous and next
		`<a href="#wiring">Wiring</a>`,                       // in-page table of contents
		`class="hl-chroma"`,                                  // highlighted code
		`plain text, not guessed`,                            // unknown language shown plain
		`href="../assets/specgen.css"`,                       // stylesheet relative to the page
		`<a href="../guide/setup.html" aria-current="page">`, // current page marked
	} {
		if !strings.Contains(setup, want) {
			t.Errorf("guide/setup.html lacks %s", want)
		}
	}
	if strings.Contains(setup, "<b>raw</b>") || strings.Contains(setup, `<div class="x">`) {
		t.Error("raw HTML reached the page unescaped")
	}
	if strings.Contains(setup, "javascript:") {
		t.Error("a javascript: link reached the page")
	}
	index := read("index.html")
	for _, want := range []string{`href="guide/index.html"`, `href="guide/setup.html#wiring"`, `href="https://example.org/spec.md"`, `class="footnote-ref"`, `<table>`} {
		if !strings.Contains(index, want) {
			t.Errorf("index.html lacks %s", want)
		}
	}
	if got := read("notes.txt"); got != "plain static file\n" {
		t.Errorf("static file copied as %q", got)
	}
	teardown := read("guide/teardown.html")
	if !strings.Contains(teardown, "<title>Teardown &amp; storage · Test Bench Notes</title>") {
		t.Error("title from the first heading missing or unescaped")
	}
}

func TestRawHTMLAllowedByConfig(t *testing.T) {
	root := buildCopy(t, "basic")
	cfg := "title = \"T\"\n[markdown]\nraw_html = true\n"
	if err := os.WriteFile(filepath.Join(root, ConfigFile), []byte(cfg), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	b, _ := os.ReadFile(filepath.Join(root, DefaultOut, "guide", "setup.html"))
	if !bytes.Contains(b, []byte("<b>raw</b>")) {
		t.Error("raw_html = true did not let raw HTML through")
	}
}

func TestRebuildIsByteIdentical(t *testing.T) {
	root := buildCopy(t, "basic")
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	first := treeHash(t, filepath.Join(root, DefaultOut))
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	if second := treeHash(t, filepath.Join(root, DefaultOut)); first != second {
		t.Error("two builds of the same tree differ")
	}
}

func TestFailedBuildLeavesOutputUntouched(t *testing.T) {
	root := buildCopy(t, "basic")
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	before := treeHash(t, filepath.Join(root, DefaultOut))
	bad := "+++\ntitel = \"oops\"\n+++\nbody\n"
	if err := os.WriteFile(filepath.Join(root, "content", "guide", "setup.md"), []byte(bad), 0o644); err != nil {
		t.Fatal(err)
	}
	_, err := Build(root, Options{})
	if err == nil || !inputerr.Is(err) {
		t.Fatalf("want an input error, got %v", err)
	}
	if after := treeHash(t, filepath.Join(root, DefaultOut)); after != before {
		t.Error("a failed build changed the previous output")
	}
	entries, _ := os.ReadDir(root)
	for _, e := range entries {
		if strings.HasPrefix(e.Name(), ".dist") {
			t.Errorf("a failed build left %s behind", e.Name())
		}
	}
}

func TestRefusedOutputFolders(t *testing.T) {
	root := buildCopy(t, "basic")
	foreign := filepath.Join(root, "mine")
	if err := os.MkdirAll(foreign, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(foreign, "thesis.txt"), []byte("keep me"), 0o644); err != nil {
		t.Fatal(err)
	}
	other := t.TempDir()
	if err := os.MkdirAll(filepath.Join(other, "content"), 0o755); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name, out, why string
	}{
		{"site root", ".", "is the site root"},
		{"site root spelled absolute", root, "is the site root"},
		{"above the root", "..", "above the site root"},
		{"inside content", "content/out", "inside the site's sources"},
		{"holds content", other, "holds a content/ folder"},
		{"foreign files", "mine", "did not write"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := Build(root, Options{Out: c.out})
			if err == nil || !strings.Contains(err.Error(), c.why) {
				t.Fatalf("want refusal %q, got %v", c.why, err)
			}
		})
	}
	if b, err := os.ReadFile(filepath.Join(foreign, "thesis.txt")); err != nil || string(b) != "keep me" {
		t.Error("a refused folder was touched")
	}
}

// TestDemoLinksResolve builds the repository's demo site and checks that
// every relative href and src in it points at a file of the output.
func TestDemoLinksResolve(t *testing.T) {
	out := filepath.Join(t.TempDir(), "site")
	if _, err := Build(filepath.Join("..", ".."), Options{Out: out}); err != nil {
		t.Fatal(err)
	}
	if pages := checkLinks(t, readTree(t, out)); pages < 8 {
		t.Fatalf("demo has %d pages, want at least 8", pages)
	}
}

// checkLinks checks that every relative href and src of the HTML files
// points at a file of the tree, and at an element with the fragment's id;
// it returns the number of pages.
func checkLinks(t *testing.T, files map[string][]byte) int {
	t.Helper()
	ref := regexp.MustCompile(`(?:href|src)="([^"]*)"`)
	var pages []string
	for name := range files {
		if strings.HasSuffix(name, ".html") {
			pages = append(pages, name)
		}
	}
	sort.Strings(pages)
	for _, page := range pages {
		for _, m := range ref.FindAllStringSubmatch(string(files[page]), -1) {
			link := m[1]
			if strings.Contains(link, "://") || strings.HasPrefix(link, "mailto:") {
				continue
			}
			if strings.HasPrefix(link, "/") {
				t.Errorf("%s: link %q is not relative", page, link)
				continue
			}
			target, frag, _ := strings.Cut(link, "#")
			if target == "" {
				target = page
			} else {
				target = filepath.ToSlash(filepath.Join(filepath.Dir(page), target))
			}
			data, ok := files[target]
			if !ok {
				t.Errorf("%s: link %q points at a missing file", page, link)
				continue
			}
			if frag != "" && !strings.Contains(string(data), `id="`+frag+`"`) {
				t.Errorf("%s: link %q points at a missing anchor", page, link)
			}
		}
	}
	return len(pages)
}

// TestEveryCautionLevel builds testdata/site/cautions, whose blocks raise
// one caution of each signal word, and checks each box and the
// acknowledgement reach the page with their words.
func TestEveryCautionLevel(t *testing.T) {
	root := buildCopy(t, "cautions")
	s, err := Load(root)
	if err != nil {
		t.Fatal(err)
	}
	if n := len(s.Problems()); n != 0 {
		t.Errorf("an acknowledged DANGER still counts as a problem (%d)", n)
	}
	if _, err := s.Write(Options{}); err != nil {
		t.Fatal(err)
	}
	page, _ := os.ReadFile(filepath.Join(root, DefaultOut, "index.html"))
	for _, want := range []string{`sg-caution-danger" id="calc-`, `aria-label="DANGER"`, `aria-label="WARNING"`, `aria-label="CAUTION"`, `aria-label="NOTICE"`,
		"<strong>Acknowledged:</strong> a bench demonstration", "licensed practice govern"} {
		if !strings.Contains(string(page), want) {
			t.Errorf("page lacks %s", want)
		}
	}
}

// TestContentSymlinkRefused: a page that is a link to a file outside the
// site is refused, not published.
func TestContentSymlinkRefused(t *testing.T) {
	root := buildCopy(t, "basic")
	secret := filepath.Join(t.TempDir(), "secret.md")
	writeFile(t, secret, "# private notes\n")
	if err := os.Symlink(secret, filepath.Join(root, "content", "leak.md")); err != nil {
		t.Skip("no symbolic links here:", err)
	}
	_, err := Build(root, Options{})
	if err == nil || !strings.Contains(err.Error(), "content/leak.md: is a symbolic link") {
		t.Fatalf("want the link refused, got %v", err)
	}
	if _, err := os.Stat(filepath.Join(root, DefaultOut, "leak.html")); err == nil {
		t.Error("the linked page was published")
	}
}

// TestContentFolderSymlinkRefused: a linked folder in content/ (here a
// loop back to the site root) stops the build with its name instead of
// its pages being left out without a word.
func TestContentFolderSymlinkRefused(t *testing.T) {
	root := buildCopy(t, "basic")
	if err := os.Symlink("..", filepath.Join(root, "content", "loop")); err != nil {
		t.Skip("no symbolic links here:", err)
	}
	_, err := Build(root, Options{})
	if err == nil || !strings.Contains(err.Error(), "content/loop: is a symbolic link to a folder") {
		t.Fatalf("want the linked folder refused, got %v", err)
	}
}

// TestSiteWithoutHomePage: with no content/index.md the site title links
// to the first page, and every link still resolves.
func TestSiteWithoutHomePage(t *testing.T) {
	root := t.TempDir()
	writeFile(t, filepath.Join(root, "content", "guide.md"), "# Guide\n\nSee [deep](a/b/deep.md).\n")
	writeFile(t, filepath.Join(root, "content", "a", "b", "deep.md"), "+++\ntitle = \"Deep\"\n+++\nBack to [guide](../../guide.md).\n")
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	checkLinks(t, readTree(t, filepath.Join(root, DefaultOut)))
}

// TestFolderWithoutIndexLinked: a folder without index.md is closed in the
// navigation of pages outside it, so its name links to its first page;
// otherwise its pages could not be reached from there.
func TestFolderWithoutIndexLinked(t *testing.T) {
	root := t.TempDir()
	writeFile(t, filepath.Join(root, "content", "index.md"), "# Home\n")
	writeFile(t, filepath.Join(root, "content", "notes", "b.md"), "# Bravo\n")
	writeFile(t, filepath.Join(root, "content", "notes", "a.md"), "# Alpha\n")
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	home, err := os.ReadFile(filepath.Join(root, DefaultOut, "index.html"))
	if err != nil {
		t.Fatal(err)
	}
	if want := `<a href="notes/a.html">Notes</a>`; !strings.Contains(string(home), want) {
		t.Errorf("index.html lacks %s in its navigation:\n%s", want, home)
	}
}

// TestStandardCautionFitsThePage: a page whose only pressure calculation is
// a vacuum one gets the vacuum wording, and so does one with a tube pumped
// down and a lid given only the difference across it; one with compressed
// air, or a lid alone, the other; all say that local codes and licensed
// practice govern.
func TestStandardCautionFitsThePage(t *testing.T) {
	root := t.TempDir()
	pump := "```calc\nid = \"pump\"\nkind = \"vacuum\"\nbore = \"50 mm\"\nstroke = \"40 mm\"\nrod_length = \"90 mm\"\n" +
		"clearance_ratio = 0.02\nspeed = \"1450 rpm\"\nvessel_volume = \"20 L\"\ntarget_pressure = \"50 mbar(a)\"\n```\n"
	writeFile(t, filepath.Join(root, "content", "index.md"), "# Vacuum\n\n"+pump)
	writeFile(t, filepath.Join(root, "content", "both.md"), "# Both\n\nThe pump reaches =[pump.ultimate_pressure mbar].\n\n"+
		"```calc\nid = \"stage\"\nkind = \"compressor\"\nbore = \"28 mm\"\nstroke = \"32 mm\"\nrod_length = \"70 mm\"\n"+
		"clearance_volume = \"1.8 cm3\"\nspeed = \"900 rpm\"\ndischarge_pressure = \"6 bar\"\n```\n")
	lid := func(id string) string {
		return "```calc\nid = \"" + id + "\"\nkind = \"plate\"\nshape = \"circular\"\ndiameter = \"200 mm\"\nthickness = \"10 mm\"\n" +
			"material = \"s235\"\npressure_difference = \"1 bar\"\n```\n"
	}
	writeFile(t, filepath.Join(root, "content", "walls.md"), "# Walls\n\n"+lid("top")+"\n"+
		"```calc\nid = \"shell\"\nkind = \"tube\"\ninner_diameter = \"150 mm\"\nwall_thickness = \"2 mm\"\npressure = \"-0.9 bar(g)\"\nmaterial = \"s235\"\n```\n")
	writeFile(t, filepath.Join(root, "content", "lid.md"), "# Lid\n\n"+lid("cover"))
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	for page, want := range map[string]string{"index.html": "weight of the atmosphere", "both.html": "Compressed air stores energy",
		"walls.html": "weight of the atmosphere", "lid.html": "Compressed air stores energy"} {
		b, err := os.ReadFile(filepath.Join(root, DefaultOut, page))
		if err != nil {
			t.Fatal(err)
		}
		html := string(b)
		if !strings.Contains(html, want) || !strings.Contains(html, "licensed practice govern") {
			t.Errorf("%s: standard caution lacks %q or the deference to local codes", page, want)
		}
	}
}

// TestEmptyRootIsCurrentFolder: -C "" builds the current folder, as it did
// before the root was checked, rather than "site root : no such folder".
func TestEmptyRootIsCurrentFolder(t *testing.T) {
	root := t.TempDir()
	writeFile(t, filepath.Join(root, "content", "index.md"), "# Home\n")
	t.Chdir(root)
	if _, err := Build("", Options{}); err != nil {
		t.Fatal(err)
	}
}

// TestInterruptedBuildLeavesNothing: a build stopped part way (Ctrl-C)
// removes its unfinished output folder and leaves the previous output as
// it was.
func TestInterruptedBuildLeavesNothing(t *testing.T) {
	root := buildCopy(t, "basic")
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(root, DefaultOut)
	before := treeHash(t, out)
	writeFile(t, filepath.Join(root, "content", "new.md"), "# New page\n")
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	_, err := Build(root, Options{Context: ctx})
	if !errors.Is(err, ErrInterrupted) {
		t.Fatalf("want ErrInterrupted, got %v", err)
	}
	if left, _ := filepath.Glob(filepath.Join(root, ".dist.building-*")); len(left) > 0 {
		t.Errorf("the interrupted build left %v", left)
	}
	if treeHash(t, out) != before {
		t.Error("the interrupted build changed the previous output")
	}
}

// TestOddFileNamesLinked: pages whose names hold a colon, "?", "#", "%" or
// a space are reached by every link specgen writes, resolved as a browser
// does ("what?.html" unescaped would ask for "what" with a query, and
// "a:b.html" reads as a URL scheme, which html/template blanks).
func TestOddFileNamesLinked(t *testing.T) {
	root := t.TempDir()
	names := []string{"index.md", "a:b.md", "what?.md", "c#.md", "100%.md", "sub dir/x:y.md"}
	block := "```calc\nid = \"low\"\nkind = \"compressor\"\nbore = \"32 mm\"\nstroke = \"28 mm\"\nrod_length = \"70 mm\"\n" +
		"clearance_volume = \"1.8 cm3\"\nspeed = \"900 rpm\"\ndischarge_pressure = \"6 bar\"\n[show]\ncharts = [\"pv\"]\n```\n"
	for _, n := range names {
		text := "# Page " + n + "\n\nDelivery =[low.free_air_delivery L/min].\n"
		if n == "what?.md" {
			text += "\n" + block
		}
		writeFile(t, filepath.Join(root, "content", filepath.FromSlash(n)), text)
	}
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	files := readTree(t, filepath.Join(root, DefaultOut))
	ref := regexp.MustCompile(`(?:href|src)="([^"]*)"`)
	seen := 0
	for name, data := range files {
		if !strings.HasSuffix(name, ".html") {
			continue
		}
		base := &url.URL{Scheme: "file", Path: "/site/" + name}
		for _, m := range ref.FindAllStringSubmatch(string(data), -1) {
			link, err := url.Parse(html.UnescapeString(m[1]))
			if strings.Contains(m[1], "ZgotmplZ") {
				t.Errorf("%s: html/template blanked a link as unsafe: %q", name, m[1])
			}
			if err != nil {
				t.Errorf("%s: link %q: %v", name, m[1], err)
				continue
			}
			target := base.ResolveReference(link)
			if target.Scheme != "file" {
				t.Errorf("%s: link %q reads as a %s: URL", name, m[1], target.Scheme)
				continue
			}
			rel := strings.TrimPrefix(target.Path, "/site/")
			if _, ok := files[rel]; !ok {
				t.Errorf("%s: link %q reaches %q, which is not in the output", name, m[1], rel)
			}
			seen++
		}
	}
	if seen < 50 {
		t.Errorf("only %d links checked; the test proves little", seen)
	}
}

// TestFileNameNotUTF8: a page whose file name is in another encoding
// (Latin-1 "café") is refused by name; it was published with a garbled
// title and a link only some servers would match.
func TestFileNameNotUTF8(t *testing.T) {
	root := t.TempDir()
	writeFile(t, filepath.Join(root, "content", "index.md"), "# Home\n")
	if err := os.WriteFile(filepath.Join(root, "content", "caf\xe9.md"), []byte("# Cafe\n"), 0o644); err != nil {
		t.Skip("this file system refuses the name:", err)
	}
	_, err := Build(root, Options{})
	if err == nil || !strings.Contains(err.Error(), "content/caf\uFFFD.md: the file name is not UTF-8 text") {
		t.Fatalf("want the name refused, got %v", err)
	}
}
