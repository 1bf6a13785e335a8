package poly

import (
	"fmt"
	"math"
	"math/big"
	"math/rand/v2"
	"slices"
	"sort"
	"strconv"
	"strings"
	"testing"
	"unicode"

	"gonum.org/v1/gonum/mat"
)

// ---------------------------------------------------------------------------
// helpers (prefixed ut to stay out of the way of other files in the package)

// utR parses a rational such as "3", "-3/2" or "1.5"; it panics on bad input.
func utR(s string) *big.Rat {
	r, ok := new(big.Rat).SetString(s)
	if !ok {
		panic("bad rational " + s)
	}
	return r
}

// utP builds a polynomial from coefficient strings, low to high.
func utP(coeffs ...string) Univariate {
	c := make([]*big.Rat, len(coeffs))
	for i, s := range coeffs {
		c[i] = utR(s)
	}
	return NewUnivariate(c...)
}

// utLin returns t - r.
func utLin(r *big.Rat) Univariate {
	return NewUnivariate(new(big.Rat).Neg(r), big.NewRat(1, 1))
}

// utFromRoots returns the product of (t - r) over the roots.
func utFromRoots(roots ...string) Univariate {
	p := UnivariateFromInts(1)
	for _, r := range roots {
		p = p.Mul(utLin(utR(r)))
	}
	return p
}

func utPow(p Univariate, k int) Univariate {
	q := UnivariateFromInts(1)
	for range k {
		q = q.Mul(p)
	}
	return q
}

func utRats(ss ...string) []*big.Rat {
	out := make([]*big.Rat, len(ss))
	for i, s := range ss {
		out[i] = utR(s)
	}
	return out
}

func utRatsString(rs []*big.Rat) string {
	parts := make([]string, len(rs))
	for i, r := range rs {
		parts[i] = r.RatString()
	}
	return "[" + strings.Join(parts, " ") + "]"
}

func utRatsEqual(a, b []*big.Rat) bool {
	return slices.EqualFunc(a, b, func(x, y *big.Rat) bool { return x.Cmp(y) == 0 })
}

// utCheckRoots checks the documented invariants of IsolateRoots output.
func utCheckRoots(t *testing.T, p Univariate, roots []URoot) {
	t.Helper()
	for i, r := range roots {
		if r.Exact != nil {
			if p.Sign(r.Exact) != 0 {
				t.Errorf("root %d: exact %s is not a root of %s", i, r.Exact.RatString(), p.String("t"))
			}
			if r.Lo.Cmp(r.Exact) != 0 || r.Hi.Cmp(r.Exact) != 0 || !r.Poly.Equal(utLin(r.Exact)) {
				t.Errorf("root %d: exact root with Lo=%s Hi=%s Poly=%s", i, r.Lo.RatString(), r.Hi.RatString(), r.Poly.String("t"))
			}
		} else {
			if r.Lo.Cmp(r.Hi) >= 0 {
				t.Errorf("root %d: Lo %s >= Hi %s", i, r.Lo.RatString(), r.Hi.RatString())
				continue
			}
			if r.Poly.Sign(r.Lo) == 0 || r.Poly.Sign(r.Hi) == 0 {
				t.Errorf("root %d: Poly vanishes at an end", i)
			}
			if n := r.Poly.CountRoots(UBoundOpen(r.Lo), UBoundOpen(r.Hi)); n != 1 {
				t.Errorf("root %d: Poly has %d roots in (Lo, Hi), want 1", i, n)
			}
			if n := p.CountRoots(UBoundOpen(r.Lo), UBoundOpen(r.Hi)); n != 1 {
				t.Errorf("root %d: p has %d roots in (Lo, Hi), want 1", i, n)
			}
			if _, rem := p.DivMod(r.Poly); !rem.IsZero() {
				t.Errorf("root %d: Poly %s does not divide p", i, r.Poly.String("t"))
			}
			if len(r.Poly.RationalRoots()) != 0 {
				t.Errorf("root %d: Poly %s still has rational roots", i, r.Poly.String("t"))
			}
		}
		if i > 0 {
			if roots[i-1].Hi.Cmp(r.Lo) >= 0 {
				t.Errorf("roots %d and %d: intervals [%s, %s] and [%s, %s] touch", i-1, i,
					roots[i-1].Lo.RatString(), roots[i-1].Hi.RatString(), r.Lo.RatString(), r.Hi.RatString())
			}
			if c := CompareRoots(roots[i-1], r); c != -1 {
				t.Errorf("roots %d and %d: CompareRoots = %d, want -1", i-1, i, c)
			}
		}
	}
	if n := p.CountRoots(UBoundNegInf(), UBoundPosInf()); n != len(roots) {
		t.Errorf("IsolateRoots found %d roots, CountRoots says %d", len(roots), n)
	}
}

// utParse is a tiny independent expression parser (+ - * / ^, parentheses,
// integers, one variable) used to check that String's output reads back.
func utParse(s, v string) (Univariate, error) {
	ps := &utParser{src: s, v: v}
	ps.next()
	p, err := ps.expr()
	if err == nil && ps.tok != "" {
		err = fmt.Errorf("trailing %q", ps.tok)
	}
	return p, err
}

type utParser struct {
	src, v, tok string
	pos         int
}

func (ps *utParser) next() {
	for ps.pos < len(ps.src) && ps.src[ps.pos] == ' ' {
		ps.pos++
	}
	if ps.pos >= len(ps.src) {
		ps.tok = ""
		return
	}
	start := ps.pos
	c := rune(ps.src[ps.pos])
	switch {
	case unicode.IsDigit(c):
		for ps.pos < len(ps.src) && unicode.IsDigit(rune(ps.src[ps.pos])) {
			ps.pos++
		}
	case unicode.IsLetter(c):
		for ps.pos < len(ps.src) && unicode.IsLetter(rune(ps.src[ps.pos])) {
			ps.pos++
		}
	default:
		ps.pos++
	}
	ps.tok = ps.src[start:ps.pos]
}

func (ps *utParser) expr() (Univariate, error) {
	p, err := ps.term()
	for err == nil && (ps.tok == "+" || ps.tok == "-") {
		op := ps.tok
		ps.next()
		var q Univariate
		if q, err = ps.term(); err == nil {
			if op == "+" {
				p = p.Add(q)
			} else {
				p = p.Sub(q)
			}
		}
	}
	return p, err
}

func (ps *utParser) term() (Univariate, error) {
	p, err := ps.unary()
	for err == nil && (ps.tok == "*" || ps.tok == "/") {
		op := ps.tok
		ps.next()
		var q Univariate
		if q, err = ps.unary(); err == nil {
			if op == "*" {
				p = p.Mul(q)
			} else if q.Degree() != 0 {
				err = fmt.Errorf("division by non-constant")
			} else {
				p = p.Scale(new(big.Rat).Inv(q.Lead()))
			}
		}
	}
	return p, err
}

func (ps *utParser) unary() (Univariate, error) {
	if ps.tok == "-" {
		ps.next()
		p, err := ps.unary()
		return p.Neg(), err
	}
	return ps.power()
}

