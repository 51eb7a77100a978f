package site

import (
	"fmt"
	"path"
	"slices"
	"sort"
	"strings"
)

// navNode is a folder or a page in the site's navigation tree.
type navNode struct {
	Name     string // folder or file name
	Dir      string // folder path relative to content/ ("" for the root)
	Page     *Page  // the page, or the folder's index.md; nil for a folder without one
	Children []*navNode
	Parent   *navNode
}

func (n *navNode) isFolder() bool { return n.Page == nil || n.Page.IsIndex() }

func (n *navNode) title() string {
	if n.Page != nil {
		return n.Page.Title
	}
	return titleFromName(n.Dir + "/index.md")
}

func (n *navNode) order() int {
	if n.Page != nil {
		return n.Page.Front.Order
	}
	return 0
}

// buildNav arranges pages into a tree by folder, each level sorted by
// front-matter order, then title, then name. It also returns the pages in
// reading order (depth first), which gives previous and next.
func buildNav(pages []*Page) (*navNode, []*Page) {
	root := &navNode{}
	folders := map[string]*navNode{"": root}
	var folder func(dir string) *navNode
	folder = func(dir string) *navNode {
		if f, ok := folders[dir]; ok {
			return f
		}
		parentDir := path.Dir(dir)
		if parentDir == "." {
			parentDir = ""
		}
		parent := folder(parentDir)
		f := &navNode{Name: path.Base(dir), Dir: dir, Parent: parent}
		parent.Children = append(parent.Children, f)
		folders[dir] = f
		return f
	}
	for _, p := range pages {
		f := folder(p.Dir())
		if p.IsIndex() {
			f.Page = p
			continue
		}
		f.Children = append(f.Children, &navNode{Name: path.Base(p.Rel), Dir: p.Dir(), Page: p, Parent: f})
	}
	var order []*Page
	var walk func(n *navNode)
	walk = func(n *navNode) {
		sort.SliceStable(n.Children, func(i, j int) bool {
			a, b := n.Children[i], n.Children[j]
			if a.order() != b.order() {
				return a.order() < b.order()
			}
			if ta, tb := strings.ToLower(a.title()), strings.ToLower(b.title()); ta != tb {
				return ta < tb
			}
			return a.Name < b.Name
		})
		if n.Page != nil {
			order = append(order, n.Page)
		}
		for _, c := range n.Children {
			walk(c)
		}
	}
	walk(root)
	return root, order
}

// NavItem is one entry of the navigation as a template sees it.
type NavItem struct {
	Title    string
	URL      string // relative to the current page; for a folder without an index page, its first page
	Current  bool   // the page being rendered
	Open     bool   // the current page lies inside this folder
	Folder   bool
	Children []NavItem
	// More, when above zero, makes the item a gap: that many entries of
	// the folder are left out here, and URL leads to them (the folder's
	// index, which lists them all, or else the nearest of them).
	More int
}

// Link is a titled relative URL.
type Link struct {
	Title string
	URL   string
}

// navReach is how many entries either side of the current page (or of
// the open folder) a folder's level of the navigation lists; a gap link
// stands for the rest. A page's navigation so stays the same size however
// big its folder grows; the folder's index page lists the folder whole.
const navReach = 12

// navFor returns the navigation as seen from page p: the top level, and
// the contents of the folders that lead to p. Other folders stay closed,
// and each level lists the entries near the way to p, so that a page's
// navigation grows with the depth of the site, not its size.
func navFor(root *navNode, p *Page, rootPrefix string) []NavItem {
	var items func(n *navNode) []NavItem
	items = func(n *navNode) []NavItem {
		whole := n.Page != nil && n.Page == p
		shown := navShown(n, p, whole)
		out := make([]NavItem, 0, len(n.Children))
		for i := 0; i < len(n.Children); i++ {
			if !shown[i] {
				j := i
				for j < len(n.Children) && !shown[j] {
					j++
				}
				out = append(out, navGap(n, n.Children[i:j], i > 0 && shown[i-1], rootPrefix))
				i = j - 1
				continue
			}
			c := n.Children[i]
			it := NavItem{Title: c.title(), Folder: c.isFolder()}
			if c.Page != nil {
				it.URL = href(rootPrefix + c.Page.Out)
				it.Current = c.Page == p
			} else if first := firstPage(c); first != nil {
				// A folder without index.md is closed on other pages;
				// without a link its pages could not be reached.
				it.URL = href(rootPrefix + first.Out)
			}
			if it.Folder {
				it.Open = c.holds(p)
				if it.Open {
					it.Children = items(c)
				}
			}
			out = append(out, it)
		}
		return out
	}
	top := items(root)
	if root.Page != nil {
		home := NavItem{Title: root.Page.Title, URL: href(rootPrefix + root.Page.Out), Current: root.Page == p}
		top = append([]NavItem{home}, top...)
	}
	return top
}

