package units

import "strconv"

// Error reports text that cannot be read as a quantity or a unit. Its
// message starts with the quoted text, e.g.
//
//	"32 mmm": unknown unit "mmm"; did you mean "mm"?
//
// so that a caller can prefix "file:line: key: ".
type Error struct {
	Text    string // the text as given, trimmed
	Suggest string // a near-miss unit spelling, or ""
	msg     string
}

func (e *Error) Error() string { return e.msg }

// newError makes an *Error whose message is the quoted text followed by rest,
// which starts with ": " or " is ...".
func newError(text, rest string) *Error {
	return &Error{Text: text, msg: quote(text) + rest}
}

// quote writes s in double quotes, as Go would.
func quote(s string) string { return strconv.Quote(s) }
