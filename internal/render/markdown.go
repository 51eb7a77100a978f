// Package render turns parsed Markdown pages into HTML: the goldmark setup,
// code highlighting, calculation blocks, value references, tables and charts.
// It knows nothing of files or folders.
package render

import (
	"bytes"

	"github.com/yuin/goldmark"
	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/extension"
	"github.com/yuin/goldmark/parser"
	"github.com/yuin/goldmark/renderer"
	"github.com/yuin/goldmark/renderer/html"
	"github.com/yuin/goldmark/text"
	"github.com/yuin/goldmark/util"
)

// Markdown parses and renders specgen pages. It is safe for concurrent use.
type Markdown struct {
	md      goldmark.Markdown
	rawHTML bool
	packer  *Packer
}

// Option configures a Markdown.
type Option func(*Markdown)

// WithRawHTML lets raw HTML in pages through. By default it is shown escaped,
// as text, so that a page cannot inject markup or scripts into the site.
func WithRawHTML(allow bool) Option {
	return func(m *Markdown) { m.rawHTML = allow }
}

// WithPacker has prepared pages packed by p (by default deflated).
func WithPacker(p *Packer) Option {
	return func(m *Markdown) { m.packer = p }
}

// New returns a Markdown with GFM tables, task lists, strikethrough,
// footnotes, heading anchors, class-based code highlighting and links
// between .md files rewritten to the .html pages.
func New(opts ...Option) *Markdown {
	m := &Markdown{}
	for _, o := range opts {
		o(m)
	}
	rendererOpts := []renderer.Option{
		renderer.WithNodeRenderers(
			util.Prioritized(&codeBlockRenderer{}, 100),
			util.Prioritized(&calcRenderer{}, 100),
		),
	}
	if m.rawHTML {
		rendererOpts = append(rendererOpts, html.WithUnsafe())
	} else {
		rendererOpts = append(rendererOpts, renderer.WithNodeRenderers(
			util.Prioritized(&escapedHTMLRenderer{}, 100),
		))
	}
	m.md = goldmark.New(
		goldmark.WithExtensions(extension.GFM, extension.Footnote),
		goldmark.WithParserOptions(
			parser.WithAutoHeadingID(),
			parser.WithASTTransformers(
				util.Prioritized(mdLinkTransformer{}, 100),
				util.Prioritized(calcBlockTransformer{}, 100),
				util.Prioritized(headingIDTransformer{}, 200),
			),
			parser.WithInlineParsers(util.Prioritized(valueRefParser{}, 500)),
		),
		goldmark.WithRendererOptions(rendererOpts...),
	)
	return m
}

// Document is one parsed page body.
type Document struct {
	Source []byte
	Root   ast.Node
	// LineOffset is the number of file lines before Source (front matter),
	// added to every line number reported for this document.
	LineOffset int
	// written holds the destinations of links rewritten from .md as the
	// page wrote them.
	written map[ast.Node]string
	// titleRefs are the value references of the heading TakeTitle took.
	titleRefs []*ValueRef
}

// Parse parses a page body. lineOffset is the file line on which the body
// starts, minus one.
func (m *Markdown) Parse(src []byte, lineOffset int) *Document {
	pc := parser.NewContext()
	root := m.md.Parser().Parse(text.NewReader(src), parser.WithContext(pc))
	written, _ := pc.Get(writtenDests).(map[ast.Node]string)
	return &Document{Source: src, Root: root, LineOffset: lineOffset, written: written}
}

// Render writes the document's HTML.
func (m *Markdown) Render(doc *Document) ([]byte, error) {
	var buf bytes.Buffer
	if err := m.md.Renderer().Render(&buf, doc.Source, doc.Root); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// Line returns the 1-based file line of a byte offset in the document body.
func (d *Document) Line(offset int) int {
	if offset > len(d.Source) {
		offset = len(d.Source)
	}
	return bytes.Count(d.Source[:offset], []byte("\n")) + 1 + d.LineOffset
}
