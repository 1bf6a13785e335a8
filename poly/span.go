package poly

import (
	"math/big"
	"strconv"
	"strings"
)

// End is an end of a real interval: −∞ (Inf < 0), +∞ (Inf > 0), a rational
// Value, or an algebraic number: the unique real root of P in the open
// interval (A, B). Closed says whether the end belongs to the interval.
type End struct {
	Inf    int
	Value  *big.Rat
	P      Univariate
	A, B   *big.Rat
	Closed bool
}

// Rational reports a finite rational end.
func (e End) Rational() bool { return e.Inf == 0 && e.Value != nil }

// Algebraic reports an end given by an isolating interval.
func (e End) Algebraic() bool { return e.Inf == 0 && e.Value == nil }

// Same reports that two ends denote the same number in the same way.
func (e End) Same(f End) bool {
	switch {
	case e.Inf != 0 || f.Inf != 0:
		return e.Inf == f.Inf
	case e.Rational() && f.Rational():
		return e.Value.Cmp(f.Value) == 0
	case e.Algebraic() && f.Algebraic():
		return e.P.Equal(f.P) && e.A.Cmp(f.A) == 0 && e.B.Cmp(f.B) == 0
	}
	return false
}

// Matches reports that e is the bound b of an interval, with the same
// openness.
func (e End) Matches(b Bound) bool {
	if b.Inf != 0 || e.Inf != 0 {
		return b.Inf == e.Inf
	}
	return e.Rational() && e.Value.Cmp(b.Value) == 0 && e.Closed == !b.Open
}

// inner returns the rational bound just inside an end: the value itself, the
// far side of an isolating interval, or an infinity.
func (e End) inner(upper bool) UBound {
	switch {
	case e.Inf < 0:
		return UBoundNegInf()
	case e.Inf > 0:
		return UBoundPosInf()
	case e.Rational():
		return UBound{Value: e.Value, Open: !e.Closed}
	case upper:
		return UBound{Value: e.A} // closed: A lies inside the span
	}
	return UBound{Value: e.B}
}

// Less reports lo < hi, decided exactly from rational values and disjoint
// isolating intervals (false when they overlap).
func Less(lo, hi End) bool {
	switch {
	case lo.Inf < 0 || hi.Inf > 0:
		return !(lo.Inf < 0 && hi.Inf < 0) && !(lo.Inf > 0 && hi.Inf > 0)
	case lo.Inf > 0 || hi.Inf < 0:
		return false
	}
	l := lo.Value
	if lo.Algebraic() {
		l = lo.B
	}
	h := hi.Value
	if hi.Algebraic() {
		h = hi.A
	}
	return l.Cmp(h) < 0
}

// Span is the interval between two ends.
type Span struct{ Lo, Hi End }

// Point reports a span of one point.
func (s Span) Point() bool { return s.Lo.Same(s.Hi) && s.Lo.Closed && s.Hi.Closed }

// PositiveOn reports q > 0 at every point of the span (Sturm's theorem: no
// root inside, the sign of one rational sample; at an algebraic end the only
// possible root is the end itself, decided through the gcd with its
// polynomial).
func (s Span) PositiveOn(q Univariate) bool {
	if q.IsZero() {
		return false
	}
	if s.Point() {
		return pointSign(q, s.Lo) > 0
	}
	return s.rootFree(q, true) && q.Sign(s.sample()) > 0
}

// NonPositiveOn reports q ≤ 0 at every point of the span (by continuity at
// the ends when q < 0 inside).
func (s Span) NonPositiveOn(q Univariate) bool {
	if q.IsZero() {
		return true
	}
	if s.Point() {
		return pointSign(q, s.Lo) <= 0
	}
	return s.rootFree(q, false) && q.Sign(s.sample()) < 0
}

