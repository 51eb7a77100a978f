package calcdiff

import (
	"maps"
	"math"
	"slices"
	"sort"

	"github.com/millrace-workshop/specgen/internal/results"
)

// Diff is what changed in a site's calculations between two evaluations.
type Diff struct {
	Base, Head string `json:"-"`
	// BaseCommit and HeadCommit name the commits compared, when known.
	BaseCommit string `json:"base_commit,omitempty"`
	HeadCommit string `json:"head_commit,omitempty"`
	// Failing are the head's failed claims and unacknowledged DANGER
	// cautions, new or not: what fails its check.
	Failing []Failure    `json:"failing"`
	Changed []BlockDiff  `json:"changed"`
	Added   []BlockBrief `json:"added"`
	Removed []BlockBrief `json:"removed"`
	Renamed []Rename     `json:"renamed"`
	// NewlyFailing counts claims that held (or did not exist) and now fail;
	// NewDangers counts DANGER cautions that appeared unacknowledged.
	NewlyFailing int `json:"newly_failing"`
	NewDangers   int `json:"new_dangers"`
	// Notes say what the reader must know to read the diff, such as a
	// revision without the site.
	Notes []string `json:"notes,omitempty"`
}

// BlockBrief names a block and where it is.
type BlockBrief struct {
	ID   string `json:"id"`
	Kind string `json:"kind"`
	Page string `json:"page"`
	Line int    `json:"line"` // of the block's opening fence
}

// briefOf names block b.
func briefOf(b results.Block) BlockBrief {
	return BlockBrief{ID: b.ID, Kind: b.Kind, Page: b.Page, Line: b.Line}
}

// Failure is a failed claim or an unacknowledged DANGER caution of the
// head.
type Failure struct {
	BlockBrief
	Type    string `json:"type"` // "claim" or "caution"
	Name    string `json:"name"` // the claimed result, or the caution's rule
	Message string `json:"message"`
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
	// Quoted are the places in the head's prose that quote a value of the
	// block that changed.
	Quoted []Quote `json:"quoted,omitempty"`
}

// Quote is a place in a page's prose that quotes a changed value.
type Quote struct {
	Name string `json:"name"` // the input or result quoted
	Page string `json:"page"`
	Line int    `json:"line"`
}

// ValueChange is an input or result that changed.
type ValueChange struct {
	Name   string `json:"name"`
	Before string `json:"before"` // as shown: text or display
	After  string `json:"after"`
	// BeforeValue and AfterValue are the SI values (pressures absolute),
	// nil on the side where the value is missing.
	BeforeValue *float64 `json:"before_value"`
	AfterValue  *float64 `json:"after_value"`
	Change      *float64 `json:"relative_change,omitempty"` // (after − before)/|before| of the SI values (pressures absolute)
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

// ClaimChange is a claim whose verdict or text changed, or that came or
// went.
type ClaimChange struct {
	Name  string `json:"name"`
	Claim string `json:"claim"` // as the head writes it (the base, for a removed claim)
	// Status is "newly fails", "newly holds", "added", "removed", or for a
	// claim whose text alone changed, its Rewrite.
	Status string `json:"status"`
	OK     bool   `json:"ok"` // whether Claim holds
	// Before is the claim as the base wrote it, when its text changed,
	// and BeforeOK whether it held there.
	Before   string `json:"before,omitempty"`
	BeforeOK *bool  `json:"before_ok,omitempty"`
	// Rewrite says how a changed text bounds the result: "weakened" (it
	// allows every value the old one did, and more), "strengthened"
	// (fewer) or "changed".
	Rewrite string `json:"rewrite,omitempty"`
	After   string `json:"message"`
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
func Compare(base, head *results.File) *Diff {
	d := &Diff{Failing: failuresOf(head), Changed: []BlockDiff{}, Added: []BlockBrief{}, Removed: []BlockBrief{}, Renamed: []Rename{},
		BaseCommit: base.Commit, HeadCommit: head.Commit}
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
		d.Added = append(d.Added, briefOf(b))
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
			d.Removed = append(d.Removed, briefOf(old[id]))
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
			bd.Quoted = quotesOf(bd, head.Quotes)
			d.Changed = append(d.Changed, bd)
		}
	}
	return d
}

