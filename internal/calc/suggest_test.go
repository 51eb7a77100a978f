package calc

import "testing"

func TestSuggest(t *testing.T) {
	candidates := []string{"aluminium-6061-t6", "inlet_pressure", "inlet_temperature", "stainless-304", "stroke"}
	for _, c := range []struct{ s, want string }{
		{"stainles-304", "stainless-304"}, // a typo: edit distance 1
		{"strok", "stroke"},
		{"aluminium", "aluminium-6061-t6"}, // the only name that starts so
		{"stainless", "stainless-304"},
		{"inlet", ""},    // two names start so: no guess
		{"al", ""},       // too short to guess from
		{"titanium", ""}, // nothing near
	} {
		if got := Suggest(c.s, candidates); got != c.want {
			t.Errorf("Suggest(%q) = %q, want %q", c.s, got, c.want)
		}
	}
}
