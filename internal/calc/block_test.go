package calc

import "testing"

// TestLineCount counts a block's lines as the size limit does.
func TestLineCount(t *testing.T) {
	for _, c := range []struct {
		src  string
		want int
	}{{"", 0}, {"a", 1}, {"a\n", 1}, {"a\nb", 2}, {"\n\n", 2}} {
		if got := lineCount(c.src); got != c.want {
			t.Errorf("lineCount(%q) = %d, want %d", c.src, got, c.want)
		}
	}
}
