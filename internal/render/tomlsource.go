package render

import (
	"strconv"
	"strings"

	"github.com/yuin/goldmark/util"
)

// writeBlockSource writes a calc block's TOML with the highlighting
// classes chroma uses, by a small scanner of its own: blocks are short and
// regular (keys, strings, numbers, tables, comments), and a site has
// hundreds of them, where chroma's general lexer was a tenth of the build.
// Each line carries its line number in the page (the block's first line is
// first), as messages cite them.
func writeBlockSource(w util.BufWriter, src string, first int) {
	_, _ = w.WriteString(`<div class="sg-code" data-lang="toml"><pre class="hl-chroma"><code>`)
	for i, line := range strings.SplitAfter(src, "\n") {
		if line == "" {
			continue
		}
		if first > 0 {
			_, _ = w.WriteString(`<span class="sg-ln" aria-hidden="true">` + strconv.Itoa(first+i) + `</span>`)
		}
		writeTOMLLine(w, line)
	}
	_, _ = w.WriteString("</code></pre></div>\n")
}

func span(w util.BufWriter, class, text string) {
	if text == "" {
		return
	}
	if class == "" {
		_, _ = w.WriteString(esc(text))
		return
	}
	_, _ = w.WriteString(`<span class="hl-` + class + `">` + esc(text) + `</span>`)
}

// writeTOMLLine highlights one line: a table header, a key = value pair or
// a comment; anything else is written plain.
func writeTOMLLine(w util.BufWriter, line string) {
	body := strings.TrimRight(line, "\r\n")
	end := line[len(body):]
	trimmed := strings.TrimLeft(body, " \t")
	indent := body[:len(body)-len(trimmed)]
	span(w, "", indent)
	switch {
	case strings.HasPrefix(trimmed, "#"):
		span(w, "c1", trimmed)
	case strings.HasPrefix(trimmed, "["):
		code, comment := splitComment(trimmed)
		span(w, "kt", code)
		span(w, "c1", comment)
	default:
		eq := strings.IndexByte(trimmed, '=')
		if eq < 0 {
			span(w, "", trimmed)
			break
		}
		span(w, "nx", trimmed[:eq])
		span(w, "p", "=")
		writeTOMLValue(w, trimmed[eq+1:])
	}
	span(w, "", end)
}

// writeTOMLValue highlights strings, numbers, booleans and punctuation.
func writeTOMLValue(w util.BufWriter, v string) {
	for i := 0; i < len(v); {
		c := v[i]
		switch {
		case c == '"' || c == '\'':
			j := i + 1
			for j < len(v) && v[j] != c {
				if v[j] == '\\' && c == '"' {
					j++
				}
				j++
			}
			j = min(j+1, len(v))
			span(w, "s2", v[i:j])
			i = j
		case c == '#':
			span(w, "c1", v[i:])
			return
		case strings.IndexByte("[],{}", c) >= 0:
			span(w, "p", v[i:i+1])
			i++
		case c == ' ' || c == '\t':
			span(w, "", v[i:i+1])
			i++
		default:
			j := i
			for j < len(v) && strings.IndexByte(" \t[],{}#", v[j]) < 0 {
				j++
			}
			class := "m"
			if word := v[i:j]; word == "true" || word == "false" {
				class = "kc"
			}
			span(w, class, v[i:j])
			i = j
		}
	}
}

// splitComment cuts a trailing comment off a table header.
func splitComment(s string) (code, comment string) {
	if i := strings.Index(s, "#"); i >= 0 {
		return s[:i], s[i:]
	}
	return s, ""
}
