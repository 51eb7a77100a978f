package site

import (
	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/results"
)

// Results returns the contents of results.json, with the places that
// quote each value and the commit the site was read from.
func (s *Site) Results() results.File {
	f := results.Of(s.blocks())
	f.Quotes = map[string][]results.Place{}
	for _, p := range s.Pages {
		for _, ref := range p.refs {
			if ref.Problem == "" {
				key := ref.Block + "." + ref.Result
				f.Quotes[key] = append(f.Quotes[key], results.Place{File: p.File, Line: ref.Line})
			}
		}
	}
	if r := s.revision; r != nil {
		f.Commit = r.Commit
		if r.Modified {
			f.Commit += " with uncommitted changes"
		}
	}
	return f
}

// blocks is every evaluated block of the site, sorted by id.
func (s *Site) blocks() []*calc.Evaluated {
	if s.Calc == nil {
		return nil
	}
	return s.Calc.Blocks
}
