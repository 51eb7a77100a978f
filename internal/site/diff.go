package site

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"maps"
	"math"
	"slices"
	"sort"
	"strings"
)

// Diff is what changed in a site's calculations between two evaluations.
type Diff struct {
	Base, Head string       `json:"-"`
	Changed    []BlockDiff  `json:"changed"`
	Added      []BlockBrief `json:"added"`
	Removed    []BlockBrief `json:"removed"`
	Renamed    []Rename     `json:"renamed"`
	// NewlyFailing counts claims that held (or did not exist) and now fail;
	// NewDangers counts DANGER cautions that appeared unacknowledged.
	NewlyFailing int `json:"newly_failing"`
	NewDangers   int `json:"new_dangers"`
	// Notes say what the reader must know to read the diff, such as a
	// revision without the site.
	Notes []string `json:"notes,omitempty"`
}

// BlockBrief names a block.
type BlockBrief struct {
	ID   string `json:"id"`
	Kind string `json:"kind"`
	Page string `json:"page"`
}

// Rename is a block whose id changed while its kind and inputs did not.
type Rename struct {
	From string `json:"from"`
	To   string `json:"to"`
	Page string `json:"page"`
}

// BlockDiff is one block present on both sides with something changed.
type BlockDiff struct {
	BlockBrief
	Inputs   []ValueChange   `json:"inputs"`
	Results  []ValueChange   `json:"results"`
	Claims   []ClaimChange   `json:"claims"`
	Cautions []CautionChange `json:"cautions"`
}

// ValueChange is an input or result that changed.
type ValueChange struct {
	Name   string   `json:"name"`
	Before string   `json:"before"` // as shown: text or display
	After  string   `json:"after"`
	Change *float64 `json:"relative_change,omitempty"` // (after − before)/|before| of the SI values (pressures absolute)
	// Absolute marks a change taken on an absolute scale, which a gauge
	// or Celsius reading does not share: Unit says which.
	Absolute bool `json:"absolute,omitempty"`
	// Unit is the SI unit of a result's values, "Pa(a)" or "K" for the
	// absolute scales.
	Unit string `json:"unit,omitempty"`
}

// absoluteScale is the Markdown mark of a relative change taken on an
// absolute scale, by the results.json unit; "" for other units.
func absoluteScale(unit string) string {
	switch unit {
	case "Pa(a)":
		return "absolute"
	case "K":
		// Every temperature result is absolute; a percentage of °C would
		// depend on where the scale puts its zero.
		return "kelvin"
	}
	return ""
}

// ClaimChange is a claim whose verdict changed, or that came or went.
type ClaimChange struct {
	Name   string `json:"name"`
	Claim  string `json:"claim"`
	Status string `json:"status"` // "newly fails", "newly holds", "added", "removed"
	After  string `json:"message"`
}

// CautionChange is a caution that appeared or went, or whose acknowledgement
// came or went.
type CautionChange struct {
	Level   string `json:"level"`
	Rule    string `json:"rule"`
	Status  string `json:"status"` // "appeared", "went", "acknowledged" (Message: the reason), "no longer acknowledged"
	Message string `json:"message"`
}

// Failed reports whether the change makes a claim fail or raises a DANGER.
func (d *Diff) Failed() bool { return d.NewlyFailing > 0 || d.NewDangers > 0 }

// Empty reports whether nothing changed.
func (d *Diff) Empty() bool {
	return len(d.Changed)+len(d.Added)+len(d.Removed)+len(d.Renamed) == 0
}

