package calcdiff

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"strings"
)

// WriteMarkdown writes the diff as GitHub-flavoured Markdown, ready to
// paste as a pull-request comment.
func (d *Diff) WriteMarkdown(w io.Writer) {
	fmt.Fprintf(w, "### Calculation changes: `%s` → `%s`\n\n", mdCode(d.Base), mdCode(d.Head))
	for _, n := range d.Notes {
		fmt.Fprintf(w, "> %s\n\n", n)
	}
	if d.Empty() {
		fmt.Fprintln(w, "No calculation changed.")
		return
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
	fmt.Fprintf(w, "%s.\n", upperFirst(summary))
	for _, r := range d.Renamed {
		fmt.Fprintf(w, "\n- Renamed `%s` → `%s` (%s)", r.From, r.To, mdCell(r.Page))
	}
	for _, b := range d.Added {
		fmt.Fprintf(w, "\n- Added `%s` (%s, %s)", b.ID, b.Kind, mdCell(b.Page))
	}
	for _, b := range d.Removed {
		fmt.Fprintf(w, "\n- Removed `%s` (%s, %s)", b.ID, b.Kind, mdCell(b.Page))
	}
	if len(d.Renamed)+len(d.Added)+len(d.Removed) > 0 {
		fmt.Fprintln(w)
	}
	for _, b := range d.Changed {
		fmt.Fprintf(w, "\n#### `%s` (%s, %s)\n", b.ID, b.Kind, mdCell(b.Page))
		if len(b.Inputs) > 0 {
			fmt.Fprintln(w, "\n| input | before | after |\n|---|---|---|")
			for _, c := range b.Inputs {
				fmt.Fprintf(w, "| %s | %s | %s |\n", mdCell(c.Name), mdCell(c.Before), mdCell(c.After))
			}
		}
		if len(b.Results) > 0 {
			fmt.Fprintln(w, "\n| result | before | after | change |\n|---|---|---|---:|")
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
				fmt.Fprintf(w, "| %s | %s | %s | %s |\n", mdCell(c.Name), mdCell(c.Before), mdCell(c.After), change)
			}
			var notes []string
			if marks["absolute"] {
				notes = append(notes, "(absolute) is the change of the absolute pressure, not of the gauge reading")
			}
			if marks["kelvin"] {
				notes = append(notes, "(kelvin) is the change of the temperature in kelvin, not in °C or °F")
			}
			if len(notes) > 0 {
				fmt.Fprintf(w, "\n%s.\n", upperFirst(strings.Join(notes, "; ")))
			}
		}
		if len(b.Claims) > 0 {
			fmt.Fprintln(w)
			for _, c := range b.Claims {
				mark := c.Status
				if c.Status == "newly fails" {
					mark = "**NEWLY FAILS**"
				}
				fmt.Fprintf(w, "- Claim %s: %s\n", mark, mdCell(c.After))
			}
		}
		if len(b.Cautions) > 0 {
			fmt.Fprintln(w)
			for _, c := range b.Cautions {
				level := c.Level
				if c.Level == "DANGER" && (c.Status == "appeared" || c.Status == "no longer acknowledged") {
					level = "**DANGER**"
				}
				fmt.Fprintf(w, "- Caution %s %s (`%s`): %s\n", c.Status, level, c.Rule, mdCell(c.Message))
			}
		}
	}
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