// holds reports whether page p lies inside folder n, at any depth.
func (n *navNode) holds(p *Page) bool {
	return p.Dir() == n.Dir || strings.HasPrefix(p.Dir(), n.Dir+"/")
}

// navShown tells which entries of folder n the navigation of page p lists:
// all of them on the folder's own index page (whole), else those within
// navReach of the entry on the way to p (the first ones when none is),
// and the subfolders, ways down, unless there are more of them than a
// window holds. A gap of one entry would save nothing, so it is listed.
func navShown(n *navNode, p *Page, whole bool) []bool {
	shown := make([]bool, len(n.Children))
	if whole || len(n.Children) <= 2*navReach+1 {
		for i := range shown {
			shown[i] = true
		}
		return shown
	}
	at := slices.IndexFunc(n.Children, func(c *navNode) bool {
		return c.Page == p || (c.isFolder() && c.holds(p))
	})
	lo, hi := max(at, navReach)-navReach, max(at, navReach)+navReach
	if lo <= 1 {
		lo = 0
	}
	if hi >= len(n.Children)-2 {
		hi = len(n.Children) - 1
	}
	folders := 0
	for _, c := range n.Children {
		if c.isFolder() {
			folders++
		}
	}
	for i, c := range n.Children {
		shown[i] = (i >= lo && i <= hi) || (c.isFolder() && folders <= 2*navReach+1)
	}
	return shown
}

// navGap is the item that stands for the entries left out of folder n's
// listing: a link to the folder's index, which lists them, or else to the
// one of them nearest the listed ones (after says they follow them).
func navGap(n *navNode, left []*navNode, after bool, rootPrefix string) NavItem {
	target := n.Page
	if target == nil {
		near := left[len(left)-1]
		if after {
			near = left[0]
		}
		target = firstPage(near)
	}
	where := n.title()
	if n.Dir == "" && n.Page == nil {
		where = "the top level"
	}
	it := NavItem{More: len(left), Title: fmt.Sprintf("%d more in %s", len(left), where)}
	if target != nil {
		it.URL = href(rootPrefix + target.Out)
	}
	return it
}

// firstPage is the first page of a folder in reading order.
func firstPage(n *navNode) *Page {
	if n.Page != nil {
		return n.Page
	}
	for _, c := range n.Children {
		if p := firstPage(c); p != nil {
			return p
		}
	}
	return nil
}

// breadcrumbsFor lists the folders above p, from the home page down.
func breadcrumbsFor(root *navNode, p *Page, rootPrefix string) []Link {
	var crumbs []Link
	if root.Page != nil && root.Page != p {
		crumbs = append(crumbs, Link{Title: root.Page.Title, URL: href(rootPrefix + root.Page.Out)})
	}
	dir := ""
	for _, part := range strings.Split(p.Dir(), "/") {
		if part == "" {
			continue
		}
		if dir == "" {
			dir = part
		} else {
			dir += "/" + part
		}
		n := findFolder(root, dir)
		if n == nil || n.Page == p {
			break
		}
		l := Link{Title: n.title()}
		if n.Page != nil {
			l.URL = href(rootPrefix + n.Page.Out)
		}
		crumbs = append(crumbs, l)
	}
	return crumbs
}

func findFolder(n *navNode, dir string) *navNode {
	for _, c := range n.Children {
		if c.Dir == dir && c.isFolder() {
			return c
		}
		if strings.HasPrefix(dir, c.Dir+"/") && c.isFolder() {
			return findFolder(c, dir)
		}
	}
	return nil
}
