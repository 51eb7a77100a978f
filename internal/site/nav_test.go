package site

import (
	"fmt"
	"slices"
	"testing"
)

// navPages makes the pages of a site: index.md at the top, big/ with an
// index and n pages, loose/ without an index and n pages, and small/ with
// three pages.
func navPages(n int) []*Page {
	page := func(rel string, order int) *Page {
		file := ContentDir + "/" + rel
		p := &Page{File: file, Rel: rel, Out: PageOutput(file), Front: FrontMatter{Order: order}}
		p.Title = titleFromName(rel)
		return p
	}
	pages := []*Page{page("index.md", 0), page("big/index.md", 1), page("small/index.md", 2)}
	for i := 0; i < n; i++ {
		pages = append(pages, page(fmt.Sprintf("big/p%03d.md", i), i), page(fmt.Sprintf("loose/p%03d.md", i), i))
	}
	for i := 0; i < 3; i++ {
		pages = append(pages, page(fmt.Sprintf("small/s%d.md", i), i))
	}
	return pages
}

// folderOf returns the children listed under the open folder titled title.
func folderOf(t *testing.T, items []NavItem, title string) []NavItem {
	t.Helper()
	for _, it := range items {
		if it.Title == title {
			return it.Children
		}
	}
	t.Fatalf("no folder %q in the navigation", title)
	return nil
}

func titles(items []NavItem) []string {
	var out []string
	for _, it := range items {
		out = append(out, it.Title)
	}
	return out
}

func TestNavBoundedInBigFolders(t *testing.T) {
	pages := navPages(300)
	root, _ := buildNav(pages)
	find := func(rel string) *Page {
		i := slices.IndexFunc(pages, func(p *Page) bool { return p.Rel == rel })
		return pages[i]
	}

	// A page in the middle of a big folder: navReach pages either side,
	// and a gap on each side that leads to the folder's index.
	mid := find("big/p150.md")
	big := folderOf(t, navFor(root, mid, "../"), "Big")
	want := []string{"138 more in Big"}
	for i := 150 - navReach; i <= 150+navReach; i++ {
		want = append(want, fmt.Sprintf("P%03d", i))
	}
	want = append(want, "137 more in Big")
	if got := titles(big); !slices.Equal(got, want) {
		t.Errorf("big/p150: folder listing\n got %q\nwant %q", got, want)
	}
	for _, gap := range []NavItem{big[0], big[len(big)-1]} {
		if gap.More == 0 || gap.URL != "../big/index.html" {
			t.Errorf("big/p150: gap %+v: want a gap linked to the folder's index.html", gap)
		}
	}
	if !big[1+navReach].Current {
		t.Errorf("big/p150: the middle entry %+v is not the current page", big[1+navReach])
	}

	// The folder's index lists every page of it.
	if got := len(folderOf(t, navFor(root, find("big/index.md"), "../"), "Big")); got != 300 {
		t.Errorf("big/index: lists %d pages of its folder, want all 300", got)
	}

	// Near the start no gap before; a gap of one would save nothing.
	if got := titles(folderOf(t, navFor(root, find("big/p001.md"), "../"), "Big")); got[0] != "P000" || got[len(got)-1] != "275 more in Big" || len(got) != 26 {
		t.Errorf("big/p001: listing %q: want P000 to P024 and a gap of 275", got)
	}
	if got := titles(folderOf(t, navFor(root, find("big/p013.md"), "../"), "Big")); got[0] != "P000" {
		t.Errorf("big/p013: listing starts %q, want P000 (a gap of one entry is listed instead)", got[0])
	}

	// Without an index, a gap leads to the nearest page it leaves out.
	loose := folderOf(t, navFor(root, find("loose/p150.md"), "../"), "Loose")
	if first, last := loose[0], loose[len(loose)-1]; first.URL != "../loose/p137.html" || last.URL != "../loose/p163.html" {
		t.Errorf("loose/p150: gaps lead to %q and %q, want p137.html and p163.html", first.URL, last.URL)
	}

	// Small folders are listed whole, and the top level with them.
	if got := titles(navFor(root, find("small/s1.md"), "../")); !slices.Equal(got, []string{"Home", "Loose", "Big", "Small"}) {
		t.Errorf("small/s1: top level %q", got)
	}
	if got := len(folderOf(t, navFor(root, find("small/s1.md"), "../"), "Small")); got != 3 {
		t.Errorf("small/s1: lists %d pages of its folder, want 3", got)
	}
}

// TestNavSizeBounded: however big a folder, a page's navigation holds the
// same number of entries.
func TestNavSizeBounded(t *testing.T) {
	count := func(items []NavItem) int {
		var walk func([]NavItem) int
		walk = func(items []NavItem) int {
			n := len(items)
			for _, it := range items {
				n += walk(it.Children)
			}
			return n
		}
		return walk(items)
	}
	var sizes []int
	for _, n := range []int{100, 1000} {
		pages := navPages(n)
		root, _ := buildNav(pages)
		p := pages[slices.IndexFunc(pages, func(p *Page) bool { return p.Rel == fmt.Sprintf("big/p%03d.md", n/2) })]
		sizes = append(sizes, count(navFor(root, p, "../")))
	}
	if sizes[0] != sizes[1] || sizes[0] > 2*navReach+10 {
		t.Errorf("navigation entries of a page in a folder of 100 and 1000 pages: %v; want the same, at most %d", sizes, 2*navReach+10)
	}
}