func (ps *utParser) power() (Univariate, error) {
	p, err := ps.primary()
	if err == nil && ps.tok == "^" {
		ps.next()
		k, e := strconv.Atoi(ps.tok)
		if e != nil {
			return p, e
		}
		ps.next()
		p = utPow(p, k)
	}
	return p, err
}

func (ps *utParser) primary() (Univariate, error) {
	tok := ps.tok
	switch {
	case tok == "(":
		ps.next()
		p, err := ps.expr()
		if err == nil && ps.tok != ")" {
			err = fmt.Errorf("missing )")
		}
		ps.next()
		return p, err
	case tok == ps.v:
		ps.next()
		return UnivariateFromInts(0, 1), nil
	case tok != "" && unicode.IsDigit(rune(tok[0])):
		ps.next()
		return NewUnivariate(utR(tok)), nil
	}
	return Univariate{}, fmt.Errorf("unexpected %q", tok)
}

// utRandPoly returns a random polynomial of degree <= deg with small rational
// coefficients.
func utRandPoly(rng *rand.Rand, deg int) Univariate {
	c := make([]*big.Rat, deg+1)
	for i := range c {
		if rng.IntN(4) == 0 {
			c[i] = new(big.Rat)
			continue
		}
		c[i] = big.NewRat(rng.Int64N(41)-20, rng.Int64N(5)+1)
	}
	return NewUnivariate(c...)
}

// ---------------------------------------------------------------------------
// basic arithmetic

func TestUnivariateBasics(t *testing.T) {
	tests := []struct {
		name   string
		p      Univariate
		degree int
		lead   string
		str    string
	}{
		{"zero value", Univariate{}, -1, "0", "0"},
		{"trimmed zeros", UnivariateFromInts(0, 0, 0), -1, "0", "0"},
		{"constant", UnivariateFromInts(-7), 0, "-7", "-7"},
		{"trailing zeros trimmed", UnivariateFromInts(-2, 0, 1, 0, 0), 2, "1", "t^2 - 2"},
		{"rational linear", utP("1", "3/2"), 1, "3/2", "3/2*t + 1"},
		{"negative lead", UnivariateFromInts(0, 1, 0, -1), 3, "-1", "-t^3 + t"},
		{"fractions", utP("-1/2", "0", "-5/3"), 2, "-5/3", "-5/3*t^2 - 1/2"},
		{"nil coefficient is zero", NewUnivariate(nil, big.NewRat(2, 1)), 1, "2", "2*t"},
		{"high degree", UnivariateFromInts(1, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 1), 11, "1", "t^11 + 1"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := tc.p.Degree(); got != tc.degree {
				t.Errorf("Degree = %d, want %d", got, tc.degree)
			}
			if got := tc.p.IsZero(); got != (tc.degree < 0) {
				t.Errorf("IsZero = %v", got)
			}
			if got := tc.p.Lead(); got.Cmp(utR(tc.lead)) != 0 {
				t.Errorf("Lead = %s, want %s", got.RatString(), tc.lead)
			}
			if got := tc.p.String("t"); got != tc.str {
				t.Errorf("String = %q, want %q", got, tc.str)
			}
			if got := len(tc.p.Coeffs()); got != tc.degree+1 {
				t.Errorf("len(Coeffs) = %d, want %d", got, tc.degree+1)
			}
		})
	}
}

func TestUnivariateImmutable(t *testing.T) {
	in := []*big.Rat{big.NewRat(1, 1), big.NewRat(2, 1)}
	p := NewUnivariate(in...)
	in[0].SetInt64(100)
	c := p.Coeffs()
	c[1].SetInt64(100)
	p.Lead().SetInt64(100)
	p.Eval(big.NewRat(3, 1)).SetInt64(100)
	if want := UnivariateFromInts(1, 2); !p.Equal(want) {
		t.Fatalf("p changed to %s", p.String("t"))
	}
	q := p
	_ = q.Add(p).Mul(p).Scale(big.NewRat(3, 1))
	if !p.Equal(UnivariateFromInts(1, 2)) {
		t.Fatalf("p changed by arithmetic to %s", p.String("t"))
	}
}

func TestUnivariateArithmetic(t *testing.T) {
	p := UnivariateFromInts(1, 1)  // t + 1
	q := UnivariateFromInts(-1, 1) // t - 1
	tests := []struct {
		name string
		got  Univariate
		want Univariate
	}{
		{"add", p.Add(q), UnivariateFromInts(0, 2)},
		{"sub", p.Sub(q), UnivariateFromInts(2)},
		{"sub to zero", p.Sub(p), Univariate{}},
		{"add leading cancel", UnivariateFromInts(1, 0, 1).Add(UnivariateFromInts(0, 1, -1)), UnivariateFromInts(1, 1)},
		{"mul", p.Mul(q), UnivariateFromInts(-1, 0, 1)},
		{"mul zero", p.Mul(Univariate{}), Univariate{}},
		{"neg", q.Neg(), UnivariateFromInts(1, -1)},
		{"scale", q.Scale(big.NewRat(3, 2)), utP("-3/2", "3/2")},
		{"scale zero", q.Scale(new(big.Rat)), Univariate{}},
		{"derivative", UnivariateFromInts(5, -2, 0, 1).Derivative(), UnivariateFromInts(-2, 0, 3)},
		{"derivative constant", UnivariateFromInts(5).Derivative(), Univariate{}},
		{"monic", utP("1", "2", "-4").Monic(), utP("-1/4", "-1/2", "1")},
		{"monic zero", Univariate{}.Monic(), Univariate{}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if !tc.got.Equal(tc.want) {
				t.Errorf("got %s, want %s", tc.got.String("t"), tc.want.String("t"))
			}
		})
	}
	if got := UnivariateFromInts(1, -3, 2).Eval(big.NewRat(1, 2)); got.Sign() != 0 {
		t.Errorf("(2t^2-3t+1)(1/2) = %s, want 0", got.RatString())
	}
	if got := UnivariateFromInts(1, -3, 2).Eval(big.NewRat(-1, 3)); got.Cmp(big.NewRat(20, 9)) != 0 {
		t.Errorf("(2t^2-3t+1)(-1/3) = %s, want 20/9", got.RatString())
	}
	if got := (Univariate{}).Eval(big.NewRat(5, 1)); got.Sign() != 0 {
		t.Errorf("zero(5) = %s", got.RatString())
	}
}

