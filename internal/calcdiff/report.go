package calcdiff

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"net/url"
	"strings"

	"github.com/millrace-workshop/specgen/internal/render"
	"github.com/millrace-workshop/specgen/internal/site"
)

// Marker is the hidden first line of the Markdown report, by which a CI
// job finds its own comment on a pull request to edit it in place.
const Marker = "<!-- specgen:calc-diff -->"

// MarkdownOptions shape the Markdown report.
type MarkdownOptions struct {
	// PreviewURL is the address of the head's built site ("" for none):
	// each block then links to its table there.
	PreviewURL string
	// MaxBytes caps the report (0: no cap). Whole failures and blocks that
	// do not fit are left out, and a closing note counts them and names
	// Rest, where the whole report is.
	MaxBytes int
	Rest     string
}

// WriteMarkdown writes the diff as GitHub-flavoured Markdown, ready to
// post as a pull-request comment: the head's failed claims and DANGER
// cautions first, then a summary, then each changed block.
func (d *Diff) WriteMarkdown(w io.Writer, opts MarkdownOptions) error {
	var head strings.Builder
	fmt.Fprintf(&head, "%s\n### Calculation changes: %s → %s\n\n", Marker, revision(d.Base, d.BaseCommit), revision(d.Head, d.HeadCommit))
	for _, n := range d.Notes {
		fmt.Fprintf(&head, "> %s\n\n", n)
	}
	// Every piece after the heading is left out whole when it does not
	// fit; what the reader must see first comes first.
	var pieces []piece
	if len(d.Failing) > 0 {
		pieces = append(pieces, piece{text: fmt.Sprintf("**Failing in the %s: %s.** The check fails until each is fixed or acknowledged.\n\n",
			revision(d.Head, ""), plural(len(d.Failing), "problem"))})
		for i, f := range d.Failing {
			text := fmt.Sprintf("- %s `%s` of %s: %s\n", failureWord(f), f.Name, d.blockRef(f.BlockBrief, opts), mdCell(f.Message))
			if i == len(d.Failing)-1 {
				text += "\n"
			}
			pieces = append(pieces, piece{text: text, what: "failure"})
		}
	}
	pieces = append(pieces, piece{text: d.summary()})
	for _, b := range d.Changed {
		pieces = append(pieces, piece{text: d.blockSection(b, opts), what: "block"})
	}
	return writeCapped(w, head.String(), pieces, opts)
}

// piece is a part of the Markdown report; what names what is left out
// when it does not fit ("" for a part that is always written).
type piece struct{ text, what string }

// writeCapped writes head and the pieces that fit in opts.MaxBytes, and a
// note that counts what did not.
func writeCapped(w io.Writer, head string, pieces []piece, opts MarkdownOptions) error {
	var b strings.Builder
	b.WriteString(head)
	// Room for the note: a line naming the counts and the file.
	budget := opts.MaxBytes - 300 - len(opts.Rest)
	left := map[string]int{}
	for _, p := range pieces {
		if opts.MaxBytes > 0 && p.what != "" && (b.Len()+len(p.text) > budget || len(left) > 0) {
			left[p.what]++
			continue
		}
		b.WriteString(p.text)
	}
	if len(left) > 0 {
		var parts []string
		for _, what := range []string{"failure", "block"} {
			if n := left[what]; n > 0 {
				parts = append(parts, plural(n, what))
			}
		}
		fmt.Fprintf(&b, "\n---\n_%s more not shown: this report is capped at %d bytes. The whole report is the file `%s` (a CI job keeps it as an artifact)._\n",
			upperFirst(strings.Join(parts, " and ")), opts.MaxBytes, mdCode(opts.Rest))
	}
	_, err := io.WriteString(w, b.String())
	return err
}

// revision names one side of the diff: the revision as given, and its
// commit when known.
func revision(name, commit string) string {
	if commit == "" || commit == name {
		return "`" + mdCode(name) + "`"
	}
	return fmt.Sprintf("`%s` (%s)", mdCode(name), mdCode(commit))
}

