package calc

import (
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

// Errors is every input problem found in one pass, sorted by place.
type Errors []*Error

func (l Errors) Error() string {
	msgs := make([]string, len(l))
	for i, e := range l {
		msgs[i] = e.Error()
	}
	return strings.Join(msgs, "\n")
}

// Sorted sorts the list by file and line and returns it, or nil when it
// is empty.
func (l Errors) Sorted() error {
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

// capped keeps the first n problems, by place, and replaces the rest with
// one that counts them.
func (l Errors) capped(n int) Errors {
	if len(l) <= n {
		return l
	}
	_ = l.Sorted()
	rest := len(l) - n
	last := l[n-1]
	return append(l[:n:n], &Error{File: last.File, Line: last.Line, Msg: fmt.Sprintf("... and %d more problems in this block, not shown", rest)})
}
