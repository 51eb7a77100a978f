package render

import (
	"strings"

	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/util"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// KindCautionList is the AST kind of a site-wide caution list.
var KindCautionList = ast.NewNodeKind("CautionList")

// CautionList is a fenced block whose info string is "cautions": the site
// fills Items with every caution of every block, and it renders as a table.
type CautionList struct {
	ast.BaseBlock
	FenceLine int    // 1-based line of the opening fence in the document body
	Content   string // what the fence holds, which should be nothing
	Items     []CautionItem
	prep      *preparing
}

// CautionItem is one caution with the block that raised it.
type CautionItem struct {
	calc.CautionNote
	Block, BlockTitle string
	Href              string // link to the block's table
}

// Kind implements ast.Node.
func (n *CautionList) Kind() ast.NodeKind { return KindCautionList }

// Dump implements ast.Node.
func (n *CautionList) Dump(source []byte, level int) { ast.DumpHelper(n, source, level, nil, nil) }

// CautionLists lists the document's caution lists.
func (d *Document) CautionLists() []*CautionList {
	var out []*CautionList
	_ = ast.Walk(d.Root, func(n ast.Node, entering bool) (ast.WalkStatus, error) {
		if c, ok := n.(*CautionList); ok && entering {
			out = append(out, c)
		}
		return ast.WalkContinue, nil
	})
	return out
}

func (r *calcRenderer) renderCautionList(w util.BufWriter, source []byte, node ast.Node, entering bool) (ast.WalkStatus, error) {
	if !entering {
		return ast.WalkContinue, nil
	}
	n := node.(*CautionList)
	if n.prep != nil {
		n.prep.hole(w, n, Hole{Kind: HoleCautions})
		return ast.WalkSkipChildren, nil
	}
	WriteCautionList(w, n.Items)
	return ast.WalkSkipChildren, nil
}

// WriteCautionList writes a caution list of items as a table.
func WriteCautionList(w util.BufWriter, items []CautionItem) {
	if len(items) == 0 {
		_, _ = w.WriteString(`<p class="sg-caution-none">No calculation on this site raises a caution.</p>` + "\n")
		return
	}
	_, _ = w.WriteString(`<table class="sg-caution-list"><thead><tr><th scope="col">Level</th><th scope="col">Block</th><th scope="col">Rule</th><th scope="col">What</th></tr></thead><tbody>` + "\n")
	for _, it := range items {
		word := it.Level.String()
		title := it.BlockTitle
		if title == "" {
			title = it.Block
		}
		what := keepWithUnit(esc(it.Message))
		if it.Acknowledged != "" {
			what += ` <span class="sg-caution-ack"><strong>Acknowledged:</strong> ` + esc(it.Acknowledged) + `</span>`
		}
		_, _ = w.WriteString(`<tr><td><span class="sg-level sg-level-` + strings.ToLower(word) + `">` + word + `</span></td>` +
			`<td><a href="` + esc(it.Href) + `">` + esc(title) + `</a></td><td><code>` + esc(it.Rule) + `</code></td><td>` + what + "</td></tr>\n")
	}
	_, _ = w.WriteString("</tbody></table>\n")
}
