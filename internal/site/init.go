package site

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"github.com/millrace-workshop/specgen/internal/inputerr"
	"github.com/millrace-workshop/specgen/templates"
)

// Init writes a new site into dir: specgen.toml, a home page and an
// example page with a compressor block, a claim and a chart, and a
// .gitignore for the output and cache folders. It refuses a dir that
// exists and is not empty.
func Init(dir string) ([]string, error) {
	if dir == "" {
		// ReadDir("") fails as "not exist", and the files would land in
		// the current folder, over whatever is there.
		return nil, &inputerr.Error{Msg: "specgen init: the folder name is empty; give the folder for the new site, e.g. specgen init docs"}
	}
	if info, err := os.Stat(dir); err == nil && !info.IsDir() {
		return nil, &inputerr.Error{Msg: fmt.Sprintf("%s is a file; specgen init writes a new site into an empty or new folder", dir)}
	}
	entries, err := os.ReadDir(dir)
	switch {
	case errors.Is(err, fs.ErrNotExist):
	case err != nil:
		return nil, err
	case len(entries) > 0:
		return nil, &inputerr.Error{Msg: fmt.Sprintf("%s is not empty; specgen init writes a new site only into an empty or new folder", dir)}
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
		written = append(written, rel)
		return writeNew(filepath.Join(dir, filepath.FromSlash(rel)), data)
	})
	if err != nil {
		return written, err
	}
	written = append(written, ".gitignore")
	return written, writeNew(filepath.Join(dir, ".gitignore"), []byte(starterGitignore))
}

// starterGitignore keeps what a build writes out of the site's repository.
const starterGitignore = "# Written by specgen build: the site, and what an unchanged rebuild skips.\n" +
	"/" + DefaultOut + "/\n" +
	"/" + CacheDir + "/\n"

// writeNew writes a file that must not exist yet, and its folder.
func writeNew(target string, data []byte) error {
	if err := os.MkdirAll(filepath.Dir(target), 0o755); err != nil {
		return err
	}
	// O_EXCL: never write over a file, even one that appeared since the
	// folder was found empty.
	f, err := os.OpenFile(target, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
	if err != nil {
		return err
	}
	_, err = f.Write(data)
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	return err
}
