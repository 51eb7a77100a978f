package site

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"github.com/millrace-workshop/specgen/internal/inputerr"
)

// readStatic reads every file under static/, keyed by its output path.
// Symbolic links are not followed, so static/ cannot reach outside the site.
func readStatic(root string) (map[string][]byte, error) {
	dir := filepath.Join(root, StaticDir)
	files := map[string][]byte{}
	if _, err := os.Stat(dir); errors.Is(err, fs.ErrNotExist) {
		return files, nil
	}
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		rel, err := filepath.Rel(dir, p)
		if err != nil {
			return err
		}
		rel = filepath.ToSlash(rel)
		name := StaticDir + "/" + rel
		if rel == "." {
			name = StaticDir + "/"
		}
		switch {
		case d.Type()&fs.ModeSymlink != 0:
			return &inputerr.Error{File: name, Msg: "is a symbolic link; static/ holds plain files only, so nothing outside the site root is published by accident"}
		case d.IsDir():
			return nil
		case rel == OutputMarker || strings.HasPrefix(rel, ".specgen"):
			return &inputerr.Error{File: name, Msg: "this name is reserved for specgen's own files"}
		}
		b, err := os.ReadFile(p)
		files[rel] = b
		return err
	})
	return files, err
}
