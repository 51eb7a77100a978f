package render

import (
	"math/rand/v2"
	"testing"
)

// TestGroupFiguresShortcut checks groupFigures, whose shortcut skips values
// without five digits in a row, against the grouping of every figure.
func TestGroupFiguresShortcut(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	alphabet := []byte("0123456789 .-eWkx_")
	for range 20000 {
		s := make([]byte, r.IntN(14))
		for i := range s {
			s[i] = alphabet[r.IntN(len(alphabet))]
		}
		if got, want := groupFigures(string(s)), groupEachFigure(string(s)); got != want {
			t.Fatalf("groupFigures(%q) = %q, grouping each figure gives %q", s, got, want)
		}
	}
	if got := groupFigures("6140000 W"); got != "6\u00a0140\u00a0000 W" {
		t.Errorf("groupFigures(6140000 W) = %q", got)
	}
}
