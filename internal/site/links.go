package site

import (
	"fmt"
	"net/url"
	"path"
	"strings"
)

// checkLinks reports every relative link or image of a page that points at
// no page or static file of the site, or at an anchor its page lacks: a
// broken link is found when the site is built, not by its readers.
func (s *Site) checkLinks(static map[string]bool) ErrorList {
	pages := map[string]*Page{}
	for _, p := range s.Pages {
		pages[p.Out] = p
	}
	var errs ErrorList
	for _, p := range s.Pages {
		for _, l := range p.links {
			target, frag, ok := relativeTarget(p.Out, l.Dest)
			if !ok {
				continue
			}
			fail := func(format string, args ...any) {
				errs = append(errs, &Error{File: p.File, Line: l.Line, Msg: fmt.Sprintf("link %q: ", l.Written) + fmt.Sprintf(format, args...)})
			}
			var to *Page
			switch {
			case target == p.Out:
				to = p
			case pages[target] != nil:
				to = pages[target]
			case static[target]:
				continue
			case strings.HasSuffix(target, ".html"):
				fail("there is no page %s; links name the .md file, relative to this page", strings.TrimSuffix(target, ".html")+".md")
				continue
			default:
				fail("there is no file %s in static/ or content/", target)
				continue
			}
			if frag != "" && !to.anchors[frag] {
				fail("%s has no heading or block with the anchor #%s", to.File, frag)
			}
		}
	}
	return errs
}

// relativeTarget resolves a link of the page at out to an output path and
// fragment; ok is false for links that leave the site (absolute URLs,
// mail, data) or are empty.
func relativeTarget(out, dest string) (target, frag string, ok bool) {
	// A colon with no slash before it starts a scheme, however mangled
	// ("java&#x09;script:"): not a file of the site.
	if before, _, found := strings.Cut(dest, ":"); found && !strings.Contains(before, "/") {
		return "", "", false
	}
	u, err := url.Parse(dest)
	if err != nil || u.Scheme != "" || u.Host != "" || strings.HasPrefix(dest, "/") || dest == "" {
		return "", "", false
	}
	if u.Path == "" {
		return out, u.Fragment, true
	}
	return path.Clean(path.Join(path.Dir(out), u.Path)), u.Fragment, true
}
