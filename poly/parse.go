package poly

import (
	"errors"
	"fmt"
	"math"
	"math/big"
	"slices"
	"strconv"
	"strings"
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
//
// Every step is bounded by Limits (the defaults when zero): the recursion by
// Depth, and every product and power is checked against Degree, Terms,
// ConstBits and the Work left before it is computed, so that a tower such as
// ((2^64)^64)^64 is refused without being built. The work spent accumulates
// over the expressions one parser reads (Spent), which bounds the cost of a
// whole file read with one parser.
type ExprParser struct {
	Ring   *Ring
	Env    Env
	Limits Limits
	Spent  int64 // work spent so far, in the units of Limits.Work

	lim   Limits
	toks  []Token
	pos   int
	err   *Error
	depth int
}

// ParseExpr parses text (which starts at position start) as one whole
// expression over r with names resolved by env (RingEnv(r) when env is nil),
// within the default limits.
func ParseExpr(r *Ring, env Env, text string, start Pos) (RatFunc, error) {
	return ParseExprLimits(r, env, text, start, Limits{})
}

// ParseExprLimits is ParseExpr within the given limits.
func ParseExprLimits(r *Ring, env Env, text string, start Pos, lim Limits) (RatFunc, error) {
	toks, err := ScanLine(text, start, lim)
	if err != nil {
		return RatFunc{}, err
	}
	p := &ExprParser{Ring: r, Env: env, Limits: lim}
	return p.ParseTokens(toks)
}

// ParseTokens parses the tokens (ending with EOF) as one whole expression.
// The error, when not nil, is a *Error.
func (p *ExprParser) ParseTokens(toks []Token) (RatFunc, error) {
	if p.Env == nil {
		p.Env = RingEnv(p.Ring)
	}
	p.lim = p.Limits.WithDefaults()
	p.toks, p.pos, p.err, p.depth = toks, 0, nil, 0
	if len(toks) == 0 || toks[len(toks)-1].Kind != EOF {
		// A programmer's slip; the scanner always ends with EOF.
		var pos Pos
		if len(toks) > 0 {
			pos = toks[len(toks)-1].Pos
		}
		p.toks = append(slices.Clone(toks), Token{Kind: EOF, Pos: pos})
	}
	v := p.expr()
	if t := p.peek(); p.err == nil && t.Kind == Invalid {
		p.fail(t.Pos, "%s", InvalidChar(t.Text))
	}
	if p.err == nil && p.peek().Kind != EOF {
		p.fail(p.peek().Pos, "expected an operator or the end of the expression, found %s", p.peek())
	}
	if p.err == nil {
		// Exact division can make coefficients larger than any operand's;
		// what is accepted must print as text that parses again.
		if b := coefBits(v); b > p.lim.ConstBits {
			p.fail(toks[0].Pos, "%s", Exceeded("const-bits", fmt.Sprintf("a coefficient of %d bits", b), p.lim.ConstBits))
		}
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

func (p *ExprParser) failLimit(pos Pos, name, found string, limit int) {
	p.fail(pos, "%s", Exceeded(name, found, limit))
}

func (p *ExprParser) zero() RatFunc { return FromPoly(Zero(p.Ring)) }

func (p *ExprParser) isOp(s string) bool {
	t := p.peek()
	return t.Kind == Op && t.Text == s
}

// enter counts one level of nesting; false (and an error) beyond Depth.
func (p *ExprParser) enter() bool {
	p.depth++
	if p.depth > p.lim.Depth {
		p.failLimit(p.peek().Pos, "depth", fmt.Sprintf("parentheses or signs nested %d deep", p.depth), p.lim.Depth)
		return false
	}
	return true
}

// spend charges work; false (and an error at pos) when the budget is gone.
func (p *ExprParser) spend(pos Pos, w int64) bool {
	p.Spent = SatAdd(p.Spent, w)
	if p.Spent > int64(p.lim.Work) {
		p.failLimit(pos, "work", "the arithmetic needed", p.lim.Work)
		return false
	}
	return true
}

// expr is entered from primary's "(" (which counts the nesting) or at the top.
func (p *ExprParser) expr() RatFunc {
	// A long sum is added as a balanced tree (a binary counter of partial
	// sums), so that n terms cost O(n log n) and not O(n²) map copies.
	var stack []partial
	first := p.term()
	if p.err != nil {
		return first
	}
	push := func(v RatFunc, pos Pos) bool {
		s := partial{v, 1}
		for len(stack) > 0 && stack[len(stack)-1].n == s.n {
			top := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			if !p.checkSum(top.v, s.v, pos) {
				return false
			}
			s = partial{top.v.Add(s.v), 2 * s.n}
		}
		stack = append(stack, s)
		return true
	}
	if !p.isOp("+") && !p.isOp("-") {
		return first
	}
	push(first, p.peek().Pos)
	for p.err == nil && (p.isOp("+") || p.isOp("-")) {
		op := p.next()
		w := p.term()
		if p.err != nil {
			break
		}
		if op.Text == "-" {
			w = w.Neg()
		}
		if !push(w, op.Pos) {
			break
		}
	}
	if p.err != nil {
		return p.zero()
	}
	v := stack[len(stack)-1].v
	for i := len(stack) - 2; i >= 0; i-- {
		if !p.checkSum(stack[i].v, v, p.peek().Pos) {
			return p.zero()
		}
		v = stack[i].v.Add(v)
	}
	return v
}

// partial is a sum of n summands.
type partial struct {
	v RatFunc
	n int
}

// checkSum checks and charges the addition a + b.
func (p *ExprParser) checkSum(a, b RatFunc, pos Pos) bool {
	ta, tb := int64(a.Num.NumTerms()), int64(b.Num.NumTerms())
	if ta+tb > int64(p.lim.Terms) {
		// The sum may cancel, but a partial sum of a canonical text never
		// has more terms than the whole.
		p.failLimit(pos, "terms", fmt.Sprintf("a sum of %d terms", ta+tb), p.lim.Terms)
		return false
	}
	w := ta + tb
	if len(a.Den) > 0 || len(b.Den) > 0 {
		// Bringing to a common denominator multiplies the numerators, and
		// cancelling divides the sum exactly: quadratic in the terms.
		w = SatAdd(w, SatMul(SatMul(ta+tb, ta+tb), int64(len(a.Den)+len(b.Den))))
	}
	if d := max(denDegree(a), denDegree(b)); a.Num.Degree()+d > p.lim.Degree || b.Num.Degree()+d > p.lim.Degree {
		p.failLimit(pos, "degree", fmt.Sprintf("degree %d over a common denominator", max(a.Num.Degree(), b.Num.Degree())+d), p.lim.Degree)
		return false
	}
	if denDegree(a)+denDegree(b) > p.lim.Degree {
		p.failLimit(pos, "degree", fmt.Sprintf("a denominator of degree %d", denDegree(a)+denDegree(b)), p.lim.Degree)
		return false
	}
	if bits := max(coefBits(a), coefBits(b)) + 1; bits > p.lim.ConstBits || (len(a.Den)+len(b.Den) > 0 && coefBits(a)+coefBits(b) > p.lim.ConstBits) {
		p.failLimit(pos, "const-bits", fmt.Sprintf("a sum with coefficients of up to %d bits", coefBits(a)+coefBits(b)), p.lim.ConstBits)
		return false
	}
	return p.spend(pos, w)
}

// shape is what the checks need to know of an operand.
type shape struct {
	terms  int64 // terms of the numerator
	deg    int   // degree of the numerator
	denDeg int   // degree of the denominator
	bits   int   // largest numerator of a coefficient, in bits
	dbits  int   // largest denominator of a coefficient, in bits
	nden   int   // denominator factors
}

func shapeOf(f RatFunc) shape {
	nb, db := f.Num.numDenBits()
	for _, d := range f.Den {
		nb = max(nb, d.P.coefBits())
	}
	return shape{int64(f.Num.NumTerms()), f.Num.Degree(), denDegree(f), nb, db, len(f.Den)}
}

func (p *Poly) numDenBits() (int, int) {
	nb, db := 0, 0
	for _, c := range p.terms {
		nb = max(nb, c.Num().BitLen())
		db = max(db, c.Denom().BitLen())
	}
	return nb, db
}

// inverseShape is the shape of 1/f: its denominator, expanded, becomes a
// numerator (Quo multiplies it out), with terms and coefficients estimated
// from above without expanding it.
func inverseShape(f RatFunc) shape {
	t, bits := int64(1), 0
	for _, d := range f.Den {
		pt := int64(d.P.NumTerms())
		for range min(d.Mult, 64) {
			t = SatMul(t, pt)
		}
		if d.Mult > 64 && pt > 1 {
			t = math.MaxInt64
		}
		bits = satInt(bits + d.Mult*(d.P.coefBits()+bitLen(pt)))
	}
	nb, db := f.Num.numDenBits()
	if f.Num.NumTerms() == 1 && len(f.Den) == 0 {
		// 1/(n/d) = d/n for a monomial.
		return shape{1, 0, max(f.Num.Degree(), 0), db, nb, 1}
	}
	return shape{t, denDegree(f), max(f.Num.Degree(), 0), max(bits, nb, db), 0, 1 + len(f.Den)}
}

func satInt(n int) int {
	if n < 0 || n > math.MaxInt32 {
		return math.MaxInt32
	}
	return n
}

// checkProduct checks and charges a·b before it is computed.
func (p *ExprParser) checkProduct(a, b shape, pos Pos) bool {
	if t := SatMul(a.terms, b.terms); t > int64(p.lim.Terms) {
		p.failLimit(pos, "terms", fmt.Sprintf("a product of %d·%d terms", a.terms, b.terms), p.lim.Terms)
		return false
	}
	if d := a.deg + b.deg; d > p.lim.Degree {
		p.failLimit(pos, "degree", fmt.Sprintf("degree %d", d), p.lim.Degree)
		return false
	}
	if d := a.denDeg + b.denDeg; d > p.lim.Degree {
		p.failLimit(pos, "degree", fmt.Sprintf("a denominator of degree %d", d), p.lim.Degree)
		return false
	}
	// A product of monomials multiplies numerators and denominators; a
	// product of sums also adds up to min(ta, tb) products per coefficient
	// (checked again on the result).
	bits := satInt(max(a.bits+b.bits, a.dbits+b.dbits))
	if a.terms > 1 && b.terms > 1 {
		bits = satInt(bits + bitLen(min(a.terms, b.terms)))
	}
	if bits > p.lim.ConstBits {
		p.failLimit(pos, "const-bits", fmt.Sprintf("a product with coefficients of up to %d bits", bits), p.lim.ConstBits)
		return false
	}
	w := mulWork(a.terms, b.terms, max(a.bits, a.dbits), max(b.bits, b.dbits))
	if a.nden+b.nden > 0 {
		// Cancelling a denominator factor is an exact division, quadratic
		// in the terms of the numerator.
		t := SatMul(a.terms, b.terms)
		w = SatAdd(w, SatMul(SatMul(t, t), int64(a.nden+b.nden)))
	}
	return p.spend(pos, w)
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
			if !p.checkProduct(shapeOf(v), shapeOf(w), op.Pos) {
				break
			}
			v = v.Mul(w)
			if !p.checkBits(v, op.Pos) {
				break
			}
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
		// v/w = v·den(w)/num(w): the same checks as a product, and the
		// numerator of w joins the denominator.
		if !p.checkProduct(shapeOf(v), inverseShape(w), op.Pos) {
			break
		}
		v = v.Quo(w)
		if !p.checkBits(v, op.Pos) {
			break
		}
	}
	return v
}

// checkBits checks the coefficients of a result, which a product of sums
// or an exact division can make larger than estimated.
func (p *ExprParser) checkBits(v RatFunc, pos Pos) bool {
	if b := coefBits(v); b > p.lim.ConstBits {
		p.failLimit(pos, "const-bits", fmt.Sprintf("a coefficient of %d bits", b), p.lim.ConstBits)
		return false
	}
	return true
}

func (p *ExprParser) unary() RatFunc {
	if p.isOp("-") || p.isOp("+") {
		if !p.enter() {
			return p.zero()
		}
		defer func() { p.depth-- }()
		if p.next().Text == "-" {
			v := p.unary()
			if p.err != nil || !p.spend(p.peek().Pos, int64(v.Num.NumTerms())) {
				return p.zero()
			}
			return v.Neg()
		}
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
	n, ok := smallInt(t.Text, p.lim.Exponent)
	if !ok {
		if isDigits(t.Text) {
			p.failLimit(t.Pos, "exponent", "exponent "+shorten(t.Text), p.lim.Exponent)
		} else {
			p.fail(t.Pos, "exponent must be a non-negative integer, found %s", shorten(t.Text))
		}
		return v
	}
	if paren {
		if c := p.next(); c.Kind != Op || c.Text != ")" {
			p.fail(c.Pos, "expected ) after the exponent, found %s", c)
			return v
		}
	}
	if p.isOp("^") {
		p.fail(p.peek().Pos, "a^b^c is ambiguous; use parentheses")
		return v
	}
	if n == 0 {
		return FromPoly(ConstInt(p.Ring, 1))
	}
	if d := v.Num.Degree(); d > 0 && d*n > p.lim.Degree {
		p.failLimit(caret.Pos, "degree", fmt.Sprintf("degree %d", d*n), p.lim.Degree)
		return v
	}
	if d := denDegree(v); d*n > p.lim.Degree {
		p.failLimit(caret.Pos, "degree", fmt.Sprintf("a denominator of degree %d", d*n), p.lim.Degree)
		return v
	}
	// The size of the coefficients of v^n before computing it: at most n
	// times the bits of v's, plus the multinomial coefficients (below
	// terms^n).
	tv := int64(v.Num.NumTerms())
	if bits := SatMul(int64(coefBits(v)), int64(n)) + SatMul(int64(bitLen(tv)), int64(n)); tv > 0 && bits > int64(p.lim.ConstBits) {
		p.failLimit(caret.Pos, "const-bits", fmt.Sprintf("a power with coefficients of up to %d bits", bits), p.lim.ConstBits)
		return v
	}
	out := FromPoly(ConstInt(p.Ring, 1))
	for i := 0; i < n; i++ {
		if !p.checkProduct(shapeOf(out), shapeOf(v), caret.Pos) {
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
		q, err := parseNumber(t.Text, p.lim)
		if err != nil {
			p.fail(t.Pos, "%v", err)
			return p.zero()
		}
		return RatConst(p.Ring, q)
	case Name:
		v, ok := p.Env(t.Text)
		if !ok {
			p.fail(t.Pos, "unknown name %q", shorten(t.Text))
			return p.zero()
		}
		return v
	case Op:
		if t.Text == "(" {
			if !p.enter() {
				return p.zero()
			}
			defer func() { p.depth-- }()
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
		p.fail(t.Pos, "%s", InvalidChar(t.Text))
		return p.zero()
	}
	p.fail(t.Pos, "expected a number, a name or (, found %s", t)
	return p.zero()
}

// smallInt reads a string of decimal digits as an integer of at most max.
func smallInt(s string, max int) (int, bool) {
	if s == "" || len(s) > 12 || !isDigits(s) {
		return 0, false
	}
	n, err := strconv.Atoi(s)
	return n, err == nil && n <= max
}

func isDigits(s string) bool {
	for i := 0; i < len(s); i++ {
		if s[i] < '0' || s[i] > '9' {
			return false
		}
	}
	return s != ""
}

// shorten cuts a long token for an error message.
func shorten(s string) string {
	if len(s) <= 40 {
		return s
	}
	return s[:20] + "…" + s[len(s)-10:] + fmt.Sprintf(" (%d characters)", len(s))
}

// coefBits returns the largest bit length of a numerator or denominator of
// a coefficient of f (denominator factors included).
func coefBits(f RatFunc) int {
	b := f.Num.coefBits()
	for _, d := range f.Den {
		b = max(b, d.P.coefBits())
	}
	return b
}

func (p *Poly) coefBits() int {
	b := 0
	for _, c := range p.terms {
		b = max(b, c.Num().BitLen(), c.Denom().BitLen())
	}
	return b
}

// denDegree returns the total degree of f's denominator.
func denDegree(f RatFunc) int {
	d := 0
	for _, df := range f.Den {
		d += df.Mult * max(df.P.Degree(), 0)
	}
	return d
}

// mulWork estimates the cost of multiplying polynomials of ta and tb terms
// with coefficients of ba and bb bits: one unit a term product of small
// coefficients, more for large ones (schoolbook size in 64-bit words).
func mulWork(ta, tb int64, ba, bb int) int64 {
	wa, wb := int64(ba/64+1), int64(bb/64+1)
	return SatMul(SatMul(ta, tb), 1+wa*wb/16)
}

func bitLen(n int64) int {
	b := 0
	for n > 0 {
		b++
		n >>= 1
	}
	return b
}

// SatAdd and SatMul are addition and multiplication of non-negative numbers
// that stop at the largest int64 instead of wrapping (for cost estimates).
func SatAdd(a, b int64) int64 {
	if a > math.MaxInt64-b {
		return math.MaxInt64
	}
	return a + b
}

func SatMul(a, b int64) int64 {
	if a == 0 || b == 0 {
		return 0
	}
	if a > math.MaxInt64/b {
		return math.MaxInt64
	}
	return a * b
}

// ParseNumber reads a decimal literal exactly ("3", "0.35", "1e-3", "2.5E+2"),
// within the default limits.
func ParseNumber(s string) (*big.Rat, error) { return parseNumber(s, DefaultLimits()) }

// parseNumber is ParseNumber within lim: at most lim.Digits digits, and a
// value whose numerator and denominator fit in lim.ConstBits bits, checked
// before the power of ten is computed.
func parseNumber(s string, lim Limits) (*big.Rat, error) {
	if q, ok := parseShortDecimal(s); ok {
		return q, nil
	}
	mant, exp := s, ""
	if i := strings.IndexAny(s, "eE"); i >= 0 {
		mant, exp = s[:i], s[i+1:]
	}
	digits := 0
	for i := 0; i < len(mant); i++ {
		if mant[i] >= '0' && mant[i] <= '9' {
			digits++
		}
	}
	if digits > lim.Digits {
		return nil, errors.New(Exceeded("digits", fmt.Sprintf("number literal of %d digits", digits), lim.Digits))
	}
	e := 0
	if exp != "" {
		x := strings.TrimPrefix(strings.TrimPrefix(exp, "+"), "-")
		n, ok := smallInt(x, 1<<30)
		if !ok {
			return nil, fmt.Errorf("malformed number %q", shorten(s))
		}
		e = n
	}
	// The value is m·10^(±e) with m below 10^digits: about 3.33 bits a digit.
	if bits := int64(digits+e) * 3322 / 1000; bits > int64(lim.ConstBits) {
		return nil, errors.New(Exceeded("const-bits", fmt.Sprintf("number %s of about %d bits", shorten(s), bits), lim.ConstBits))
	}
	// big.Rat reads decimal text exactly; the digits, point and exponent
	// checked here keep it from any other base or form.
	q, ok := new(big.Rat).SetString(s)
	if !ok || strings.Trim(s, "0123456789.eE+-") != "" {
		return nil, fmt.Errorf("malformed number %q", shorten(s))
	}
	return q, nil
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

// ParseConstant parses text (which starts at pos) as a constant expression:
// numbers, + − * / ^ and parentheses, no names, within the default limits.
// It reads every constant of the command line (--set, --box, --grid, --q,
// --slice) and of a model's assumptions.
func ParseConstant(text string, pos Pos) (*big.Rat, error) {
	f, err := ParseExpr(NewRing(nil, nil), func(string) (RatFunc, bool) { return RatFunc{}, false }, text, pos)
	if err != nil {
		return nil, err
	}
	return f.Num.ConstTerm(), nil
}
