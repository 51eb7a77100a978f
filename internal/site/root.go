package site

import (
	"cmp"
	"errors"
	"fmt"
	"io/fs"
	"os"

	"github.com/millrace-workshop/specgen/internal/inputerr"
)

// CheckRoot says plainly when the site root (the -C folder) is missing or
// is a file, before anything looks for files below it and reports a
// confusing path such as "afile/dist: not a directory".
func CheckRoot(root string) error {
	// An empty -C means the current folder, as filepath.Abs takes it.
	info, err := os.Stat(cmp.Or(root, "."))
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return &inputerr.Error{Msg: fmt.Sprintf("site root %s: no such folder; -C names the folder that holds content/", root)}
	case err != nil:
		return &inputerr.Error{Msg: fmt.Sprintf("site root %s: %v", root, errors.Unwrap(err))}
	case !info.IsDir():
		return &inputerr.Error{Msg: fmt.Sprintf("site root %s: is a file, not a folder; -C names the folder that holds content/", root)}
	}
	return nil
}
