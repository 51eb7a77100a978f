package render

import (
	"strings"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// CautionStripHTML is the one-line form of the standard caution, for a
// page that quotes or charts figures without holding their calculation:
// the signal word, message, and a link to the site's safety page (none
// when href is empty).
func CautionStripHTML(message, href string) string {
	word := calc.Warning.String()
	var b strings.Builder
	b.WriteString(`<p class="sg-caution-strip" role="note" aria-label="` + word + `"><span class="sg-caution-strip-word">` +
		`<span class="sg-caution-icon" aria-hidden="true"></span>` + word + `</span> ` + esc(message))
	if href != "" {
		b.WriteString(` <a href="` + esc(href) + `">Read the safety page.</a>`)
	}
	b.WriteString("</p>\n")
	return b.String()
}

// PageProblem is a failed claim or an unacknowledged DANGER caution of a
// block a page shows, for the note under the page's title.
type PageProblem struct {
	Claim      bool   // a failed claim, else a DANGER caution
	Name       string // the result claimed, or the caution's rule
	BlockTitle string
	Href       string // link to the block's table
}

// PageAlertHTML says under a page's title that a block it shows has a
// failed claim or a DANGER nobody acknowledged, each linked to its block;
// empty when there is none.
func PageAlertHTML(problems []PageProblem) string {
	if len(problems) == 0 {
		return ""
	}
	var b strings.Builder
	b.WriteString(`<div class="sg-page-alert"><p class="sg-page-alert-head">Before you rely on this page:</p><ul>` + "\n")
	for _, p := range problems {
		what := `<span class="sg-flag sg-level-danger">DANGER</span> not acknowledged: <code>` + esc(p.Name) + `</code> in `
		if p.Claim {
			what = `<span class="sg-flag sg-flag-claim">claim fails</span> <code>` + esc(p.Name) + `</code> in `
		}
		b.WriteString(`<li>` + what + `<a href="` + esc(p.Href) + `">` + esc(p.BlockTitle) + "</a></li>\n")
	}
	b.WriteString("</ul></div>\n")
	return b.String()
}