func TestUnivariateDivMod(t *testing.T) {
	tests := []struct {
		name          string
		p, q          Univariate
		wantQ, wantRm Univariate
	}{
		{"exact", UnivariateFromInts(-1, 0, 1), UnivariateFromInts(-1, 1), UnivariateFromInts(1, 1), Univariate{}},
		{"remainder", UnivariateFromInts(1, -3, 0, 1), UnivariateFromInts(-1, 0, 3), utP("0", "1/3"), utP("1", "-8/3")},
		{"lower degree", UnivariateFromInts(1, 1), UnivariateFromInts(0, 0, 1), Univariate{}, UnivariateFromInts(1, 1)},
		{"by constant", UnivariateFromInts(2, 4), UnivariateFromInts(2), UnivariateFromInts(1, 2), Univariate{}},
		{"zero dividend", Univariate{}, UnivariateFromInts(3, 1), Univariate{}, Univariate{}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			gq, gr := tc.p.DivMod(tc.q)
			if !gq.Equal(tc.wantQ) || !gr.Equal(tc.wantRm) {
				t.Errorf("got (%s, %s), want (%s, %s)", gq.String("t"), gr.String("t"), tc.wantQ.String("t"), tc.wantRm.String("t"))
			}
		})
	}
	t.Run("property", func(t *testing.T) {
		rng := rand.New(rand.NewPCG(7, 11))
		for range 200 {
			p := utRandPoly(rng, rng.IntN(9))
			q := utRandPoly(rng, rng.IntN(6))
			if q.IsZero() {
				continue
			}
			quo, rem := p.DivMod(q)
			if rem.Degree() >= q.Degree() || !quo.Mul(q).Add(rem).Equal(p) {
				t.Fatalf("%s = (%s)(%s) + %s fails", p.String("t"), quo.String("t"), q.String("t"), rem.String("t"))
			}
		}
	})
	t.Run("panics on zero", func(t *testing.T) {
		defer func() {
			if recover() == nil {
				t.Error("no panic")
			}
		}()
		UnivariateFromInts(1, 1).DivMod(Univariate{})
	})
}

func TestUnivariateGCD(t *testing.T) {
	tests := []struct {
		name string
		p, q Univariate
		want Univariate
	}{
		{"both zero", Univariate{}, Univariate{}, Univariate{}},
		{"one zero", Univariate{}, UnivariateFromInts(2, 4), utP("1/2", "1")},
		{"coprime", UnivariateFromInts(-2, 0, 1), UnivariateFromInts(1, 1), UnivariateFromInts(1)},
		{"common factor", utFromRoots("1", "2", "3"), utFromRoots("2", "3", "4").Scale(big.NewRat(-5, 7)), utFromRoots("2", "3")},
		{"rational roots", utFromRoots("1/2", "-2/3"), utFromRoots("-2/3"), utFromRoots("-2/3")},
		{"irreducible factor", UnivariateFromInts(-2, 0, 1).Mul(UnivariateFromInts(1, 1)), UnivariateFromInts(-2, 0, 1).Mul(UnivariateFromInts(1, 0, 1)), UnivariateFromInts(-2, 0, 1)},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := UnivariateGCD(tc.p, tc.q); !got.Equal(tc.want) {
				t.Errorf("gcd = %s, want %s", got.String("t"), tc.want.String("t"))
			}
			if got := UnivariateGCD(tc.q, tc.p); !got.Equal(tc.want) {
				t.Errorf("gcd swapped = %s, want %s", got.String("t"), tc.want.String("t"))
			}
		})
	}
}

func TestUnivariateSquareFree(t *testing.T) {
	tests := []struct {
		name string
		p    Univariate
		want Univariate
	}{
		{"zero", Univariate{}, Univariate{}},
		{"constant", UnivariateFromInts(-3), UnivariateFromInts(1)},
		{"already", UnivariateFromInts(-4, 0, 2), UnivariateFromInts(-2, 0, 1)},
		{"(t-1)^3(t+2)", utPow(utFromRoots("1"), 3).Mul(utFromRoots("-2")), utFromRoots("1", "-2")},
		{"(t^2-2)^2 (t^2+1)^3 * 5", utPow(UnivariateFromInts(-2, 0, 1), 2).Mul(utPow(UnivariateFromInts(1, 0, 1), 3)).Scale(big.NewRat(5, 1)),
			UnivariateFromInts(-2, 0, 1).Mul(UnivariateFromInts(1, 0, 1))},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := tc.p.SquareFree(); !got.Equal(tc.want) {
				t.Errorf("got %s, want %s", got.String("t"), tc.want.String("t"))
			}
		})
	}
}

func TestUnivariateString(t *testing.T) {
	tests := []struct {
		p    Univariate
		v    string
		want string
	}{
		{UnivariateFromInts(-2, 0, 1), "t", "t^2 - 2"},
		{utP("1", "3/2"), "t", "3/2*t + 1"},
		{utP("-1/2", "-1"), "x", "-x - 1/2"},
		{UnivariateFromInts(0, -3, 0, 1), "s", "s^3 - 3*s"},
		{UnivariateFromInts(1, 1), "", "t + 1"},
		{UnivariateFromInts(0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, -12), "t", "-12*t^12"},
	}
	for _, tc := range tests {
		if got := tc.p.String(tc.v); got != tc.want {
			t.Errorf("String(%q) = %q, want %q", tc.v, got, tc.want)
		}
	}
}

func TestUnivariateStringRoundTrip(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 5))
	for range 300 {
		p := utRandPoly(rng, rng.IntN(8))
		s := p.String("t")
		q, err := utParse(s, "t")
		if err != nil {
			t.Fatalf("parse %q: %v", s, err)
		}
		if !q.Equal(p) {
			t.Fatalf("%q read back as %q", s, q.String("t"))
		}
	}
}

// ---------------------------------------------------------------------------
// Sturm sequences and counting

func TestSturmSequence(t *testing.T) {
	// t^3 - 3t + 1: p' = 3t^2 - 3, rem(p, p') = -2t + 1, rem(p', 2t - 1) = -9/4.
	got := UnivariateFromInts(1, -3, 0, 1).SturmSequence()
	want := []Univariate{UnivariateFromInts(1, -3, 0, 1), UnivariateFromInts(-3, 0, 3), UnivariateFromInts(-1, 2), utP("9/4")}
	if !slices.EqualFunc(got, want, Univariate.Equal) {
		t.Errorf("got %s, want %s", utSeqString(got), utSeqString(want))
	}
	// Non-square-free: the sequence ends with gcd(p, p') up to a constant.
	p := utPow(utFromRoots("1"), 2).Mul(utFromRoots("-1"))
	seq := p.SturmSequence()
	if last := seq[len(seq)-1]; !last.Monic().Equal(utFromRoots("1")) {
		t.Errorf("last element %s, want a multiple of t - 1", last.String("t"))
	}
	if s := (Univariate{}).SturmSequence(); s != nil {
		t.Errorf("zero: %s", utSeqString(s))
	}
	if s := UnivariateFromInts(4).SturmSequence(); len(s) != 1 {
		t.Errorf("constant: %s", utSeqString(s))
	}
}

func utSeqString(seq []Univariate) string {
	parts := make([]string, len(seq))
	for i, p := range seq {
		parts[i] = p.String("t")
	}
	return "[" + strings.Join(parts, ", ") + "]"
}

