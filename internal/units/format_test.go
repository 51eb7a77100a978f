package units

import (
	"path/filepath"
	"testing"

	"github.com/BurntSushi/toml"
)

// decodeCases reads testdata/units/name into v, failing the test on error.
func decodeCases(t testing.TB, name string, v any) {
	t.Helper()
	path := filepath.Join("..", "..", "testdata", "units", name)
	md, err := toml.DecodeFile(path, v)
	if err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	if keys := md.Undecoded(); len(keys) > 0 {
		t.Fatalf("%s: unknown keys %v", path, keys)
	}
}

func TestFormat(t *testing.T) {
	var file struct {
		Case []struct {
			Value float64
			Sig   int
			Want  string
		}
	}
	decodeCases(t, "format.toml", &file)
	if len(file.Case) == 0 {
		t.Fatal("format.toml: no cases")
	}
	for _, c := range file.Case {
		if got := Format(c.Value, c.Sig); got != c.Want {
			t.Errorf("Format(%v, %d) = %q, want %q", c.Value, c.Sig, got, c.Want)
		}
	}
}
