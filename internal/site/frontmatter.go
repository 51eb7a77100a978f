package site

import (
	"bytes"
	"errors"
	"fmt"
	"regexp"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/inputerr"
)

// FrontMatter is the TOML header of a page, between "+++" lines.
type FrontMatter struct {
	Title       string `toml:"title"`
	Order       int    `toml:"order"`
	Description string `toml:"description"`
	Template    string `toml:"template"`
}

var frontMatterKeys = []string{"description", "order", "template", "title"}

// byteOrderMark is the UTF-8 encoding of U+FEFF, which some editors write
// at the start of a file.
const byteOrderMark = "\ufeff"

// splitFrontMatter separates a leading "+++" block from the body. It returns
// the TOML, the body and the number of file lines before the body. A byte
// order mark at the start of the file is dropped.
func splitFrontMatter(file string, src []byte) (fm []byte, body []byte, offset int, err error) {
	const fence = "+++"
	src = bytes.TrimPrefix(src, []byte(byteOrderMark))
	first, rest, _ := bytes.Cut(src, []byte("\n"))
	if strings.TrimRight(string(first), "\r \t") != fence {
		if k := colonHeader(first, rest); k != "" {
			return nil, nil, 0, &inputerr.Error{File: file, Line: 1, Msg: fmt.Sprintf(`the page opens with "---" lines of "key: value" (%s:); they would show as a heading. Front matter is TOML between "+++" lines: %s = ...`, k, k)}
		}
		return nil, src, 0, nil
	}
	line := 1
	pos := len(first) + 1
	for len(rest) > 0 || pos <= len(src) {
		var l []byte
		l, rest, _ = bytes.Cut(rest, []byte("\n"))
		line++
		if strings.TrimRight(string(l), "\r \t") == fence {
			return src[len(first)+1 : pos], src[min(pos+len(l)+1, len(src)):], line, nil
		}
		pos += len(l) + 1
		if len(rest) == 0 {
			break
		}
	}
	return nil, nil, 0, &inputerr.Error{File: file, Line: 1, Msg: `front matter opened with "+++" is never closed; end it with a line holding only "+++"`}
}

// colonKey is a "key: value" line of a header in another syntax.
var colonKey = regexp.MustCompile(`^([a-z_]+):(\s|$)`)

// colonHeader returns the first key when the page opens with a "---" line,
// then only "key: value" lines, then "---": a header specgen does not read,
// which Markdown turns into a rule and a heading.
func colonHeader(first, rest []byte) string {
	if strings.TrimRight(string(first), "\r \t") != "---" {
		return ""
	}
	key := ""
	for _, l := range strings.Split(string(rest), "\n") {
		l = strings.TrimRight(l, "\r \t")
		if l == "---" {
			return key
		}
		m := colonKey.FindStringSubmatch(l)
		switch {
		case m != nil && key == "":
			key = m[1]
		case m == nil && key == "":
			return ""
		case m == nil && !strings.HasPrefix(l, " ") && !strings.HasPrefix(l, "-"):
			return ""
		}
	}
	return ""
}

// parseFrontMatter decodes a page's front matter strictly: unknown keys and
// wrong types are errors that name the line. With such an error the body
// and its offset are still given, so that the rest of the page can be
// checked; the body is nil only when the page cannot be split at all.
func parseFrontMatter(file string, src []byte) (FrontMatter, map[string]int, []byte, int, error) {
	var fm FrontMatter
	if err := checkPageLimits(file, src); err != nil {
		return fm, nil, nil, 0, err
	}
	head, body, offset, err := splitFrontMatter(file, src)
	if err != nil || head == nil {
		return fm, nil, body, offset, err
	}
	text := string(head)
	lines := calc.KeyLines(text)
	md, err := toml.Decode(text, &fm)
	if err != nil {
		return FrontMatter{}, nil, body, offset, tomlError(file, 1, text, err, "front matter")
	}
	var errs inputerr.List
	for _, k := range md.Undecoded() {
		key := k.String()
		msg := fmt.Sprintf("front matter: unknown key %q; allowed: %s", key, strings.Join(frontMatterKeys, ", "))
		if s := calc.Suggest(key, frontMatterKeys); s != "" {
			msg = fmt.Sprintf("front matter: unknown key %q; did you mean %q? (allowed: %s)", key, s, strings.Join(frontMatterKeys, ", "))
		}
		errs = append(errs, &inputerr.Error{File: file, Line: 1 + lines[key], Msg: msg})
	}
	if len(errs) > 0 {
		return fm, lines, body, offset, errs.Sorted()
	}
	return fm, lines, body, offset, nil
}