// rootFree reports that q has no root in the span, with its closed ends
// included when withEnds.
func (s Span) rootFree(q Univariate, withEnds bool) bool {
	lo, hi := s.Lo.inner(false), s.Hi.inner(true)
	if !withEnds {
		if s.Lo.Rational() {
			lo.Open = true
		}
		if s.Hi.Rational() {
			hi.Open = true
		}
	}
	if q.CountRoots(lo, hi) != 0 {
		return false
	}
	// Between an algebraic end α and the inner side of its isolating
	// interval the only root q may have is α itself: q has one root in the
	// interval and shares a root there with α's polynomial.
	for _, e := range []End{s.Lo, s.Hi} {
		if !e.Algebraic() {
			continue
		}
		switch q.CountRoots(UBound{Value: e.A, Open: true}, UBound{Value: e.B, Open: true}) {
		case 0:
		case 1:
			g := UnivariateGCD(q, e.P)
			if g.Degree() < 1 || g.CountRoots(UBound{Value: e.A, Open: true}, UBound{Value: e.B, Open: true}) != 1 {
				return false
			}
			if withEnds && e.Closed {
				return false // q(α) = 0 on a closed algebraic end
			}
		default:
			return false
		}
	}
	return true
}

// sample returns a rational point inside a span of positive length.
func (s Span) sample() *big.Rat {
	lo, hi := s.Lo.inner(false), s.Hi.inner(true)
	switch {
	case lo.Inf < 0 && hi.Inf > 0:
		return new(big.Rat)
	case lo.Inf < 0:
		return new(big.Rat).Sub(hi.Value, big.NewRat(1, 1))
	case hi.Inf > 0:
		return new(big.Rat).Add(lo.Value, big.NewRat(1, 1))
	}
	m := new(big.Rat).Add(lo.Value, hi.Value)
	return m.Quo(m, big.NewRat(2, 1))
}

// pointSign returns the sign of q at a finite end; 2 when it cannot be decided.
func pointSign(q Univariate, e End) int {
	if e.Rational() {
		return q.Sign(e.Value)
	}
	if e.Inf != 0 {
		return 2
	}
	open := func(v *big.Rat) UBound { return UBound{Value: v, Open: true} }
	switch q.CountRoots(UBound{Value: e.A}, UBound{Value: e.B}) {
	case 0:
		return q.Sign(e.A)
	case 1:
		g := UnivariateGCD(q, e.P)
		if g.Degree() >= 1 && g.CountRoots(open(e.A), open(e.B)) == 1 {
			return 0
		}
	}
	return 2
}

// RoundsTo reports that the unique root of u in (a, b) lies within half a
// unit of the last digit of the decimal s (digits, an optional point, an
// optional exponent): s is that root correctly rounded, or one of the two
// roundings of a root at a tie, decided by Sturm's theorem.
func RoundsTo(u Univariate, a, b *big.Rat, s string) bool {
	v, half, ok := parseDecimal(s)
	if !ok {
		return false
	}
	lo, hi := new(big.Rat).Sub(v, half), new(big.Rat).Add(v, half)
	if lo.Cmp(a) < 0 {
		lo = a
	}
	if hi.Cmp(b) > 0 {
		hi = b
	}
	return lo.Cmp(hi) < 0 && u.CountRoots(UBound{Value: lo, Open: true}, UBound{Value: hi, Open: true}) == 1
}

// parseDecimal reads a decimal and returns it with half a unit of its last digit.
func parseDecimal(s string) (*big.Rat, *big.Rat, bool) {
	if len(s) > 1000 || strings.ContainsAny(s, "/ \t\n") {
		return nil, nil, false
	}
	mant, exp, _ := strings.Cut(strings.ToLower(s), "e")
	e := 0
	if exp != "" {
		var err error
		if e, err = strconv.Atoi(exp); err != nil || e < -1000 || e > 1000 {
			return nil, nil, false
		}
	}
	if _, frac, ok := strings.Cut(mant, "."); ok {
		e -= len(frac)
	}
	v, ok := new(big.Rat).SetString(s)
	if !ok {
		return nil, nil, false
	}
	// half = 5·10^(e−1)
	p := new(big.Rat).SetInt(new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(max(e-1, 1-e))), nil))
	half := big.NewRat(5, 1)
	if e-1 >= 0 {
		half.Mul(half, p)
	} else {
		half.Quo(half, p)
	}
	return v, half, true
}
