package site

import (
	"os"
	"path/filepath"
	"testing"
)

// TestSafetyFactorPrecedence checks that a material-class minimum given
// beside the general one wins, whatever the order of the keys, and that
// the buckling minimum is set only by its own key.
func TestSafetyFactorPrecedence(t *testing.T) {
	for _, c := range []struct {
		name, toml               string
		metal, brittle, buckling float64
	}{
		{"defaults", "", 2.5, 4, 3},
		{"general only", "minimum_factor = 5\n", 5, 5, 3},
		{"general then metal", "minimum_factor = 3\nminimum_factor_metal = 2\n", 2, 3, 3},
		{"plastic then general", "minimum_factor_plastic = 6\nminimum_factor = 3\n", 3, 6, 3},
		{"buckling", "minimum_factor_buckling = 4.5\n", 2.5, 4, 4.5},
	} {
		t.Run(c.name, func(t *testing.T) {
			root := t.TempDir()
			src := "title = \"T\"\n[safety]\n" + c.toml
			if err := os.WriteFile(filepath.Join(root, ConfigFile), []byte(src), 0o644); err != nil {
				t.Fatal(err)
			}
			cfg, err := LoadConfig(root)
			if err != nil {
				t.Fatal(err)
			}
			got := cfg.env.Safety
			if got.MinimumFactorMetal != c.metal || got.MinimumFactorBrittle != c.brittle || got.MinimumFactorBuckling != c.buckling {
				t.Errorf("metal %g, brittle %g, buckling %g; want %g, %g, %g", got.MinimumFactorMetal, got.MinimumFactorBrittle,
					got.MinimumFactorBuckling, c.metal, c.brittle, c.buckling)
			}
		})
	}
}