// tomlError turns a TOML decoding error into an Error at the right file
// line. base is the file line of the document's first line, minus one.
func tomlError(file string, base int, text string, err error, what string) error {
	var pe toml.ParseError
	if errors.As(err, &pe) {
		line := max(pe.Position.Line, 1)
		// The parser counts a newline it stopped at as the next line.
		if s := pe.Position.Start; s > 0 && s <= len(text) {
			line = strings.Count(text[:s], "\n") + 1
		}
		msg := pe.Message
		if m := outOfRange.FindStringSubmatch(msg); m != nil {
			msg = m[1] + " is too large; " + rangeWords(m[2])
		}
		if pe.LastKey != "" && !strings.Contains(msg, pe.LastKey) {
			msg = pe.LastKey + ": " + msg
		}
		return &inputerr.Error{File: file, Line: base + line, Msg: what + ": " + msg}
	}
	if m := typeMismatch.FindStringSubmatch(err.Error()); m != nil {
		line, _ := strconv.Atoi(m[1])
		return &inputerr.Error{File: file, Line: base + max(line, 1), Msg: fmt.Sprintf("%s: %s: %s is not allowed here; write %s",
			what, m[2], tomlTypeWord(m[3]), tomlTypeWord(m[4]))}
	}
	if m := tableMismatch.FindStringSubmatch(err.Error()); m != nil {
		line, _ := strconv.Atoi(m[1])
		return &inputerr.Error{File: file, Line: base + max(line, 1), Msg: fmt.Sprintf("%s: %s: %s is not allowed here; write a table: a line [%s] and its keys below it",
			what, m[2], tomlTypeWord(m[3]), m[2])}
	}
	return &inputerr.Error{File: file, Line: base + 1, Msg: what + ": " + strings.TrimPrefix(err.Error(), "toml: ")}
}

// tableMismatch matches the TOML decoder's report of a plain value where
// a table belongs; its Go type names are no use to a writer.
var tableMismatch = regexp.MustCompile(`^toml: line (\d+) \(last key "([^"]*)"\): type mismatch for [^:]+: expected table but found (.+)$`)

// outOfRange matches the TOML parser's report of a number too large for
// its Go type.
var outOfRange = regexp.MustCompile(`^(.+) is out of range for (u?int\d*|float\d*)$`)

// rangeWords says what numbers a Go number type holds, in a writer's words.
func rangeWords(goType string) string {
	if strings.HasPrefix(goType, "float") {
		return "a number is at most about 1.8e308"
	}
	return "a whole number is at most 9223372036854775807"
}

// typeMismatch matches the TOML decoder's report of a value of the wrong
// type: its line, key, the value's Go type and the wanted type.
var typeMismatch = regexp.MustCompile(`^toml: line (\d+) \(last key "([^"]*)"\): incompatible types: TOML value has type ([^;]+); destination has type (.+)$`)

// tomlTypeWord names a Go type from the TOML decoder in a writer's words.
func tomlTypeWord(goType string) string {
	switch {
	case strings.HasPrefix(goType, "int"), strings.HasPrefix(goType, "uint"), goType == "integer":
		return "a whole number"
	case strings.HasPrefix(goType, "float"):
		return "a number"
	case goType == "string":
		return "a quoted string"
	case goType == "bool", goType == "boolean":
		return "true or false"
	case strings.HasPrefix(goType, "[]"), goType == "slice", goType == "array":
		return "a list"
	case strings.HasPrefix(goType, "map"), goType == "struct":
		return "a table"
	case strings.Contains(goType, "Time"), strings.Contains(goType, "Date"):
		return "a date or time"
	}
	return "a value of type " + goType
}

// Limits on one page, far above any hand-written page. Markdown parsing
// time grows with the square of the nesting depth, so a page of thousands
// of nested quotes or list markers would stall a build (and a preview).
const (
	MaxPageBytes   = 2 << 20
	MaxPageNesting = 32 // quote and list levels opening one line
)

// checkPageLimits refuses a page that is too large or nests too deeply.
func checkPageLimits(file string, src []byte) error {
	if len(src) > MaxPageBytes {
		return &inputerr.Error{File: file, Line: 1, Msg: fmt.Sprintf("the page is %.1f MiB; allowed: up to %d MiB; split it into several pages", float64(len(src))/(1<<20), MaxPageBytes>>20)}
	}
	line := 1
	for rest := src; len(rest) > 0; line++ {
		var l []byte
		l, rest, _ = bytes.Cut(rest, []byte("\n"))
		if depth := nesting(l); depth > MaxPageNesting {
			return &inputerr.Error{File: file, Line: line, Msg: fmt.Sprintf("this line opens %d levels of quotes or lists; allowed: up to %d levels of nesting", depth, MaxPageNesting)}
		}
	}
	return nil
}

// nesting estimates the levels of quotes and lists that open a line: each
// block-quote marker (">") and list marker ("-", "*", "+", "1." or "1)"
// followed by a space) counts one, and the indentation before a marker one
// per two columns, the least a nested list item is indented by.
func nesting(line []byte) int {
	depth, indent := 0, 0
	for i := 0; i < len(line); {
		switch c := line[i]; {
		case c == ' ':
			indent++
			i++
		case c == '\t':
			indent += 4
			i++
		case c == '>':
			depth, indent = depth+1, 0
			i++
		case (c == '-' || c == '*' || c == '+') && i+1 < len(line) && (line[i+1] == ' ' || line[i+1] == '\t'):
			depth, indent = depth+1+indent/2, 0
			i += 2
		case c >= '0' && c <= '9':
			j := i
			for j < len(line) && j-i < 9 && line[j] >= '0' && line[j] <= '9' {
				j++
			}
			if j+1 >= len(line) || (line[j] != '.' && line[j] != ')') || (line[j+1] != ' ' && line[j+1] != '\t') {
				return depth
			}
			depth, indent = depth+1+indent/2, 0
			i = j + 2
		default:
			return depth
		}
	}
	return depth
}