func TestSturmCountRoots(t *testing.T) {
	sqrt2 := UnivariateFromInts(-2, 0, 1)
	cl, op := UBoundClosed, UBoundOpen
	ni, pi := UBoundNegInf(), UBoundPosInf()
	tests := []struct {
		name   string
		p      Univariate
		lo, hi UBound
		want   int
	}{
		{"t^2-2 everywhere", sqrt2, ni, pi, 2},
		{"t^2-2 positive", sqrt2, op(utR("0")), pi, 1},
		{"t^2-2 [1.41,1.42]", sqrt2, cl(utR("1.41")), cl(utR("1.42")), 1},
		{"t^2-2 [1.42,2]", sqrt2, cl(utR("1.42")), cl(utR("2")), 0},
		{"t^2-2 (-inf,-1.4142)", sqrt2, ni, op(utR("-1.4142")), 1},
		{"t^2-2 (-1.4142,1.4142)", sqrt2, op(utR("-1.4142")), op(utR("1.4142")), 0},
		{"t^2+1 none", UnivariateFromInts(1, 0, 1), ni, pi, 0},
		{"constant", UnivariateFromInts(3), ni, pi, 0},
		{"linear", UnivariateFromInts(3, 2), ni, pi, 1},
		{"(t-1)^3(t+2) distinct", utPow(utFromRoots("1"), 3).Mul(utFromRoots("-2")), ni, pi, 2},
		{"(t-1)^3(t+2) [1,1]", utPow(utFromRoots("1"), 3).Mul(utFromRoots("-2")), cl(utR("1")), cl(utR("1")), 1},
		{"(t-1)^3(t+2) (1,1]", utPow(utFromRoots("1"), 3).Mul(utFromRoots("-2")), op(utR("1")), cl(utR("1")), 0},
		{"empty lo > hi", sqrt2, cl(utR("2")), cl(utR("-2")), 0},
		{"lo = +inf", sqrt2, pi, pi, 0},
		{"hi = -inf", sqrt2, ni, ni, 0},
		{"wilkinson 10", utFromRoots("1", "2", "3", "4", "5", "6", "7", "8", "9", "10"), cl(utR("3")), op(utR("8")), 5},
		{"odd degree negative lead", UnivariateFromInts(0, 1, 0, -1), ni, pi, 3},
		{"close roots", utFromRoots("1/1000000", "2/1000000"), op(utR("0")), op(utR("3/2000000")), 1},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := tc.p.CountRoots(tc.lo, tc.hi); got != tc.want {
				t.Errorf("got %d, want %d", got, tc.want)
			}
		})
	}
}

// utKnownRoot is a root known independently: rational q or sign*sqrt(k).
type utKnownRoot struct {
	q    *big.Rat
	sign int
	k    *big.Rat
}

// cmp compares the root with v exactly, without the code under test.
func (r utKnownRoot) cmp(v *big.Rat) int {
	if r.q != nil {
		return r.q.Cmp(v)
	}
	// sign*sqrt(k) vs v.
	if r.sign > 0 {
		if v.Sign() < 0 {
			return 1
		}
		return r.k.Cmp(new(big.Rat).Mul(v, v))
	}
	if v.Sign() >= 0 {
		return -1
	}
	return new(big.Rat).Mul(v, v).Cmp(r.k)
}

func TestSturmCountRootsEndCombinations(t *testing.T) {
	rat := func(s string) utKnownRoot { return utKnownRoot{q: utR(s)} }
	tests := []struct {
		name   string
		p      Univariate
		roots  []utKnownRoot
		points []string
	}{
		{"(t-1)(t-2)(t-3)", utFromRoots("1", "2", "3"), []utKnownRoot{rat("1"), rat("2"), rat("3")},
			[]string{"-1", "0", "1", "3/2", "2", "5/2", "3", "4"}},
		{"(t-1)^3(t+2)", utPow(utFromRoots("1"), 3).Mul(utFromRoots("-2")), []utKnownRoot{rat("-2"), rat("1")},
			[]string{"-3", "-2", "0", "1", "2"}},
		{"-(2t-1)(t^2-2)(t^2+1)", UnivariateFromInts(-1, 2).Mul(UnivariateFromInts(-2, 0, 1)).Mul(UnivariateFromInts(1, 0, 1)).Neg(),
			[]utKnownRoot{{sign: -1, k: utR("2")}, rat("1/2"), {sign: 1, k: utR("2")}},
			[]string{"-2", "-1.5", "-1.4", "0", "1/2", "1", "1.4", "1.5", "3"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var bounds []UBound
			for _, s := range tc.points {
				bounds = append(bounds, UBoundClosed(utR(s)), UBoundOpen(utR(s)))
			}
			bounds = append(bounds, UBoundNegInf(), UBoundPosInf())
			for _, lo := range bounds {
				for _, hi := range bounds {
					want := 0
					for _, r := range tc.roots {
						in := true
						if lo.Inf > 0 || hi.Inf < 0 {
							in = false
						}
						if lo.Inf == 0 {
							c := r.cmp(lo.Value)
							in = in && (c > 0 || (c == 0 && !lo.Open))
						}
						if hi.Inf == 0 {
							c := r.cmp(hi.Value)
							in = in && (c < 0 || (c == 0 && !hi.Open))
						}
						if in {
							want++
						}
					}
					if got := tc.p.CountRoots(lo, hi); got != want {
						t.Errorf("CountRoots(%s, %s) = %d, want %d", utBoundString(lo, true), utBoundString(hi, false), got, want)
					}
				}
			}
		})
	}
}

func utBoundString(b UBound, lower bool) string {
	switch {
	case b.Inf < 0:
		return "(-inf"
	case b.Inf > 0:
		return "+inf)"
	case lower && b.Open:
		return "(" + b.Value.RatString()
	case lower:
		return "[" + b.Value.RatString()
	case b.Open:
		return b.Value.RatString() + ")"
	}
	return b.Value.RatString() + "]"
}

func TestSturmCountRootsPanics(t *testing.T) {
	for name, f := range map[string]func(){
		"zero poly": func() { Univariate{}.CountRoots(UBoundNegInf(), UBoundPosInf()) },
		"nil value": func() { UnivariateFromInts(1, 1).CountRoots(UBound{}, UBoundPosInf()) },
	} {
		t.Run(name, func(t *testing.T) {
			defer func() {
				if recover() == nil {
					t.Error("no panic")
				}
			}()
			f()
		})
	}
}

// ---------------------------------------------------------------------------
// root isolation

