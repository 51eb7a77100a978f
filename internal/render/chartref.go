package render

import (
	"bytes"
	"strings"

	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/util"
)

// KindChartRef is the AST kind of a chart shown away from its block.
var KindChartRef = ast.NewNodeKind("ChartRef")

// ChartRef is a fenced block whose info string is "chart": each line names
// a chart of a block, "bellows-lp.pv", to draw here, on a spec sheet say.
// The site resolves the names and sets Charts.
type ChartRef struct {
	ast.BaseBlock
	Names     []ChartName
	FenceLine int // 1-based line of the opening fence in the document body
	Charts    []*DrawnChart
	prep      *preparing
}

// ChartName is one line of a chart fence.
type ChartName struct {
	Block, Chart string
	Text         string // the line as written
	Line         int    // 1-based line in the document body
}

// Kind implements ast.Node.
func (n *ChartRef) Kind() ast.NodeKind { return KindChartRef }

// Dump implements ast.Node.
func (n *ChartRef) Dump(source []byte, level int) { ast.DumpHelper(n, source, level, nil, nil) }

func newChartRef(f *ast.FencedCodeBlock, source []byte) *ChartRef {
	n := &ChartRef{FenceLine: fenceLine(f, source)}
	lines := f.Lines()
	for i := 0; i < lines.Len(); i++ {
		seg := lines.At(i)
		text := strings.TrimSpace(string(seg.Value(source)))
		if text == "" || strings.HasPrefix(text, "#") {
			continue
		}
		block, chart, _ := strings.Cut(text, ".")
		n.Names = append(n.Names, ChartName{Block: block, Chart: chart, Text: text,
			Line: bytes.Count(source[:seg.Start], []byte("\n")) + 1})
	}
	return n
}

// ChartRefs lists the document's chart fences.
func (d *Document) ChartRefs() []*ChartRef {
	var out []*ChartRef
	_ = ast.Walk(d.Root, func(n ast.Node, entering bool) (ast.WalkStatus, error) {
		if c, ok := n.(*ChartRef); ok && entering {
			out = append(out, c)
		}
		return ast.WalkContinue, nil
	})
	return out
}

func (r *calcRenderer) renderChartRef(w util.BufWriter, source []byte, node ast.Node, entering bool) (ast.WalkStatus, error) {
	if !entering {
		return ast.WalkContinue, nil
	}
	n := node.(*ChartRef)
	if n.prep != nil {
		n.prep.hole(w, n, Hole{Kind: HoleChartRef})
		return ast.WalkSkipChildren, nil
	}
	WriteChartRef(w, n.Charts)
	return ast.WalkSkipChildren, nil
}

// WriteChartRef writes the charts a chart fence draws.
func WriteChartRef(w util.BufWriter, charts []*DrawnChart) {
	_, _ = w.WriteString(`<div class="sg-chartref">` + "\n")
	for _, c := range charts {
		_, _ = w.WriteString(c.HTML)
	}
	_, _ = w.WriteString("</div>\n")
}
