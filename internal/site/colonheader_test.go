package site

import (
	"bytes"
	"testing"
)

// TestColonHeader: only a "---" block of "key: value" lines counts as a
// header in the wrong syntax; a page that opens with a rule does not.
func TestColonHeader(t *testing.T) {
	for _, c := range []struct{ src, want string }{
		{"---\ntitle: Parts\norder: 2\n---\n# Parts\n", "title"},
		{"---\r\ntitle: Parts\r\n---\r\n", "title"},
		{"---\ntags:\n  - bench\n---\n", "tags"},
		{"---\n\nA rule, then prose.\n\n---\n", ""},
		{"---\nWarning: hot surfaces\n---\n", ""},
		{"---\ntitle: Parts\n\nno closing line\n", ""},
		{"# Parts\n", ""},
	} {
		first, rest, _ := bytes.Cut([]byte(c.src), []byte("\n"))
		if got := colonHeader(first, rest); got != c.want {
			t.Errorf("%q: got %q, want %q", c.src, got, c.want)
		}
	}
}
