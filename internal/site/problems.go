package site

import (
	"sort"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// Problem is a failed claim or a danger-level caution: something that
// makes check and build -strict exit 1.
type Problem struct {
	File    string `json:"file"`
	Line    int    `json:"line"`
	Block   string `json:"block"`
	Type    string `json:"type"` // "claim" or "caution"
	Name    string `json:"name"` // the result claimed, or the caution rule
	Level   string `json:"level,omitempty"`
	Message string `json:"message"`
}

// Problems lists the site's failed claims and DANGER cautions by place.
func (s *Site) Problems() []Problem {
	var out []Problem
	if s.Calc == nil {
		return out
	}
	for _, e := range s.Calc.Blocks {
		for _, c := range e.Claims {
			if !c.OK {
				out = append(out, Problem{File: e.Block.File, Line: c.Claim.Line, Block: e.Block.ID, Type: "claim", Name: c.Claim.Result, Message: c.Message})
			}
		}
		for _, c := range e.Cautions {
			if c.Level >= calc.Danger && c.Acknowledged == "" {
				out = append(out, Problem{File: e.Block.File, Line: e.Block.Line, Block: e.Block.ID, Type: "caution", Name: c.Rule, Level: c.Level.String(), Message: c.Message})
			}
		}
	}
	sort.SliceStable(out, func(i, j int) bool {
		if out[i].File != out[j].File {
			return out[i].File < out[j].File
		}
		return out[i].Line < out[j].Line
	})
	return out
}

// Notices lists the cautions that do not fail a check (below DANGER, or
// acknowledged), by place, for the reader of check's report.
func (s *Site) Notices() []Problem {
	var out []Problem
	if s.Calc == nil {
		return out
	}
	for _, e := range s.Calc.Blocks {
		for _, c := range e.Cautions {
			if c.Level < calc.Danger || c.Acknowledged != "" {
				msg := c.Message
				if c.Acknowledged != "" {
					msg += " (acknowledged: " + c.Acknowledged + ")"
				}
				out = append(out, Problem{File: e.Block.File, Line: e.Block.Line, Block: e.Block.ID, Type: "caution", Name: c.Rule, Level: c.Level.String(), Message: msg})
			}
		}
	}
	sort.SliceStable(out, func(i, j int) bool {
		if out[i].File != out[j].File {
			return out[i].File < out[j].File
		}
		return out[i].Line < out[j].Line
	})
	return out
}

// Tally counts what a check looked at.
type Tally struct {
	Pages        int `json:"pages"`
	Blocks       int `json:"blocks"`
	Claims       int `json:"claims"`
	FailedClaims int `json:"failed_claims"`
	Cautions     int `json:"cautions"`
	Dangers      int `json:"dangers"` // not acknowledged
}

// Tally counts the site's blocks, claims and cautions.
func (s *Site) Tally() Tally {
	t := Tally{Pages: len(s.Pages)}
	if s.Calc == nil {
		return t
	}
	for _, e := range s.Calc.Blocks {
		t.Blocks++
		t.Claims += len(e.Claims)
		for _, c := range e.Claims {
			if !c.OK {
				t.FailedClaims++
			}
		}
		t.Cautions += len(e.Cautions)
		for _, c := range e.Cautions {
			if c.Level >= calc.Danger && c.Acknowledged == "" {
				t.Dangers++
			}
		}
	}
	return t
}
