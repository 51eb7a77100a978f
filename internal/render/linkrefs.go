package render

import (
	"github.com/yuin/goldmark/ast"
)

// LinkRef is a link or image of a page: where it points (after .md links
// were rewritten), what the page wrote, and the file line it is on.
type LinkRef struct {
	Dest, Written string
	Line          int
}

// LinkRefs lists the document's links and images.
func (d *Document) LinkRefs() []LinkRef {
	var out []LinkRef
	_ = ast.Walk(d.Root, func(n ast.Node, entering bool) (ast.WalkStatus, error) {
		if !entering {
			return ast.WalkContinue, nil
		}
		var dest []byte
		switch l := n.(type) {
		case *ast.Link:
			dest = l.Destination
		case *ast.Image:
			dest = l.Destination
		default:
			return ast.WalkContinue, nil
		}
		written, ok := d.written[n]
		if !ok {
			written = string(dest)
		}
		out = append(out, LinkRef{Dest: string(dest), Written: written, Line: d.nodeLine(n)})
		return ast.WalkContinue, nil
	})
	return out
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
