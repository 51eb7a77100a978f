package site

import (
	"fmt"
	"maps"
	"net/url"
	"os"
	"path"
	"path/filepath"
	"slices"
	"strings"

	"github.com/millrace-workshop/specgen/internal/inputerr"
)

// checkLinks reports every link or image of a page, relative or from the
// site's root ("/img/pump.png"), that points at no page or static file of
// the site, or at an anchor its page lacks: a broken link is found when
// the site is built, not by its readers.
func (s *Site) checkLinks(static map[string]bool) inputerr.List {
	// What the build writes besides pages and static/ can be linked too:
	// results.json, the assets and the charts' data files.
	static = maps.Clone(static)
	static["results.json"], static["assets/syntax.css"] = true, true
	for name := range s.layouts.assets {
		static["assets/"+name] = true
	}
	pages := map[string]*Page{}
	for _, p := range s.Pages {
		pages[p.Out] = p
		for _, name := range chartDataNames(p) {
			static[name] = true
		}
	}
	var errs inputerr.List
	for _, p := range s.Pages {
		for _, l := range p.links {
			target, frag, rooted, ok := linkTarget(p.Out, l.Dest)
			if !ok {
				continue
			}
			fail := func(format string, args ...any) {
				errs = append(errs, &inputerr.Error{File: p.File, Line: l.Line, Msg: fmt.Sprintf("link %q: ", l.Written) + fmt.Sprintf(format, args...)})
			}
			// mdLink is how this page links the page at out: relative, by
			// its source, as the Markdown rewrite expects.
			mdLink := func(out string) string {
				return strings.TrimSuffix(shortestLink(p.Out, out), ".html") + ".md"
			}
			var to *Page
			switch {
			case target == p.Out:
				to = p
			case pages[target] != nil:
				to = pages[target]
			case static[target]:
				continue
			case rooted && strings.EqualFold(path.Ext(target), ".md"):
				// Only relative .md links are turned into links to pages.
				html := strings.TrimSuffix(target, path.Ext(target)) + ".html"
				if pages[html] != nil {
					fail("a root path to a page's source is not turned into a link to the page; write it relative to this page: %s", mdLink(html))
				} else {
					fail("there is no page %s; links name the .md file, relative to this page", target)
				}
				continue
			case target == ".." || strings.HasPrefix(target, "../"):
				fail("it leads out of the site's top folder; a page links only pages and static files of its site")
				continue
			case pages[path.Join(target, "index.html")] != nil:
				fail("a link to a folder (%s) fails when the site is opened from disk; link its page: %s", folderName(target), mdLink(path.Join(target, "index.html")))
				continue
			case strings.HasSuffix(target, ".html"):
				fail("there is no page %s; links name the .md file, relative to this page", strings.TrimSuffix(target, ".html")+".md")
				continue
			case s.inContent(target):
				fail("%s/%s is not published: only the pages of content/ are; put the file in static/ (static/%s)", ContentDir, target, target)
				continue
			default:
				fail("there is no file %s in static/; %s", target, nearFiles(target, static))
				continue
			}
			if frag != "" && !to.hasAnchor(frag) && !to.unread {
				fail("%s has no heading or block with the anchor #%s", to.File, frag)
			}
		}
	}
	return errs
}

// shortestLink is the shortest relative link from the output page from to
// the output path to: "index.html" rather than "../a/index.html" within a/.
func shortestLink(from, to string) string {
	dir := strings.Split(path.Dir(from), "/")
	if dir[0] == "." {
		dir = nil
	}
	parts := strings.Split(to, "/")
	i := 0
	for i < len(dir) && i < len(parts)-1 && dir[i] == parts[i] {
		i++
	}
	return strings.Repeat("../", len(dir)-i) + strings.Join(parts[i:], "/")
}

// inContent reports whether content/ holds a file that is not a page at
// the output path target.
func (s *Site) inContent(target string) bool {
	info, err := os.Stat(filepath.Join(s.Root, ContentDir, filepath.FromSlash(target)))
	return err == nil && info.Mode().IsRegular()
}

// folderName names a folder of the output for a message.
func folderName(dir string) string {
	if dir == "." {
		return "the site's top folder"
	}
	return dir + "/"
}

// nearFiles says what static/ holds in the folder of a missing file.
func nearFiles(target string, static map[string]bool) string {
	dir := path.Dir(target)
	var names []string
	for name := range static {
		if path.Dir(name) == dir {
			names = append(names, path.Base(name))
		}
	}
	slices.Sort(names)
	where := "static/" + dir + "/"
	if dir == "." {
		where = "static/"
	}
	switch {
	case len(names) == 0:
		return where + " holds no files (only static/ is published besides the pages)"
	case len(names) > 8:
		names = append(names[:8], fmt.Sprintf("and %d more", len(names)-8))
	}
	return where + " holds " + strings.Join(names, ", ")
}

// linkTarget resolves a link of the page at out to an output path and
// fragment; rooted tells a link from the site's root ("/img/a.png"). ok is
// false for links that leave the site (absolute URLs, mail, data) or are
// empty.
func linkTarget(out, dest string) (target, frag string, rooted, ok bool) {
	// A colon with no slash before it starts a scheme, however mangled
	// ("java&#x09;script:"): not a file of the site.
	if before, _, found := strings.Cut(dest, ":"); found && !strings.Contains(before, "/") {
		return "", "", false, false
	}
	u, err := url.Parse(dest)
	if err != nil || u.Scheme != "" || u.Host != "" || strings.HasPrefix(dest, "//") || dest == "" {
		return "", "", false, false
	}
	if strings.HasPrefix(u.Path, "/") {
		return path.Clean(strings.TrimPrefix(u.Path, "/")), u.Fragment, true, true
	}
	if u.Path == "" {
		return out, u.Fragment, false, true
	}
	return path.Clean(path.Join(path.Dir(out), u.Path)), u.Fragment, false, true
}
