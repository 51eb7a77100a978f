package calc

import (
	"strings"
	"testing"
)

// TestUndeclaredCautionRefused checks that a model cannot raise a caution
// its kind does not declare: one the rule table, explain and
// [acknowledge] would not know.
func TestUndeclaredCautionRefused(t *testing.T) {
	loud := &Kind{Name: "test-loud", Raises: []string{"declared"},
		Evaluate: func(in *Inputs) (*Outcome, error) {
			return &Outcome{Cautions: []CautionNote{{Level: Notice, Rule: "undeclared", Message: "m"}}}, nil
		}}
	cat, err := NewCatalog([]*Kind{loud}, []Rule{{ID: "declared", Level: Notice, Summary: "s"}}, nil)
	if err != nil {
		t.Fatal(err)
	}
	b, err := cat.ParseBlock("content/index.md", 1, "id = \"x\"\nkind = \"test-loud\"\n")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := cat.Evaluate([]*Block{b}, Options{}); err == nil || !strings.Contains(err.Error(), `"undeclared"`) {
		t.Errorf("an undeclared caution evaluated: %v", err)
	}
	if _, err := NewCatalog([]*Kind{loud}, nil, nil); err == nil {
		t.Error("a kind raising a rule missing from the table was accepted")
	}
}

// TestSupersededCautionDropped checks that a rule's caution on a block is
// dropped where a rule that supersedes it raises one, and kept elsewhere.
func TestSupersededCautionDropped(t *testing.T) {
	quiet := &Kind{Name: "test-quiet", Evaluate: func(in *Inputs) (*Outcome, error) { return &Outcome{}, nil }}
	onBlock := func(id string) func(s *Set) []Raised {
		return func(s *Set) []Raised {
			e, _ := s.Lookup(id)
			return []Raised{{Block: e, Note: CautionNote{Level: Warning, Message: "m"}}}
		}
	}
	everywhere := func(s *Set) []Raised {
		var out []Raised
		for _, e := range s.Blocks {
			out = append(out, Raised{Block: e, Note: CautionNote{Level: Notice, Message: "m"}})
		}
		return out
	}
	cat, err := NewCatalog([]*Kind{quiet}, []Rule{
		{ID: "general", Level: Notice, Summary: "s", Check: everywhere},
		{ID: "specific", Level: Warning, Summary: "s", Check: onBlock("a"), Supersedes: []string{"general"}},
	}, nil)
	if err != nil {
		t.Fatal(err)
	}
	var blocks []*Block
	for _, id := range []string{"a", "b"} {
		b, err := cat.ParseBlock("content/index.md", 1, "id = \""+id+"\"\nkind = \"test-quiet\"\n")
		if err != nil {
			t.Fatal(err)
		}
		blocks = append(blocks, b)
	}
	set, err := cat.Evaluate(blocks, Options{})
	if err != nil {
		t.Fatal(err)
	}
	rules := func(id string) []string {
		e, _ := set.Lookup(id)
		var r []string
		for _, c := range e.Cautions {
			r = append(r, c.Rule)
		}
		return r
	}
	if got := strings.Join(rules("a"), ","); got != "specific" {
		t.Errorf("block a: %s, want specific alone", got)
	}
	if got := strings.Join(rules("b"), ","); got != "general" {
		t.Errorf("block b: %s, want general", got)
	}
	if _, err := NewCatalog(nil, []Rule{{ID: "x", Supersedes: []string{"nothing"}}}, nil); err == nil {
		t.Error("a supersession of an unknown rule was accepted")
	}
}
