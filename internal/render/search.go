package render

import (
	"github.com/yuin/goldmark/ast"
)

// prose is the page's prose as plain text, for the search index: its
// headings, paragraphs, lists and tables, one a line, with its inline
// values (numbered by refIndex) left open. Code, calculation blocks and raw
// HTML are left out.
func (d *Document) prose(refIndex map[*ValueRef]int) Spliced {
	var pw splicedWriter
	_ = ast.Walk(d.Root, func(n ast.Node, entering bool) (ast.WalkStatus, error) {
		if !entering || n.Type() != ast.TypeBlock || hasBlockChild(n) {
			return ast.WalkContinue, nil
		}
		switch n.Kind() {
		case ast.KindCodeBlock, ast.KindFencedCodeBlock, ast.KindHTMLBlock:
			return ast.WalkSkipChildren, nil
		}
		writeText(&pw.buf, n, d.Source, func(r *ValueRef) { pw.ref(refIndex[r]) })
		pw.buf.WriteByte('\n')
		return ast.WalkSkipChildren, nil
	})
	return pw.done()
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
