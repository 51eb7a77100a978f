package site

import (
	"bufio"
	"encoding/json"
	"io"
	"strings"
	"unicode"
	"unicode/utf8"

	"github.com/millrace-workshop/specgen/internal/render"
)

// searchIndexFile is the site's search index: a script that hands every
// page's entry to the search script (assets/search.js), which loads it
// the first time a reader searches. A script rather than JSON, because a
// page opened from disk may load scripts but not fetch files.
const searchIndexFile = "assets/search-index.js"

// The size of a page's entry: a big site's index stays a few megabytes.
const (
	searchWords   = 400 // distinct words of a page
	searchExcerpt = 160 // characters of its opening, shown with a result
)

// searchEntry is one page in the search index.
type searchEntry struct {
	Title    string      `json:"t"`
	URL      string      `json:"u"` // from the site's root
	Excerpt  string      `json:"x"`
	Headings [][2]string `json:"h"` // text and anchor id of each heading
	Words    string      `json:"w"` // the page's distinct words, lower case, by first use
}

// newSearchEntry makes page p's entry of the search index from its text
// and headings.
func newSearchEntry(p *Page, text string, headings []render.Heading) searchEntry {
	e := searchEntry{Title: p.Title, URL: href(p.Out), Excerpt: p.Front.Description, Headings: [][2]string{}}
	if e.Excerpt == "" {
		e.Excerpt = excerpt(text, searchExcerpt)
	}
	for _, h := range headings {
		e.Headings = append(e.Headings, [2]string{h.Text, h.ID})
	}
	e.Words = distinctWords(p.Title+" "+text, searchWords)
	return e
}

// excerpt is the opening of text on one line, cut at a word and marked
// with an ellipsis when longer than n characters.
func excerpt(text string, n int) string {
	line := strings.Join(strings.Fields(text), " ")
	runes := []rune(line)
	if len(runes) <= n {
		return line
	}
	cut := string(runes[:n])
	if i := strings.LastIndexByte(cut, ' '); i > n/2 {
		cut = cut[:i]
	}
	return cut + " …"
}

// distinctWords lists the words of text in lower case, each once, in the
// order they first appear, at most n of them.
func distinctWords(text string, n int) string {
	seen := map[string]bool{}
	var words []string
	lower := strings.ToLower(text)
	inWord := func(r rune) bool { return unicode.IsLetter(r) || unicode.IsDigit(r) }
	// The fields of strings.FieldsFunc, taken one at a time, so that a
	// long page stops at the n-th word.
	for i := 0; i < len(lower) && len(words) < n; {
		r, size := utf8.DecodeRuneInString(lower[i:])
		if !inWord(r) {
			i += size
			continue
		}
		start := i
		for i < len(lower) {
			if r, size = utf8.DecodeRuneInString(lower[i:]); !inWord(r) {
				break
			}
			i += size
		}
		if w := lower[start:i]; !seen[w] {
			seen[w] = true
			words = append(words, w)
		}
	}
	return strings.Join(words, " ")
}

// json is the entry as the index holds it. json.Marshal escapes <, > and
// & and the line separators U+2028 and U+2029: the text cannot end the
// script or break its lines.
func (e searchEntry) json() ([]byte, error) { return json.Marshal(e) }

// writeSearchIndex writes the index script: one call of specgenSearchIndex
// with every page's entry (packed), in the site's page order.
func writeSearchIndex(w io.Writer, entries []render.Packed) error {
	bw := bufio.NewWriter(w)
	bw.WriteString("specgenSearchIndex([\n")
	for i, e := range entries {
		b, err := e.Bytes()
		if err != nil {
			return err
		}
		bw.Write(b)
		if i < len(entries)-1 {
			bw.WriteByte(',')
		}
		bw.WriteByte('\n')
	}
	bw.WriteString("]);\n")
	return bw.Flush()
}
