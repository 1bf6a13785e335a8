package poly

// Exact univariate real-root toolkit.
//
// Everything in this file works over the rationals with math/big and makes
// every decision (signs, root counts, comparisons) exactly; no floating point
// is used anywhere, not even for the decimal strings of roots.
//
// The main tools are:
//
//   - Sturm's theorem (Sturm 1829): for a square-free polynomial p with Sturm
//     sequence p0 = p, p1 = p', p(i+1) = -rem(p(i-1), p(i)), the number of
//     distinct real roots of p in (a, b] is V(a) - V(b), where V(x) is the
//     number of sign variations (zeros dropped) of p0(x), p1(x), ...
//   - Cauchy's bound: every complex root z of a(n) t^n + ... + a(0) satisfies
//     |z| < 1 + max |a(i)/a(n)|.
//   - The rational root theorem: a rational root n/d (lowest terms) of an
//     integer polynomial has d | a(n) and n | a(0).
//
// Roots are isolated by plain Sturm bisection (Collins & Akritas 1976 use
// Descartes' rule instead; Sturm counts are simpler and exact as well).

import (
	"math/big"
	"strings"
)

// Univariate is a dense polynomial c[0] + c[1] t + ... with exact rational
// coefficients. The zero value is the zero polynomial. Trailing zero
// coefficients are trimmed by every constructor and operation, so the
// representation is canonical (Degree of the zero polynomial is -1).
//
// A Univariate is immutable: its coefficients are never modified after
// construction, so values may be shared and copied freely.
type Univariate struct{ c []*big.Rat }

// uZeroRat is a shared read-only zero; never modify it.
var uZeroRat = new(big.Rat)

// mkUnivariate wraps freshly allocated coefficients (not shared with anyone)
// after trimming trailing zeros.
func mkUnivariate(c []*big.Rat) Univariate {
	n := len(c)
	for n > 0 && c[n-1].Sign() == 0 {
		n--
	}
	if n == 0 {
		return Univariate{}
	}
	return Univariate{c[:n:n]}
}

// NewUnivariate returns c[0] + c[1] t + ... ; the coefficients are copied and
// a nil coefficient counts as zero.
func NewUnivariate(coeffs ...*big.Rat) Univariate {
	c := make([]*big.Rat, len(coeffs))
	for i, x := range coeffs {
		c[i] = new(big.Rat)
		if x != nil {
			c[i].Set(x)
		}
	}
	return mkUnivariate(c)
}

// UnivariateFromInts returns c[0] + c[1] t + ... with integer coefficients.
func UnivariateFromInts(coeffs ...int64) Univariate {
	c := make([]*big.Rat, len(coeffs))
	for i, x := range coeffs {
		c[i] = new(big.Rat).SetInt64(x)
	}
	return mkUnivariate(c)
}

// Coeffs returns a copy of the coefficients, from the constant term up to the
// leading one (nil for the zero polynomial).
func (p Univariate) Coeffs() []*big.Rat {
	if len(p.c) == 0 {
		return nil
	}
	out := make([]*big.Rat, len(p.c))
	for i, x := range p.c {
		out[i] = new(big.Rat).Set(x)
	}
	return out
}

// Degree returns the degree of p, -1 for the zero polynomial.
func (p Univariate) Degree() int { return len(p.c) - 1 }

// IsZero reports whether p is the zero polynomial.
func (p Univariate) IsZero() bool { return len(p.c) == 0 }

// Lead returns (a copy of) the leading coefficient, 0 for the zero polynomial.
func (p Univariate) Lead() *big.Rat {
	if len(p.c) == 0 {
		return new(big.Rat)
	}
	return new(big.Rat).Set(p.c[len(p.c)-1])
}

// coef returns coefficient i (read-only; the shared zero past the degree).
func (p Univariate) coef(i int) *big.Rat {
	if i < len(p.c) {
		return p.c[i]
	}
	return uZeroRat
}

// Eval returns p(t) (Horner's scheme), as a new value.
func (p Univariate) Eval(t *big.Rat) *big.Rat {
	acc := new(big.Rat)
	for i := len(p.c) - 1; i >= 0; i-- {
		acc.Mul(acc, t)
		acc.Add(acc, p.c[i])
	}
	return acc
}

// Sign returns the sign (-1, 0 or +1) of p(t).
func (p Univariate) Sign(t *big.Rat) int { return p.Eval(t).Sign() }

// Add returns p + q.
func (p Univariate) Add(q Univariate) Univariate {
	n := max(len(p.c), len(q.c))
	c := make([]*big.Rat, n)
	for i := range c {
		c[i] = new(big.Rat).Add(p.coef(i), q.coef(i))
	}
	return mkUnivariate(c)
}

