package site

import (
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// TestRootLinksMadeRelative: links and images an author writes from the
// site's root reach the same file from every page, so that the site works
// from a sub-path of a web server and from file:// (checkLinks refuses any
// link that still starts with "/").
func TestRootLinksMadeRelative(t *testing.T) {
	root := t.TempDir()
	body := "# %s\n\n![head](/img/head.png) and [safety](/safety.html#relief).\n"
	writeFile(t, filepath.Join(root, "content", "index.md"), strings.ReplaceAll(body, "%s", "Home"))
	writeFile(t, filepath.Join(root, "content", "safety.md"), "# Safety\n\n## Relief\n")
	writeFile(t, filepath.Join(root, "content", "pump", "deep", "parts.md"), strings.ReplaceAll(body, "%s", "Parts"))
	writeFile(t, filepath.Join(root, "static", "img", "head.png"), "png")
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	files := readTree(t, filepath.Join(root, DefaultOut))
	for page, want := range map[string][]string{
		"index.html":           {`src="img/head.png"`, `href="safety.html#relief"`},
		"pump/deep/parts.html": {`src="../../img/head.png"`, `href="../../safety.html#relief"`},
	} {
		for _, w := range want {
			if !strings.Contains(string(files[page]), w) {
				t.Errorf("%s lacks %s", page, w)
			}
		}
	}
	checkLinks(t, files)
}

// TestBaseURL: with base_url the build writes sitemap.xml (every page's
// full address, sorted) and a canonical link on every page, and the 404
// page's links start at the site's root on its host, so that they work at
// any depth.
func TestBaseURL(t *testing.T) {
	root := t.TempDir()
	writeFile(t, filepath.Join(root, ConfigFile), "title = \"Pumps\"\nbase_url = \"https://docs.example.invalid/pumps\"\n")
	writeFile(t, filepath.Join(root, "content", "index.md"), "# Home\n")
	writeFile(t, filepath.Join(root, "content", "stage one", "valves.md"), "# Valves\n")
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	files := readTree(t, filepath.Join(root, DefaultOut))
	wantMap := `<?xml version="1.0" encoding="UTF-8"?>
<urlset xmlns="http://www.sitemaps.org/schemas/sitemap/0.9">
  <url><loc>https://docs.example.invalid/pumps/index.html</loc></url>
  <url><loc>https://docs.example.invalid/pumps/stage%20one/valves.html</loc></url>
</urlset>
`
	if got := string(files["sitemap.xml"]); got != wantMap {
		t.Errorf("sitemap.xml:\n%s\nwant:\n%s", got, wantMap)
	}
	if want := `<link rel="canonical" href="https://docs.example.invalid/pumps/stage%20one/valves.html">`; !strings.Contains(string(files["stage one/valves.html"]), want) {
		t.Errorf("valves.html lacks %s", want)
	}
	notFound := string(files["404.html"])
	for _, want := range []string{`href="/pumps/assets/specgen.css"`, `href="/pumps/index.html">the home page`,
		`href="/pumps/stage%20one/valves.html"`, `src="/pumps/assets/search.js"`} {
		if !strings.Contains(notFound, want) {
			t.Errorf("404.html lacks %s:\n%s", want, notFound)
		}
	}
}

// TestWithoutBaseURL: without base_url there is no sitemap and no
// canonical link, and the 404 page links only the home page, relatively
// (the README says it is right only in the top folder).
func TestWithoutBaseURL(t *testing.T) {
	root := t.TempDir()
	writeFile(t, filepath.Join(root, "content", "index.md"), "# Home\n")
	writeFile(t, filepath.Join(root, "content", "a", "b.md"), "# B\n")
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	files := readTree(t, filepath.Join(root, DefaultOut))
	if _, ok := files["sitemap.xml"]; ok {
		t.Error("a sitemap without base_url")
	}
	if strings.Contains(string(files["a/b.html"]), `rel="canonical"`) {
		t.Error("a canonical link without base_url")
	}
	notFound := string(files["404.html"])
	links := regexp.MustCompile(`<a [^>]*href="([^"#]*)"`).FindAllStringSubmatch(notFound, -1)
	for _, l := range links {
		if l[1] != "index.html" {
			t.Errorf("404.html links %q; without base_url it links the home page only", l[1])
		}
	}
	if len(links) == 0 {
		t.Error("404.html does not link the home page")
	}
}

// TestOwnNotFoundPageKept: a site's own 404 page or sitemap is published
// instead of specgen's.
func TestOwnNotFoundPageKept(t *testing.T) {
	root := t.TempDir()
	writeFile(t, filepath.Join(root, ConfigFile), "base_url = \"https://example.invalid/\"\n")
	writeFile(t, filepath.Join(root, "content", "index.md"), "# Home\n")
	writeFile(t, filepath.Join(root, "content", "404.md"), "# Lost in the workshop\n")
	writeFile(t, filepath.Join(root, "static", "sitemap.xml"), "<urlset/>\n")
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	files := readTree(t, filepath.Join(root, DefaultOut))
	if !strings.Contains(string(files["404.html"]), "Lost in the workshop") {
		t.Error("the site's own 404 page was replaced")
	}
	if string(files["sitemap.xml"]) != "<urlset/>\n" {
		t.Error("the site's own sitemap was replaced")
	}
}

func TestBaseURLRefused(t *testing.T) {
	for _, bad := range []string{"docs.example.invalid/pumps", "ftp://example.invalid/", "https://example.invalid/?page=1", "/pumps/"} {
		root := t.TempDir()
		writeFile(t, filepath.Join(root, ConfigFile), "title = \"Pumps\"\nbase_url = \""+bad+"\"\n")
		writeFile(t, filepath.Join(root, "content", "index.md"), "# Home\n")
		_, err := Load(root)
		if err == nil || !strings.Contains(err.Error(), "specgen.toml:2: base_url: \""+bad+"\" is not allowed; write the full address") {
			t.Errorf("base_url %q: %v", bad, err)
		}
	}
}

// TestSearchIndex: the index holds every page with its title, address
// from the root, headings with their anchors and its words, values as
// shown; code is left out.
func TestSearchIndex(t *testing.T) {
	root := t.TempDir()
	writeFile(t, filepath.Join(root, "content", "index.md"), "# Home\n\nThe workshop's machines.\n")
	writeFile(t, filepath.Join(root, "content", "pump", "valves.md"), "+++\ndescription = \"Reed valves of the pump.\"\n+++\n# Valves\n\n"+
		"## Reed springs\n\nSpring steel reeds, cut by hand.\n\n```go\nsecretword := 1\n```\n")
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	index := string(readTree(t, filepath.Join(root, DefaultOut))[searchIndexFile])
	want := `specgenSearchIndex([
{"t":"Home","u":"index.html","x":"The workshop's machines.","h":[],"w":"home the workshop s machines"},
{"t":"Valves","u":"pump/valves.html","x":"Reed valves of the pump.","h":[["Reed springs","reed-springs"]],"w":"valves reed springs spring steel reeds cut by hand"}
]);
`
	if index != want {
		t.Errorf("search index:\n%s\nwant:\n%s", index, want)
	}
}
