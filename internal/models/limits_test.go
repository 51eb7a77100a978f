package models

import (
	"fmt"
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// TestBlockLimits checks that an oversized block fails at once with one
// message at its fence, and that a block with many mistakes reports the
// first MaxBlockErrors of them and counts the rest.
func TestBlockLimits(t *testing.T) {
	long := stageTOML + strings.Repeat("# a comment\n", calc.MaxBlockLines)
	_, err := testCatalog.ParseBlock("content/index.md", 3, long)
	if err == nil || !strings.HasPrefix(err.Error(), "content/index.md:3: the block is ") ||
		!strings.Contains(err.Error(), fmt.Sprintf("up to %d lines", calc.MaxBlockLines)) || strings.Count(err.Error(), "\n") != 0 {
		t.Errorf("a block of %d lines: %v", strings.Count(long, "\n"), err)
	}
	wide := stageTOML + "title = \"" + strings.Repeat("x", calc.MaxBlockBytes) + "\"\n"
	if _, err := testCatalog.ParseBlock("content/index.md", 3, wide); err == nil || !strings.Contains(err.Error(), "bytes long") {
		t.Errorf("a block of %d bytes: %v", len(wide), err)
	}
	var keys strings.Builder
	for i := range 100 {
		fmt.Fprintf(&keys, "extra_%03d = 1\n", i)
	}
	_, err = testCatalog.ParseBlock("content/index.md", 3, stageTOML+keys.String())
	lines := strings.Split(err.Error(), "\n")
	if len(lines) != calc.MaxBlockErrors+1 || !strings.Contains(lines[calc.MaxBlockErrors], "and 80 more problems") {
		t.Errorf("100 unknown keys: %d lines, last %q", len(lines), lines[len(lines)-1])
	}
	if !strings.Contains(lines[0], "extra_000") {
		t.Errorf("100 unknown keys: the first reported is %q, want extra_000", lines[0])
	}
}
