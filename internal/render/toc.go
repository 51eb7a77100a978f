package render

import (
	"bufio"
	"bytes"
	"html"
	"strings"

	"github.com/yuin/goldmark/ast"
	gmhtml "github.com/yuin/goldmark/renderer/html"
)

// Heading is one entry of a page's table of contents, with the headings
// of the next level below it.
type Heading struct {
	Level    int
	ID       string
	Text     string
	Children []Heading
}

// Nest arranges a flat list of headings into a tree by level.
func Nest(flat []Heading) []Heading {
	var out []Heading
	for i := 0; i < len(flat); {
		h := flat[i]
		j := i + 1
		for j < len(flat) && flat[j].Level > h.Level {
			j++
		}
		h.Children = Nest(flat[i+1 : j])
		out = append(out, h)
		i = j
	}
	return out
}

// headingParts lists the document's headings from level 2 to maxLevel, in
// order; refIndex numbers the value references their text may hold.
func (d *Document) headingParts(maxLevel int, refIndex map[*ValueRef]int) []PreparedHeading {
	var out []PreparedHeading
	_ = ast.Walk(d.Root, func(n ast.Node, entering bool) (ast.WalkStatus, error) {
		if !entering {
			return ast.WalkContinue, nil
		}
		h, ok := n.(*ast.Heading)
		if !ok {
			return ast.WalkContinue, nil
		}
		if h.Level >= 2 && h.Level <= maxLevel {
			id, _ := h.AttributeString("id")
			idBytes, _ := id.([]byte)
			var pw splicedWriter
			writeText(&pw.buf, h, d.Source, func(r *ValueRef) { pw.ref(refIndex[r]) })
			out = append(out, PreparedHeading{Level: h.Level, ID: string(idBytes), Text: pw.done()})
		}
		return ast.WalkSkipChildren, nil
	})
	return out
}

// HeadingsWith gives the prepared headings their text, with value giving the
// text of each value reference.
func (p *Prepared) HeadingsWith(value func(ref int) string) []Heading {
	out := make([]Heading, len(p.Headings))
	for i, h := range p.Headings {
		out[i] = Heading{Level: h.Level, ID: h.ID, Text: h.Text.String(value)}
	}
	return out
}

// TitlePart is a piece of a page's level-1 heading: text, or a value
// reference whose value the site fills in.
type TitlePart struct {
	Text string
	Ref  *ValueRef
}

// TakeTitle removes a level-1 heading that opens the document and returns
// its pieces, or nil when the document does not open with one. The layout
// shows the page title itself, so the body must not repeat it. The
// heading's value references stay first in ValueRefs, so that the site
// checks and resolves them with the others.
func (d *Document) TakeTitle() []TitlePart {
	first := d.Root.FirstChild()
	h, ok := first.(*ast.Heading)
	if !ok || h.Level != 1 {
		return nil
	}
	d.Root.RemoveChild(d.Root, h)
	var parts []TitlePart
	var buf bytes.Buffer
	flush := func() {
		if buf.Len() > 0 {
			parts = append(parts, TitlePart{Text: buf.String()})
			buf.Reset()
		}
	}
	writeText(&buf, h, d.Source, func(r *ValueRef) {
		flush()
		parts = append(parts, TitlePart{Ref: r})
		d.titleRefs = append(d.titleRefs, r)
	})
	flush()
	if parts == nil {
		parts = []TitlePart{}
	}
	return parts
}

// TitleText joins a title's pieces, with value shown for each reference.
func TitleText(parts []TitlePart, value func(*ValueRef) string) string {
	var b strings.Builder
	for _, p := range parts {
		if p.Ref != nil {
			b.WriteString(value(p.Ref))
		} else {
			b.WriteString(p.Text)
		}
	}
	return b.String()
}

// writeText writes the text content of a node to buf, without markup, and
// calls ref for each value reference in it.
func writeText(buf *bytes.Buffer, n ast.Node, source []byte, ref func(*ValueRef)) {
	_ = ast.Walk(n, func(c ast.Node, entering bool) (ast.WalkStatus, error) {
		if !entering {
			return ast.WalkContinue, nil
		}
		switch t := c.(type) {
		case *ValueRef:
			ref(t)
			return ast.WalkSkipChildren, nil
		case *ast.Text:
			if t.IsRaw() {
				buf.Write(t.Segment.Value(source))
			} else {
				buf.WriteString(shownText(t.Segment.Value(source)))
			}
			if t.SoftLineBreak() {
				buf.WriteByte(' ')
			}
		case *ast.String:
			if t.IsRaw() || t.IsCode() {
				buf.Write(t.Value)
			} else {
				buf.WriteString(shownText(t.Value))
			}
		case *ast.RawHTML:
			// Kept as text, as the page shows it: the layout escapes it.
			for i := 0; i < t.Segments.Len(); i++ {
				seg := t.Segments.At(i)
				buf.Write(seg.Value(source))
			}
		case *ast.CodeSpan:
			// Code is shown as written, its line ends as spaces.
			for cc := t.FirstChild(); cc != nil; cc = cc.NextSibling() {
				if tt, ok := cc.(*ast.Text); ok {
					value := tt.Segment.Value(source)
					if bytes.HasSuffix(value, []byte("\n")) {
						value = append(value[:len(value)-1:len(value)-1], ' ')
					}
					buf.Write(value)
				}
			}
			return ast.WalkSkipChildren, nil
		}
		return ast.WalkContinue, nil
	})
}

// shownText is Markdown text as a reader sees it once goldmark has
// rendered it: backslash escapes dropped, entity and numeric references
// resolved ("AT&amp;T" reads "AT&T"). Goldmark's own writer does the
// work, so that the title and contents never differ from the page body.
func shownText(value []byte) string {
	if bytes.IndexAny(value, "&\\\x00") < 0 {
		return string(value) // no escape, reference or NUL: shown as written
	}
	var b strings.Builder
	w := bufio.NewWriter(&b)
	gmhtml.DefaultWriter.Write(w, value)
	_ = w.Flush()
	return html.UnescapeString(b.String())
}
