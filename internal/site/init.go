package site

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"specgen/templates"
)

// Init writes a new site into dir: specgen.toml, a home page and an
// example page with a compressor block, a claim and a chart. It refuses a
// dir that exists and is not empty.
func Init(dir string) ([]string, error) {
	entries, err := os.ReadDir(dir)
	switch {
	case errors.Is(err, fs.ErrNotExist):
	case err != nil:
		return nil, err
	case len(entries) > 0:
		return nil, &Error{Msg: fmt.Sprintf("%s is not empty; specgen init writes a new site only into an empty or new folder", dir)}
	}
	var written []string
	err = fs.WalkDir(templates.FS, "starter", func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		rel := strings.TrimPrefix(p, "starter/")
		data, err := fs.ReadFile(templates.FS, p)
		if err != nil {
			return err
		}
		target := filepath.Join(dir, filepath.FromSlash(rel))
		if err := os.MkdirAll(filepath.Dir(target), 0o755); err != nil {
			return err
		}
		written = append(written, rel)
		return os.WriteFile(target, data, 0o644)
	})
	return written, err
}