// Sub returns p - q.
func (p Univariate) Sub(q Univariate) Univariate {
	n := max(len(p.c), len(q.c))
	c := make([]*big.Rat, n)
	for i := range c {
		c[i] = new(big.Rat).Sub(p.coef(i), q.coef(i))
	}
	return mkUnivariate(c)
}

// Neg returns -p.
func (p Univariate) Neg() Univariate {
	c := make([]*big.Rat, len(p.c))
	for i, x := range p.c {
		c[i] = new(big.Rat).Neg(x)
	}
	return mkUnivariate(c)
}

// Scale returns s*p.
func (p Univariate) Scale(s *big.Rat) Univariate {
	if s.Sign() == 0 {
		return Univariate{}
	}
	c := make([]*big.Rat, len(p.c))
	for i, x := range p.c {
		c[i] = new(big.Rat).Mul(x, s)
	}
	return mkUnivariate(c)
}

// Mul returns p*q.
func (p Univariate) Mul(q Univariate) Univariate {
	if p.IsZero() || q.IsZero() {
		return Univariate{}
	}
	c := make([]*big.Rat, len(p.c)+len(q.c)-1)
	for i := range c {
		c[i] = new(big.Rat)
	}
	t := new(big.Rat)
	for i, a := range p.c {
		if a.Sign() == 0 {
			continue
		}
		for j, b := range q.c {
			c[i+j].Add(c[i+j], t.Mul(a, b))
		}
	}
	return mkUnivariate(c)
}

// Derivative returns dp/dt.
func (p Univariate) Derivative() Univariate {
	if len(p.c) <= 1 {
		return Univariate{}
	}
	c := make([]*big.Rat, len(p.c)-1)
	for i := range c {
		c[i] = new(big.Rat).Mul(p.c[i+1], new(big.Rat).SetInt64(int64(i+1)))
	}
	return mkUnivariate(c)
}

// DivMod returns the quotient and remainder of Euclidean division over the
// rationals: p = quo*q + rem with deg rem < deg q. It panics if q is zero.
func (p Univariate) DivMod(q Univariate) (quo, rem Univariate) {
	if q.IsZero() {
		panic("poly: Univariate division by the zero polynomial")
	}
	dq := q.Degree()
	if p.Degree() < dq {
		return Univariate{}, p
	}
	r := make([]*big.Rat, len(p.c))
	for i, x := range p.c {
		r[i] = new(big.Rat).Set(x)
	}
	qc := make([]*big.Rat, p.Degree()-dq+1)
	inv := new(big.Rat).Inv(q.c[dq])
	t := new(big.Rat)
	for k := len(qc) - 1; k >= 0; k-- {
		f := new(big.Rat).Mul(r[k+dq], inv)
		qc[k] = f
		if f.Sign() == 0 {
			continue
		}
		for j := 0; j <= dq; j++ {
			r[k+j].Sub(r[k+j], t.Mul(f, q.c[j]))
		}
	}
	return mkUnivariate(qc), mkUnivariate(r[:dq])
}

// Monic returns p divided by its leading coefficient (zero stays zero).
func (p Univariate) Monic() Univariate {
	if p.IsZero() {
		return p
	}
	return p.Scale(new(big.Rat).Inv(p.c[len(p.c)-1]))
}

// UnivariateGCD returns the monic greatest common divisor of p and q
// (Euclid's algorithm over the rationals); zero if both are zero.
func UnivariateGCD(p, q Univariate) Univariate {
	a, b := p.Monic(), q.Monic()
	for !b.IsZero() {
		_, r := a.DivMod(b)
		a, b = b, r.Monic()
	}
	return a.Monic()
}

// SquareFree returns the square-free part p / gcd(p, p'), made monic: it has
// the same distinct complex roots as p, each simple. Zero stays zero and a
// non-zero constant gives 1.
func (p Univariate) SquareFree() Univariate {
	if p.Degree() <= 0 {
		return p.Monic()
	}
	g := UnivariateGCD(p, p.Derivative())
	q, _ := p.DivMod(g)
	return q.Monic()
}

// Equal reports whether p and q are the same polynomial.
func (p Univariate) Equal(q Univariate) bool {
	if len(p.c) > 0 && len(p.c) == len(q.c) && &p.c[0] == &q.c[0] {
		return true // shared coefficients (a Univariate is immutable)
	}
	if len(p.c) != len(q.c) {
		return false
	}
	for i := range p.c {
		if p.c[i].Cmp(q.c[i]) != 0 {
			return false
		}
	}
	return true
}

