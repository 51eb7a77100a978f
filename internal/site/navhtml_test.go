package site

import (
	"html/template"
	"io/fs"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/templates"
)

// TestNavListAsTemplate holds NavList to the default layout's
// _navlist.html, run by html/template, on random navigation trees whose
// titles and URLs hold everything the template escapes.
func TestNavListAsTemplate(t *testing.T) {
	src, err := fs.ReadFile(templates.FS, "_nav.html")
	if err != nil {
		t.Fatal(err)
	}
	tpl := template.Must(template.New("_nav.html").Parse(string(src)))
	r := rand.New(rand.NewPCG(7, 8))
	words := []string{"Stage", "1", " ", "&", "<b>", `"q"`, "'", "+", "\x00", "é", "\xff", "%", "%4", "%41", "%zz", ":", "/", "?", "#",
		"a b", "mailto:", "javascript:", "HTTP:", "../", "~", "ﷰ", "\t", "=", "[x]"}
	text := func() string {
		var b strings.Builder
		for range r.IntN(5) {
			b.WriteString(words[r.IntN(len(words))])
		}
		return b.String()
	}
	var tree func(depth int) []NavItem
	tree = func(depth int) []NavItem {
		items := make([]NavItem, r.IntN(5))
		for i := range items {
			items[i] = NavItem{Title: text(), Current: r.IntN(4) == 0, Open: r.IntN(2) == 0, Folder: r.IntN(3) == 0}
			if r.IntN(5) > 0 {
				items[i].URL = text()
			}
			if r.IntN(6) == 0 {
				items[i].More = r.IntN(30) - 2
			}
			if depth < 3 && r.IntN(3) == 0 {
				items[i].Children = tree(depth + 1)
			}
		}
		return items
	}
	for n := range 3000 {
		nav := tree(0)
		if n == 0 {
			nav = nil
		}
		var want strings.Builder
		if err := tpl.ExecuteTemplate(&want, "_navlist.html", nav); err != nil {
			t.Fatal(err)
		}
		if got := string(PageData{Nav: nav}.NavList()); got != want.String() {
			t.Fatalf("NavList of %+v:\n%q\nthe template writes\n%q", nav, got, want.String())
		}
	}
}
