package site

import (
	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/results"
)

// Results returns the contents of results.json.
func (s *Site) Results() results.File {
	return results.Of(s.blocks())
}

// blocks is every evaluated block of the site, sorted by id.
func (s *Site) blocks() []*calc.Evaluated {
	if s.Calc == nil {
		return nil
	}
	return s.Calc.Blocks
}