// String formats p in descending powers of varName ("t" if empty), e.g.
// "t^2 - 2", "3/2*t + 1", "-t^3 + 1/2*t". Coefficients are written as
// integers or p/q, with "*" between a coefficient and the variable, so the
// result can be read back by an ordinary expression parser with + - * / ^
// (usual precedence, "/" left-associative). The zero polynomial is "0".
func (p Univariate) String(varName string) string {
	if varName == "" {
		varName = "t"
	}
	if p.IsZero() {
		return "0"
	}
	var sb strings.Builder
	first := true
	abs := new(big.Rat)
	for i := len(p.c) - 1; i >= 0; i-- {
		c := p.c[i]
		if c.Sign() == 0 {
			continue
		}
		switch {
		case first && c.Sign() < 0:
			sb.WriteString("-")
		case !first && c.Sign() < 0:
			sb.WriteString(" - ")
		case !first:
			sb.WriteString(" + ")
		}
		first = false
		abs.Abs(c)
		one := abs.IsInt() && abs.Num().IsInt64() && abs.Num().Int64() == 1
		if i == 0 || !one {
			sb.WriteString(abs.RatString())
			if i > 0 {
				sb.WriteString("*")
			}
		}
		if i > 0 {
			sb.WriteString(varName)
			if i > 1 {
				sb.WriteString("^")
				sb.WriteString(big.NewInt(int64(i)).String())
			}
		}
	}
	return sb.String()
}

// SturmSequence returns the Sturm sequence of p exactly as given: p0 = p,
// p1 = p', p(i+1) = -rem(p(i-1), p(i)), stopping before the first zero
// remainder (the last element is then gcd(p, p') up to a constant). It is nil
// for the zero polynomial and [p] for a constant.
//
// For a square-free p, Sturm's theorem says that the number of distinct real
// roots in (a, b] is V(a) - V(b), where V(x) counts the sign changes of the
// sequence evaluated at x (zeros are skipped). CountRoots applies it to the
// square-free part of p, which makes it valid for any p.
func (p Univariate) SturmSequence() []Univariate {
	if p.IsZero() {
		return nil
	}
	seq := []Univariate{p}
	if p.Degree() == 0 {
		return seq
	}
	seq = append(seq, p.Derivative())
	for {
		_, r := seq[len(seq)-2].DivMod(seq[len(seq)-1])
		if r.IsZero() {
			return seq
		}
		seq = append(seq, r.Neg())
	}
}

// ---------------------------------------------------------------------------
// Integer polynomials for fast exact sign evaluation.

// uIntPoly is an integer polynomial, low to high, with a non-zero leading
// coefficient (or empty for zero).
type uIntPoly []*big.Int

// uPrimitive returns the primitive integer polynomial c*p with a rational
// c > 0 (so it has the same sign as p everywhere): p is multiplied by the lcm
// of the denominators and divided by the gcd of the numerators.
func uPrimitive(p Univariate) uIntPoly {
	if p.IsZero() {
		return nil
	}
	l := big.NewInt(1)
	g := new(big.Int)
	for _, x := range p.c {
		d := x.Denom()
		g.GCD(nil, nil, l, d)
		l.Mul(l, new(big.Int).Quo(d, g))
	}
	out := make(uIntPoly, len(p.c))
	g.SetInt64(0)
	for i, x := range p.c {
		v := new(big.Int).Quo(l, x.Denom())
		v.Mul(v, x.Num())
		out[i] = v
		if v.Sign() != 0 {
			g.GCD(nil, nil, g, new(big.Int).Abs(v))
		}
	}
	if g.Cmp(big.NewInt(1)) != 0 {
		for _, v := range out {
			v.Quo(v, g)
		}
	}
	return out
}

// toUnivariate converts back to rational coefficients.
func (a uIntPoly) toUnivariate() Univariate {
	c := make([]*big.Rat, len(a))
	for i, v := range a {
		c[i] = new(big.Rat).SetInt(v)
	}
	return mkUnivariate(c)
}

// signAt returns the sign of a(x). With x = n/d (d > 0) it evaluates the
// homogenised sum a(i) n^i d^(deg-i) = d^deg a(x) in integers, which has the
// same sign as a(x).
func (a uIntPoly) signAt(x *big.Rat) int {
	deg := len(a) - 1
	if deg < 0 {
		return 0
	}
	n, d := x.Num(), x.Denom()
	acc := new(big.Int).Set(a[deg])
	if d.IsInt64() && d.Int64() == 1 {
		for i := deg - 1; i >= 0; i-- {
			acc.Mul(acc, n)
			acc.Add(acc, a[i])
		}
		return acc.Sign()
	}
	dp := new(big.Int).Set(d)
	t := new(big.Int)
	for i := deg - 1; i >= 0; i-- {
		acc.Mul(acc, n)
		acc.Add(acc, t.Mul(a[i], dp))
		if i > 0 {
			dp.Mul(dp, d)
		}
	}
	return acc.Sign()
}

// signAtInf returns the sign of a(t) as t -> s*infinity (s = +1 or -1).
func (a uIntPoly) signAtInf(s int) int {
	deg := len(a) - 1
	if deg < 0 {
		return 0
	}
	sg := a[deg].Sign()
	if s < 0 && deg%2 == 1 {
		sg = -sg
	}
	return sg
}

