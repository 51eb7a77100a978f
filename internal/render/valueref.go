package render

import (
	"regexp"

	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/parser"
	"github.com/yuin/goldmark/text"
)

// KindValueRef is the AST kind of an inline value reference.
var KindValueRef = ast.NewNodeKind("ValueRef")

// ValueRef is "=[id.result unit]" in prose: a computed value shown inline.
// The site resolves it and sets Text and Href before rendering.
type ValueRef struct {
	ast.BaseInline
	Block, Result, Unit string
	Offset              int    // byte offset in the document body, for messages
	Shown               string // the formatted value
	Href                string // link to the block's table
}

// Kind implements ast.Node.
func (n *ValueRef) Kind() ast.NodeKind { return KindValueRef }

// Dump implements ast.Node.
func (n *ValueRef) Dump(source []byte, level int) {
	ast.DumpHelper(n, source, level, map[string]string{"Block": n.Block, "Result": n.Result, "Unit": n.Unit}, nil)
}

// valueRefPattern matches the reference at the start of a line segment.
// Anything else after "=[" is left as ordinary text.
var valueRefPattern = regexp.MustCompile(`^=\[\s*([a-z0-9][a-z0-9_-]*)\.([A-Za-z0-9_]+)(?:\s+([^\]\n]*?))?\s*\]`)

// valueRefParser reads value references.
type valueRefParser struct{}

func (valueRefParser) Trigger() []byte { return []byte{'='} }

func (valueRefParser) Parse(parent ast.Node, block text.Reader, pc parser.Context) ast.Node {
	line, seg := block.PeekLine()
	m := valueRefPattern.FindSubmatchIndex(line)
	if m == nil {
		return nil
	}
	n := &ValueRef{
		Block:  string(line[m[2]:m[3]]),
		Result: string(line[m[4]:m[5]]),
		Offset: seg.Start,
	}
	if m[6] >= 0 {
		n.Unit = string(line[m[6]:m[7]])
	}
	block.Advance(m[1])
	return n
}

// ValueRefs lists the document's value references in order.
func (d *Document) ValueRefs() []*ValueRef {
	var out []*ValueRef
	_ = ast.Walk(d.Root, func(n ast.Node, entering bool) (ast.WalkStatus, error) {
		if r, ok := n.(*ValueRef); ok && entering {
			out = append(out, r)
		}
		return ast.WalkContinue, nil
	})
	return out
}
