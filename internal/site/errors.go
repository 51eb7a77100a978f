// Package site builds a specgen site: it walks content/, reads the site
// configuration, evaluates calculation blocks, lays pages out with the
// templates and writes the output folder.
package site

import (
	"errors"

	"specgen/internal/calc"
)

// Error is a problem with the user's input at a place in a file.
type Error = calc.Error

// ErrorList is every input problem found in one pass.
type ErrorList = calc.Errors

// IsInputError reports whether err is a problem with the user's input (exit
// status 2) rather than a failure of the machine (disk, permissions).
func IsInputError(err error) bool {
	var e *Error
	var l ErrorList
	return errors.As(err, &e) || errors.As(err, &l)
}