// uSturm is the Sturm sequence of a square-free polynomial, every element
// scaled by a positive rational to a primitive integer polynomial. Positive
// scaling changes no sign, and rem(c1*a, c2*b) = c1*rem(a, b), so the scaled
// chain has exactly the sign pattern of the true one.
type uSturm []uIntPoly

func newUSturm(sf Univariate) uSturm {
	if sf.IsZero() {
		panic("poly: Sturm sequence of the zero polynomial")
	}
	a := uPrimitive(sf)
	chain := uSturm{a}
	au := a.toUnivariate()
	bu := au.Derivative()
	for !bu.IsZero() {
		b := uPrimitive(bu)
		chain = append(chain, b)
		bu = b.toUnivariate()
		_, r := au.DivMod(bu)
		au, bu = bu, r.Neg()
	}
	return chain
}

func uVariations(signs func(i int) int, n int) int {
	v, last := 0, 0
	for i := range n {
		s := signs(i)
		if s == 0 {
			continue
		}
		if last != 0 && s != last {
			v++
		}
		last = s
	}
	return v
}

// varAt returns V(x), the number of sign variations of the chain at x.
func (st uSturm) varAt(x *big.Rat) int {
	return uVariations(func(i int) int { return st[i].signAt(x) }, len(st))
}

// varAtInf returns V(s*infinity).
func (st uSturm) varAtInf(s int) int {
	return uVariations(func(i int) int { return st[i].signAtInf(s) }, len(st))
}

// varAtBound returns V at a bound (a finite value or +-infinity).
func (st uSturm) varAtBound(b UBound) int {
	if b.Inf != 0 {
		return st.varAtInf(b.Inf)
	}
	return st.varAt(b.Value)
}

// ---------------------------------------------------------------------------
// Root counting.

// UBound is an end of an interval: a finite rational Value (Inf == 0) or
// -infinity (Inf == -1) or +infinity (Inf == +1), open or closed. An
// infinite end is always treated as open.
type UBound struct {
	Value *big.Rat
	Inf   int // -1 for -infinity, +1 for +infinity, 0 for the finite Value
	Open  bool
}

// UBoundClosed returns the closed end v.
func UBoundClosed(v *big.Rat) UBound { return UBound{Value: new(big.Rat).Set(v)} }

// UBoundOpen returns the open end v.
func UBoundOpen(v *big.Rat) UBound { return UBound{Value: new(big.Rat).Set(v), Open: true} }

// UBoundNegInf returns the end -infinity.
func UBoundNegInf() UBound { return UBound{Inf: -1, Open: true} }

// UBoundPosInf returns the end +infinity.
func UBoundPosInf() UBound { return UBound{Inf: +1, Open: true} }

// CountRoots returns the number of distinct real roots of p in the interval
// from lo to hi, each end open or closed as given (infinite ends are open).
// An empty interval (lo > hi, or lo == hi unless both are closed) has none.
// It panics if p is zero or a finite end has a nil Value.
//
// By Sturm's theorem applied to the square-free part s of p, the number of
// roots in (a, b] is V(a) - V(b) for any a < b (an end may be a root: at a
// root of s, s' does not vanish and V(x) equals V just to the right of x).
// A closed finite lower end then adds 1 if p(a) = 0 and an open finite upper
// end subtracts 1 if p(b) = 0. At -infinity and +infinity the sequence has
// the signs of its leading coefficients, times (-1)^deg at -infinity.
func (p Univariate) CountRoots(lo, hi UBound) int {
	if p.IsZero() {
		panic("poly: CountRoots of the zero polynomial")
	}
	if (lo.Inf == 0 && lo.Value == nil) || (hi.Inf == 0 && hi.Value == nil) {
		panic("poly: CountRoots with a nil finite bound")
	}
	return NewSturm(p).Count(lo, hi)
}

// ---------------------------------------------------------------------------
// Root isolation.

// URoot is one real root of a polynomial. Either Exact != nil, and the root
// is the rational Exact (then Lo = Hi = Exact and Poly = t - Exact), or the
// root is the unique root of Poly in the open interval (Lo, Hi), with
// rational Lo < Hi and Poly(Lo) != 0, Poly(Hi) != 0.
//
// The methods treat a URoot as a value: they never modify the receiver's
// numbers and return new ones.
type URoot struct {
	Poly   Univariate
	Lo, Hi *big.Rat
	Exact  *big.Rat
}

// uIso is an isolated root of a square-free polynomial: exact (lo == hi) or
// the unique root in the open interval (lo, hi).
type uIso struct {
	lo, hi *big.Rat
	exact  bool
}

func uMid(a, b *big.Rat) *big.Rat {
	m := new(big.Rat).Add(a, b)
	return m.Mul(m, big.NewRat(1, 2))
}

