package calc

import (
	"strings"
	"testing"
)

// TestLineOfMatchesKeyLines checks the line a block finds for a key in its
// sorted list against a search of the KeyLines map it stands in for: keys
// in tables, dotted keys, keys set twice, quoted keys, keys inside
// multi-line strings, and tables named only by their keys.
func TestLineOfMatchesKeyLines(t *testing.T) {
	sources := []string{
		"id = \"a\"\nkind = \"compressor\"\nbore = \"32 mm\"\n\n[expect]\nswept_volume = \">= 1 cm3\"\n\n[show]\noutputs = [\"a\"]\ncharts = [\"pv\"]\n",
		"id = \"b\"\nbore.x = 1\nbore.y = 2\n\"quoted.key\" = 3\n'single' = 4\nbore-x = 5\n[bore2]\nz = 1\n",
		"note = \"\"\"\nfake = 1\n\"\"\"\nreal = 2\nreal = 3\n[a.b]\nc = 1\n[a]\nd = 2\n# comment = 9\n[derive] # comment\nx = \"1 + 2\"\n",
		"",
	}
	for _, src := range sources {
		lines := KeyLines(src)
		want := func(key string) int {
			if l, ok := lines[key]; ok {
				return 100 + l
			}
			first := 0
			for k, l := range lines {
				if strings.HasPrefix(k, key+".") && (first == 0 || l < first) {
					first = l
				}
			}
			return 100 + first
		}
		b := &Block{Line: 100, lines: keyLineList(src)}
		keys := []string{"", "bore", "bore2", "quoted", "a", "a.b", "expect", "show", "derive", "missing", "fake", "real", "note"}
		for k := range lines {
			keys = append(keys, k)
			if i := strings.IndexByte(k, '.'); i > 0 {
				keys = append(keys, k[:i])
			}
		}
		for _, key := range keys {
			if got, w := b.lineOf(key), want(key); got != w {
				t.Errorf("source %q: line of %q is %d, want %d", src, key, got, w)
			}
		}
	}
}