func TestRootIsolateKnown(t *testing.T) {
	tests := []struct {
		name   string
		p      Univariate
		digits int
		want   []string // Decimal(digits) of each root, ascending
		exact  []bool
	}{
		// sqrt 2 = 1.41421356237309504880168872... (decimal expansion of
		// sqrt 2, from memory).
		{"sqrt 2", UnivariateFromInts(-2, 0, 1), 21,
			[]string{"-1.41421356237309504880", "1.41421356237309504880"}, []bool{false, false}},
		// Golden ratio phi = 1.61803398874989484820458683... (from memory);
		// the other root of t^2 - t - 1 is 1 - phi.
		{"golden ratio", UnivariateFromInts(-1, -1, 1), 20,
			[]string{"-0.61803398874989484820", "1.6180339887498948482"}, []bool{false, false}},
		// Cube root of 2 = 1.25992104989487316476... (from memory).
		{"cube root of 2", UnivariateFromInts(-2, 0, 0, 1), 20,
			[]string{"1.2599210498948731648"}, []bool{false}},
		{"no real roots", UnivariateFromInts(1, 0, 1), 5, nil, nil},
		{"constant", UnivariateFromInts(5), 5, nil, nil},
		{"(t-1)^3(t+2)", utPow(utFromRoots("1"), 3).Mul(utFromRoots("-2")), 3,
			[]string{"-2.00", "1.00"}, []bool{true, true}},
		{"wilkinson 10", utFromRoots("1", "2", "3", "4", "5", "6", "7", "8", "9", "10"), 2,
			[]string{"1.0", "2.0", "3.0", "4.0", "5.0", "6.0", "7.0", "8.0", "9.0", "10"},
			[]bool{true, true, true, true, true, true, true, true, true, true}},
		{"mixed (2t-1)(t^2-2)(t^2+1)(3t+5)", UnivariateFromInts(-1, 2).Mul(UnivariateFromInts(-2, 0, 1)).Mul(UnivariateFromInts(1, 0, 1)).Mul(UnivariateFromInts(5, 3)), 6,
			[]string{"-1.66667", "-1.41421", "0.500000", "1.41421"}, []bool{true, false, true, false}},
		{"zero root t^3 - 2t", UnivariateFromInts(0, -2, 0, 1), 4,
			[]string{"-1.414", "0", "1.414"}, []bool{false, true, false}},
		{"tiny root", utP("-1/1000000000000", "1").Mul(UnivariateFromInts(-3, 0, 1)), 3,
			[]string{"-1.73", "1.00e-12", "1.73"}, []bool{false, true, false}},
		{"huge root 3^40", utFromRoots("12157665459056928801").Mul(UnivariateFromInts(-5, 0, 1)), 5,
			[]string{"-2.2361", "2.2361", "1.2158e+19"}, []bool{false, false, true}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			roots := tc.p.IsolateRoots()
			utCheckRoots(t, tc.p, roots)
			if len(roots) != len(tc.want) {
				t.Fatalf("got %d roots, want %d", len(roots), len(tc.want))
			}
			for i, r := range roots {
				if got := r.Decimal(tc.digits); got != tc.want[i] {
					t.Errorf("root %d: Decimal(%d) = %s, want %s", i, tc.digits, got, tc.want[i])
				}
				if (r.Exact != nil) != tc.exact[i] {
					t.Errorf("root %d: exact = %v, want %v", i, r.Exact != nil, tc.exact[i])
				}
			}
		})
	}
}

func TestRootIsolateIrrationalPoly(t *testing.T) {
	// The irrational roots carry the square-free part without its rational
	// roots: here (t^2 - 2)(t^2 - 3), monic.
	p := utPow(UnivariateFromInts(-2, 0, 1), 2).Mul(UnivariateFromInts(-3, 0, 1)).Mul(utFromRoots("1/3", "7")).Scale(big.NewRat(-6, 1))
	want := UnivariateFromInts(-2, 0, 1).Mul(UnivariateFromInts(-3, 0, 1))
	roots := p.IsolateRoots()
	utCheckRoots(t, p, roots)
	if len(roots) != 6 {
		t.Fatalf("got %d roots", len(roots))
	}
	for i, r := range roots {
		if r.Exact == nil && !r.Poly.Equal(want) {
			t.Errorf("root %d: Poly = %s, want %s", i, r.Poly.String("t"), want.String("t"))
		}
	}
}

func TestRootIsolateWilkinson20(t *testing.T) {
	var rs []string
	for i := 1; i <= 20; i++ {
		rs = append(rs, strconv.Itoa(i))
	}
	p := utFromRoots(rs...)
	roots := p.IsolateRoots()
	utCheckRoots(t, p, roots)
	if len(roots) != 20 {
		t.Fatalf("got %d roots", len(roots))
	}
	for i, r := range roots {
		if r.Exact == nil || r.Exact.Cmp(big.NewRat(int64(i+1), 1)) != 0 {
			t.Errorf("root %d = %+v, want exact %d", i, r, i+1)
		}
	}
	// Perturbed Wilkinson: (t-1)...(t-20) - 2^-23 t^19 has 10 real roots
	// (Wilkinson 1963); here we only check consistency with Sturm.
	q := p.Sub(NewUnivariate(append(make([]*big.Rat, 19), big.NewRat(1, 1<<23))...))
	qr := q.IsolateRoots()
	utCheckRoots(t, q, qr)
	if len(qr) != 10 {
		t.Errorf("perturbed Wilkinson: %d real roots, want 10", len(qr))
	}
}

func TestRootIsolateCloseRoots(t *testing.T) {
	// Mignotte-type polynomials t^n - 2(a t - 1)^2 have two real roots within
	// about a^-(n+2)/2 of 1/a.
	for _, tc := range []struct{ n, a int64 }{{4, 10}, {6, 10}, {7, 30}, {9, 100}} {
		t.Run(fmt.Sprintf("t^%d-2(%dt-1)^2", tc.n, tc.a), func(t *testing.T) {
			c := make([]int64, tc.n+1)
			c[tc.n] = 1
			c[0] -= 2
			c[1] += 4 * tc.a
			c[2] -= 2 * tc.a * tc.a
			p := UnivariateFromInts(c...)
			roots := p.IsolateRoots()
			utCheckRoots(t, p, roots)
			near := 0
			inv := big.NewRat(1, tc.a)
			for _, r := range roots {
				if d := new(big.Rat).Sub(r.Refine(big.NewRat(1, 1000*tc.a)).Lo, inv); new(big.Rat).Abs(d).Cmp(big.NewRat(1, 100*tc.a)) < 0 {
					near++
				}
			}
			if near != 2 {
				t.Errorf("%d roots near 1/%d, want 2", near, tc.a)
			}
		})
	}
}

func TestRootRationalRoots(t *testing.T) {
	pow70 := new(big.Rat).SetInt(new(big.Int).Lsh(big.NewInt(1), 70))
	tests := []struct {
		name string
		p    Univariate
		want []*big.Rat
	}{
		{"constant", UnivariateFromInts(7), nil},
		{"t^2-2", UnivariateFromInts(-2, 0, 1), nil},
		{"t(t-1)", UnivariateFromInts(0, -1, 1), utRats("0", "1")},
		{"6t^2-5t+1", UnivariateFromInts(1, -5, 6), utRats("1/3", "1/2")},
		{"rational coefficients", utP("-1/8", "0", "1/2"), utRats("-1/2", "1/2")},
		{"multiplicity", utPow(utFromRoots("-3/4"), 4).Mul(utFromRoots("5")), utRats("-3/4", "5")},
		{"big ratio", utFromRoots("123456789/987654321").Mul(UnivariateFromInts(1, 0, 1)), utRats("123456789/987654321")},
		{"huge lead (2^70 t - 3)(t^2 - 5)", NewUnivariate(big.NewRat(-3, 1), pow70).Mul(UnivariateFromInts(-5, 0, 1)),
			[]*big.Rat{new(big.Rat).Quo(big.NewRat(3, 1), pow70)}},
		{"large primes", utFromRoots("1000000007", "-999999937").Mul(UnivariateFromInts(1, 1, 1)), utRats("-999999937", "1000000007")},
		{"many divisors", utFromRoots("720720", "1/720720", "-360360/7"), utRats("-360360/7", "1/720720", "720720")},
		{"huge constant", utFromRoots("170141183460469231731687303715884105727", "-1/3").Mul(UnivariateFromInts(-2, 0, 1)),
			utRats("-1/3", "170141183460469231731687303715884105727")},
		{"close rationals", utFromRoots("1/1000000", "1000001/1000000000000", "-7/5"), utRats("-7/5", "1/1000000", "1000001/1000000000000")},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := tc.p.RationalRoots()
			if !utRatsEqual(got, tc.want) {
				t.Errorf("got %s, want %s", utRatsString(got), utRatsString(tc.want))
			}
		})
	}
}

