package render

import (
	"bytes"

	"github.com/yuin/goldmark/ast"
)

// Text is the page's prose as plain text, for the search index: its
// headings, paragraphs, lists and tables, with inline values as shown.
// Code, calculation blocks and raw HTML are left out.
func (d *Document) Text() string {
	var buf bytes.Buffer
	_ = ast.Walk(d.Root, func(n ast.Node, entering bool) (ast.WalkStatus, error) {
		if !entering || n.Type() != ast.TypeBlock || hasBlockChild(n) {
			return ast.WalkContinue, nil
		}
		switch n.Kind() {
		case ast.KindCodeBlock, ast.KindFencedCodeBlock, ast.KindHTMLBlock:
			return ast.WalkSkipChildren, nil
		}
		buf.WriteString(plainText(n, d.Source))
		buf.WriteByte('\n')
		return ast.WalkSkipChildren, nil
	})
	return buf.String()
}

// hasBlockChild reports whether a block holds other blocks (a list, a
// quote) rather than text.
func hasBlockChild(n ast.Node) bool {
	for c := n.FirstChild(); c != nil; c = c.NextSibling() {
		if c.Type() == ast.TypeBlock {
			return true
		}
	}
	return false
}
