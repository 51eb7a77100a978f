package site

import (
	"path"
	"strings"
	"sync"
)

// outputNames holds the output paths taken so far and who took them.
// Paths are compared without case, as on the file systems of many web
// hosts, and a file may not have the path of another's folder (static/
// index.html/x beside the home page index.html).
type outputNames struct {
	mu    sync.Mutex
	files map[string]taken // lower-case path → its file
	dirs  map[string]taken // lower-case folder → a file in it
}

type taken struct{ name, owner string }

func newOutputNames() *outputNames {
	return &outputNames{files: map[string]taken{}, dirs: map[string]taken{}}
}

// take claims name for owner. When it is taken it returns why: the other
// owner, and how the names clash.
func (o *outputNames) take(name, owner string) (string, bool) {
	o.mu.Lock()
	defer o.mu.Unlock()
	key := strings.ToLower(name)
	clash := func(t taken) (string, bool) {
		switch {
		case t.name == name:
			return t.owner, false
		case strings.EqualFold(t.name, name):
			return t.owner + " (names that differ only in case are one file on many web servers)", false
		}
		return t.owner + " (a file cannot have the name of a folder)", false
	}
	if t, ok := o.files[key]; ok {
		return clash(t)
	}
	if t, ok := o.dirs[key]; ok {
		return clash(t)
	}
	for d := path.Dir(key); d != "."; d = path.Dir(d) {
		if t, ok := o.files[d]; ok {
			return clash(t)
		}
	}
	o.files[key] = taken{name, owner}
	for d := path.Dir(key); d != "."; d = path.Dir(d) {
		if _, ok := o.dirs[d]; !ok {
			o.dirs[d] = taken{name, owner}
		}
	}
	return "", true
}
