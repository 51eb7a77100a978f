// Package site builds a specgen site: it walks content/, reads the site
// configuration, evaluates calculation blocks, lays pages out with the
// templates and writes the output folder.
package site

import (
	"errors"
	"fmt"
	"sort"
	"strings"
)

// Error is a problem with the user's input at a place in a file.
type Error struct {
	File string // relative to the site root, slash-separated
	Line int    // 1-based; 0 when the whole file is meant
	Msg  string
}

func (e *Error) Error() string {
	if e.Line > 0 {
		return fmt.Sprintf("%s:%d: %s", e.File, e.Line, e.Msg)
	}
	if e.File != "" {
		return e.File + ": " + e.Msg
	}
	return e.Msg
}

// ErrorList is every input problem found in one pass, sorted by place.
type ErrorList []*Error

func (l ErrorList) Error() string {
	msgs := make([]string, len(l))
	for i, e := range l {
		msgs[i] = e.Error()
	}
	return strings.Join(msgs, "\n")
}

// sorted returns the list ordered by file and line, or nil when empty.
func (l ErrorList) sorted() error {
	if len(l) == 0 {
		return nil
	}
	sort.SliceStable(l, func(i, j int) bool {
		if l[i].File != l[j].File {
			return l[i].File < l[j].File
		}
		return l[i].Line < l[j].Line
	})
	return l
}

// IsInputError reports whether err is a problem with the user's input (exit
// status 2) rather than a failure of the machine (disk, permissions).
func IsInputError(err error) bool {
	var e *Error
	var l ErrorList
	return errors.As(err, &e) || errors.As(err, &l)
}