// utQuad is an irreducible quadratic with its real roots, known exactly.
type utQuad struct {
	name  string
	p     Univariate
	roots []utKnownRoot // ascending
}

func TestRootIsolateProperty(t *testing.T) {
	// 3 +- sqrt 2 are the roots of t^2 - 6t + 7; shifting is not supported
	// by utKnownRoot, so its roots are checked by the sign change only.
	quads := []utQuad{
		{"t^2-2", UnivariateFromInts(-2, 0, 1), []utKnownRoot{{sign: -1, k: utR("2")}, {sign: 1, k: utR("2")}}},
		{"t^2-3", UnivariateFromInts(-3, 0, 1), []utKnownRoot{{sign: -1, k: utR("3")}, {sign: 1, k: utR("3")}}},
		{"2t^2-7", UnivariateFromInts(-7, 0, 2), []utKnownRoot{{sign: -1, k: utR("7/2")}, {sign: 1, k: utR("7/2")}}},
		{"t^2+1", UnivariateFromInts(1, 0, 1), nil},
		{"t^2-t-1", UnivariateFromInts(-1, -1, 1), nil},
		{"t^2-6t+7", UnivariateFromInts(7, -6, 1), nil},
	}
	nreal := map[string]int{"t^2+1": 0}
	rng := rand.New(rand.NewPCG(2024, 1829))
	for trial := range 150 {
		q := quads[rng.IntN(len(quads))]
		var rats []*big.Rat
		p := q.p
		for range rng.IntN(6) {
			r := big.NewRat(rng.Int64N(41)-20, rng.Int64N(6)+1)
			if !slices.ContainsFunc(rats, func(x *big.Rat) bool { return x.Cmp(r) == 0 }) {
				rats = append(rats, r)
			}
			p = p.Mul(utPow(utLin(r), 1+rng.IntN(3)))
		}
		p = p.Scale(big.NewRat(rng.Int64N(19)-9|1, rng.Int64N(7)+1))
		sort.Slice(rats, func(i, j int) bool { return rats[i].Cmp(rats[j]) < 0 })
		wantIrr := 2
		if n, ok := nreal[q.name]; ok {
			wantIrr = n
		}

		roots := p.IsolateRoots()
		utCheckRoots(t, p, roots)
		var gotRats []*big.Rat
		var irr []URoot
		for _, r := range roots {
			if r.Exact != nil {
				gotRats = append(gotRats, r.Exact)
			} else {
				irr = append(irr, r)
			}
		}
		if !utRatsEqual(gotRats, rats) {
			t.Fatalf("trial %d %s: rational roots %s, want %s", trial, p.String("t"), utRatsString(gotRats), utRatsString(rats))
		}
		if got := p.RationalRoots(); !utRatsEqual(got, rats) {
			t.Fatalf("trial %d: RationalRoots %s, want %s", trial, utRatsString(got), utRatsString(rats))
		}
		if len(irr) != wantIrr {
			t.Fatalf("trial %d %s: %d irrational roots, want %d", trial, p.String("t"), len(irr), wantIrr)
		}
		for i, r := range irr {
			if q.p.Sign(r.Lo)*q.p.Sign(r.Hi) >= 0 {
				t.Errorf("trial %d: %s does not change sign on [%s, %s]", trial, q.name, r.Lo.RatString(), r.Hi.RatString())
			}
			if q.roots != nil && (q.roots[i].cmp(r.Lo) <= 0 || q.roots[i].cmp(r.Hi) >= 0) {
				t.Errorf("trial %d: root %d of %s not in (%s, %s)", trial, i, q.name, r.Lo.RatString(), r.Hi.RatString())
			}
		}
	}
}

func TestRootIsolateRandomConsistency(t *testing.T) {
	// Arbitrary random polynomials: invariants and agreement with Sturm.
	rng := rand.New(rand.NewPCG(99, 100))
	for range 150 {
		p := utRandPoly(rng, 1+rng.IntN(10))
		if p.IsZero() {
			continue
		}
		utCheckRoots(t, p, p.IsolateRoots())
	}
}

func TestRootIsolatePanicsOnZero(t *testing.T) {
	defer func() {
		if recover() == nil {
			t.Error("no panic")
		}
	}()
	Univariate{}.IsolateRoots()
}

// ---------------------------------------------------------------------------
// refining, comparing, printing

func TestRootRefine(t *testing.T) {
	p := UnivariateFromInts(-2, 0, 1)
	roots := p.IsolateRoots()
	r := roots[1]
	lo0, hi0 := new(big.Rat).Set(r.Lo), new(big.Rat).Set(r.Hi)
	for _, w := range []string{"1", "1/1000", "1/1000000000000000000000000000000"} {
		width := utR(w)
		rr := r.Refine(width)
		if d := new(big.Rat).Sub(rr.Hi, rr.Lo); d.Cmp(width) > 0 || d.Sign() <= 0 {
			t.Errorf("width %s: got interval of width %s", w, d.RatString())
		}
		if rr.Lo.Cmp(lo0) < 0 || rr.Hi.Cmp(hi0) > 0 {
			t.Errorf("width %s: interval grew", w)
		}
		// sqrt 2 in (Lo, Hi): Lo^2 < 2 < Hi^2.
		if new(big.Rat).Mul(rr.Lo, rr.Lo).Cmp(utR("2")) >= 0 || new(big.Rat).Mul(rr.Hi, rr.Hi).Cmp(utR("2")) <= 0 {
			t.Errorf("width %s: sqrt 2 not in (%s, %s)", w, rr.Lo.RatString(), rr.Hi.RatString())
		}
		if rr.Poly.Sign(rr.Lo) == 0 || rr.Poly.Sign(rr.Hi) == 0 {
			t.Errorf("width %s: Poly vanishes at an end", w)
		}
	}
	if r.Lo.Cmp(lo0) != 0 || r.Hi.Cmp(hi0) != 0 {
		t.Error("Refine modified its receiver")
	}
	// A midpoint that is the root makes the result exact.
	ex := URoot{Poly: UnivariateFromInts(-1, 2).Mul(UnivariateFromInts(1, 0, 1)), Lo: utR("0"), Hi: utR("1")}.Refine(utR("1/10"))
	if ex.Exact == nil || ex.Exact.Cmp(utR("1/2")) != 0 {
		t.Errorf("Refine to a dyadic root: %+v", ex)
	}
	// Exact roots are returned as they are.
	e := URoot{Poly: utLin(utR("3")), Lo: utR("3"), Hi: utR("3"), Exact: utR("3")}.Refine(utR("1"))
	if e.Exact.Cmp(utR("3")) != 0 {
		t.Errorf("exact: %+v", e)
	}
}

