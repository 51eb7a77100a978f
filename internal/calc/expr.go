package calc

import (
	"fmt"
	"strings"
	"unicode/utf8"
)

// Expr is a parsed [derive] expression: numbers, names, + − × ÷ ^, unary
// minus, parentheses, the functions of exprFunctions and the constant pi.
// It holds no values; Eval computes it from a lookup of the names, and may
// be called from several goroutines at once.
type Expr struct {
	src   string
	root  *exprNode
	nodes int // how many nodes, numbered 0..nodes-1 in exprNode.id
}

// ExprRef is a name an expression uses: a value of the block itself
// (Block == "", written "shaft_power") or of another block ("lp.shaft_power").
type ExprRef struct {
	Block string
	Name  string
}

// String writes the reference as it is written in an expression.
func (r ExprRef) String() string {
	if r.Block == "" {
		return r.Name
	}
	return r.Block + "." + r.Name
}

// ExprError is a problem with an expression: its syntax, a name, a
// dimension, or a value that is not a finite number. Its message says what
// is wrong and what is allowed, so that a caller need only put the file,
// line and key in front of it.
type ExprError struct {
	Col int    // 1-based column, in characters, of the problem; 0 for the whole expression
	Msg string // what is wrong and what is allowed
	// Unknown is the name that no value answered to, when that is the
	// problem, so that a caller may add "did you mean" from the names that
	// exist where it is used.
	Unknown *ExprRef
}

func (e *ExprError) Error() string {
	if e.Col > 0 {
		return fmt.Sprintf("column %d: %s", e.Col, e.Msg)
	}
	return e.Msg
}

// exprKind is what an exprNode is.
type exprKind int

const (
	numberNode exprKind = iota // a decimal number: text, num
	nameNode                   // a value: ref
	piNode                     // the constant pi
	negNode                    // unary minus: args[0]
	binaryNode                 // op applied to args[0] and args[1]
	callNode                   // the function text applied to args
	parenNode                  // (args[0]), kept to show the working as written
)

// exprNode is one node of the syntax tree. One struct serves every kind:
// the language is small, and evaluation and the trace both walk the tree.
type exprNode struct {
	kind     exprKind
	id       int    // index into a per-evaluation table of values
	pos, end int    // byte span in the source
	at       int    // byte offset a message points at: the operator, the function name
	text     string // the number, operator or function name as written
	op       byte   // for binaryNode: '+', '-', '*', '/' or '^'
	num      float64
	ref      ExprRef
	args     []*exprNode
}

// exprFunctions are the functions an expression may call, with how many
// arguments each takes (-1: two or more).
var exprFunctions = map[string]int{
	"sqrt": 1, "abs": 1, "min": -1, "max": -1, "ln": 1, "exp": 1, "log10": 1,
	"sin": 1, "cos": 1, "tan": 1, "gauge": 1,
}

// exprFunctionList names the functions for messages, in the order the
// documentation gives them.
const exprFunctionList = "sqrt, abs, min, max, ln, exp, log10, sin, cos, tan, gauge"

// maxExprDepth bounds nesting, so that a pathological expression is an
// error rather than a deep recursion.
const maxExprDepth = 100

// ParseExpr reads an expression. It checks only the syntax; a failure is an
// *ExprError with the column of the problem and what was expected there.
func ParseExpr(src string) (*Expr, error) {
	toks, err := lexExpr(src)
	if err != nil {
		return nil, err
	}
	p := &exprParser{src: src, toks: toks}
	if toks[0].kind == tokEnd {
		return nil, &ExprError{Msg: "empty; write an expression such as \"shaft_power / free_air_delivery\""}
	}
	root, err := p.sum()
	if err != nil {
		return nil, err
	}
	if t := p.peek(); t.kind != tokEnd {
		return nil, p.errAt(t, p.unexpectedAfterOperand(t))
	}
	return &Expr{src: src, root: root, nodes: p.nodes}, nil
}

