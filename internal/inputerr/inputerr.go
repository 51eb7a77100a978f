// Package inputerr is the error a user's input causes: a place in a file
// (the file, the line, the key) and what is wrong there and what is
// allowed. Every package that reads what users write reports with it, and
// the command line exits 2 for it; any other error is the machine's.
package inputerr

import (
	"errors"
	"fmt"
	"sort"
	"strings"
)

// Error is a problem with the user's input at a place in a file: a
// calculation block's key, a page, the site configuration.
type Error struct {
	File string // relative to the site root, slash-separated
	Line int    // 1-based; 0 when the whole file is meant
	Key  string // the key to blame, "" for none
	Msg  string
}

func (e *Error) Error() string {
	msg := e.Msg
	if e.Key != "" {
		msg = e.Key + ": " + msg
	}
	switch {
	case e.File == "" && e.Line > 0:
		return fmt.Sprintf("line %d: %s", e.Line, msg)
	case e.File == "":
		return msg
	case e.Line > 0:
		return fmt.Sprintf("%s:%d: %s", e.File, e.Line, msg)
	}
	return e.File + ": " + msg
}

// List is every input problem found in one pass, sorted by place.
type List []*Error

func (l List) Error() string {
	msgs := make([]string, len(l))
	for i, e := range l {
		msgs[i] = e.Error()
	}
	return strings.Join(msgs, "\n")
}

// Sorted sorts the list by file and line and returns it, or nil when it
// is empty.
func (l List) Sorted() error {
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

// Capped keeps the first n problems, by place, and replaces the rest with
// one that counts them ("in this block", "in this site": where names the
// scope).
func (l List) Capped(n int, where string) List {
	if len(l) <= n {
		return l
	}
	_ = l.Sorted()
	rest := len(l) - n
	last := l[n-1]
	return append(l[:n:n], &Error{File: last.File, Line: last.Line, Msg: fmt.Sprintf("... and %d more problems %s, not shown", rest, where)})
}

// Join lists the input problems of errs, nil ones left out, sorted by
// place; nil when there are none.
func Join(errs ...error) error {
	var all List
	for _, err := range errs {
		if err != nil {
			all = append(all, From(err)...)
		}
	}
	return all.Sorted()
}

// Is reports whether err is a problem with the user's input (exit status 2)
// rather than a failure of the machine (disk, permissions).
func Is(err error) bool {
	var e *Error
	var l List
	return errors.As(err, &e) || errors.As(err, &l)
}

// From lists the input problems err holds; any other error becomes one
// problem with no place.
func From(err error) List {
	var list List
	if errors.As(err, &list) {
		return list
	}
	var one *Error
	if errors.As(err, &one) {
		return List{one}
	}
	return List{{Msg: err.Error()}}
}