func TestRootRefineFallback(t *testing.T) {
	// URoots built by hand may break the sign invariant, e.g. a double root
	// or an end that is another root; Sturm counts take over then.
	tests := []struct {
		name   string
		r      URoot
		digits int
		want   string
	}{
		{"double sqrt 2", URoot{Poly: utPow(UnivariateFromInts(-2, 0, 1), 2), Lo: utR("1"), Hi: utR("2")}, 10, "1.414213562"},
		{"double root at 1", URoot{Poly: utPow(utFromRoots("1"), 2), Lo: utR("0"), Hi: utR("3")}, 5, "1.0000"},
		{"lower end is a root", URoot{Poly: utFromRoots("0", "1/3").Mul(UnivariateFromInts(1, 0, 1)), Lo: utR("0"), Hi: utR("1")}, 4, "0.3333"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := tc.r.Decimal(tc.digits); got != tc.want {
				t.Errorf("Decimal = %s, want %s", got, tc.want)
			}
			rr := tc.r.Refine(utR("1/1000000"))
			if rr.Exact == nil && new(big.Rat).Sub(rr.Hi, rr.Lo).Cmp(utR("1/1000000")) > 0 {
				t.Errorf("Refine did not shrink: [%s, %s]", rr.Lo.RatString(), rr.Hi.RatString())
			}
		})
	}
}

func TestRootCompareRat(t *testing.T) {
	sqrt2 := UnivariateFromInts(-2, 0, 1).IsolateRoots()[1]
	tests := []struct {
		name string
		r    URoot
		q    string
		want int
	}{
		{"sqrt2 vs 7/5", sqrt2, "7/5", 1},
		{"sqrt2 vs 3/2", sqrt2, "3/2", -1},
		{"sqrt2 vs 1.41421356237", sqrt2, "1.41421356237", 1},
		{"sqrt2 vs 1.41421356238", sqrt2, "1.41421356238", -1},
		{"sqrt2 vs -10", sqrt2, "-10", 1},
		{"sqrt2 vs 10", sqrt2, "10", -1},
		{"exact", URoot{Poly: utLin(utR("1/3")), Lo: utR("1/3"), Hi: utR("1/3"), Exact: utR("1/3")}, "1/3", 0},
		{"rational inside a hand-made interval", URoot{Poly: utFromRoots("1/3").Mul(UnivariateFromInts(1, 0, 1)), Lo: utR("0"), Hi: utR("1")}, "1/3", 0},
		{"hand-made wide interval", URoot{Poly: UnivariateFromInts(-2, 0, 1), Lo: utR("0"), Hi: utR("100")}, "1.5", -1},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := tc.r.CompareRat(utR(tc.q)); got != tc.want {
				t.Errorf("got %d, want %d", got, tc.want)
			}
		})
	}
}

func TestRootCompareRoots(t *testing.T) {
	sqrt2 := UnivariateFromInts(-2, 0, 1).IsolateRoots()[1]
	sqrt3 := UnivariateFromInts(-3, 0, 1).IsolateRoots()[1]
	// t^4 - 4 = (t^2 - 2)(t^2 + 2): the same sqrt 2 from another polynomial.
	sqrt2b := URoot{Poly: UnivariateFromInts(-4, 0, 0, 0, 1), Lo: utR("1"), Hi: utR("3")}
	// sqrt(2 + 10^-20): distinct from sqrt 2 by about 3.5e-21.
	near := URoot{Poly: utP("-200000000000000000001/100000000000000000000", "0", "1"), Lo: utR("1"), Hi: utR("2")}
	half := URoot{Poly: utLin(utR("1/2")), Lo: utR("1/2"), Hi: utR("1/2"), Exact: utR("1/2")}
	phi := UnivariateFromInts(-1, -1, 1).IsolateRoots()[1]
	tests := []struct {
		name string
		a, b URoot
		want int
	}{
		{"sqrt2 < sqrt3", sqrt2, sqrt3, -1},
		{"sqrt3 > sqrt2", sqrt3, sqrt2, 1},
		{"same sqrt2, other polynomial", sqrt2, sqrt2b, 0},
		{"same sqrt2, itself", sqrt2, sqrt2, 0},
		{"very close roots", sqrt2, near, -1},
		{"very close roots swapped", near, sqrt2, 1},
		{"exact vs irrational", half, sqrt2, -1},
		{"irrational vs exact", sqrt2, half, 1},
		{"exact vs exact", half, half, 0},
		{"phi vs sqrt3 (overlapping)", URoot{Poly: phi.Poly, Lo: utR("1"), Hi: utR("2")}, URoot{Poly: sqrt3.Poly, Lo: utR("1"), Hi: utR("2")}, -1},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := CompareRoots(tc.a, tc.b); got != tc.want {
				t.Errorf("got %d, want %d", got, tc.want)
			}
		})
	}
}

func TestRootDecimalExact(t *testing.T) {
	ex := func(s string) URoot {
		r := utR(s)
		return URoot{Poly: utLin(r), Lo: r, Hi: r, Exact: r}
	}
	tests := []struct {
		x      string
		digits int
		want   string
	}{
		{"1/3", 5, "0.33333"},
		{"2/3", 5, "0.66667"},
		{"5", 3, "5.00"},
		{"-5", 1, "-5"},
		{"0", 4, "0"},
		{"123456789", 3, "1.23e+08"},
		{"123456789", 9, "123456789"},
		{"123456789", 12, "123456789.000"},
		{"-1/8", 2, "-0.13"},
		{"1/8", 2, "0.13"},
		{"9.995", 3, "10.0"},
		{"-9.995", 3, "-10.0"},
		{"9.994", 3, "9.99"},
		{"1/1000000000", 2, "1.0e-09"},
		{"0.0001234", 3, "0.000123"},
		{"0.00000001234", 3, "1.23e-08"},
		{"99999", 2, "1.0e+05"},
		{"1/7", 0, "0.1"},
	}
	for _, tc := range tests {
		if got := ex(tc.x).Decimal(tc.digits); got != tc.want {
			t.Errorf("Decimal(%s, %d) = %s, want %s", tc.x, tc.digits, got, tc.want)
		}
	}
}

