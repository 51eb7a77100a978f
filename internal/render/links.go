package render

import (
	"strings"

	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/parser"
	"github.com/yuin/goldmark/text"
)

// mdLinkTransformer points links to .md files at the .html pages built from
// them, so one link works both in a repository's file view and in the site.
type mdLinkTransformer struct{}

// writtenDests keeps, in the parser context, what each rewritten link
// said before, so that messages quote the page as written.
var writtenDests = parser.NewContextKey()

func (mdLinkTransformer) Transform(doc *ast.Document, reader text.Reader, pc parser.Context) {
	written := map[ast.Node]string{}
	_ = ast.Walk(doc, func(n ast.Node, entering bool) (ast.WalkStatus, error) {
		if !entering {
			return ast.WalkContinue, nil
		}
		if link, ok := n.(*ast.Link); ok {
			if to := RewriteLink(string(link.Destination)); to != string(link.Destination) {
				written[n] = string(link.Destination)
				link.Destination = []byte(to)
			}
		}
		return ast.WalkContinue, nil
	})
	pc.Set(writtenDests, written)
}

// RewriteLink turns a relative link to "x.md" (with an optional #fragment
// or ?query) into "x.html". Absolute URLs and other files are left alone.
func RewriteLink(dest string) string {
	if dest == "" || strings.Contains(dest, "://") || strings.HasPrefix(dest, "/") ||
		strings.HasPrefix(dest, "#") || strings.HasPrefix(strings.ToLower(dest), "mailto:") {
		return dest
	}
	path, rest := dest, ""
	if i := strings.IndexAny(dest, "#?"); i >= 0 {
		path, rest = dest[:i], dest[i:]
	}
	if !strings.HasSuffix(strings.ToLower(path), ".md") {
		return dest
	}
	return path[:len(path)-len(".md")] + ".html" + rest
}

// RelativeFromRoot rewrites the links and images that start at the site's
// root ("/img/head.png", "/safety.html#relief") to reach the same file
// from the page, so that the site works from a sub-path of a web server
// and from disk. up is the way from the page to the root: "" at the top,
// "../" per folder below it. Links to other hosts ("//host/x") stay.
func (d *Document) RelativeFromRoot(up string) {
	_ = ast.Walk(d.Root, func(n ast.Node, entering bool) (ast.WalkStatus, error) {
		if !entering {
			return ast.WalkContinue, nil
		}
		switch l := n.(type) {
		case *ast.Link:
			l.Destination = relativeFromRoot(l.Destination, up)
		case *ast.Image:
			l.Destination = relativeFromRoot(l.Destination, up)
		}
		return ast.WalkContinue, nil
	})
}

// relativeFromRoot is dest reached from a page up below the root, when
// dest starts at the root.
func relativeFromRoot(dest []byte, up string) []byte {
	s := string(dest)
	if !strings.HasPrefix(s, "/") || strings.HasPrefix(s, "//") {
		return dest
	}
	rel := up + s[1:]
	// "step:1.html" would read as a URL scheme.
	if first, _, _ := strings.Cut(rel, "/"); strings.Contains(first, ":") {
		rel = "./" + rel
	}
	return []byte(rel)
}