// uCauchyBound returns a power of two B with every complex root z of a
// satisfying |z| < B (Cauchy: |z| < 1 + max |a(i)/a(n)|).
func uCauchyBound(a uIntPoly) *big.Rat {
	n := len(a) - 1
	m := new(big.Int)
	for _, v := range a[:n] {
		if v.CmpAbs(m) > 0 {
			m.Abs(v)
		}
	}
	bound := new(big.Rat).SetFrac(m, new(big.Int).Abs(a[n]))
	bound.Add(bound, big.NewRat(1, 1))
	b := big.NewRat(1, 1)
	two := big.NewRat(2, 1)
	for b.Cmp(bound) < 0 {
		b.Mul(b, two)
	}
	return b
}

// uIsolate returns all real roots of the square-free primitive integer
// polynomial s (with Sturm chain st), ascending, in pairwise disjoint
// isolating intervals; rational roots are always returned exact.
//
// Phase 1 bisects (-B, B] with Sturm counts until each piece (a, b] holds one
// root. Phase 2 shrinks each piece by sign bisection (s changes sign at each
// of its simple roots) until
//   - its lower end has moved off a (so neighbours share no end point), and
//   - its width is at most 1/|L|, L the leading coefficient of s.
//
// By the rational root theorem every rational root of s is k/L for some
// integer k, and an open interval of width <= 1/|L| contains at most one such
// point: checking that single candidate finds the root exactly if it is
// rational. This needs no factoring of the coefficients, so it stays sound
// and complete however large they are.
func uIsolate(s uIntPoly, st uSturm) []uIso {
	if len(s) <= 1 {
		return nil
	}
	B := uCauchyBound(s)
	lo := new(big.Rat).Neg(B)
	var pieces [][2]*big.Rat
	var rec func(a, b *big.Rat, va, vb int)
	rec = func(a, b *big.Rat, va, vb int) {
		switch va - vb {
		case 0:
			return
		case 1:
			pieces = append(pieces, [2]*big.Rat{a, b})
			return
		}
		m := uMid(a, b)
		vm := st.varAt(m)
		rec(a, m, va, vm)
		rec(m, b, vm, vb)
	}
	rec(lo, B, st.varAt(lo), st.varAt(B))

	L := new(big.Int).Abs(s[len(s)-1])
	invL := new(big.Rat).SetFrac(big.NewInt(1), L)
	out := make([]uIso, 0, len(pieces))
	for _, pc := range pieces {
		a, b := pc[0], pc[1]
		if s.signAt(b) == 0 {
			out = append(out, uIso{lo: b, hi: b, exact: true})
			continue
		}
		sb := s.signAt(b)
		l, h := a, b
		w := new(big.Rat)
		exact := false
		for l == a || w.Sub(h, l).Cmp(invL) > 0 {
			m := uMid(l, h)
			sm := s.signAt(m)
			if sm == 0 {
				out = append(out, uIso{lo: m, hi: m, exact: true})
				exact = true
				break
			}
			if sm == sb {
				h = m
			} else {
				l = m
			}
		}
		if exact {
			continue
		}
		// The only candidate k/L in (l, h): k = floor(l*L) + 1.
		k := new(big.Int).Mul(l.Num(), L)
		k.Div(k, l.Denom())
		k.Add(k, big.NewInt(1))
		cand := new(big.Rat).SetFrac(k, L)
		if cand.Cmp(h) < 0 && s.signAt(cand) == 0 {
			out = append(out, uIso{lo: cand, hi: cand, exact: true})
			continue
		}
		out = append(out, uIso{lo: l, hi: h})
	}
	return out
}

// isolate runs uIsolate on the square-free part of p.
func (p Univariate) isolate() (sf Univariate, isos []uIso) {
	if p.IsZero() {
		panic("poly: root isolation of the zero polynomial")
	}
	sf = p.SquareFree()
	if sf.Degree() <= 0 {
		return sf, nil
	}
	return sf, uIsolate(uPrimitive(sf), newUSturm(sf))
}

// RationalRoots returns the distinct rational roots of p, ascending. It
// panics if p is zero.
//
// Method: when a small prime shows p square-free, p-adic lifting
// (SquareFreeRationalRoots). Otherwise the real roots of the square-free part are isolated by Sturm
// bisection, and each isolating interval is shrunk to width <= 1/|L| (L the
// leading coefficient of the primitive integer square-free part); by the
// rational root theorem such an interval holds at most one candidate k/L,
// which is tested exactly (see uIsolate). Every returned value is a root and
// no rational root is missed, whatever the size of the coefficients.
func (p Univariate) RationalRoots() []*big.Rat {
	if p.IsZero() {
		panic("poly: root isolation of the zero polynomial")
	}
	// Square-free modulo a small prime (the usual case): p-adic lifting,
	// which isolates nothing (SquareFreeRationalRoots).
	if roots, ok := p.SquareFreeRationalRoots(); ok {
		return roots
	}
	return p.isolatedRationalRoots()
}

