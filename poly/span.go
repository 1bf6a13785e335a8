package poly

import (
	"errors"
	"fmt"
	"math/big"
	"slices"
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

// Tiles reports how spans fail to tile dom, nil when they do: every span
// a point or of positive length, the first starting where dom starts, each
// next one where the previous ends with the shared end in exactly one of
// them, and the last ending where dom ends.
func Tiles(spans []Span, dom Interval) error {
	if len(spans) == 0 {
		return errors.New("no pieces")
	}
	for i, sp := range spans {
		switch {
		case !sp.Point() && !Less(sp.Lo, sp.Hi):
			return fmt.Errorf("piece %d is empty", i+1)
		case i == 0 && !sp.Lo.Matches(dom.Lo):
			return fmt.Errorf("the first piece does not start at the lower end of %s", dom)
		case i > 0 && (!spans[i-1].Hi.Same(sp.Lo) || spans[i-1].Hi.Closed == sp.Lo.Closed):
			return fmt.Errorf("pieces %d and %d do not meet with their common end in exactly one", i, i+1)
		}
	}
	if !spans[len(spans)-1].Hi.Matches(dom.Hi) {
		return fmt.Errorf("the last piece does not end at the upper end of %s", dom)
	}
	return nil
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

// SignAt returns the sign of q at the point e (a rational end, or the
// unique root α of e.P in (e.A, e.B)), and false when it cannot tell within
// maxRefine bisections. At α: zero when gcd(P, q) has a root in (A, B) (α
// is P's only root there); else the interval is halved, keeping α (Sturm),
// until q has no root in it, and q's sign at any point of it is its sign
// at α.
func SignAt(q Univariate, e End) (int, bool) {
	const maxRefine = 4096
	switch {
	case q.Degree() <= 0: // a constant (or zero)
		return q.Sign(new(big.Rat)), true
	case e.Rational():
		return q.Sign(e.Value), true
	case !e.Algebraic():
		return 0, false
	}
	if g := UnivariateGCD(e.P, q); g.Degree() >= 1 && g.CountRoots(UBoundOpen(e.A), UBoundOpen(e.B)) > 0 {
		return 0, true
	}
	a, b := e.A, e.B
	for range maxRefine {
		if q.CountRoots(UBoundOpen(a), UBoundOpen(b)) == 0 {
			return q.Sign(uMid(a, b)), true
		}
		m := uMid(a, b)
		switch {
		case e.P.Sign(m) == 0:
			return q.Sign(m), true
		case e.P.CountRoots(UBoundOpen(a), UBoundOpen(m)) == 1:
			b = m
		default:
			a = m
		}
	}
	return 0, false
}

// NonNegativeAt reports that every function of defined and of nonneg is a
// rational function of variable v alone whose denominator is non-zero at
// the point e (rational or algebraic), and every function of nonneg is ≥ 0
// there; the signs are exact (SignAt).
func NonNegativeAt(e End, v int, defined, nonneg []RatFunc) bool {
	for k, f := range slices.Concat(defined, nonneg) {
		den, ok1 := f.DenPoly().Univariate(v)
		num, ok2 := new(Poly).Mul(f.Num, f.DenPoly()).Univariate(v)
		sd, ok3 := SignAt(den, e)
		sn, ok4 := SignAt(num, e)
		if !ok1 || !ok2 || !ok3 || !ok4 || sd == 0 || k >= len(defined) && sn < 0 {
			return false
		}
	}
	return true
}
