package render

import (
	"strings"

	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/parser"
	"github.com/yuin/goldmark/text"
)

// headingIDTransformer gives headings that quote a value an anchor id made
// from their words without the reference: "## Delivery =[low.fad L/min] at
// speed" gets "delivery-at-speed", which stays the same when the value
// changes. A heading that is nothing but references gets its result names
// ("fad"). Goldmark makes ids from the raw heading line; when a page has
// such headings, every heading's id is made again in page order, so that
// numbering of repeated ids ("-1", "-2") still follows the page. Pages
// without them keep goldmark's ids untouched.
type headingIDTransformer struct{}

func (headingIDTransformer) Transform(doc *ast.Document, reader text.Reader, pc parser.Context) {
	var headings []*ast.Heading
	quoting := false
	_ = ast.Walk(doc, func(n ast.Node, entering bool) (ast.WalkStatus, error) {
		h, ok := n.(*ast.Heading)
		if !ok || !entering {
			return ast.WalkContinue, nil
		}
		headings = append(headings, h)
		for c := h.FirstChild(); c != nil && !quoting; c = c.NextSibling() {
			quoting = hasValueRef(c)
		}
		return ast.WalkSkipChildren, nil
	})
	if !quoting {
		return
	}
	source := reader.Source()
	ids := parser.NewContext().IDs()
	for _, h := range headings {
		if _, ok := h.AttributeString("id"); !ok {
			continue
		}
		h.SetAttribute([]byte("id"), ids.Generate([]byte(headingIDText(h, source)), ast.KindHeading))
	}
}

// hasValueRef reports whether n is or holds a value reference.
func hasValueRef(n ast.Node) bool {
	found := false
	_ = ast.Walk(n, func(c ast.Node, entering bool) (ast.WalkStatus, error) {
		if _, ok := c.(*ValueRef); ok && entering {
			found = true
			return ast.WalkStop, nil
		}
		return ast.WalkContinue, nil
	})
	return found
}

// headingIDText is the text goldmark makes a heading's id from, its last
// source line, with each value reference on it cut out.
func headingIDText(h *ast.Heading, source []byte) string {
	if h.Lines().Len() == 0 {
		return ""
	}
	seg := h.Lines().At(h.Lines().Len() - 1)
	var refs []*ValueRef
	_ = ast.Walk(h, func(c ast.Node, entering bool) (ast.WalkStatus, error) {
		if r, ok := c.(*ValueRef); ok && entering && r.Offset >= seg.Start && r.End <= seg.Stop {
			refs = append(refs, r)
		}
		return ast.WalkContinue, nil
	})
	if len(refs) == 0 {
		return string(seg.Value(source))
	}
	var b strings.Builder
	at := seg.Start
	for _, r := range refs {
		b.WriteString(strings.TrimRight(string(source[at:r.Offset]), " \t"))
		b.WriteByte(' ')
		at = r.End
	}
	b.WriteString(strings.TrimLeft(string(source[at:seg.Stop]), " \t"))
	if !strings.ContainsFunc(b.String(), isASCIIAlnum) {
		// Nothing but references: name them by their results.
		b.Reset()
		for _, r := range refs {
			b.WriteString(r.Result + " ")
		}
	}
	return b.String()
}

// isASCIIAlnum reports whether r is a letter or digit an id keeps.
func isASCIIAlnum(r rune) bool {
	return 'a' <= r && r <= 'z' || 'A' <= r && r <= 'Z' || '0' <= r && r <= '9'
}
