package calc

import (
	"fmt"
	"strconv"
	"unicode"
	"unicode/utf8"

	"github.com/millrace-workshop/specgen/internal/units"
)

// exprTokenKind is what an exprToken is.
type exprTokenKind int

const (
	tokEnd exprTokenKind = iota
	tokNumber
	tokName // a bare or qualified name, a function or pi
	tokOp
	tokLeft
	tokRight
	tokComma
)

// exprToken is one token of an expression.
type exprToken struct {
	kind     exprTokenKind
	pos, end int    // byte span in the source
	text     string // as written
	op       byte   // for tokOp: '+', '-', '*', '/' or '^', whatever the spelling
	num      float64
	ref      ExprRef
}

// isOp reports whether t is one of the operators ops.
func (t exprToken) isOp(ops ...byte) bool {
	if t.kind != tokOp {
		return false
	}
	for _, o := range ops {
		if t.op == o {
			return true
		}
	}
	return false
}

// describe names t for a message: "the end", "the name \"bore\"", "\"×\"".
func (t exprToken) describe() string {
	switch t.kind {
	case tokEnd:
		return "the end"
	case tokNumber:
		return "the number " + t.text
	case tokName:
		return fmt.Sprintf("the name %q", t.text)
	}
	return strconv.Quote(t.text)
}

// exprOperators maps each spelling of an operator to its ASCII form: the
// typeset minus, times, middle dot and division sign read as - * * /.
var exprOperators = map[rune]byte{
	'+': '+', '-': '-', '*': '*', '/': '/', '^': '^',
	'\u2212': '-', '×': '*', '·': '*', '⋅': '*', '÷': '/',
}

// lexExpr splits src into tokens, ending with a tokEnd at len(src).
func lexExpr(src string) ([]exprToken, error) {
	var toks []exprToken
	for i := 0; i < len(src); {
		r, size := utf8.DecodeRuneInString(src[i:])
		switch {
		case r == ' ' || r == '\t' || r == '\n' || r == '\r':
			i += size
			continue
		case r == '(' || r == ')' || r == ',':
			kind := map[rune]exprTokenKind{'(': tokLeft, ')': tokRight, ',': tokComma}[r]
			toks = append(toks, exprToken{kind: kind, pos: i, end: i + 1, text: string(r)})
		case exprOperators[r] != 0:
			toks = append(toks, exprToken{kind: tokOp, pos: i, end: i + size, text: string(r), op: exprOperators[r]})
		case (r < utf8.RuneSelf && isDigitByte(byte(r))) || (r == '.' && i+1 < len(src) && isDigitByte(src[i+1])):
			t, err := lexNumber(src, i)
			if err != nil {
				return nil, err
			}
			toks = append(toks, t)
		case r == '_' || isASCIILetter(r):
			toks = append(toks, lexName(src, i))
		default:
			return nil, &ExprError{Col: column(src, i), Msg: badCharacter(r)}
		}
		i = toks[len(toks)-1].end
	}
	return append(toks, exprToken{kind: tokEnd, pos: len(src), end: len(src)}), nil
}

// lexNumber reads a decimal number at src[i:], which starts with a digit
// or a point: digits with at most one point, and an exponent when one
// follows ("2.5e-3"), as a quantity's number is written.
func lexNumber(src string, i int) (exprToken, error) {
	text, _ := units.SplitNumber(src[i:])
	v, err := strconv.ParseFloat(text, 64)
	if err != nil {
		return exprToken{}, &ExprError{Col: column(src, i), Msg: fmt.Sprintf("the number %s is out of range", text)}
	}
	return exprToken{kind: tokNumber, pos: i, end: i + len(text), text: text, num: v}, nil
}

// lexName reads a name at src[i:]. A run of id characters (which include
// '-') followed by '.' and a name is another block's value, "lp-stage.power";
// otherwise the name stops before any '-', which is then a minus.
func lexName(src string, i int) exprToken {
	j := i
	for j < len(src) && (isNameByte(src[j]) || src[j] == '-') {
		j++
	}
	if j+1 < len(src) && src[j] == '.' && (src[j+1] == '_' || isASCIILetter(rune(src[j+1]))) {
		k := j + 1
		for k < len(src) && isNameByte(src[k]) {
			k++
		}
		return exprToken{kind: tokName, pos: i, end: k, text: src[i:k], ref: ExprRef{Block: src[i:j], Name: src[j+1 : k]}}
	}
	j = i
	for j < len(src) && isNameByte(src[j]) {
		j++
	}
	return exprToken{kind: tokName, pos: i, end: j, text: src[i:j], ref: ExprRef{Name: src[i:j]}}
}

// badCharacter says why r cannot appear in an expression and what to write.
func badCharacter(r rune) string {
	allowed := "; an expression holds numbers, names, + - * / ^ (or − × · ÷), parentheses and commas"
	switch {
	case r == utf8.RuneError:
		return "not valid UTF-8 text"
	case r == '–' || r == '—' || r == '‐' || r == '‑' || r == '‒':
		return fmt.Sprintf("%q is a dash; write a minus as - or −", r)
	case r == '=':
		return "an expression has no =; the name before = in [derive] is the result"
	case r == '"' || r == '\'':
		return "no quoted text in an expression; a quantity with a unit enters as an input of a figures block, by its name"
	case r == '%':
		return "% is not an operator; write a percentage as a fraction (0.05 for 5 %)"
	case r == '²' || r == '³':
		return fmt.Sprintf("%q: write a power with ^ (x^2)", r)
	case r == '.':
		return "a point not followed by a name or digits; write id.name for another block's value, or a number such as 0.5"
	case unicode.IsLetter(r) || unicode.IsDigit(r):
		return fmt.Sprintf("%q: names are ASCII letters, digits and _, and numbers ASCII digits", r)
	}
	return fmt.Sprintf("unexpected character %q", r) + allowed
}

func isDigitByte(c byte) bool { return '0' <= c && c <= '9' }

func isASCIILetter(r rune) bool { return ('a' <= r && r <= 'z') || ('A' <= r && r <= 'Z') }

func isNameByte(c byte) bool { return c == '_' || isDigitByte(c) || isASCIILetter(rune(c)) }
