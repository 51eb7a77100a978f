package site

import (
	"archive/tar"
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"reflect"
	"strings"
)

// ResultsAt evaluates the site at root as it was at a git revision, in a
// temporary copy taken with git archive: the user's tree and index are
// never touched.
func ResultsAt(root, rev string) (*ResultsFile, error) {
	if err := CheckRoot(root); err != nil {
		return nil, err
	}
	abs, err := filepath.Abs(root)
	if err != nil {
		return nil, err
	}
	if _, err := exec.LookPath("git"); err != nil {
		return nil, &Error{Msg: "git is not installed (or not on PATH), so revisions cannot be compared; install git, or give two results.json files instead"}
	}
	top, err := git(abs, "rev-parse", "--show-toplevel")
	if err != nil {
		return nil, &Error{Msg: fmt.Sprintf("%s is not in a git repository, so revisions cannot be compared; give two results.json files instead", root)}
	}
	top = strings.TrimSpace(top)
	if _, err := git(abs, "rev-parse", "--verify", "--quiet", rev+"^{commit}"); err != nil {
		return nil, &Error{Msg: fmt.Sprintf("%q is not a revision of this repository (a commit, branch or tag, e.g. HEAD~1 or main)", rev)}
	}
	rel, err := filepath.Rel(realPath(top), realPath(abs))
	if err != nil {
		return nil, err
	}
	tmp, err := os.MkdirTemp("", "specgen-rev-")
	if err != nil {
		return nil, err
	}
	defer os.RemoveAll(tmp)
	cmd := exec.Command("git", "-C", top, "archive", "--format=tar", rev)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.StdoutPipe()
	if err != nil {
		return nil, err
	}
	if err := cmd.Start(); err != nil {
		return nil, err
	}
	untarErr := untar(out, tmp)
	if err := cmd.Wait(); err != nil {
		return nil, fmt.Errorf("git archive %s: %v: %s", rev, err, strings.TrimSpace(stderr.String()))
	}
	if untarErr != nil {
		return nil, untarErr
	}
	// A revision from before the site existed has no blocks, so a pull
	// request that adds the documentation shows every block as added.
	if info, err := os.Stat(filepath.Join(tmp, rel, ContentDir)); err != nil || !info.IsDir() {
		return &ResultsFile{Version: ResultsVersion, NoSite: true}, nil
	}
	s, err := Load(filepath.Join(tmp, rel))
	if err != nil {
		var list ErrorList
		if errors.As(err, &list) || IsInputError(err) {
			return nil, &Error{Msg: fmt.Sprintf("the site at %s does not build:\n%v", rev, err)}
		}
		return nil, err
	}
	f := s.Results()
	return &f, nil
}

// IsRevision reports whether rev names a commit of the repository that
// holds root.
func IsRevision(root, rev string) bool {
	_, err := git(root, "rev-parse", "--verify", "--quiet", rev+"^{commit}")
	return err == nil
}

// ResultsOf evaluates the site at root as it is on disk.
func ResultsOf(root string) (*ResultsFile, error) {
	s, err := Load(root)
	if err != nil {
		return nil, err
	}
	f := s.Results()
	return &f, nil
}

func git(dir string, args ...string) (string, error) {
	cmd := exec.Command("git", append([]string{"-C", dir}, args...)...)
	out, err := cmd.Output()
	return string(out), err
}

// untar writes a tar stream's regular files and folders under dir,
// refusing names that would leave it.
func untar(r io.Reader, dir string) error {
	tr := tar.NewReader(r)
	for {
		h, err := tr.Next()
		if err == io.EOF {
			return nil
		}
		if err != nil {
			return err
		}
		name := filepath.Clean(filepath.FromSlash(h.Name))
		if filepath.IsAbs(name) || name == ".." || strings.HasPrefix(name, ".."+string(filepath.Separator)) {
			return fmt.Errorf("git archive: unsafe path %q", h.Name)
		}
		target := filepath.Join(dir, name)
		switch h.Typeflag {
		case tar.TypeDir:
			if err := os.MkdirAll(target, 0o755); err != nil {
				return err
			}
		case tar.TypeReg:
			if err := os.MkdirAll(filepath.Dir(target), 0o755); err != nil {
				return err
			}
			f, err := os.OpenFile(target, os.O_CREATE|os.O_WRONLY|os.O_TRUNC, 0o644)
			if err != nil {
				return err
			}
			_, err = io.Copy(f, tr)
			if cerr := f.Close(); err == nil {
				err = cerr
			}
			if err != nil {
				return err
			}
		}
	}
}

// ReadResults reads a results.json file.
func ReadResults(path string) (*ResultsFile, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, &Error{Msg: fmt.Sprintf("%s: %v", path, err)}
	}
	var f ResultsFile
	if err := jsonUnmarshalStrict(b, &f); err != nil {
		return nil, &Error{File: path, Msg: "not a specgen results.json: " + jsonProblem(err)}
	}
	if f.Version == 0 {
		return nil, &Error{File: path, Msg: "not a specgen results.json: it has no version; specgen build writes one as dist/results.json"}
	}
	if f.Version != ResultsVersion {
		return nil, &Error{File: path, Msg: fmt.Sprintf("results.json version %d; this specgen reads version %d", f.Version, ResultsVersion)}
	}
	for i, blk := range f.Blocks {
		if blk.ID == "" {
			return nil, &Error{File: path, Msg: fmt.Sprintf("not a specgen results.json: block %d of its list has no id", i+1)}
		}
	}
	return &f, nil
}

// jsonProblem says what is wrong with a JSON file without Go's type names.
func jsonProblem(err error) string {
	var te *json.UnmarshalTypeError
	var se *json.SyntaxError
	switch {
	case errors.As(err, &te) && te.Field == "":
		return "the file holds a JSON " + te.Value + "; results.json holds an object, {\"version\": 1, \"blocks\": [...]}"
	case errors.As(err, &te):
		return fmt.Sprintf("%s: a JSON %s where %s belongs", te.Field, te.Value, jsonKindWord(te.Type.Kind()))
	case errors.As(err, &se):
		return fmt.Sprintf("%s (at byte %d)", strings.TrimPrefix(se.Error(), "json: "), se.Offset)
	case errors.Is(err, io.EOF):
		return "the file is empty"
	case errors.Is(err, io.ErrUnexpectedEOF):
		return "the file ends in the middle of its JSON (cut short?)"
	}
	return strings.TrimPrefix(err.Error(), "json: ")
}

// jsonKindWord names what a Go kind reads from JSON.
func jsonKindWord(k reflect.Kind) string {
	switch k {
	case reflect.String:
		return "a string"
	case reflect.Float32, reflect.Float64:
		return "a number"
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64,
		reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64:
		return "a whole number"
	case reflect.Bool:
		return "true or false"
	case reflect.Slice, reflect.Array:
		return "an array"
	}
	return "an object"
}
