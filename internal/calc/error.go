package calc

import (
	"fmt"
	"sort"
	"strings"
)

// Error is a problem with a calculation block, at a line of its page.
type Error struct {
	File string
	Line int
	Key  string // the key to blame, "" for the block as a whole
	Msg  string
}

func (e *Error) Error() string {
	place := e.File
	if e.Line > 0 {
		place = fmt.Sprintf("%s:%d", e.File, e.Line)
	}
	if e.Key != "" {
		return place + ": " + e.Key + ": " + e.Msg
	}
	return place + ": " + e.Msg
}

// Errors is every block problem found in one pass, sorted by place.
type Errors []*Error

func (l Errors) Error() string {
	msgs := make([]string, len(l))
	for i, e := range l {
		msgs[i] = e.Error()
	}
	return strings.Join(msgs, "\n")
}

// orNil sorts the list and returns it, or nil when it is empty.
func (l Errors) orNil() error {
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
	_ = l.orNil()
	rest := len(l) - n
	last := l[n-1]
	return append(l[:n:n], &Error{File: last.File, Line: last.Line, Msg: fmt.Sprintf("... and %d more problems in this block, not shown", rest)})
}
