package render

import (
	"bytes"
	"strings"

	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/parser"
	"github.com/yuin/goldmark/text"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// KindCalcBlock is the AST kind of a calculation block.
var KindCalcBlock = ast.NewNodeKind("CalcBlock")

// CalcBlock is a fenced code block whose info string is "calc". The site
// evaluates its Source and sets Eval before the page is rendered.
type CalcBlock struct {
	ast.BaseBlock
	Source    string
	FenceLine int // 1-based line of the opening fence in the document body
	// Closed is false when no closing fence ends the block, so that it ran
	// to the end of the page (or of its list item or quote).
	Closed bool
	Eval   *calc.Evaluated
	Links  map[string]string // links to the blocks its inputs name or quote
	Charts []*DrawnChart     // the charts its [show] asks for, drawn
	prep   *preparing        // set while the page is prepared: leave a hole
}

// Kind implements ast.Node.
func (n *CalcBlock) Kind() ast.NodeKind { return KindCalcBlock }

// Dump implements ast.Node.
func (n *CalcBlock) Dump(source []byte, level int) {
	ast.DumpHelper(n, source, level, map[string]string{"Source": n.Source}, nil)
}

// calcBlockTransformer swaps "calc" fences for CalcBlock nodes, so that
// chroma never sees them and the site can find them, and "cautions" fences
// for CautionList nodes.
type calcBlockTransformer struct{}

func (calcBlockTransformer) Transform(doc *ast.Document, reader text.Reader, pc parser.Context) {
	source := reader.Source()
	var fences []*ast.FencedCodeBlock
	_ = ast.Walk(doc, func(n ast.Node, entering bool) (ast.WalkStatus, error) {
		if f, ok := n.(*ast.FencedCodeBlock); ok && entering && f.Info != nil {
			if lang := string(f.Language(source)); lang == "calc" || lang == "cautions" || lang == "chart" {
				fences = append(fences, f)
			}
		}
		return ast.WalkContinue, nil
	})
	for _, f := range fences {
		switch string(f.Language(source)) {
		case "cautions":
			f.Parent().ReplaceChild(f.Parent(), f, &CautionList{FenceLine: fenceLine(f, source),
				Content: strings.TrimSpace(string(f.Lines().Value(source)))})
			continue
		case "chart":
			f.Parent().ReplaceChild(f.Parent(), f, newChartRef(f, source))
			continue
		}
		var src bytes.Buffer
		lines := f.Lines()
		for i := 0; i < lines.Len(); i++ {
			seg := lines.At(i)
			src.Write(seg.Value(source))
		}
		n := &CalcBlock{Source: src.String(), FenceLine: fenceLine(f, source),
			Closed: fenceClosed(f, source)}
		f.Parent().ReplaceChild(f.Parent(), f, n)
	}
}

// fenceLine is the 1-based line of a fenced block's opening fence.
func fenceLine(f *ast.FencedCodeBlock, source []byte) int {
	return bytes.Count(source[:f.Info.Segment.Start], []byte("\n")) + 1
}

// fenceClosed reports whether a closing fence follows a fenced block's
// last line (after any quote markers and indentation).
func fenceClosed(f *ast.FencedCodeBlock, source []byte) bool {
	end := f.Info.Segment.Stop
	if lines := f.Lines(); lines.Len() > 0 {
		end = lines.At(lines.Len() - 1).Stop
	}
	rest := source[end:]
	if i := bytes.IndexByte(rest, '\n'); i >= 0 && end == f.Info.Segment.Stop {
		rest = rest[i+1:] // an empty block: skip the rest of the info line
	}
	line, _, _ := bytes.Cut(rest, []byte("\n"))
	line = bytes.TrimLeft(line, " \t>")
	return bytes.HasPrefix(line, []byte("```")) || bytes.HasPrefix(line, []byte("~~~"))
}

// CalcBlocks lists the document's calculation blocks in order.
func (d *Document) CalcBlocks() []*CalcBlock {
	var out []*CalcBlock
	_ = ast.Walk(d.Root, func(n ast.Node, entering bool) (ast.WalkStatus, error) {
		if b, ok := n.(*CalcBlock); ok && entering {
			out = append(out, b)
		}
		return ast.WalkContinue, nil
	})
	return out
}
