package render

import (
	"bufio"
	"html"
	"strings"
	"testing"

	gmhtml "github.com/yuin/goldmark/renderer/html"
)

// TestShownTextAsGoldmarkWrites checks shownText, shortcut included,
// against goldmark's writer followed by unescaping, the page's own way.
func TestShownTextAsGoldmarkWrites(t *testing.T) {
	for _, in := range []string{
		"", "plain words", `a "quoted" <tag> and > sign`, "1 < 2 > 0",
		"AT&amp;T", "&#x22;hex&#34;", `\*not emphasis\*`, "nul\x00byte",
		"ünïcödé — 3 mm³", "&unknown; and & alone", `back\\slash`, "tab\tend ",
	} {
		var b strings.Builder
		w := bufio.NewWriter(&b)
		gmhtml.DefaultWriter.Write(w, []byte(in))
		_ = w.Flush()
		if got, want := shownText([]byte(in)), html.UnescapeString(b.String()); got != want {
			t.Errorf("shownText(%q) = %q, want %q", in, got, want)
		}
	}
}