// isolatedRationalRoots is RationalRoots by root isolation alone.
func (p Univariate) isolatedRationalRoots() []*big.Rat {
	_, isos := p.isolate()
	var out []*big.Rat
	for _, r := range isos {
		if r.exact {
			out = append(out, new(big.Rat).Set(r.lo))
		}
	}
	return out
}

// IsolateRoots returns every distinct real root of p, ascending, with
// pairwise disjoint isolating intervals (they do not even share end points).
// Rational roots are exact (Exact set, Poly = t - r). The others carry as
// Poly the monic square-free part of p with its rational roots divided out,
// and rational Lo < Hi such that (Lo, Hi) contains exactly one root of Poly
// and Poly(Lo), Poly(Hi) != 0. It panics if p is zero.
//
// Roots are confined by Cauchy's bound and separated by Sturm bisection
// (see uIsolate).
func (p Univariate) IsolateRoots() []URoot {
	sf, isos := p.isolate()
	if len(isos) == 0 {
		return nil
	}
	irr := sf
	for _, r := range isos {
		if r.exact {
			q, _ := irr.DivMod(NewUnivariate(new(big.Rat).Neg(r.lo), big.NewRat(1, 1)))
			irr = q
		}
	}
	irr = irr.Monic()
	out := make([]URoot, len(isos))
	for i, r := range isos {
		if r.exact {
			out[i] = URoot{
				Poly:  NewUnivariate(new(big.Rat).Neg(r.lo), big.NewRat(1, 1)),
				Lo:    new(big.Rat).Set(r.lo),
				Hi:    new(big.Rat).Set(r.lo),
				Exact: new(big.Rat).Set(r.lo),
			}
			continue
		}
		out[i] = URoot{Poly: irr, Lo: new(big.Rat).Set(r.lo), Hi: new(big.Rat).Set(r.hi)}
	}
	return out
}

// ---------------------------------------------------------------------------
// Working with one isolated root.

// uRefiner bisects the isolating interval of a URoot. When Poly has opposite
// non-zero signs at Lo and Hi (always the case for roots made by
// IsolateRoots, Poly being square-free) it uses signs only; otherwise it
// falls back to Sturm counts of the square-free part, which only needs the
// interval to contain exactly one distinct root.
type uRefiner struct {
	s      uIntPoly
	sLo    int
	st     uSturm // nil in sign mode
	lo, hi *big.Rat
	exact  *big.Rat
}

func newURefiner(r URoot) *uRefiner {
	if r.Poly.IsZero() {
		panic("poly: URoot with the zero polynomial")
	}
	if r.Lo == nil || r.Hi == nil {
		panic("poly: URoot without an isolating interval")
	}
	f := &uRefiner{s: uPrimitive(r.Poly), lo: new(big.Rat).Set(r.Lo), hi: new(big.Rat).Set(r.Hi)}
	f.sLo = f.s.signAt(f.lo)
	if f.sLo == 0 || f.s.signAt(f.hi) != -f.sLo {
		f.st = newUSturm(r.Poly.SquareFree())
	}
	return f
}

// below reports whether the root lies in (lo, m), for lo < m < hi with
// Poly(m) != 0.
func (f *uRefiner) below(m *big.Rat) bool {
	if f.st == nil {
		return f.s.signAt(m) != f.sLo
	}
	return f.st.varAt(f.lo)-f.st.varAt(m) > 0
}

// step halves the interval; it reports false once the root is known exactly.
func (f *uRefiner) step() bool {
	if f.exact != nil {
		return false
	}
	m := uMid(f.lo, f.hi)
	if f.s.signAt(m) == 0 {
		f.exact = m
		return false
	}
	if f.below(m) {
		f.hi = m
	} else {
		f.lo = m
	}
	return true
}

func (f *uRefiner) root(poly Univariate) URoot {
	if f.exact != nil {
		return URoot{
			Poly:  NewUnivariate(new(big.Rat).Neg(f.exact), big.NewRat(1, 1)),
			Lo:    new(big.Rat).Set(f.exact),
			Hi:    new(big.Rat).Set(f.exact),
			Exact: new(big.Rat).Set(f.exact),
		}
	}
	return URoot{Poly: poly, Lo: f.lo, Hi: f.hi}
}

func (r URoot) copyRoot() URoot {
	c := URoot{Poly: r.Poly}
	if r.Lo != nil {
		c.Lo = new(big.Rat).Set(r.Lo)
	}
	if r.Hi != nil {
		c.Hi = new(big.Rat).Set(r.Hi)
	}
	if r.Exact != nil {
		c.Exact = new(big.Rat).Set(r.Exact)
	}
	return c
}