func failureWord(f Failure) string {
	if f.Type == "caution" {
		return "**DANGER**"
	}
	return "Claim **FAILS**:"
}

// summary counts the blocks that changed, came, went or were renamed.
func (d *Diff) summary() string {
	if d.Empty() {
		return "No calculation changed.\n"
	}
	var parts []string
	if n := len(d.Changed); n > 0 {
		parts = append(parts, plural(n, "block")+" changed")
	}
	if n := len(d.Added); n > 0 {
		parts = append(parts, fmt.Sprintf("%d added", n))
	}
	if n := len(d.Removed); n > 0 {
		parts = append(parts, fmt.Sprintf("%d removed", n))
	}
	if n := len(d.Renamed); n > 0 {
		parts = append(parts, fmt.Sprintf("%d renamed", n))
	}
	summary := strings.Join(parts, ", ")
	if d.NewlyFailing > 0 {
		summary += fmt.Sprintf("; **%s newly failing**", plural(d.NewlyFailing, "claim"))
	}
	if d.NewDangers > 0 {
		summary += fmt.Sprintf("; **%s newly raised**", plural(d.NewDangers, "DANGER caution"))
	}
	var b strings.Builder
	fmt.Fprintf(&b, "%s.\n", upperFirst(summary))
	for _, r := range d.Renamed {
		fmt.Fprintf(&b, "\n- Renamed `%s` → `%s` (%s)", r.From, r.To, mdCell(r.Page))
	}
	for _, a := range d.Added {
		fmt.Fprintf(&b, "\n- Added `%s` (%s, %s)", a.ID, a.Kind, place(a.Page, a.Line))
	}
	for _, r := range d.Removed {
		fmt.Fprintf(&b, "\n- Removed `%s` (%s, %s)", r.ID, r.Kind, place(r.Page, r.Line))
	}
	if len(d.Renamed)+len(d.Added)+len(d.Removed) > 0 {
		b.WriteString("\n")
	}
	return b.String()
}

// blockRef names a block of the head with its page and line, linked to
// its table in the built site when there is one.
func (d *Diff) blockRef(b BlockBrief, opts MarkdownOptions) string {
	name := "`" + b.ID + "`"
	if opts.PreviewURL != "" {
		name = fmt.Sprintf("[%s](%s)", name, previewLink(opts.PreviewURL, b.Page, render.BlockAnchor(b.ID)))
	}
	return fmt.Sprintf("%s (%s, %s)", name, b.Kind, place(b.Page, b.Line))
}

// previewLink is the address of a page's anchor in the built site at base.
func previewLink(base, page, anchor string) string {
	link := strings.TrimSuffix(base, "/") + "/" + (&url.URL{Path: site.PageOutput(page)}).String()
	if anchor != "" {
		link += "#" + anchor
	}
	return link
}

// place writes a page and line: "content/a.md:12".
func place(page string, line int) string {
	if line == 0 {
		return mdCell(page)
	}
	return fmt.Sprintf("%s:%d", mdCell(page), line)
}

