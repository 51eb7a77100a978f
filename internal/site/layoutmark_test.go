package site

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestLayoutContentPlaces checks that a page's content reaches every place
// a layout puts it, as the template would put it: once as HTML (the mark
// put in its place), twice, and in an attribute, where html/template
// keeps its text alone.
func TestLayoutContentPlaces(t *testing.T) {
	for _, c := range []struct {
		name, layout string
		want         []string
	}{
		{"once", `<main>{{.Page.Content}}</main>`, []string{"<main><p>Bore <em>32 mm</em> &amp; more.</p>\n</main>"}},
		{"twice", `<main>{{.Page.Content}}</main><aside>{{.Page.Content}}</aside>`,
			[]string{"<main><p>Bore <em>32 mm</em> &amp; more.</p>\n</main>", "<aside><p>Bore <em>32 mm</em> &amp; more.</p>\n</aside>"}},
		{"attribute", `<main>{{.Page.Content}}</main><div data-copy="{{.Page.Content}}"></div>`,
			[]string{"<main><p>Bore <em>32 mm</em> &amp; more.</p>\n</main>", `data-copy="Bore 32 mm &amp; more.`}},
		{"none", `<main>{{.Page.Title}}</main>`, []string{"<main>Bore</main>"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			root := t.TempDir()
			siteEdit{"content/bore.md", "", "+++\ntitle = \"Bore\"\n+++\nBore *32 mm* & more.\n"}.apply(t, root)
			siteEdit{"templates/page.html", "", c.layout}.apply(t, root)
			if _, err := Build(root, Options{}); err != nil {
				t.Fatal(err)
			}
			page, err := os.ReadFile(filepath.Join(root, DefaultOut, "bore.html"))
			if err != nil {
				t.Fatal(err)
			}
			for _, w := range c.want {
				if !strings.Contains(string(page), w) {
					t.Errorf("the page lacks %q:\n%s", w, page)
				}
			}
			if strings.ContainsRune(string(page), 0) || strings.Contains(string(page), contentMarkWords) {
				t.Errorf("the content mark is left in the page:\n%s", page)
			}
		})
	}
}
