package site

import (
	"path/filepath"
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
