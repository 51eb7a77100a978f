package calc

import (
	"errors"
	"path/filepath"
	"strings"
	"testing"

	"github.com/BurntSushi/toml"

	"github.com/millrace-workshop/specgen/internal/units"
)

// claimRow is one [[case]] of testdata/claims/*.toml: a claim as a page
// writes it, the computed SI value it is checked against and the verdict
// specgen's claim semantics give (see testdata/claims/README.md).
type claimRow struct {
	Claim   string
	Dim     string
	SI      *float64 `toml:"si"`
	Ambient float64
	OK      *bool `toml:"ok"`
	Error   string
	Message string // a substring of the check's message
	Note    string
}

// dimensionNamed returns the dimension whose name is name ("volume flow").
func dimensionNamed(t *testing.T, name string) units.Dimension {
	t.Helper()
	for d := range units.Dimension(100) { // past the last: the names of undeclared ones never match
		if d.String() == name {
			return d
		}
	}
	t.Fatalf("no dimension named %q", name)
	return 0
}

// TestClaimReference parses every claim of testdata/claims and checks it
// against its SI value: the verdict, and for an invalid claim the error.
func TestClaimReference(t *testing.T) {
	paths, err := filepath.Glob(filepath.Join("..", "..", "testdata", "claims", "*.toml"))
	if err != nil || len(paths) == 0 {
		t.Fatalf("no claim cases: %v", err)
	}
	for _, path := range paths {
		var file struct{ Case []claimRow }
		md, err := toml.DecodeFile(path, &file)
		if err != nil {
			t.Fatalf("%s: %v", path, err)
		}
		if extra := md.Undecoded(); len(extra) > 0 {
			t.Fatalf("%s: unknown keys %v", path, extra)
		}
		if len(file.Case) == 0 {
			t.Fatalf("%s: no [[case]]", path)
		}
		for i, row := range file.Case {
			name := filepath.Base(path) + "/" + row.Claim
			dim := dimensionNamed(t, row.Dim)
			c, err := ParseClaim("result", row.Claim, dim)
			ambient := row.Ambient
			if ambient == 0 {
				ambient = DefaultAmbient
			}
			if row.Error != "" {
				// An error row with a value: the claim parses, and is
				// refused against that value (a vacuum claimed unmarked).
				if row.OK != nil {
					t.Fatalf("%s case %d: an error row takes no ok", path, i+1)
				}
				if err == nil && row.SI != nil {
					err = errors.New(c.MarkFor(*row.SI, dim, ambient, false, 3))
				}
				if err == nil || !strings.Contains(err.Error(), row.Error) {
					t.Errorf("%s: error %v, want one containing %q (%s)", name, err, row.Error, row.Note)
				}
				continue
			}
			if row.SI == nil || row.OK == nil {
				t.Fatalf("%s case %d: a row needs si and ok (or error)", path, i+1)
			}
			if err != nil {
				t.Errorf("%s: %v (%s)", name, err, row.Note)
				continue
			}
			if why := c.MarkFor(*row.SI, dim, ambient, false, 3); why != "" {
				t.Errorf("%s: refused (%s), want checked", name, why)
				continue
			}
			r := c.Check(*row.SI, dim, ambient, 3)
			if r.OK != *row.OK {
				t.Errorf("%s against %g SI (ambient %g Pa): ok = %v, want %v (%s); %s",
					name, *row.SI, ambient, r.OK, *row.OK, row.Note, r.Message)
			}
			verdict := "fails"
			if *row.OK {
				verdict = "holds"
			}
			if !strings.Contains(r.Message, verdict) {
				t.Errorf("%s: message %q does not say it %s", name, r.Message, verdict)
			}
			if !strings.Contains(r.Message, row.Message) {
				t.Errorf("%s: message %q lacks %q", name, r.Message, row.Message)
			}
		}
	}
}
