package calc

import "sync"

// setIndex finds a set's blocks by role, by the blocks they link to and by
// file, so that the caution rules and charts, which ask for each block,
// take time in proportion to the site, not its square. It is built on
// first use, once the set is evaluated.
type setIndex struct {
	once     sync.Once
	byRole   map[Role][]*Evaluated // one role each
	linkedBy map[string][]*Evaluated
	byFile   map[string][]*Evaluated
}

func (s *Set) indexed() *setIndex {
	x := &s.index
	x.once.Do(func() {
		x.byRole, x.linkedBy, x.byFile = map[Role][]*Evaluated{}, map[string][]*Evaluated{}, map[string][]*Evaluated{}
		for _, e := range s.Blocks {
			for r := Role(1); r != 0 && r <= e.Block.Kind.Roles; r <<= 1 {
				if e.Block.Kind.Roles&r != 0 {
					x.byRole[r] = append(x.byRole[r], e)
				}
			}
			seen := map[string]bool{}
			for _, in := range e.Inputs {
				for _, id := range in.Links {
					if !seen[id] {
						seen[id] = true
						x.linkedBy[id] = append(x.linkedBy[id], e)
					}
				}
			}
			x.byFile[e.Block.File] = append(x.byFile[e.Block.File], e)
		}
	})
	return x
}

// Having returns the blocks of the set whose kind has every role of r, in
// the set's order.
func (s *Set) Having(r Role) []*Evaluated {
	x := s.indexed()
	if r != 0 && r&(r-1) == 0 {
		return x.byRole[r]
	}
	var out []*Evaluated
	for _, e := range s.Blocks {
		if e.Block.Kind.Has(r) {
			out = append(out, e)
		}
	}
	return out
}

// LinkedFrom returns the blocks of the set whose Link or LinkList inputs
// name block id, in the set's order.
func (s *Set) LinkedFrom(id string) []*Evaluated { return s.indexed().linkedBy[id] }

// InFile returns the blocks of the set on the page file, in the set's
// order.
func (s *Set) InFile(file string) []*Evaluated { return s.indexed().byFile[file] }
