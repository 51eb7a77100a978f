package calc

import (
	"errors"
	"slices"
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/inputerr"
	"github.com/millrace-workshop/specgen/internal/units"
)

// listCatalog has a kind whose temperature input takes one value or a
// list (its sum is the result), and a kind that links to it and reports
// what the linked block's own links were.
func listCatalog(t *testing.T) *Catalog {
	t.Helper()
	sum := &Kind{Name: "test-sum",
		Inputs: []InputSpec{
			{Name: "t", Dim: units.Temperature, List: true, Range: Between(150, 1000)},
			{Name: "of", Type: LinkList, Optional: true},
		},
		Results: []ResultSpec{{Name: "total", Dim: units.TemperatureDifference}, {Name: "count", Dim: units.Dimensionless}},
		Evaluate: func(in *Inputs) (*Outcome, error) {
			total := 0.0
			for _, v := range in.ValuesOf("t") {
				total += v
			}
			return &Outcome{Results: []Result{
				{Name: "total", Value: total, Dim: units.TemperatureDifference},
				{Name: "count", Value: float64(len(in.ValuesOf("t"))), Dim: units.Dimensionless},
			}}, nil
		}}
	reach := &Kind{Name: "test-reach",
		Inputs:  []InputSpec{{Name: "via", Type: Link}},
		Results: []ResultSpec{{Name: "reached", Dim: units.Dimensionless}},
		Evaluate: func(in *Inputs) (*Outcome, error) {
			n := 0
			for _, l := range in.LinkOf("via").Model.LinksOf("of") {
				n += len(l.ID)
			}
			return &Outcome{Results: []Result{{Name: "reached", Value: float64(n), Dim: units.Dimensionless}}}, nil
		}}
	cat, err := NewCatalog([]*Kind{sum, reach}, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	return cat
}

func evaluateSrcs(t *testing.T, cat *Catalog, srcs ...string) (*Set, error) {
	t.Helper()
	var blocks []*Block
	for i, src := range srcs {
		b, err := cat.ParseBlock("content/index.md", 10*i, src)
		if err != nil {
			return nil, err
		}
		blocks = append(blocks, b)
	}
	return cat.Evaluate(blocks, Options{})
}

// TestListInput checks that a List input takes one value or a list, each
// parsed and range-checked, and that the model sees them in order.
func TestListInput(t *testing.T) {
	cat := listCatalog(t)
	for _, c := range []struct {
		src          string
		total, count float64
	}{
		{`t = "20 degC"`, 293.15, 1},
		{`t = ["20 degC", "300 K", "80.33 degF"]`, 293.15 + 300 + 300, 3},
	} {
		set, err := evaluateSrcs(t, cat, "id = \"a\"\nkind = \"test-sum\"\n"+c.src+"\n")
		if err != nil {
			t.Fatalf("%s: %v", c.src, err)
		}
		e, _ := set.Lookup("a")
		total, _ := e.Result("total")
		count, _ := e.Result("count")
		// 80.33 °F is 300.0 K to 1e-4 K (NIST SP 811: K = (°F + 459.67)/1.8).
		if count.Value != c.count || total.Value < c.total-1e-3 || total.Value > c.total+1e-3 {
			t.Errorf("%s: %d values summing to %g K, want %g values summing to %g K", c.src, int(count.Value), total.Value, c.count, c.total)
		}
	}
	for _, c := range []struct{ src, want string }{
		{`t = []`, "t: an empty list"},
		{`t = ["20 degC", "=a.total"]`, "a reference stands alone"},
		{`t = ["20 degC", 30]`, "30 has no unit"},
		{`t = ["20 degC", true]`, "true in the list is not a quantity"},
		{`t = ["20 degC", "2000 degC"]`, `"2000 degC" is out of range`},
		{`t = ["20 degC", "20 mm"]`, "t:"},
	} {
		_, err := evaluateSrcs(t, cat, "id = \"a\"\nkind = \"test-sum\"\n"+c.src+"\n")
		var list inputerr.List
		if !errors.As(err, &list) || len(list) != 1 || list[0].Line != 3 || !strings.Contains(list[0].Error(), c.want) {
			t.Errorf("%s: got %v, want one error on line 3 saying %q", c.src, err, c.want)
		}
	}
}

// TestLinkedModel checks that a block sees, through a block it links to,
// what that block's model saw: here, the blocks it links to.
func TestLinkedModel(t *testing.T) {
	set, err := evaluateSrcs(t, listCatalog(t),
		"id = \"x1\"\nkind = \"test-sum\"\nt = \"300 K\"\n",
		"id = \"yy2\"\nkind = \"test-sum\"\nt = \"300 K\"\n",
		"id = \"m\"\nkind = \"test-sum\"\nt = \"300 K\"\nof = [\"x1\", \"yy2\"]\n",
		"id = \"r\"\nkind = \"test-reach\"\nvia = \"m\"\n")
	if err != nil {
		t.Fatal(err)
	}
	e, _ := set.Lookup("r")
	if r, _ := e.Result("reached"); r.Value != float64(len("x1")+len("yy2")) {
		t.Errorf("reached %g ids' letters through m, want 5", r.Value)
	}
	m, _ := set.Lookup("m")
	if !slices.Equal(m.Inputs[1].Links, []string{"x1", "yy2"}) {
		t.Errorf("m links %v", m.Inputs[1].Links)
	}
}