// Refs returns every name the expression uses, once each, in the order
// they first appear.
func (x *Expr) Refs() []ExprRef {
	var refs []ExprRef
	seen := map[ExprRef]bool{}
	var walk func(n *exprNode)
	walk = func(n *exprNode) {
		if n.kind == nameNode && !seen[n.ref] {
			seen[n.ref] = true
			refs = append(refs, n.ref)
		}
		for _, a := range n.args {
			walk(a)
		}
	}
	walk(x.root)
	return refs
}

// exprParser is a recursive-descent parser over the tokens of one
// expression. Grammar, loosest first:
//
//	sum     = product { ("+" | "-") product }
//	product = unary { ("*" | "/") unary }
//	unary   = "-" unary | power
//	power   = primary [ "^" unary ]        (right-associative: a^b^c = a^(b^c))
//	primary = number | name | id "." name | "pi" | function "(" sum { "," sum } ")" | "(" sum ")"
type exprParser struct {
	src   string
	toks  []exprToken
	i     int
	depth int
	nodes int
}

func (p *exprParser) peek() exprToken { return p.toks[p.i] }

func (p *exprParser) next() exprToken {
	t := p.toks[p.i]
	if t.kind != tokEnd {
		p.i++
	}
	return t
}

// node makes a node numbered for the evaluation table.
func (p *exprParser) node(kind exprKind, pos, end int) *exprNode {
	n := &exprNode{kind: kind, id: p.nodes, pos: pos, end: end, at: pos}
	p.nodes++
	return n
}

// column is the 1-based character column of byte offset pos.
func column(src string, pos int) int { return utf8.RuneCountInString(src[:pos]) + 1 }

func (p *exprParser) errAt(t exprToken, msg string) *ExprError {
	return &ExprError{Col: column(p.src, t.pos), Msg: msg}
}

func (p *exprParser) binary(op exprToken, l, r *exprNode) *exprNode {
	n := p.node(binaryNode, l.pos, r.end)
	n.op, n.text, n.at, n.args = op.op, op.text, op.pos, []*exprNode{l, r}
	return n
}

func (p *exprParser) sum() (*exprNode, error) { return p.chain(p.product, '+', '-') }

func (p *exprParser) product() (*exprNode, error) { return p.chain(p.unary, '*', '/') }

// chain reads operands joined by the left-associative operators ops:
// a - b - c is (a - b) - c.
func (p *exprParser) chain(operand func() (*exprNode, error), ops ...byte) (*exprNode, error) {
	l, err := operand()
	for err == nil && p.peek().isOp(ops...) {
		op := p.next()
		var r *exprNode
		if r, err = operand(); err == nil {
			l = p.binary(op, l, r)
		}
	}
	return l, err
}

// unary is where every operand starts, so it bounds the nesting of
// parentheses, function calls, exponents and minus signs alike.
func (p *exprParser) unary() (*exprNode, error) {
	if p.depth++; p.depth > maxExprDepth {
		return nil, p.errAt(p.peek(), fmt.Sprintf("nested more than %d deep; split it into several derived values", maxExprDepth))
	}
	defer func() { p.depth-- }()
	if !p.peek().isOp('-') {
		return p.power()
	}
	minus := p.next()
	x, err := p.unary()
	if err != nil {
		return nil, err
	}
	n := p.node(negNode, minus.pos, x.end)
	n.text, n.args = minus.text, []*exprNode{x}
	return n, nil
}

func (p *exprParser) power() (*exprNode, error) {
	base, err := p.primary()
	if err != nil || !p.peek().isOp('^') {
		return base, err
	}
	op := p.next()
	exponent, err := p.unary() // the exponent may be negative: 2^-1
	if err != nil {
		return nil, err
	}
	return p.binary(op, base, exponent), nil
}