// Compare computes the changes from base to head.
func Compare(base, head *ResultsFile) *Diff {
	d := &Diff{Changed: []BlockDiff{}, Added: []BlockBrief{}, Removed: []BlockBrief{}, Renamed: []Rename{}}
	old, cur := byID(base), byID(head)
	var added, removed []string
	for _, id := range slices.Sorted(maps.Keys(cur)) {
		if _, ok := old[id]; !ok {
			added = append(added, id)
		}
	}
	for _, id := range slices.Sorted(maps.Keys(old)) {
		if _, ok := cur[id]; !ok {
			removed = append(removed, id)
		}
	}
	// A removed and an added block of the same kind and the same inputs
	// are one block renamed.
	renamedTo := map[string]string{}
	for _, r := range removed {
		for _, a := range added {
			if _, taken := renamedTo[a]; taken {
				continue
			}
			if old[r].Kind == cur[a].Kind && sameInputs(old[r], cur[a]) {
				renamedTo[a] = r
				d.Renamed = append(d.Renamed, Rename{From: r, To: a, Page: cur[a].Page})
				break
			}
		}
	}
	renamedFrom := map[string]bool{}
	for _, r := range renamedTo {
		renamedFrom[r] = true
	}
	for _, id := range added {
		if _, ok := renamedTo[id]; ok {
			continue
		}
		b := cur[id]
		d.Added = append(d.Added, BlockBrief{ID: id, Kind: b.Kind, Page: b.Page})
		for _, c := range b.Expect {
			if !c.OK {
				d.NewlyFailing++
			}
		}
		for _, c := range b.Cautions {
			if c.Level == "DANGER" && c.Acknowledged == "" {
				d.NewDangers++
			}
		}
	}
	for _, id := range removed {
		if !renamedFrom[id] {
			d.Removed = append(d.Removed, BlockBrief{ID: id, Kind: old[id].Kind, Page: old[id].Page})
		}
	}
	pairs := map[string]string{} // head id → base id
	for id := range cur {
		if _, ok := old[id]; ok {
			pairs[id] = id
		}
	}
	maps.Copy(pairs, renamedTo)
	for _, id := range slices.Sorted(maps.Keys(pairs)) {
		if bd, changed := compareBlock(old[pairs[id]], cur[id], d); changed {
			d.Changed = append(d.Changed, bd)
		}
	}
	return d
}

func byID(f *ResultsFile) map[string]ResultBlock {
	m := map[string]ResultBlock{}
	for _, b := range f.Blocks {
		m[b.ID] = b
	}
	return m
}

func sameInputs(a, b ResultBlock) bool {
	if len(a.Inputs) != len(b.Inputs) {
		return false
	}
	for k, v := range a.Inputs {
		if w, ok := b.Inputs[k]; !ok || w.Text != v.Text {
			return false
		}
	}
	return true
}