// Refine returns the root with its isolating interval halved until
// Hi - Lo <= width. If a midpoint happens to be the root, the result is that
// exact root. It panics if width <= 0 (unless the root is already exact).
func (r URoot) Refine(width *big.Rat) URoot {
	if r.Exact != nil {
		return r.copyRoot()
	}
	if width.Sign() <= 0 {
		panic("poly: URoot.Refine needs a positive width")
	}
	f := newURefiner(r)
	w := new(big.Rat)
	for w.Sub(f.hi, f.lo).Cmp(width) > 0 && f.step() {
	}
	return f.root(r.Poly)
}

// CompareRat returns -1, 0 or +1 as the root is less than, equal to or
// greater than q. It is exact and needs no refinement: for q strictly inside
// the isolating interval, the sign of Poly(q) tells on which side of q the
// root lies (or q is the root when Poly(q) = 0).
func (r URoot) CompareRat(q *big.Rat) int {
	if r.Exact != nil {
		return r.Exact.Cmp(q)
	}
	if q.Cmp(r.Lo) <= 0 {
		return 1
	}
	if q.Cmp(r.Hi) >= 0 {
		return -1
	}
	f := newURefiner(r)
	if f.s.signAt(q) == 0 {
		return 0
	}
	if f.below(q) {
		return -1
	}
	return 1
}

// CompareRoots returns -1, 0 or +1 as the root a is less than, equal to or
// greater than the root b, exactly. Disjoint intervals decide at once. For
// overlapping intervals with intersection (L, H), the roots are equal iff
// g = gcd(a.Poly, b.Poly) has a root in (L, H) (a common root is a root of
// g; conversely a root of g in (L, H) is the unique root of each polynomial
// there). Otherwise the roots differ and both intervals are halved until
// they are disjoint.
func CompareRoots(a, b URoot) int {
	switch {
	case a.Exact != nil && b.Exact != nil:
		return a.Exact.Cmp(b.Exact)
	case a.Exact != nil:
		return -b.CompareRat(a.Exact)
	case b.Exact != nil:
		return a.CompareRat(b.Exact)
	}
	if a.Hi.Cmp(b.Lo) <= 0 {
		return -1
	}
	if b.Hi.Cmp(a.Lo) <= 0 {
		return 1
	}
	L, H := a.Lo, a.Hi
	if b.Lo.Cmp(L) > 0 {
		L = b.Lo
	}
	if b.Hi.Cmp(H) < 0 {
		H = b.Hi
	}
	if g := UnivariateGCD(a.Poly, b.Poly); g.Degree() >= 1 &&
		g.CountRoots(UBoundOpen(L), UBoundOpen(H)) > 0 {
		return 0
	}
	fa, fb := newURefiner(a), newURefiner(b)
	for {
		fa.step()
		fb.step()
		if fa.exact != nil || fb.exact != nil {
			return CompareRoots(fa.root(a.Poly), fb.root(b.Poly))
		}
		if fa.hi.Cmp(fb.lo) <= 0 {
			return -1
		}
		if fb.hi.Cmp(fa.lo) <= 0 {
			return 1
		}
	}
}

// Decimal returns the root as a decimal string with `digits` significant
// digits (at least 1), correctly rounded (ties, possible only for rational
// roots, away from zero): the string is within half a unit of its last digit
// of the true root. Plain notation is used when the decimal exponent e
// satisfies -7 <= e < digits ("1.414", "0.0001234", "123.0"), scientific
// otherwise ("1.23e+08", "4.5e-10"). Zero is "0".
//
// Method: the interval is bisected until both ends round to the same string;
// rounding is monotone, so the root in between rounds to it too. This ends
// for any root that is not a rounding boundary; a boundary is rational and
// is tested exactly (as is 0) so that such a root is returned exactly.
func (r URoot) Decimal(digits int) string {
	if digits < 1 {
		digits = 1
	}
	if r.Exact != nil {
		return uFormatRat(r.Exact, digits)
	}
	f := newURefiner(r)
	// Move the interval off 0 (the root is in the open interval, so an end
	// at 0 means the root is not 0).
	for f.exact == nil && f.lo.Sign() <= 0 && f.hi.Sign() >= 0 {
		if f.lo.Sign() < 0 && f.hi.Sign() > 0 && f.s.signAt(uZeroRat) == 0 {
			return "0"
		}
		f.step()
	}
	// Shrink in one go to about the needed relative width.
	if f.exact == nil {
		w := new(big.Rat).Abs(f.lo)
		if a := new(big.Rat).Abs(f.hi); a.Cmp(w) < 0 {
			w = a
		}
		w.Mul(w, uPow10(-digits))
		for d := new(big.Rat); f.exact == nil && d.Sub(f.hi, f.lo).Cmp(w) > 0; {
			f.step()
		}
	}
	for f.exact == nil {
		sg, n, e := uRound(f.lo, digits)
		s := uFormatDigits(sg, n, e, digits)
		if s == uFormatRat(f.hi, digits) {
			return s
		}
		// The rounding changes at the upper edge of the cell of lo: if the
		// root is that (rational) edge, bisection would never separate them.
		edge := uCellEdge(f.lo, n, e, digits)
		if edge.Cmp(f.lo) > 0 && edge.Cmp(f.hi) < 0 && f.s.signAt(edge) == 0 {
			return uFormatRat(edge, digits)
		}
		f.step()
	}
	return uFormatRat(f.exact, digits)
}