// failuresOf lists the failed claims and unacknowledged DANGER cautions of
// f, by block id.
func failuresOf(f *results.File) []Failure {
	out := []Failure{}
	for _, b := range f.Blocks {
		for _, c := range b.Expect {
			if !c.OK {
				out = append(out, Failure{BlockBrief: briefOf(b), Type: "claim", Name: c.Name, Message: c.Message})
			}
		}
		for _, c := range b.Cautions {
			if c.Level == "DANGER" && c.Acknowledged == "" {
				out = append(out, Failure{BlockBrief: briefOf(b), Type: "caution", Name: c.Rule, Message: c.Message})
			}
		}
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].ID < out[j].ID })
	return out
}

// quotesOf lists the places that quote a changed input or result of the
// block, by page and line.
func quotesOf(bd BlockDiff, quotes map[string][]results.Place) []Quote {
	var out []Quote
	for _, changes := range [][]ValueChange{bd.Inputs, bd.Results} {
		for _, c := range changes {
			for _, p := range quotes[bd.ID+"."+c.Name] {
				out = append(out, Quote{Name: c.Name, Page: p.File, Line: p.Line})
			}
		}
	}
	sort.SliceStable(out, func(i, j int) bool {
		if out[i].Page != out[j].Page {
			return out[i].Page < out[j].Page
		}
		return out[i].Line < out[j].Line
	})
	return out
}

func byID(f *results.File) map[string]results.Block {
	m := map[string]results.Block{}
	for _, b := range f.Blocks {
		m[b.ID] = b
	}
	return m
}

func sameInputs(a, b results.Block) bool {
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

func compareBlock(a, b results.Block, d *Diff) (BlockDiff, bool) {
	bd := BlockDiff{BlockBrief: briefOf(b)}
	for _, name := range unionKeys(a.Inputs, b.Inputs) {
		x, inA := a.Inputs[name]
		y, inB := b.Inputs[name]
		if inA && inB && x.Text == y.Text && x.Value == y.Value {
			continue
		}
		bd.Inputs = append(bd.Inputs, ValueChange{Name: name, Before: textOr(x.Text, inA), After: textOr(y.Text, inB),
			BeforeValue: valueOr(x.Value, inA), AfterValue: valueOr(y.Value, inB)})
	}
	for _, name := range unionKeys(a.Results, b.Results) {
		x, inA := a.Results[name]
		y, inB := b.Results[name]
		if inA && inB && sameNumber(x.Value, y.Value) {
			continue
		}
		vc := ValueChange{Name: name, Before: textOr(x.Display, inA), After: textOr(y.Display, inB),
			BeforeValue: valueOr(x.Value, inA), AfterValue: valueOr(y.Value, inB)}
		if inA && inB {
			vc.Change = relativeChange(x, y)
			vc.Unit = y.Unit
			vc.Absolute = x.Unit == y.Unit && absoluteScale(y.Unit) != ""
		}
		bd.Results = append(bd.Results, vc)
	}
	oldClaims := map[string]results.Claim{}
	for _, c := range a.Expect {
		oldClaims[c.Name] = c
	}
	newClaims := map[string]bool{}
	for _, c := range b.Expect {
		newClaims[c.Name] = true
		was, existed := oldClaims[c.Name]
		cc := ClaimChange{Name: c.Name, Claim: c.Claim, OK: c.OK, After: c.Message}
		if existed && was.Claim != c.Claim {
			cc.Before, cc.BeforeOK = was.Claim, &was.OK
			cc.Rewrite = rewrite(was.Claim, c.Claim, c.Name, b.Results[c.Name].Unit)
		}
		switch {
		case !existed:
			cc.Status = "added"
			if !c.OK {
				d.NewlyFailing++
			}
		case was.OK && !c.OK:
			cc.Status = "newly fails"
			d.NewlyFailing++
		case !was.OK && c.OK:
			cc.Status = "newly holds"
		case cc.Before != "":
			cc.Status = cc.Rewrite
		default:
			continue
		}
		bd.Claims = append(bd.Claims, cc)
	}
	for _, c := range a.Expect {
		if !newClaims[c.Name] {
			bd.Claims = append(bd.Claims, ClaimChange{Name: c.Name, Claim: c.Claim, Status: "removed", OK: c.OK, After: c.Message})
		}
	}
	key := func(c results.Caution) string { return c.Level + "\x00" + c.Rule }
	had, has := map[string]results.Caution{}, map[string]bool{}
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
func relativeChange(x, y results.Result) *float64 {
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

func valueOr(v float64, present bool) *float64 {
	if !present {
		return nil
	}
	return &v
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
