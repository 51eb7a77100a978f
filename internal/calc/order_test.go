package calc

import (
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/units"
)

// driveAndLoad is a catalog of two test kinds that refer to each other as
// a belt drive and the machine it drives do: the load quotes the drive's
// speed, which the drive gives without its links, and the drive reads the
// load's power. honest=false makes the drive's speed depend on its link.
func driveAndLoad(t *testing.T, honest bool) *Catalog {
	t.Helper()
	driver := &Kind{Name: "test-driver",
		Inputs: []InputSpec{
			{Name: "motor_speed", Dim: units.RotationalSpeed, Range: Positive, Meaning: "m"},
			{Name: "load", Type: Link, LinkRoles: Crank, Meaning: "m"},
		},
		Results: []ResultSpec{
			{Name: "crank_speed", Dim: units.RotationalSpeed, Unit: "rpm", Meaning: "m", WithoutLinks: true},
			{Name: "load_power", Dim: units.Power, Unit: "W", Meaning: "m"},
			{Name: "loaded_speed", Dim: units.RotationalSpeed, Unit: "rpm", Meaning: "m"},
		},
		Evaluate: func(in *Inputs) (*Outcome, error) {
			speed := in.Value("motor_speed") / 2
			out := &Outcome{}
			if in.LinksWithheld() {
				return &Outcome{Results: []Result{{Name: "crank_speed", Value: speed, Dim: units.RotationalSpeed}}}, nil
			}
			power := in.LinkOf("load").Results["power"]
			if !honest {
				speed += power
			}
			out.Results = []Result{{Name: "crank_speed", Value: speed, Dim: units.RotationalSpeed},
				{Name: "load_power", Value: power, Dim: units.Power},
				{Name: "loaded_speed", Value: speed * (1 - power/1e4), Dim: units.RotationalSpeed}}
			return out, nil
		}}
	load := &Kind{Name: "test-load", Roles: Crank,
		Inputs:  []InputSpec{{Name: "speed", Dim: units.RotationalSpeed, Range: Positive, Meaning: "m"}},
		Results: []ResultSpec{{Name: "power", Dim: units.Power, Unit: "W", Meaning: "m"}},
		Evaluate: func(in *Inputs) (*Outcome, error) {
			// 3 W for every rad/s.
			return &Outcome{Results: []Result{{Name: "power", Value: 3 * in.Value("speed"), Dim: units.Power}}}, nil
		}}
	cat, err := NewCatalog([]*Kind{driver, load}, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	return cat
}

func evaluateSources(t *testing.T, cat *Catalog, srcs ...string) (*Set, error) {
	t.Helper()
	return cat.Evaluate(parseSources(t, cat, srcs...), Options{})
}

// parseSources parses block sources as blocks of one page, 20 lines apart.
func parseSources(t *testing.T, cat *Catalog, srcs ...string) []*Block {
	t.Helper()
	var blocks []*Block
	for i, src := range srcs {
		b, err := cat.ParseBlock("content/index.md", 1+20*i, src)
		if err != nil {
			t.Fatal(err)
		}
		blocks = append(blocks, b)
	}
	return blocks
}

const (
	driverSource = "id = \"belt\"\nkind = \"test-driver\"\nmotor_speed = \"40 rad/s\"\nload = \"pump\"\n"
	loadSource   = "id = \"pump\"\nkind = \"test-load\"\nspeed = \"=belt.crank_speed\"\n"
)

// TestQuoteOfResultWithoutLinks checks that two blocks may refer to each
// other when what one quotes does not depend on the other: the drive's
// speed (40/2 = 20 rad/s) reaches the load, whose power (3 × 20 = 60 W)
// reaches the drive.
func TestQuoteOfResultWithoutLinks(t *testing.T) {
	set, err := evaluateSources(t, driveAndLoad(t, true), driverSource, loadSource)
	if err != nil {
		t.Fatal(err)
	}
	belt, _ := set.Lookup("belt")
	pump, _ := set.Lookup("pump")
	if r, _ := pump.Result("power"); r.Value != 60 {
		t.Errorf("pump power = %g W, want 60", r.Value)
	}
	if r, _ := belt.Result("load_power"); r.Value != 60 {
		t.Errorf("belt load_power = %g W, want 60", r.Value)
	}
}

// TestResultWithoutLinksMustNotDependOnThem checks that a kind whose result
// marked WithoutLinks does change with its links is caught, not quoted
// with one value and shown with another.
func TestResultWithoutLinksMustNotDependOnThem(t *testing.T) {
	_, err := evaluateSources(t, driveAndLoad(t, false), driverSource, loadSource)
	if err == nil || !strings.Contains(err.Error(), "must not depend on them") {
		t.Errorf("got %v", err)
	}
}

// TestCircleThroughLinkedResult checks that quoting a result that does
// depend on the links still closes a circle, reported as one.
func TestCircleThroughLinkedResult(t *testing.T) {
	src := strings.Replace(loadSource, "=belt.crank_speed", "=belt.loaded_speed", 1)
	cat := driveAndLoad(t, true)
	b1, _ := cat.ParseBlock("content/index.md", 1, driverSource)
	b2, err := cat.ParseBlock("content/index.md", 21, src)
	if err != nil {
		t.Fatal(err)
	}
	_, err = cat.Evaluate([]*Block{b1, b2}, Options{})
	if err == nil || !strings.Contains(err.Error(), "references go round in a circle: belt → pump → belt") {
		t.Errorf("got %v", err)
	}
}
