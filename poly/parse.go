package poly

import (
	"fmt"
	"math/big"
	"strconv"

	"github.com/shopspring/decimal"
)

// Limits on what one expression may build, so that hostile input cannot
// exhaust memory.
const (
	MaxExponent = 64
	MaxDegree   = 256
	MaxTerms    = 200000
)

// Env resolves a name in an expression to its value. The returned value must
// belong to the parser's ring.
type Env func(name string) (RatFunc, bool)

// RingEnv resolves the variables of r by name.
func RingEnv(r *Ring) Env {
	return func(name string) (RatFunc, bool) {
		i, ok := r.Index(name)
		if !ok {
			return RatFunc{}, false
		}
		return FromPoly(Var(r, i)), true
	}
}

// ExprParser parses expressions over a ring, by recursive descent, one
// function per grammar rule:
//
//	expr    = term { ("+" | "-") term }
//	term    = unary { ("*" | "/") unary }
//	unary   = ("-" | "+") unary | power
//	power   = primary [ "^" integer ]
//	primary = number | name | "(" expr ")"
//
// Numbers are exact: 0.35 is 35/100 and 1e-3 is 1/1000. Division is allowed
// by expressions free of states only.
type ExprParser struct {
	Ring *Ring
	Env  Env
	toks []Token
	pos  int
	err  *Error
}

// ParseExpr parses text (which starts at position start) as one whole
// expression over r with names resolved by env (RingEnv(r) when env is nil).
func ParseExpr(r *Ring, env Env, text string, start Pos) (RatFunc, error) {
	p := &ExprParser{Ring: r, Env: env}
	return p.ParseTokens(Scan(text, start))
}

// ParseTokens parses the tokens (ending with EOF) as one whole expression.
func (p *ExprParser) ParseTokens(toks []Token) (RatFunc, error) {
	if p.Env == nil {
		p.Env = RingEnv(p.Ring)
	}
	p.toks, p.pos, p.err = toks, 0, nil
	v := p.expr()
	if t := p.peek(); p.err == nil && t.Kind == Invalid {
		p.fail(t.Pos, "unexpected character %q", t.Text)
	}
	if p.err == nil && p.peek().Kind != EOF {
		p.fail(p.peek().Pos, "expected an operator or the end of the expression, found %s", p.peek())
	}
	if p.err != nil {
		return RatFunc{}, p.err
	}
	return v, nil
}

// Parse parses text as an expression over r with r's variable names; a
// convenience for certificate fields.
func Parse(r *Ring, text string) (RatFunc, error) {
	return ParseExpr(r, nil, text, Pos{Line: 1, Col: 1})
}

// MustParse is Parse that panics; for tests and constants.
func MustParse(r *Ring, text string) RatFunc {
	f, err := Parse(r, text)
	if err != nil {
		panic(err)
	}
	return f
}

func (p *ExprParser) peek() Token { return p.toks[p.pos] }

func (p *ExprParser) next() Token {
	t := p.toks[p.pos]
	if t.Kind != EOF {
		p.pos++
	}
	return t
}

func (p *ExprParser) fail(pos Pos, format string, args ...any) {
	if p.err == nil {
		p.err = &Error{Pos: pos, Msg: fmt.Sprintf(format, args...)}
	}
}

func (p *ExprParser) zero() RatFunc { return FromPoly(Zero(p.Ring)) }

func (p *ExprParser) isOp(s string) bool {
	t := p.peek()
	return t.Kind == Op && t.Text == s
}

func (p *ExprParser) expr() RatFunc {
	v := p.term()
	for p.err == nil && (p.isOp("+") || p.isOp("-")) {
		op := p.next()
		w := p.term()
		if p.err != nil {
			break
		}
		if op.Text == "+" {
			v = v.Add(w)
		} else {
			v = v.Sub(w)
		}
	}
	return v
}

func (p *ExprParser) term() RatFunc {
	v := p.unary()
	for p.err == nil && (p.isOp("*") || p.isOp("/")) {
		op := p.next()
		start := p.peek().Pos
		w := p.unary()
		if p.err != nil {
			break
		}
		if op.Text == "*" {
			if v.Num.NumTerms()*w.Num.NumTerms() > MaxTerms {
				p.fail(op.Pos, "expression too large (more than %d terms)", MaxTerms)
				break
			}
			if v.Num.Degree()+w.Num.Degree() > MaxDegree {
				p.fail(op.Pos, "degree above %d", MaxDegree)
				break
			}
			v = v.Mul(w)
			continue
		}
		if w.IsZero() {
			p.fail(start, "division by zero")
			break
		}
		if w.Num.DegreeIn(p.Ring.StateMask()) > 0 {
			p.fail(start, "division by an expression in the states; only constants and parameter expressions may divide")
			break
		}
		v = v.Quo(w)
	}
	return v
}