func (p *exprParser) primary() (*exprNode, error) {
	t := p.next()
	switch t.kind {
	case tokNumber:
		n := p.node(numberNode, t.pos, t.end)
		n.text, n.num = t.text, t.num
		return n, nil
	case tokLeft:
		x, err := p.sum()
		if err != nil {
			return nil, err
		}
		if c := p.next(); c.kind != tokRight {
			return nil, p.errAt(c, fmt.Sprintf("expected ) to close the ( at column %d, found %s", column(p.src, t.pos), c.describe()))
		}
		n := p.node(parenNode, t.pos, p.toks[p.i-1].end)
		n.args = []*exprNode{x}
		return n, nil
	case tokName:
		return p.name(t)
	case tokEnd:
		return nil, p.errAt(t, "the expression ends too soon; expected a number, a name, a function or (")
	}
	msg := "expected a number, a name, a function or (, found " + t.describe()
	if t.isOp('*') && p.i >= 2 && p.toks[p.i-2].isOp('*') && p.toks[p.i-2].end == t.pos {
		msg += "; write a power with ^"
	}
	return nil, p.errAt(t, msg)
}

// name reads what follows a name token: a value, pi, or a function call.
func (p *exprParser) name(t exprToken) (*exprNode, error) {
	called := p.peek().kind == tokLeft
	arity, isFunc := exprFunctions[t.ref.Name]
	switch {
	case t.ref.Block == "" && t.ref.Name == "pi":
		if called {
			return nil, p.errAt(t, "pi is a constant, not a function")
		}
		n := p.node(piNode, t.pos, t.end)
		n.text = t.text
		return n, nil
	case t.ref.Block == "" && isFunc:
		if !called {
			return nil, p.errAt(t, fmt.Sprintf("%s is a function; write %s(...)", t.text, t.text))
		}
		return p.call(t, arity)
	case called && t.ref.Block != "":
		return nil, p.errAt(t, fmt.Sprintf("%s is a value, not a function; the functions are %s", t.text, exprFunctionList))
	case called:
		msg := fmt.Sprintf("unknown function %q", t.text)
		if s := Suggest(t.text, functionNames()); s != "" {
			msg += fmt.Sprintf("; did you mean %q?", s)
		}
		return nil, p.errAt(t, msg+"; the functions are "+exprFunctionList)
	}
	n := p.node(nameNode, t.pos, t.end)
	n.text, n.ref = t.text, t.ref
	return n, nil
}

// functionNames lists the functions, for suggestions.
func functionNames() []string { return strings.Split(exprFunctionList, ", ") }

// call reads the parenthesised arguments of function t.
func (p *exprParser) call(t exprToken, arity int) (*exprNode, error) {
	open := p.next()
	var args []*exprNode
	for {
		a, err := p.sum()
		if err != nil {
			return nil, err
		}
		args = append(args, a)
		c := p.next()
		if c.kind == tokRight {
			break
		}
		if c.kind != tokComma {
			return nil, p.errAt(c, fmt.Sprintf("expected , or ) in the arguments of %s( at column %d, found %s", t.text, column(p.src, open.pos), c.describe()))
		}
	}
	switch {
	case arity == -1 && len(args) < 2:
		return nil, p.errAt(t, fmt.Sprintf("%s takes two or more values, separated by commas", t.text))
	case arity > 0 && len(args) != arity:
		return nil, p.errAt(t, fmt.Sprintf("%s takes one value, not %d", t.text, len(args)))
	}
	n := p.node(callNode, t.pos, p.toks[p.i-1].end)
	n.text, n.args = t.text, args
	return n, nil
}

// unexpectedAfterOperand says what is wrong with token t where an operator
// or the end was expected.
func (p *exprParser) unexpectedAfterOperand(t exprToken) string {
	switch t.kind {
	case tokRight:
		return ") without a matching ("
	case tokComma:
		return "a comma outside the arguments of a function"
	case tokName:
		if prev := p.toks[p.i-1]; prev.kind == tokNumber && t.ref.Name != "pi" && exprFunctions[t.ref.Name] == 0 {
			return fmt.Sprintf("%s after the number %s: an expression takes no units (a quantity with a unit enters as an input of a figures block, by its name); to multiply, write * between the two", t.describe(), prev.text)
		}
		fallthrough
	case tokNumber, tokLeft:
		return fmt.Sprintf("expected an operator (+ - * / ^) before %s; to multiply, write * between the two", t.describe())
	}
	return "expected an operator (+ - * / ^) or the end, found " + t.describe()
}
