package render

import (
	"bytes"
	"testing"

	"github.com/alecthomas/chroma/v2"
	"github.com/alecthomas/chroma/v2/styles"
)

// TestHighlightStyleSetsNoClass checks that the style handed to the
// formatter changes nothing in the page: with classes, chroma's own
// fallback style gives the same HTML for every language's sample.
func TestHighlightStyleSetsNoClass(t *testing.T) {
	samples := map[string]string{
		"go":     "package main\n\n// Bore in mm.\nfunc main() { x := 32.0 * 2; println(\"d\", x) }\n",
		"sh":     "#!/bin/sh\nspecgen build -C site && echo \"ok $HOME\" # done\n",
		"calc":   "id = \"low\"\nkind = \"compressor\"\nbore = \"32 mm\"\n[expect]\nswept_volume = \">= 1 cm3\"\n",
		"python": "def area(d):\n    return 3.14159 * d ** 2 / 4  # m2\n",
		"json":   "{\"bore\": 0.032, \"ok\": true, \"list\": [1, null]}\n",
		"diff":   "--- a\n+++ b\n@@ -1 +1 @@\n-old\n+new\n",
	}
	for lang, code := range samples {
		lexer := lexerFor(lang)
		if lexer == nil {
			t.Fatalf("no lexer for %s", lang)
		}
		format := func(style *chroma.Style) string {
			it, err := lexer.Tokenise(nil, code)
			if err != nil {
				t.Fatal(err)
			}
			var out bytes.Buffer
			if err := codeFormatter.Format(&out, style, it); err != nil {
				t.Fatal(err)
			}
			return out.String()
		}
		if ours, fallback := format(highlightStyle), format(styles.Fallback); ours != fallback {
			t.Errorf("%s: the style changes the page:\n%s\nwith chroma's fallback:\n%s", lang, ours, fallback)
		}
	}
}
