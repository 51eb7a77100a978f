package site

import "net/url"

// href turns a slash-separated relative path into a link that reaches it:
// "?", "#", "%" and spaces in file names are escaped (else "what?.html"
// loses its tail as a query), and a first segment with a colon gets "./"
// (else "step:1.html" reads as a URL scheme and html/template blanks it).
func href(rel string) string {
	return (&url.URL{Path: rel}).String()
}
