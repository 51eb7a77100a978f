package calcdiff

import (
	"archive/tar"
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strings"

	"github.com/millrace-workshop/specgen/internal/inputerr"
	"github.com/millrace-workshop/specgen/internal/results"
	"github.com/millrace-workshop/specgen/internal/site"
)

// ResultsAt evaluates the site at root as it was at a git revision, in a
// temporary copy taken with git archive: the user's tree and index are
// never touched.
func ResultsAt(root, rev string) (*results.File, error) {
	if err := site.CheckRoot(root); err != nil {
		return nil, err
	}
	abs, err := filepath.Abs(root)
	if err != nil {
		return nil, err
	}
	if _, err := exec.LookPath("git"); err != nil {
		return nil, &inputerr.Error{Msg: "git is not installed (or not on PATH), so revisions cannot be compared; install git, or give two results.json files instead"}
	}
	top, err := git(abs, "rev-parse", "--show-toplevel")
	if err != nil {
		return nil, &inputerr.Error{Msg: fmt.Sprintf("%s is not in a git repository, so revisions cannot be compared; give two results.json files instead", root)}
	}
	top = strings.TrimSpace(top)
	commit, err := git(abs, "rev-parse", "--verify", "--quiet", "--short=12", rev+"^{commit}")
	if err != nil {
		return nil, &inputerr.Error{Msg: fmt.Sprintf("%q is not a revision of this repository (a commit, branch or tag, e.g. HEAD~1 or main)", rev)}
	}
	commit = strings.TrimSpace(commit)
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
	if info, err := os.Stat(filepath.Join(tmp, rel, site.ContentDir)); err != nil || !info.IsDir() {
		return &results.File{Version: results.Version, NoSite: true, Commit: commit}, nil
	}
	s, err := site.Load(filepath.Join(tmp, rel))
	if err != nil {
		var list inputerr.List
		if errors.As(err, &list) || inputerr.Is(err) {
			return nil, &inputerr.Error{Msg: fmt.Sprintf("the site at %s does not build:\n%v", rev, err)}
		}
		return nil, err
	}
	f := s.Results()
	f.Commit = commit
	return &f, nil
}

// IsRevision reports whether rev names a commit of the repository that
// holds root.
func IsRevision(root, rev string) bool {
	_, err := git(root, "rev-parse", "--verify", "--quiet", rev+"^{commit}")
	return err == nil
}

// ResultsOf evaluates the site at root as it is on disk.
func ResultsOf(root string) (*results.File, error) {
	s, err := site.Load(root)
	if err != nil {
		return nil, err
	}
	f := s.Results()
	return &f, nil
}

// realPath resolves symbolic links, so that a repository reached through
// one is related to the folders inside it.
func realPath(p string) string {
	if r, err := filepath.EvalSymlinks(p); err == nil {
		return r
	}
	return p
}

// git runs git in dir and returns its output.
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