// uPow10 returns 10^k as a rational (k may be negative).
func uPow10(k int) *big.Rat {
	if k >= 0 {
		return new(big.Rat).SetInt(new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(k)), nil))
	}
	return new(big.Rat).SetFrac(big.NewInt(1), new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(-k)), nil))
}

// uExp10 returns floor(log10 |x|) for x != 0, exactly.
func uExp10(x *big.Rat) int {
	a := new(big.Rat).Abs(x)
	// Estimate from bit lengths (log10 2 ~ 0.30103), then correct exactly.
	bits := a.Num().BitLen() - a.Denom().BitLen()
	e := bits * 30103 / 100000
	for uPow10(e).Cmp(a) > 0 {
		e--
	}
	for uPow10(e+1).Cmp(a) <= 0 {
		e++
	}
	return e
}

// uRound rounds |x| (x != 0) to `digits` significant digits, half away from
// zero: |x| ~ n * 10^(e-digits+1) with 10^(digits-1) <= n < 10^digits.
func uRound(x *big.Rat, digits int) (sign int, n *big.Int, e int) {
	sign = x.Sign()
	e = uExp10(x)
	a := new(big.Rat).Abs(x)
	a.Mul(a, uPow10(digits-1-e))
	n, rem := new(big.Int).QuoRem(a.Num(), a.Denom(), new(big.Int))
	if rem.Lsh(rem, 1).Cmp(a.Denom()) >= 0 {
		n.Add(n, big.NewInt(1))
	}
	if n.Cmp(uPow10(digits).Num()) >= 0 {
		n.Quo(n, big.NewInt(10))
		e++
	}
	return sign, n, e
}

// uCellEdge returns the point above x at which the rounding of x to `digits`
// significant digits (to v = sign*n*10^(e-digits+1)) changes: v + u/2, with
// u the spacing of the rounded values just above v (a tenth of v's own unit
// when v is a negative power of ten).
func uCellEdge(x *big.Rat, n *big.Int, e, digits int) *big.Rat {
	ulp := uPow10(e - digits + 1)
	v := new(big.Rat).SetInt(n)
	v.Mul(v, ulp)
	if x.Sign() < 0 {
		v.Neg(v)
		if n.Cmp(uPow10(digits-1).Num()) == 0 {
			ulp.Mul(ulp, big.NewRat(1, 10))
		}
	}
	return v.Add(v, ulp.Mul(ulp, big.NewRat(1, 2)))
}

// uFormatRat formats x with `digits` significant digits, correctly rounded.
func uFormatRat(x *big.Rat, digits int) string {
	if x.Sign() == 0 {
		return "0"
	}
	s, n, e := uRound(x, digits)
	return uFormatDigits(s, n, e, digits)
}

// uFormatDigits writes sign * n * 10^(e-digits+1), n having `digits` digits.
func uFormatDigits(sign int, n *big.Int, e, digits int) string {
	ds := n.String()
	var sb strings.Builder
	if sign < 0 {
		sb.WriteString("-")
	}
	switch {
	case e >= 0 && e < digits:
		sb.WriteString(ds[:e+1])
		if e+1 < len(ds) {
			sb.WriteString(".")
			sb.WriteString(ds[e+1:])
		}
	case e < 0 && e >= -7:
		sb.WriteString("0.")
		sb.WriteString(strings.Repeat("0", -e-1))
		sb.WriteString(ds)
	default:
		sb.WriteString(ds[:1])
		if len(ds) > 1 {
			sb.WriteString(".")
			sb.WriteString(ds[1:])
		}
		sb.WriteString("e")
		if e < 0 {
			sb.WriteString("-")
			e = -e
		} else {
			sb.WriteString("+")
		}
		es := big.NewInt(int64(e)).String()
		if len(es) < 2 {
			es = "0" + es
		}
		sb.WriteString(es)
	}
	return sb.String()
}

// OnlyRealRoot reports that x is a root of p and p has no other real root
// (Sturm's theorem counts the distinct real roots on the whole line).
func (p Univariate) OnlyRealRoot(x *big.Rat) bool {
	if p.IsZero() || p.Sign(x) != 0 {
		return false
	}
	return NewSturm(p).Count(UBound{Inf: -1}, UBound{Inf: 1}) == 1
}
