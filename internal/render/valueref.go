package render

import (
	"bytes"
	"regexp"
	"strconv"
	"strings"
	"unicode"

	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/parser"
	"github.com/yuin/goldmark/text"
)

// KindValueRef is the AST kind of an inline value reference.
var KindValueRef = ast.NewNodeKind("ValueRef")

// ValueRef is "=[id.result unit]" in prose: a computed value shown inline.
// The site resolves it and sets Shown and Href before rendering.
//
// In prose, "=[" (an equals sign directly followed by "[") always starts a
// value reference, which runs to the first "]" on the same line. When what
// is written there is no well-formed reference, Problem says why, Written
// holds it as written, and Block, Result and Unit hold a best guess of what
// was meant (any of them may be empty), for a "did you mean". Code spans,
// code blocks and a backslash before the "=" keep "=[" as plain text.
type ValueRef struct {
	ast.BaseInline
	Block, Result, Unit string
	Offset              int    // byte offset of "=[" in the document body, for messages
	End                 int    // byte offset just past the closing "]"
	Written             string // the reference as written, "=[...]"
	Problem             string // why Written is not a well-formed reference; "" when it is
	Shown               string // the formatted value
	Href                string // link to the block's table
	prep                *preparing
}

// Kind implements ast.Node.
func (n *ValueRef) Kind() ast.NodeKind { return KindValueRef }

// Dump implements ast.Node.
func (n *ValueRef) Dump(source []byte, level int) {
	ast.DumpHelper(n, source, level, map[string]string{"Block": n.Block, "Result": n.Result, "Unit": n.Unit,
		"Problem": n.Problem}, nil)
}

// ValueRefForms is the allowed form of a value reference, for messages.
const ValueRefForms = "=[block.result] or =[block.result unit]"

// valueRefPattern matches a well-formed reference: a block id, a dot, a
// result name and an optional unit after white space (a no-break or thin
// space too, as editors and typesetting put before a unit). Result names
// may hold capitals here so that the site can say which result was meant.
var valueRefPattern = regexp.MustCompile(`^=\[[\s\p{Zs}]*([a-z0-9][a-z0-9_-]*)\.([A-Za-z0-9_]+)(?:[\s\p{Zs}]+([^\]\n]*?))?[\s\p{Zs}]*\]$`)

var (
	blockIDPattern    = regexp.MustCompile(`^[a-z0-9][a-z0-9_-]*$`)
	resultNamePattern = regexp.MustCompile(`^[A-Za-z0-9_]+$`)
)

// valueRefParser reads value references.
type valueRefParser struct{}

func (valueRefParser) Trigger() []byte { return []byte{'='} }

func (valueRefParser) Parse(parent ast.Node, block text.Reader, pc parser.Context) ast.Node {
	line, seg := block.PeekLine()
	if len(line) < 2 || line[1] != '[' {
		return nil
	}
	end := bytes.IndexByte(line, ']')
	if nl := bytes.IndexByte(line, '\n'); end < 0 || (nl >= 0 && nl < end) {
		// No "]" on this line: report the rest of the line, and read
		// only the "=[" so that the rest is parsed as usual.
		written := strings.TrimRight(string(line), " \t\r\n")
		n := &ValueRef{Offset: seg.Start, End: seg.Start + 2, Written: written,
			Problem: "no closing ] on this line (a reference is never wrapped onto the next line)"}
		guessRef(n, written[2:])
		block.Advance(2)
		return n
	}
	written := line[:end+1]
	n := &ValueRef{Offset: seg.Start, End: seg.Start + end + 1, Written: string(written)}
	if m := valueRefPattern.FindSubmatch(written); m != nil {
		n.Block, n.Result, n.Unit = string(m[1]), string(m[2]), string(m[3])
	} else {
		n.Problem = diagnoseRef(n, string(written[2:end]))
	}
	block.Advance(end + 1)
	return n
}

// diagnoseRef says why inner, the text between "=[" and "]", is no
// well-formed reference, and sets n's best guess of what was meant.
func diagnoseRef(n *ValueRef, inner string) string {
	inner = strings.TrimSpace(inner)
	if inner == "" {
		return "the reference is empty"
	}
	head, sep := guessRef(n, inner)
	parts := strings.Split(head, ".")
	switch {
	case len(parts) == 1:
		return "names a block but no result"
	case len(parts) > 2:
		return "has more than one dot (a unit goes after a space)"
	case parts[0] == "":
		return "no block id before the dot"
	case parts[1] == "":
		return "no result name after the dot"
	case !blockIDPattern.MatchString(parts[0]):
		return "block id " + quote(parts[0]) + " may hold only lower-case letters, digits, '-' and '_'"
	case !resultNamePattern.MatchString(parts[1]):
		return "result name " + quote(parts[1]) + " may hold only letters, digits and '_'"
	case sep != "":
		return "the unit is set apart with " + quote(sep) + " instead of a space"
	}
	return "not a reference"
}

// guessRef sets n's Block, Result and Unit to a best guess at what inner,
// the text between "=[" and "]", meant, and returns the part before the
// unit and the character that set the unit apart when it was no space.
func guessRef(n *ValueRef, inner string) (head, sep string) {
	inner = strings.TrimSpace(inner)
	head, unit := inner, ""
	if i := strings.IndexFunc(inner, unicode.IsSpace); i >= 0 {
		head, unit = inner[:i], strings.TrimSpace(inner[i:])
	}
	// "=[a.b,cm3]" and "=[a.b, cm3]": a punctuation mark set the unit apart.
	if i := strings.IndexAny(head, ",;:"); i >= 0 {
		head, unit, sep = head[:i], strings.TrimSpace(head[i+1:]+" "+unit), head[i:i+1]
	}
	parts := strings.Split(head, ".")
	n.Block = strings.ToLower(parts[0])
	if len(parts) > 1 {
		n.Result = strings.NewReplacer("-", "_", " ", "_").Replace(parts[1])
	}
	if len(parts) > 2 && unit == "" {
		unit = strings.Join(parts[2:], ".")
	}
	n.Unit = unit
	return head, sep
}

// quote is s in double quotes, for messages.
func quote(s string) string { return strconv.Quote(s) }

// ValueRefs lists the document's value references in order: those of the
// title taken by TakeTitle first, then those of the body.
func (d *Document) ValueRefs() []*ValueRef {
	out := append([]*ValueRef(nil), d.titleRefs...)
	_ = ast.Walk(d.Root, func(n ast.Node, entering bool) (ast.WalkStatus, error) {
		if r, ok := n.(*ValueRef); ok && entering {
			out = append(out, r)
		}
		return ast.WalkContinue, nil
	})
	return out
}
