package calc

import (
	"slices"
	"strings"
	"testing"
)

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

// TestBlockValues checks that a block finds each input it was written with
// in its sorted list, as written and on its line, and no other.
func TestBlockValues(t *testing.T) {
	cat := driveAndLoad(t, true)
	b := parseSources(t, cat, "id = \"belt\"\nkind = \"test-driver\"\nload = \"pump\"\nmotor_speed = \"40 rad/s\"\n")[0]
	for key, want := range map[string]Value{
		"motor_speed": {Key: "motor_speed", Text: "40 rad/s", Line: 5},
		"load":        {Key: "load", Text: "pump", Links: []string{"pump"}, Line: 4},
	} {
		got, ok := b.Value(key)
		if !ok || got.Text != want.Text || got.Line != want.Line || !slices.Equal(got.Links, want.Links) {
			t.Errorf("value of %s = %+v, %v; want %+v", key, got, ok, want)
		}
	}
	for _, key := range []string{"id", "kind", "speed", "", "zz"} {
		if v, ok := b.Value(key); ok {
			t.Errorf("value of %q = %+v; the block writes no such input", key, v)
		}
	}
	if !slices.IsSortedFunc(b.Values, func(x, y Value) int { return strings.Compare(x.Key, y.Key) }) || len(b.Values) != 2 {
		t.Errorf("values %+v: want the two inputs, sorted by key", b.Values)
	}
}
