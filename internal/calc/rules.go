package calc

import "sort"

// Rule is one caution rule: it looks at the evaluated blocks of a site and
// raises cautions on some of them.
type Rule struct {
	ID      string
	Level   Level  // the highest level it raises
	Summary string // what it watches, for explain and the docs
	// Supersedes lists rules that say less about the same hazard: on a
	// block this rule raises a caution on, their cautions are dropped.
	Supersedes []string
	// Check raises the rule's cautions. It is nil for a rule that a model
	// raises while it evaluates (the kind lists it in Raises).
	Check func(s *Set) []Raised
}

// Raised is a caution a rule puts on a block.
type Raised struct {
	Block *Evaluated
	Note  CautionNote
}

// applyRules raises every rule's cautions on the set's blocks, drops those
// a rule on the same block supersedes, marks the ones a block acknowledges,
// and sorts each block's cautions by level.
func (c *Catalog) applyRules(s *Set) {
	raised := map[string][]Raised{}
	for _, r := range c.rules {
		if r.Check == nil {
			continue
		}
		raised[r.ID] = r.Check(s)
	}
	// Judged on what each rule raised before any was dropped.
	superseded := map[string]map[*Evaluated]bool{}
	for _, r := range c.rules {
		for _, id := range r.Supersedes {
			if superseded[id] == nil {
				superseded[id] = map[*Evaluated]bool{}
			}
			for _, x := range raised[r.ID] {
				superseded[id][x.Block] = true
			}
		}
	}
	for _, r := range c.rules {
		for _, x := range raised[r.ID] {
			if superseded[r.ID][x.Block] {
				continue
			}
			x.Note.Rule = r.ID
			x.Block.Cautions = append(x.Block.Cautions, x.Note)
		}
	}
	for _, e := range s.Blocks {
		for i := range e.Cautions {
			e.Cautions[i].Acknowledged = e.Block.Acknowledge[e.Cautions[i].Rule]
		}
		sort.SliceStable(e.Cautions, func(i, j int) bool { return e.Cautions[i].Level > e.Cautions[j].Level })
	}
}