// blockSection is the part of the report on one changed block.
func (d *Diff) blockSection(b BlockDiff, opts MarkdownOptions) string {
	var w strings.Builder
	fmt.Fprintf(&w, "\n#### %s\n", d.blockRef(b.BlockBrief, opts))
	if len(b.Inputs) > 0 {
		fmt.Fprintln(&w, "\n| input | before | after |\n|---|---|---|")
		for _, c := range b.Inputs {
			fmt.Fprintf(&w, "| %s | %s | %s |\n", mdCell(c.Name), mdCell(c.Before), mdCell(c.After))
		}
	}
	if len(b.Results) > 0 {
		fmt.Fprintln(&w, "\n| result | before | after | change |\n|---|---|---|---:|")
		marks := map[string]bool{}
		for _, c := range b.Results {
			change := ""
			if c.Change != nil {
				change = fmt.Sprintf("%+.3g %%", *c.Change*100)
				if c.Absolute {
					change += " (" + absoluteScale(c.Unit) + ")"
					marks[absoluteScale(c.Unit)] = true
				}
			}
			fmt.Fprintf(&w, "| %s | %s | %s | %s |\n", mdCell(c.Name), mdCell(c.Before), mdCell(c.After), change)
		}
		var notes []string
		if marks["absolute"] {
			notes = append(notes, "(absolute) is the change of the absolute pressure, not of the gauge reading")
		}
		if marks["kelvin"] {
			notes = append(notes, "(kelvin) is the change of the temperature in kelvin, not in °C or °F")
		}
		if len(notes) > 0 {
			fmt.Fprintf(&w, "\n%s.\n", upperFirst(strings.Join(notes, "; ")))
		}
	}
	if len(b.Claims) > 0 {
		fmt.Fprintln(&w)
		for _, c := range b.Claims {
			fmt.Fprintf(&w, "- %s\n", claimLine(c))
		}
	}
	if len(b.Cautions) > 0 {
		fmt.Fprintln(&w)
		for _, c := range b.Cautions {
			level := c.Level
			if c.Level == "DANGER" && (c.Status == "appeared" || c.Status == "no longer acknowledged") {
				level = "**DANGER**"
			}
			fmt.Fprintf(&w, "- Caution %s %s (`%s`): %s\n", c.Status, level, c.Rule, mdCell(c.Message))
		}
	}
	if len(b.Quoted) > 0 {
		var at []string
		for _, q := range b.Quoted {
			where := place(q.Page, q.Line)
			if opts.PreviewURL != "" {
				where = fmt.Sprintf("[%s](%s)", where, previewLink(opts.PreviewURL, q.Page, ""))
			}
			at = append(at, fmt.Sprintf("%s (`%s`)", where, q.Name))
		}
		fmt.Fprintf(&w, "\nProse quoting a changed value, to reread: %s.\n", strings.Join(at, ", "))
	}
	return w.String()
}

// claimLine words a changed claim: its verdict, and when its text changed
// the old and the new text with whether each holds.
func claimLine(c ClaimChange) string {
	status := c.Status
	if c.Status == "newly fails" {
		status = "**NEWLY FAILS**"
	}
	if c.Before == "" {
		return fmt.Sprintf("Claim %s: %s", status, mdCell(c.After))
	}
	if c.Rewrite != c.Status {
		status += ", " + c.Rewrite
	}
	return fmt.Sprintf("Claim `%s` %s: was `%s` (%s), now `%s` (%s): %s", c.Name, status,
		mdCode(c.Before), verdict(*c.BeforeOK, "held", "failed"), mdCode(c.Claim), verdict(c.OK, "holds", "fails"), mdCell(c.After))
}

func verdict(ok bool, yes, no string) string {
	if ok {
		return yes
	}
	return no
}

// WriteJSON writes the diff as indented JSON.
func (d *Diff) WriteJSON(w io.Writer) error {
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false) // claims hold "<=": keep them readable
	err := enc.Encode(struct {
		Base string `json:"base"`
		Head string `json:"head"`
		*Diff
		Failed bool `json:"failed"`
	}{d.Base, d.Head, d, d.Failed()})
	if err != nil {
		return err
	}
	_, err = w.Write(buf.Bytes())
	return err
}

func plural(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return fmt.Sprintf("%d %ss", n, noun)
}

func upperFirst(s string) string {
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
}

// mdCell keeps a value from breaking a Markdown table.
func mdCell(s string) string {
	return strings.NewReplacer("|", `\|`, "\n", " ", "\r", "").Replace(s)
}

func mdCode(s string) string { return strings.ReplaceAll(s, "`", "'") }
