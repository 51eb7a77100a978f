package site

import (
	"fmt"
	"html/template"
	"strings"
	"unicode/utf8"
)

// NavList is the page's navigation as the default layout's _navlist.html
// writes it, escaped as html/template escapes it there (the test holds the
// two to the byte). The default layout shows this: run by the template's
// interpreter, the dozens of entries of a page's navigation cost more than
// the rest of the page's layout. A layout of a site's own may still range
// over Nav.
func (d PageData) NavList() template.HTML {
	var b strings.Builder
	writeNavList(&b, d.Nav)
	return template.HTML(b.String())
}

// writeNavList writes items as _navlist.html does.
func writeNavList(b *strings.Builder, items []NavItem) {
	b.WriteString("\n<ul>")
	for _, it := range items {
		if it.More != 0 {
			b.WriteString(`
<li class="sg-nav-more">`)
			writeNavEntry(b, it, false)
			b.WriteString("</li>")
			continue
		}
		b.WriteString("\n<li")
		if it.Folder {
			b.WriteString(` class="sg-nav-folder`)
			if it.Open {
				b.WriteString(" sg-nav-open")
			}
			b.WriteByte('"')
		}
		b.WriteByte('>')
		writeNavEntry(b, it, it.Current)
		if len(it.Children) > 0 {
			writeNavList(b, it.Children)
		}
		b.WriteString("</li>")
	}
	b.WriteString("\n</ul>")
}

// writeNavEntry writes an entry's link, or its title alone when it has no
// URL.
func writeNavEntry(b *strings.Builder, it NavItem, current bool) {
	if it.URL == "" {
		b.WriteString("<span>")
		writeEscaped(b, it.Title)
		b.WriteString("</span>")
		return
	}
	b.WriteString(`<a href="`)
	writeEscaped(b, normalizedURL(filteredURL(it.URL)))
	b.WriteByte('"')
	if current {
		b.WriteString(` aria-current="page"`)
	}
	b.WriteByte('>')
	writeEscaped(b, it.Title)
	b.WriteString("</a>")
}

// escapes are html/template's for text and quoted attributes.
var escapes = [...]string{0: "\uFFFD", '"': "&#34;", '&': "&amp;", '\'': "&#39;", '+': "&#43;", '<': "&lt;", '>': "&gt;"}

// writeEscaped writes s as html/template escapes a string in text or in a
// quoted attribute.
func writeEscaped(b *strings.Builder, s string) {
	written := 0
	for i := 0; i < len(s); {
		r, w := utf8.DecodeRuneInString(s[i:])
		if int(r) < len(escapes) && escapes[r] != "" {
			b.WriteString(s[written:i])
			b.WriteString(escapes[r])
			written = i + w
		}
		i += w
	}
	b.WriteString(s[written:])
}

// filteredURL is html/template's filter of a URL: one with a scheme other
// than http, https or mailto is replaced.
func filteredURL(s string) string {
	if scheme, _, ok := strings.Cut(s, ":"); ok && !strings.Contains(scheme, "/") &&
		!strings.EqualFold(scheme, "http") && !strings.EqualFold(scheme, "https") && !strings.EqualFold(scheme, "mailto") {
		return "#ZgotmplZ"
	}
	return s
}

// normalizedURL is html/template's normalizing of a URL: the bytes that
// may not stand in one are percent-encoded, valid escapes kept.
func normalizedURL(s string) string {
	var b strings.Builder
	written := 0
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case strings.IndexByte("!#$&*+,/:;=?@[]-._~", c) >= 0,
			'a' <= c && c <= 'z', 'A' <= c && c <= 'Z', '0' <= c && c <= '9':
			continue
		case c == '%' && i+2 < len(s) && isHexDigit(s[i+1]) && isHexDigit(s[i+2]):
			continue
		}
		b.WriteString(s[written:i])
		fmt.Fprintf(&b, "%%%02x", c)
		written = i + 1
	}
	if written == 0 {
		return s
	}
	b.WriteString(s[written:])
	return b.String()
}

func isHexDigit(c byte) bool {
	return '0' <= c && c <= '9' || 'a' <= c && c <= 'f' || 'A' <= c && c <= 'F'
}
