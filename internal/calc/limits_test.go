package calc

import (
	"fmt"
	"strings"
	"testing"
)

// TestBlockLimits checks that an oversized block fails at once with one
// message at its fence, and that a block with many mistakes reports the
// first MaxBlockErrors of them and counts the rest.
func TestBlockLimits(t *testing.T) {
	long := stageTOML + strings.Repeat("# a comment\n", MaxBlockLines)
	_, err := ParseBlock("content/index.md", 3, long)
	if err == nil || !strings.HasPrefix(err.Error(), "content/index.md:3: the block is ") ||
		!strings.Contains(err.Error(), fmt.Sprintf("up to %d lines", MaxBlockLines)) || strings.Count(err.Error(), "\n") != 0 {
		t.Errorf("a block of %d lines: %v", lineCount(long), err)
	}
	wide := stageTOML + "title = \"" + strings.Repeat("x", MaxBlockBytes) + "\"\n"
	if _, err := ParseBlock("content/index.md", 3, wide); err == nil || !strings.Contains(err.Error(), "bytes long") {
		t.Errorf("a block of %d bytes: %v", len(wide), err)
	}
	var keys strings.Builder
	for i := range 100 {
		fmt.Fprintf(&keys, "extra_%03d = 1\n", i)
	}
	_, err = ParseBlock("content/index.md", 3, stageTOML+keys.String())
	lines := strings.Split(err.Error(), "\n")
	if len(lines) != MaxBlockErrors+1 || !strings.Contains(lines[MaxBlockErrors], "and 80 more problems") {
		t.Errorf("100 unknown keys: %d lines, last %q", len(lines), lines[len(lines)-1])
	}
	if !strings.Contains(lines[0], "extra_000") {
		t.Errorf("100 unknown keys: the first reported is %q, want extra_000", lines[0])
	}
	for _, c := range []struct {
		src  string
		want int
	}{{"", 0}, {"a", 1}, {"a\n", 1}, {"a\nb", 2}, {"\n\n", 2}} {
		if got := lineCount(c.src); got != c.want {
			t.Errorf("lineCount(%q) = %d, want %d", c.src, got, c.want)
		}
	}
}
