package render

import (
	"bufio"
	"bytes"
	"compress/flate"
	"io"
	"strings"
	"sync"

	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/util"
)

// Prepared is a page body rendered once, as soon as it is parsed: its HTML
// with holes where what evaluation finds goes (calculation blocks, inline
// values, chart fences, caution lists), and its headings and text with
// their inline values left open. The syntax tree is not kept, so a site
// holds little more per page than the page's own HTML until it writes it.
type Prepared struct {
	// html is the page's HTML compressed: from when a page is read to
	// when it is written, it is the biggest thing a site holds of it, and
	// it shrinks some fourfold at a few microseconds a page.
	html    []byte
	htmlLen int
	holes   []Hole
	// Headings are the headings of levels 2 and 3, in order.
	Headings []PreparedHeading
	// Text is the page's prose for the search index, a block a line:
	// headings, paragraphs, lists and tables, without code, calculation
	// blocks or raw HTML.
	Text Parts
}

// PreparedHeading is a heading whose text may quote inline values.
type PreparedHeading struct {
	Level int
	ID    string
	Text  Parts
}

// HoleKind says what fills a hole.
type HoleKind int

// The kinds of hole.
const (
	HoleBlock    HoleKind = iota // a calculation block
	HoleValue                    // an inline value
	HoleChartRef                 // a chart fence
	HoleCautions                 // a caution list
)

// Hole is a place in a prepared page that the site fills.
type Hole struct {
	at   int // byte offset in the HTML
	Kind HoleKind
	// Index is the hole's node among the document's nodes of its kind, in
	// the order CalcBlocks, ValueRefs (title references first), ChartRefs
	// and CautionLists list them.
	Index int
	// For a block: the file line of its opening fence, the level its
	// title's heading takes there, and its TOML as written.
	Line   int
	Level  int
	Source string
}

// TextPart is a piece of text: as is, or, when Ref >= 0, the value of the
// document's Ref-th value reference (in ValueRefs order).
type TextPart struct {
	Text string
	Ref  int
}

// Parts is a text with inline values in it.
type Parts []TextPart

// String joins the parts, with value giving the text of each reference.
func (ps Parts) String(value func(ref int) string) string {
	var b strings.Builder
	for _, p := range ps {
		if p.Ref >= 0 {
			b.WriteString(value(p.Ref))
		} else {
			b.WriteString(p.Text)
		}
	}
	return b.String()
}

// partsWriter collects text and references into Parts.
type partsWriter struct {
	parts Parts
	buf   bytes.Buffer
}

func (pw *partsWriter) ref(i int) {
	pw.flush()
	pw.parts = append(pw.parts, TextPart{Ref: i})
}

func (pw *partsWriter) flush() {
	if pw.buf.Len() > 0 {
		pw.parts = append(pw.parts, TextPart{Text: pw.buf.String(), Ref: -1})
		pw.buf.Reset()
	}
}

func (pw *partsWriter) done() Parts {
	pw.flush()
	return pw.parts
}

// preparing records the holes of a page being prepared. The nodes that
// leave a hole point to it while the page is rendered.
type preparing struct {
	out        *bytes.Buffer
	index      map[ast.Node]int
	holes      []Hole
	lineOffset int // the document's
}

// hole marks a hole for node n where the output stands now.
func (p *preparing) hole(w util.BufWriter, n ast.Node, h Hole) {
	_ = w.Flush()
	h.at, h.Index = p.out.Len(), p.index[n]
	p.holes = append(p.holes, h)
}

// Prepare renders a parsed page with holes for what evaluation will find,
// and takes its headings and text. The document is spent: Render it no
// more.
func (m *Markdown) Prepare(doc *Document) (*Prepared, error) {
	var out bytes.Buffer
	prep := &preparing{out: &out, index: map[ast.Node]int{}, lineOffset: doc.LineOffset}
	refs := doc.ValueRefs()
	refIndex := make(map[*ValueRef]int, len(refs))
	for i, r := range refs {
		refIndex[r] = i
		prep.index[r] = i
		// One that is no reference shows as written; it has no hole.
		if r.Problem == "" {
			r.prep = prep
		}
	}
	for i, n := range doc.CalcBlocks() {
		n.prep, prep.index[n] = prep, i
	}
	for i, n := range doc.ChartRefs() {
		n.prep, prep.index[n] = prep, i
	}
	for i, n := range doc.CautionLists() {
		n.prep, prep.index[n] = prep, i
	}
	text := doc.textParts(refIndex)
	headings := doc.headingParts(3, refIndex)
	if err := m.md.Renderer().Render(&out, doc.Source, doc.Root); err != nil {
		return nil, err
	}
	html, err := compress(out.Bytes())
	if err != nil {
		return nil, err
	}
	return &Prepared{html: html, htmlLen: out.Len(), holes: prep.holes, Headings: headings, Text: text}, nil
}

// Write writes the page's HTML with fill writing each hole.
func (p *Prepared) Write(w io.Writer, fill func(w util.BufWriter, h Hole)) error {
	html, err := decompress(p.html, p.htmlLen)
	if err != nil {
		return err
	}
	bw := bufio.NewWriter(w)
	at := 0
	for _, h := range p.holes {
		_, _ = bw.Write(html[at:h.at])
		fill(bw, h)
		at = h.at
	}
	_, _ = bw.Write(html[at:])
	return bw.Flush()
}

// Compressors are reused: each holds some hundreds of kilobytes of state.
var (
	compressors = sync.Pool{New: func() any {
		w, _ := flate.NewWriter(nil, flate.BestSpeed) // a valid level: no error
		return w
	}}
	decompressors = sync.Pool{New: func() any { return flate.NewReader(bytes.NewReader(nil)) }}
)

// compress deflates b.
func compress(b []byte) ([]byte, error) {
	var out bytes.Buffer
	zw := compressors.Get().(*flate.Writer)
	defer compressors.Put(zw)
	zw.Reset(&out)
	if _, err := zw.Write(b); err != nil {
		return nil, err
	}
	if err := zw.Close(); err != nil {
		return nil, err
	}
	return bytes.Clone(out.Bytes()), nil
}

// decompress inflates z, which holds n bytes.
func decompress(z []byte, n int) ([]byte, error) {
	zr := decompressors.Get().(io.ReadCloser)
	defer decompressors.Put(zr)
	if err := zr.(flate.Resetter).Reset(bytes.NewReader(z), nil); err != nil {
		return nil, err
	}
	out := make([]byte, n)
	if _, err := io.ReadFull(zr, out); err != nil {
		return nil, err
	}
	return out, nil
}
