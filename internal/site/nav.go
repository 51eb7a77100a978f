package site

import (
	"path"
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
}

// Link is a titled relative URL.
type Link struct {
	Title string
	URL   string
}

// navFor returns the navigation as seen from page p: the top level, and
// the contents of the folders that lead to p. Other folders stay closed, so
// that a page's navigation grows with the depth of the site, not its size.
func navFor(root *navNode, p *Page, rootPrefix string) []NavItem {
	var items func(n *navNode) []NavItem
	items = func(n *navNode) []NavItem {
		out := make([]NavItem, 0, len(n.Children))
		for _, c := range n.Children {
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
				it.Open = p.Dir() == c.Dir || strings.HasPrefix(p.Dir(), c.Dir+"/")
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
