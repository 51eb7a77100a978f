package site

import (
	"os/exec"
	"path/filepath"
	"strings"
)

// Revision identifies the commit a site was built from, for the revision
// line of data sheets. It comes from git, never from the clock, so two
// builds of one commit are identical.
type Revision struct {
	Commit string // short hash
	Date   string // commit date, YYYY-MM-DD
	// Modified tells that the site's files differ from the commit.
	Modified bool
}

// revisionOf reads the revision of the git repository holding root, or
// nil when root is not in one (or git is not installed).
func revisionOf(root string) *Revision {
	out, err := git(root, "log", "-1", "--format=%h %cs")
	if err != nil {
		return nil
	}
	commit, date, ok := strings.Cut(strings.TrimSpace(out), " ")
	if !ok {
		return nil
	}
	r := &Revision{Commit: commit, Date: date}
	status, err := git(root, "status", "--porcelain", "--", filepath.Join(root, ContentDir), filepath.Join(root, ConfigFile))
	r.Modified = err == nil && strings.TrimSpace(status) != ""
	return r
}

// git runs git in dir and returns its output.
func git(dir string, args ...string) (string, error) {
	cmd := exec.Command("git", append([]string{"-C", dir}, args...)...)
	out, err := cmd.Output()
	return string(out), err
}
