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
