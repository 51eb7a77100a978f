package render

import (
	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/util"
)

// LinkRef is a link or image of a page: where it points as the page's HTML
// will have it (after .md links were rewritten, escapes and references
// resolved and the rest percent-encoded), what the page wrote, and the
// file line it is on.
type LinkRef struct {
	Dest, Written string
	Line          int
}

// LinkRefs lists the document's links and images. A link inside an
// image's description is no link: the page shows it only as the image's
// alternative text.
func (d *Document) LinkRefs() []LinkRef {
	var out []LinkRef
	_ = ast.Walk(d.Root, func(n ast.Node, entering bool) (ast.WalkStatus, error) {
		if !entering {
			return ast.WalkContinue, nil
		}
		status := ast.WalkContinue
		var dest []byte
		switch l := n.(type) {
		case *ast.Link:
			dest = l.Destination
		case *ast.Image:
			dest = l.Destination
			status = ast.WalkSkipChildren
		default:
			return ast.WalkContinue, nil
		}
		written, ok := d.written[n]
		if !ok {
			written = string(dest)
		}
		out = append(out, LinkRef{Dest: renderedDestination(dest), Written: written, Line: d.nodeLine(n)})
		return status, nil
	})
	return out
}

// renderedDestination is a link destination as goldmark writes it into
// href or src (before HTML escaping): "/f&ouml;&ouml;" becomes
// "/f%C3%B6%C3%B6" and "/bar\*" becomes "/bar*".
func renderedDestination(dest []byte) string {
	return string(util.URLEscape(dest, true))
}

// AnchorIDs lists the ids the document's headings get.
func (d *Document) AnchorIDs() []string {
	var out []string
	_ = ast.Walk(d.Root, func(n ast.Node, entering bool) (ast.WalkStatus, error) {
		if h, ok := n.(*ast.Heading); ok && entering {
			if id, ok := h.AttributeString("id"); ok {
				if b, ok := id.([]byte); ok {
					out = append(out, string(b))
				}
			}
			return ast.WalkSkipChildren, nil
		}
		return ast.WalkContinue, nil
	})
	return out
}

// nodeLine is the file line of an inline node: that of its first text, or
// of the block that holds it.
func (d *Document) nodeLine(n ast.Node) int {
	for c := n; c != nil; c = c.FirstChild() {
		if t, ok := c.(*ast.Text); ok {
			return d.Line(t.Segment.Start)
		}
	}
	for p := n.Parent(); p != nil; p = p.Parent() {
		if p.Type() == ast.TypeBlock && p.Lines().Len() > 0 {
			return d.Line(p.Lines().At(0).Start)
		}
	}
	return d.LineOffset + 1
}