func TestRootDecimalBoundaries(t *testing.T) {
	// Non-exact URoots whose root is a rational rounding boundary or 0: the
	// bisection alone would never settle these.
	tests := []struct {
		name   string
		r      URoot
		digits int
		want   string
	}{
		{"tie 1/8", URoot{Poly: UnivariateFromInts(-1, 8).Mul(UnivariateFromInts(5, 0, 1)), Lo: utR("0"), Hi: utR("1")}, 2, "0.13"},
		{"tie -1/8", URoot{Poly: UnivariateFromInts(1, 8).Mul(UnivariateFromInts(5, 0, 1)), Lo: utR("-1"), Hi: utR("-1/10")}, 2, "-0.13"},
		{"tie -9.995", URoot{Poly: UnivariateFromInts(1999, 200), Lo: utR("-11"), Hi: utR("-9")}, 3, "-10.0"},
		{"tie 9.995", URoot{Poly: UnivariateFromInts(-1999, 200), Lo: utR("9"), Hi: utR("11")}, 3, "10.0"},
		{"zero", URoot{Poly: UnivariateFromInts(0, 1, 0, 1), Lo: utR("-1"), Hi: utR("3")}, 3, "0"},
		{"end at zero", URoot{Poly: UnivariateFromInts(-1, 0, 2), Lo: utR("0"), Hi: utR("1")}, 3, "0.707"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := tc.r.Decimal(tc.digits); got != tc.want {
				t.Errorf("got %s, want %s", got, tc.want)
			}
		})
	}
}

func TestRootDecimalAgainstBigFloat(t *testing.T) {
	// sqrt(k) by big.Float at 1000 bits as an independent reference: the
	// string must be within half a unit of its last digit.
	for _, k := range []int64{2, 3, 5, 7, 10, 99, 1000001, 123456789} {
		for _, digits := range []int{1, 2, 5, 12, 30, 60} {
			r := UnivariateFromInts(-k, 0, 1).IsolateRoots()[1]
			s := r.Decimal(digits)
			got, ok := new(big.Rat).SetString(s)
			if !ok {
				t.Fatalf("sqrt %d: unparsable %q", k, s)
			}
			ref := new(big.Float).SetPrec(1000).Sqrt(new(big.Float).SetPrec(1000).SetInt64(k))
			refRat, _ := ref.Rat(nil)
			e := uExp10(got)
			ulp := new(big.Rat).SetFrac(big.NewInt(1), big.NewInt(1))
			for range digits - 1 - e {
				ulp.Quo(ulp, big.NewRat(10, 1))
			}
			for range e - digits + 1 {
				ulp.Mul(ulp, big.NewRat(10, 1))
			}
			diff := new(big.Rat).Sub(got, refRat)
			diff.Abs(diff)
			diff.Mul(diff, big.NewRat(2, 1))
			if diff.Cmp(ulp) > 0 {
				t.Errorf("sqrt %d to %d digits: %s is off by more than half a unit", k, digits, s)
			}
			if n := len(strings.TrimLeft(strings.ReplaceAll(strings.Split(s, "e")[0], ".", ""), "0")); n != digits {
				t.Errorf("sqrt %d: %q has %d significant digits, want %d", k, s, n, digits)
			}
		}
	}
}

// ---------------------------------------------------------------------------
// gonum as a reference

// utEigenRoots returns the eigenvalues of the companion matrix of p.
func utEigenRoots(t *testing.T, p Univariate) []complex128 {
	n := p.Degree()
	lead := p.Lead()
	c := mat.NewDense(n, n, nil)
	for i := range n {
		if i > 0 {
			c.Set(i, i-1, 1)
		}
		a, _ := new(big.Rat).Quo(p.Coeffs()[i], lead).Float64()
		c.Set(i, n-1, -a)
	}
	var eig mat.Eigen
	if !eig.Factorize(c, mat.EigenNone) {
		t.Fatalf("eigen decomposition failed for %s", p.String("t"))
	}
	return eig.Values(nil)
}

func TestRootGonumReference(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	compared := 0
	for range 300 {
		deg := 1 + rng.IntN(8)
		c := make([]int64, deg+1)
		for i := range c {
			c[i] = rng.Int64N(19) - 9
		}
		if c[deg] == 0 {
			c[deg] = 1 + rng.Int64N(5)
		}
		p := UnivariateFromInts(c...)
		var reals []float64
		ambiguous := false
		for _, z := range utEigenRoots(t, p) {
			switch im := math.Abs(imag(z)); {
			case im < 1e-9:
				reals = append(reals, real(z))
			case im < 1e-4:
				ambiguous = true
			}
		}
		sort.Float64s(reals)
		for i := 1; i < len(reals); i++ {
			if reals[i]-reals[i-1] < 1e-6 {
				ambiguous = true // a multiple or very close pair: floats can't tell
			}
		}
		if ambiguous {
			continue
		}
		compared++
		roots := p.IsolateRoots()
		if len(roots) != len(reals) {
			t.Errorf("%s: %d real roots, gonum finds %d (%v)", p.String("t"), len(roots), len(reals), reals)
			continue
		}
		for i, r := range roots {
			rr := r.Refine(big.NewRat(1, 1<<40))
			lo, _ := rr.Lo.Float64()
			hi, _ := rr.Hi.Float64()
			if reals[i] < lo-1e-7 || reals[i] > hi+1e-7 {
				t.Errorf("%s: root %d in [%g, %g], gonum says %g", p.String("t"), i, lo, hi, reals[i])
			}
		}
		// Counts on random intervals whose ends stay away from every root.
		for range 5 {
			a := big.NewRat(rng.Int64N(81)-40, 4)
			b := new(big.Rat).Add(a, big.NewRat(1+rng.Int64N(40), 4))
			af, _ := a.Float64()
			bf, _ := b.Float64()
			want := 0
			clear := true
			for _, x := range reals {
				if math.Abs(x-af) < 1e-6 || math.Abs(x-bf) < 1e-6 {
					clear = false
				}
				if x > af && x < bf {
					want++
				}
			}
			if !clear {
				continue
			}
			if got := p.CountRoots(UBoundOpen(a), UBoundClosed(b)); got != want {
				t.Errorf("%s: CountRoots(%s, %s] = %d, gonum says %d", p.String("t"), a.RatString(), b.RatString(), got, want)
			}
		}
	}
	if compared < 150 {
		t.Errorf("only %d of 300 polynomials compared", compared)
	}
}

// ---------------------------------------------------------------------------

func BenchmarkIsolateRoots(b *testing.B) {
	// Degree 12: (t^2-2)(t^2-3)(t^2-5)(2t-1)(t-7)(t^2+1)(t^2-t-1).
	p := UnivariateFromInts(-2, 0, 1).
		Mul(UnivariateFromInts(-3, 0, 1)).
		Mul(UnivariateFromInts(-5, 0, 1)).
		Mul(UnivariateFromInts(-1, 2)).
		Mul(UnivariateFromInts(-7, 1)).
		Mul(UnivariateFromInts(1, 0, 1)).
		Mul(UnivariateFromInts(-1, -1, 1))
	if p.Degree() != 12 {
		b.Fatalf("degree %d", p.Degree())
	}
	for b.Loop() {
		if n := len(p.IsolateRoots()); n != 10 {
			b.Fatalf("%d roots", n)
		}
	}
}