func compareBlock(a, b ResultBlock, d *Diff) (BlockDiff, bool) {
	bd := BlockDiff{BlockBrief: BlockBrief{ID: b.ID, Kind: b.Kind, Page: b.Page}}
	for _, name := range unionKeys(a.Inputs, b.Inputs) {
		x, inA := a.Inputs[name]
		y, inB := b.Inputs[name]
		if inA && inB && x.Text == y.Text && x.Value == y.Value {
			continue
		}
		bd.Inputs = append(bd.Inputs, ValueChange{Name: name, Before: textOr(x.Text, inA), After: textOr(y.Text, inB)})
	}
	for _, name := range unionKeys(a.Results, b.Results) {
		x, inA := a.Results[name]
		y, inB := b.Results[name]
		if inA && inB && sameNumber(x.Value, y.Value) {
			continue
		}
		vc := ValueChange{Name: name, Before: textOr(x.Display, inA), After: textOr(y.Display, inB)}
		if inA && inB {
			vc.Change = relativeChange(x, y)
			vc.Unit = y.Unit
			vc.Absolute = x.Unit == y.Unit && absoluteScale(y.Unit) != ""
		}
		bd.Results = append(bd.Results, vc)
	}
	oldClaims := map[string]ExpectJSON{}
	for _, c := range a.Expect {
		oldClaims[c.Name] = c
	}
	newClaims := map[string]bool{}
	for _, c := range b.Expect {
		newClaims[c.Name] = true
		was, existed := oldClaims[c.Name]
		switch {
		case !existed:
			bd.Claims = append(bd.Claims, ClaimChange{Name: c.Name, Claim: c.Claim, Status: "added", After: c.Message})
			if !c.OK {
				d.NewlyFailing++
			}
		case was.OK && !c.OK:
			bd.Claims = append(bd.Claims, ClaimChange{Name: c.Name, Claim: c.Claim, Status: "newly fails", After: c.Message})
			d.NewlyFailing++
		case !was.OK && c.OK:
			bd.Claims = append(bd.Claims, ClaimChange{Name: c.Name, Claim: c.Claim, Status: "newly holds", After: c.Message})
		case was.Claim != c.Claim:
			bd.Claims = append(bd.Claims, ClaimChange{Name: c.Name, Claim: c.Claim, Status: "reworded", After: c.Message})
		}
	}
	for _, c := range a.Expect {
		if !newClaims[c.Name] {
			bd.Claims = append(bd.Claims, ClaimChange{Name: c.Name, Claim: c.Claim, Status: "removed", After: c.Message})
		}
	}
	key := func(c CautionJSON) string { return c.Level + "\x00" + c.Rule }
	had, has := map[string]CautionJSON{}, map[string]bool{}
	for _, c := range a.Cautions {
		had[key(c)] = c
	}
	for _, c := range b.Cautions {
		has[key(c)] = true
		was, existed := had[key(c)]
		switch {
		case !existed:
			bd.Cautions = append(bd.Cautions, CautionChange{Level: c.Level, Rule: c.Rule, Status: "appeared", Message: c.Message})
			if c.Level == "DANGER" && c.Acknowledged == "" {
				d.NewDangers++
			}
		case was.Acknowledged == "" && c.Acknowledged != "":
			bd.Cautions = append(bd.Cautions, CautionChange{Level: c.Level, Rule: c.Rule, Status: "acknowledged", Message: c.Acknowledged})
		case was.Acknowledged != "" && c.Acknowledged == "":
			bd.Cautions = append(bd.Cautions, CautionChange{Level: c.Level, Rule: c.Rule, Status: "no longer acknowledged", Message: c.Message})
			if c.Level == "DANGER" {
				d.NewDangers++
			}
		}
	}
	for _, c := range a.Cautions {
		if !has[key(c)] {
			bd.Cautions = append(bd.Cautions, CautionChange{Level: c.Level, Rule: c.Rule, Status: "went", Message: c.Message})
		}
	}
	changed := len(bd.Inputs)+len(bd.Results)+len(bd.Claims)+len(bd.Cautions) > 0 || a.ID != b.ID
	return bd, changed
}

// relativeChange is (after − before)/|before| of the SI values (for a
// pressure, the absolute ones; the Markdown says so). It is nil when
// before is zero, or when the change overflows (hand-edited files).
func relativeChange(x, y ResultJSON) *float64 {
	if x.Value == 0 {
		return nil
	}
	rel := (y.Value - x.Value) / math.Abs(x.Value)
	if math.IsInf(rel, 0) || math.IsNaN(rel) {
		return nil
	}
	return &rel
}

// sameNumber treats values equal to 12 significant figures as unchanged,
// so that floating-point noise between machines is not a change.
func sameNumber(x, y float64) bool {
	return x == y || math.Abs(x-y) <= 1e-12*math.Max(math.Abs(x), math.Abs(y))
}

func textOr(s string, present bool) string {
	if !present {
		return "–"
	}
	return s
}

func unionKeys[V any](a, b map[string]V) []string {
	set := map[string]bool{}
	for k := range a {
		set[k] = true
	}
	for k := range b {
		set[k] = true
	}
	keys := slices.Collect(maps.Keys(set))
	sort.Strings(keys)
	return keys
}

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

func jsonUnmarshalStrict(b []byte, v any) error {
	dec := json.NewDecoder(bytes.NewReader(b))
	dec.DisallowUnknownFields()
	return dec.Decode(v)
}
