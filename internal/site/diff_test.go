package site

import "testing"

// TestRelativeChangeOverflow checks that a change too large for float64
// (only in hand-edited results files) is left out rather than shown as
// ±Inf, which JSON cannot hold.
func TestRelativeChangeOverflow(t *testing.T) {
	if c := relativeChange(ResultJSON{Value: -1e-300}, ResultJSON{Value: 1e308}); c != nil {
		t.Errorf("change %g, want none", *c)
	}
	if c := relativeChange(ResultJSON{Value: 2}, ResultJSON{Value: 3}); c == nil || *c != 0.5 {
		t.Errorf("change %v, want 0.5", c)
	}
}
