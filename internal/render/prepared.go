package render

import (
	"bufio"
	"bytes"
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
	// packed is the page's HTML, its first htmlLen bytes, followed by its
	// prose for the search index: packed together, the prose compresses
	// against the HTML that holds it, and a page keeps one buffer.
	packed  Packed
	htmlLen int
	holes   []Hole
	// textPlaces are the places of the values in the prose.
	textPlaces []place
	// Headings are the headings of levels 2 and 3, in order.
	Headings []PreparedHeading
}

// PreparedHeading is a heading whose text may quote inline values.
type PreparedHeading struct {
	Level int
	ID    string
	Text  Spliced
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

// Spliced is text with places where the values of inline references go.
type Spliced struct {
	text   string
	places []place
}

// place is where the value of the document's ref-th value reference (in
// ValueRefs order) goes in a text.
type place struct{ at, ref int }

// String is the text with value giving the text of each reference.
func (s Spliced) String(value func(ref int) string) string {
	return splice(s.text, s.places, value)
}

func splice(text string, places []place, value func(ref int) string) string {
	var b strings.Builder
	at := 0
	for _, p := range places {
		b.WriteString(text[at:p.at])
		b.WriteString(value(p.ref))
		at = p.at
	}
	b.WriteString(text[at:])
	return b.String()
}

// splicedWriter collects text and the places of references in it.
type splicedWriter struct {
	buf    bytes.Buffer
	places []place
}

func (sw *splicedWriter) ref(i int) { sw.places = append(sw.places, place{at: sw.buf.Len(), ref: i}) }

func (sw *splicedWriter) done() Spliced { return Spliced{text: sw.buf.String(), places: sw.places} }

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

// pageBuffers hold pages as Prepare renders them: what it keeps is a copy
// of its own size, so the buffer, grown to a page's size, serves the next.
var pageBuffers = sync.Pool{New: func() any { return new(bytes.Buffer) }}

// Prepare renders a parsed page with holes for what evaluation will find,
// and takes its headings and text. The document is spent: Render it no
// more.
func (m *Markdown) Prepare(doc *Document) (*Prepared, error) {
	out := pageBuffers.Get().(*bytes.Buffer)
	out.Reset()
	defer pageBuffers.Put(out)
	prep := &preparing{out: out, index: map[ast.Node]int{}, lineOffset: doc.LineOffset}
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
	text := doc.prose(refIndex)
	headings := doc.headingParts(3, refIndex)
	if err := m.md.Renderer().Render(out, doc.Source, doc.Root); err != nil {
		return nil, err
	}
	// Of its own size: a Packer may keep it as it is.
	page := make([]byte, 0, out.Len()+len(text.text))
	page = append(append(page, out.Bytes()...), text.text...)
	packed, err := m.packer.Pack(page)
	if err != nil {
		return nil, err
	}
	return &Prepared{packed: packed, htmlLen: out.Len(), holes: prep.holes, textPlaces: text.places, Headings: headings}, nil
}

// SearchText is the page's prose for the search index, a block a line:
// headings, paragraphs, lists and tables, without code, calculation blocks
// or raw HTML; value gives the text of each inline value.
func (p *Prepared) SearchText(value func(ref int) string) (string, error) {
	b, err := p.packed.Bytes()
	if err != nil {
		return "", err
	}
	return splice(string(b[p.htmlLen:]), p.textPlaces, value), nil
}

// Write writes the page's HTML with fill writing each hole.
func (p *Prepared) Write(w io.Writer, fill func(w util.BufWriter, h Hole)) error {
	b, err := p.packed.Bytes()
	if err != nil {
		return err
	}
	html := b[:p.htmlLen]
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