func (p *ExprParser) unary() RatFunc {
	if p.isOp("-") {
		p.next()
		return p.unary().Neg()
	}
	if p.isOp("+") {
		p.next()
		return p.unary()
	}
	return p.power()
}

func (p *ExprParser) power() RatFunc {
	v := p.primary()
	if p.err != nil || !p.isOp("^") {
		return v
	}
	caret := p.next()
	t := p.next()
	paren := false
	if t.Kind == Op && t.Text == "(" {
		paren = true
		t = p.next()
	}
	if t.Kind != Number {
		p.fail(t.Pos, "expected a non-negative integer exponent after ^, found %s", t)
		return v
	}
	n, err := strconv.Atoi(t.Text)
	if err != nil || n < 0 {
		p.fail(t.Pos, "exponent must be a non-negative integer, found %s", t.Text)
		return v
	}
	if paren {
		if c := p.next(); c.Kind != Op || c.Text != ")" {
			p.fail(c.Pos, "expected ) after the exponent, found %s", c)
			return v
		}
	}
	if n > MaxExponent {
		p.fail(t.Pos, "exponent %d is above the limit %d", n, MaxExponent)
		return v
	}
	if p.isOp("^") {
		p.fail(p.peek().Pos, "a^b^c is ambiguous; use parentheses")
		return v
	}
	if d := v.Num.Degree(); d > 0 && d*n > MaxDegree {
		p.fail(caret.Pos, "degree %d is above the limit %d", d*n, MaxDegree)
		return v
	}
	// Estimate growth before expanding: the number of terms of v^n is at most
	// binomial(t+n-1, n) for t terms; stop early when it may explode.
	out := FromPoly(ConstInt(p.Ring, 1))
	for i := 0; i < n; i++ {
		if out.Num.NumTerms()*v.Num.NumTerms() > MaxTerms {
			p.fail(caret.Pos, "expression too large (more than %d terms)", MaxTerms)
			return v
		}
		out = out.Mul(v)
	}
	return out
}

func (p *ExprParser) primary() RatFunc {
	t := p.next()
	switch t.Kind {
	case Number:
		q, err := ParseNumber(t.Text)
		if err != nil {
			p.fail(t.Pos, "%v", err)
			return p.zero()
		}
		return RatConst(p.Ring, q)
	case Name:
		v, ok := p.Env(t.Text)
		if !ok {
			p.fail(t.Pos, "unknown name %q", t.Text)
			return p.zero()
		}
		return v
	case Op:
		if t.Text == "(" {
			v := p.expr()
			if p.err != nil {
				return v
			}
			if c := p.next(); c.Kind != Op || c.Text != ")" {
				p.fail(c.Pos, "expected ), found %s", c)
			}
			return v
		}
	case Invalid:
		p.fail(t.Pos, "unexpected character %q", t.Text)
		return p.zero()
	}
	p.fail(t.Pos, "expected a number, a name or (, found %s", t)
	return p.zero()
}

// ParseNumber reads a decimal literal exactly ("3", "0.35", "1e-3", "2.5E+2").
func ParseNumber(s string) (*big.Rat, error) {
	if q, ok := parseShortDecimal(s); ok {
		return q, nil
	}
	d, err := decimal.NewFromString(s)
	if err != nil {
		return nil, fmt.Errorf("malformed number %q", s)
	}
	if e := d.Exponent(); e > 1000 || e < -1000 {
		return nil, fmt.Errorf("number %q out of range", s)
	}
	return d.Rat(), nil
}

// parseShortDecimal reads "digits" or "digits.digits" with at most 18
// digits in all, which int64 holds exactly, as ParseNumber would; false for
// any other text (ParseNumber's general path decides those).
func parseShortDecimal(s string) (*big.Rat, bool) {
	var n, den int64 = 0, 1
	digits, dot := 0, -1
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case c >= '0' && c <= '9':
			n = 10*n + int64(c-'0')
			digits++
			if dot >= 0 {
				den *= 10
			}
		case c == '.' && dot < 0:
			dot = i
		default:
			return nil, false
		}
	}
	if digits == 0 || digits > 18 || dot == 0 || dot == len(s)-1 {
		return nil, false
	}
	return setSmallFrac(new(big.Rat), n, den), true
}
