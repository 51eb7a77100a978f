package calcdiff

import (
	"testing"

	"github.com/millrace-workshop/specgen/internal/results"
)

// TestRelativeChangeOverflow checks that a change too large for float64
// (only in hand-edited results files) is left out rather than shown as
// ±Inf, which JSON cannot hold.
func TestRelativeChangeOverflow(t *testing.T) {
	if c := relativeChange(results.Result{Value: -1e-300}, results.Result{Value: 1e308}); c != nil {
		t.Errorf("change %g, want none", *c)
	}
	if c := relativeChange(results.Result{Value: 2}, results.Result{Value: 3}); c == nil || *c != 0.5 {
		t.Errorf("change %v, want 0.5", c)
	}
}

// TestCautionAcknowledgementDiff: acknowledging a caution reads as such,
// not as one caution going and another appearing; withdrawing the
// acknowledgement of a DANGER fails the diff like a new DANGER.
func TestCautionAcknowledgementDiff(t *testing.T) {
	open := results.Caution{Level: "DANGER", Rule: "hot-discharge", Message: "too hot"}
	accepted := open
	accepted.Acknowledged = "bench test behind a shield"
	block := func(c results.Caution) results.Block {
		return results.Block{ID: "c", Kind: "compressor", Cautions: []results.Caution{c}}
	}

	var d Diff
	bd, changed := compareBlock(block(open), block(accepted), &d)
	if !changed || len(bd.Cautions) != 1 || bd.Cautions[0].Status != "acknowledged" || bd.Cautions[0].Message != accepted.Acknowledged || d.Failed() {
		t.Errorf("acknowledging: %+v, failed %v", bd.Cautions, d.Failed())
	}
	d = Diff{}
	bd, _ = compareBlock(block(accepted), block(open), &d)
	if len(bd.Cautions) != 1 || bd.Cautions[0].Status != "no longer acknowledged" || !d.Failed() {
		t.Errorf("withdrawing: %+v, failed %v", bd.Cautions, d.Failed())
	}
}
