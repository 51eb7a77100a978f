package models

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/BurntSushi/toml"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// cautionCase is one file of testdata/cautions: blocks evaluated together
// and the cautions they must, and must not, raise.
type cautionCase struct {
	Note      string `toml:"note"`
	Source    string `toml:"source"`
	Materials string `toml:"materials"` // extra materials, as in specgen.toml
	Block     []struct {
		TOML string `toml:"toml"`
	} `toml:"block"`
	Expect []struct {
		Block, Rule, Level, Message, Acknowledged string
		Result                                    string // the result row the caution marks
	} `toml:"expect"`
	Absent []struct {
		Block, Rule string
	} `toml:"absent"`
}

func TestCautionRules(t *testing.T) {
	files, _ := filepath.Glob(filepath.Join("..", "..", "testdata", "cautions", "*.toml"))
	if len(files) == 0 {
		t.Fatal("no caution cases")
	}
	for _, file := range files {
		t.Run(strings.TrimSuffix(filepath.Base(file), ".toml"), func(t *testing.T) {
			var c cautionCase
			md, err := toml.DecodeFile(file, &c)
			if err != nil {
				t.Fatal(err)
			}
			if u := md.Undecoded(); len(u) > 0 {
				t.Fatalf("unknown keys %v", u)
			}
			if c.Source == "" {
				t.Fatal("a case names its source")
			}
			env := DefaultEnv()
			if c.Materials != "" {
				base, _ := DefaultMaterials()
				mats, err := ParseMaterials(c.Materials, base)
				if err != nil {
					t.Fatal(err)
				}
				env.Materials = mats
			}
			var blocks []*calc.Block
			for i, b := range c.Block {
				blk, err := testCatalog.ParseBlock(file, 10*i, b.TOML)
				if err != nil {
					t.Fatal(err)
				}
				blocks = append(blocks, blk)
			}
			set, err := catalogWith(t, env).Evaluate(blocks, calc.Options{SigFigs: 3})
			if err != nil {
				t.Fatal(err)
			}
			// find returns the block's caution of rule whose message says
			// says, else its first caution of rule: a rule may fire more
			// than once on a block (a relief valve protecting two parts).
			find := func(block, rule, says string) (calc.CautionNote, bool) {
				e, ok := set.Lookup(block)
				if !ok {
					t.Fatalf("no block %q", block)
				}
				var first *calc.CautionNote
				for i, n := range e.Cautions {
					if n.Rule != rule {
						continue
					}
					if strings.Contains(n.Message, says) {
						return n, true
					}
					if first == nil {
						first = &e.Cautions[i]
					}
				}
				if first != nil {
					return *first, true
				}
				return calc.CautionNote{}, false
			}
			for _, x := range c.Expect {
				n, ok := find(x.Block, x.Rule, x.Message)
				switch {
				case !ok:
					e, _ := set.Lookup(x.Block)
					t.Errorf("%s: no %s caution; got %+v", x.Block, x.Rule, e.Cautions)
				case n.Level.String() != x.Level:
					t.Errorf("%s: %s is %s, want %s", x.Block, x.Rule, n.Level, x.Level)
				case !strings.Contains(n.Message, x.Message):
					t.Errorf("%s: %s message %q lacks %q", x.Block, x.Rule, n.Message, x.Message)
				case !strings.Contains(n.Acknowledged, x.Acknowledged) || (x.Acknowledged == "") != (n.Acknowledged == ""):
					t.Errorf("%s: %s acknowledged %q, want %q", x.Block, x.Rule, n.Acknowledged, x.Acknowledged)
				case x.Result != "" && n.Result != x.Result:
					t.Errorf("%s: %s marks result %q, want %q", x.Block, x.Rule, n.Result, x.Result)
				}
			}
			// A caution marks a row the block's table has.
			for _, e := range set.Blocks {
				for _, n := range e.Cautions {
					if _, ok := e.Result(n.Result); n.Result != "" && !ok {
						t.Errorf("%s: %s marks result %q, which the block does not have", e.Block.ID, n.Rule, n.Result)
					}
				}
			}
			for _, x := range c.Absent {
				if n, ok := find(x.Block, x.Rule, ""); ok {
					t.Errorf("%s: unexpected %s %s: %s", x.Block, n.Level, x.Rule, n.Message)
				}
			}
		})
	}
}

// TestEveryRuleIsDocumented keeps explain's list complete.
func TestEveryRuleIsDocumented(t *testing.T) {
	var b strings.Builder
	ExplainCautions(&b, testCatalog)
	for _, r := range rules {
		if !strings.Contains(b.String(), r.ID) || r.Summary == "" {
			t.Errorf("rule %s is not explained", r.ID)
		}
	}
	if _, err := os.Stat(filepath.Join("..", "..", "testdata", "cautions")); err != nil {
		t.Fatal(err)
	}
}
