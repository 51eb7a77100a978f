package render

import "testing"

func TestRelativeFromRoot(t *testing.T) {
	cases := []struct{ dest, up, want string }{
		{"/img/head.png", "", "img/head.png"},
		{"/img/head.png", "../../", "../../img/head.png"},
		{"/safety.html#relief", "../", "../safety.html#relief"},
		{"/step:1.html", "", "./step:1.html"}, // else "step:" reads as a URL scheme
		{"//example.invalid/x", "../", "//example.invalid/x"},
		{"https://example.invalid/x", "../", "https://example.invalid/x"},
		{"parts.html", "../", "parts.html"},
		{"#top", "../", "#top"},
	}
	for _, c := range cases {
		if got := string(relativeFromRoot([]byte(c.dest), c.up)); got != c.want {
			t.Errorf("relativeFromRoot(%q, %q) = %q, want %q", c.dest, c.up, got, c.want)
		}
	}
}
