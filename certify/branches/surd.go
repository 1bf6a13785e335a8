package branches

import (
	"errors"
	"fmt"
	"math/big"

	"github.com/lyacert/lyacert/poly"
)

// Surd is a + b·√w with a, b and w rational functions of the parameters.
// W is shared by every value of one branch and is never a square in Q(p)
// (a square is taken out when the branch is solved), so a + b·√w = 0 exactly
// when a = b = 0. W nil means the value is rational (b = 0).
type Surd struct {
	A, B poly.RatFunc
	W    *poly.RatFunc
}

func zeroRF(r *poly.Ring) poly.RatFunc { return poly.FromPoly(poly.Zero(r)) }

func intRF(r *poly.Ring, n int64) poly.RatFunc { return poly.FromPoly(poly.ConstInt(r, n)) }

// Rational returns the surd f + 0·√w.
func Rational(f poly.RatFunc) Surd { return Surd{A: f, B: zeroRF(f.Ring())} }

func intSurd(r *poly.Ring, n int64) Surd { return Rational(intRF(r, n)) }

func (x Surd) w(y Surd) *poly.RatFunc {
	if x.W != nil {
		return x.W
	}
	return y.W
}

// Ring returns the ring of x.
func (x Surd) Ring() *poly.Ring { return x.A.Ring() }

// IsRational reports b = 0.
func (x Surd) IsRational() bool { return x.B.IsZero() }

// IsZero reports x = 0 (exact: w is not a square).
func (x Surd) IsZero() bool { return x.A.IsZero() && x.B.IsZero() }

// Add returns x + y.
func (x Surd) Add(y Surd) Surd { return Surd{x.A.Add(y.A), x.B.Add(y.B), x.w(y)} }

// Sub returns x − y.
func (x Surd) Sub(y Surd) Surd { return Surd{x.A.Sub(y.A), x.B.Sub(y.B), x.w(y)} }

// Neg returns −x.
func (x Surd) Neg() Surd { return Surd{x.A.Neg(), x.B.Neg(), x.W} }

// Conj returns a − b·√w.
func (x Surd) Conj() Surd { return Surd{x.A, x.B.Neg(), x.W} }

// Equal reports x = y.
func (x Surd) Equal(y Surd) bool { return x.Sub(y).IsZero() }

// Mul returns x·y = (a₁a₂ + b₁b₂w) + (a₁b₂ + a₂b₁)√w.
func (x Surd) Mul(y Surd) Surd {
	w := x.w(y)
	a := x.A.Mul(y.A)
	var b poly.RatFunc
	switch {
	case x.B.IsZero() && y.B.IsZero():
		b = zeroRF(x.Ring())
	case x.B.IsZero():
		b = x.A.Mul(y.B)
	case y.B.IsZero():
		b = x.B.Mul(y.A)
	default:
		b = x.A.Mul(y.B).Add(x.B.Mul(y.A))
		a = a.Add(x.B.Mul(y.B).Mul(*w))
	}
	return Surd{a, b, w}
}

// Norm returns x·conj(x) = a² − b²w, a rational function.
func (x Surd) Norm() poly.RatFunc {
	n := x.A.Mul(x.A)
	if !x.B.IsZero() {
		n = n.Sub(x.B.Mul(x.B).Mul(*x.W))
	}
	return n
}

var errDivZero = errors.New("division by zero")

// Quo returns x / y = x·conj(y) / (a² − b²w); the denominator of y must be
// free of states.
func (x Surd) Quo(y Surd) (Surd, error) {
	n := y.Norm()
	if n.IsZero() {
		return Surd{}, errDivZero
	}
	if y.B.IsZero() {
		return Surd{x.A.Quo(y.A), x.B.Quo(y.A), x.w(y)}, nil
	}
	c := x.Mul(y.Conj())
	return Surd{c.A.Quo(n), c.B.Quo(n), c.W}, nil
}

// Pow returns x^k, k ≥ 0.
func (x Surd) Pow(k int) Surd {
	out := intSurd(x.Ring(), 1)
	out.W = x.W
	for ; k > 0; k-- {
		out = out.Mul(x)
	}
	return out
}

// String writes a + b*sqrt(w) with the ring's names.
func (x Surd) String() string {
	if x.B.IsZero() {
		return ratString(x.A)
	}
	s := ratString(x.B) + "*sqrt(" + ratString(*x.W) + ")"
	if x.A.IsZero() {
		return s
	}
	return ratString(x.A) + " + " + s
}

func ratString(f poly.RatFunc) string {
	if f.IsPoly() && f.Num.NumTerms() > 1 {
		return "(" + f.String() + ")"
	}
	return f.String()
}

// surdSign returns the sign of a + b·√w for rationals with w ≥ 0: the sign
// of a when a, b agree, else the sign of a times that of a² − b²w.
func surdSign(sa, sb, sw, sn int) int {
	switch {
	case sb == 0 || sw == 0:
		return sa
	case sa == 0:
		return sb
	case sa == sb:
		return sa
	}
	return sa * sn
}

// point is one value of the free parameter: a rational (Exact) or an
// algebraic number isolated by Sturm sequences.
type point = poly.URoot

func ratPoint(q *big.Rat) point {
	v := new(big.Rat).Set(q)
	return point{Poly: poly.NewUnivariate(new(big.Rat).Neg(v), big.NewRat(1, 1)), Lo: v, Hi: v, Exact: v}
}

// evaluator decides signs of parameter functions at points of one free
// parameter (index pi in the ring); pi < 0 means no free parameter.
type evaluator struct {
	ring *poly.Ring
	pi   int
}

func (e evaluator) uni(p *poly.Poly) (poly.Univariate, error) {
	if e.pi < 0 {
		if !p.IsConst() {
			return poly.Univariate{}, fmt.Errorf("%s is not a constant", p)
		}
		return poly.NewUnivariate(p.ConstTerm()), nil
	}
	u, ok := p.Univariate(e.pi)
	if !ok {
		return poly.Univariate{}, fmt.Errorf("%s depends on more than one variable", p)
	}
	return u, nil
}

// polySign returns the sign of p at t: exact at a rational, and at an
// algebraic t zero when gcd(p, t's polynomial) has a root in the isolating
// interval, else the sign at an end after refining the interval clear of p's
// roots (Sturm's theorem).
func (e evaluator) polySign(p *poly.Poly, t point) (int, error) {
	u, err := e.uni(p)
	if err != nil {
		return 0, err
	}
	return uniSign(u, t)
}

func uniSign(u poly.Univariate, t point) (int, error) {
	if u.IsZero() {
		return 0, nil
	}
	if t.Exact != nil {
		return u.Sign(t.Exact), nil
	}
	open := func(v *big.Rat) poly.UBound { return poly.UBoundOpen(v) }
	if g := poly.UnivariateGCD(u, t.Poly); g.Degree() >= 1 && g.CountRoots(open(t.Lo), open(t.Hi)) > 0 {
		return 0, nil
	}
	for range 400 {
		if t.Exact != nil {
			return u.Sign(t.Exact), nil
		}
		if u.CountRoots(poly.UBoundClosed(t.Lo), poly.UBoundClosed(t.Hi)) == 0 {
			return u.Sign(t.Lo), nil
		}
		w := new(big.Rat).Sub(t.Hi, t.Lo)
		t = t.Refine(w.Quo(w, big.NewRat(2, 1)))
	}
	return 0, errors.New("sign at an algebraic point not decided")
}

// ratSign returns the sign of a rational function of the parameter at t.
func (e evaluator) ratSign(f poly.RatFunc, t point) (int, error) {
	s, err := e.polySign(f.Num, t)
	if err != nil || s == 0 {
		return s, err
	}
	for _, d := range f.Den {
		ds, err := e.polySign(d.P, t)
		if err != nil {
			return 0, err
		}
		if ds == 0 {
			return 0, errDivZero
		}
		if d.Mult%2 == 1 {
			s *= ds
		}
	}
	return s, nil
}

// sign returns the sign of the surd at t; w(t) must be ≥ 0.
func (e evaluator) sign(x Surd, t point) (int, error) {
	sa, err := e.ratSign(x.A, t)
	if err != nil {
		return 0, err
	}
	if x.B.IsZero() {
		return sa, nil
	}
	sb, err := e.ratSign(x.B, t)
	if err != nil {
		return 0, err
	}
	sw, err := e.ratSign(*x.W, t)
	if err != nil {
		return 0, err
	}
	if sw < 0 {
		return 0, errors.New("square root of a negative number")
	}
	sn := 0
	if sb != 0 && sw != 0 && sa != 0 && sa != sb {
		if sn, err = e.ratSign(x.Norm(), t); err != nil {
			return 0, err
		}
	}
	return surdSign(sa, sb, sw, sn), nil
}

// critical returns the polynomials whose roots are the only places where
// the sign of the surd can change or its value be undefined.
func critical(x Surd) []*poly.Poly {
	var out []*poly.Poly
	add := func(f poly.RatFunc) {
		out = append(out, f.Num)
		for _, d := range f.Den {
			out = append(out, d.P)
		}
	}
	add(x.A)
	if !x.B.IsZero() {
		add(x.B)
		add(*x.W)
		add(x.Norm())
	}
	return out
}

// signs decides the signs of parameter functions on a set of parameter
// values: one value (pointSigns) or a box (boxSigns). A sign is the one
// the function has at every value of the set; errUndecided says that the
// set's test does not decide it.
type signs interface {
	sign(x Surd) (int, error)
	polySign(p *poly.Poly) (int, error)
	ratSign(f poly.RatFunc) (int, error)
}

// errUndecided marks a sign that a box test leaves open.
var errUndecided = errors.New("sign not decided on the box")

// pointSigns decides signs at one value t of the free parameter.
type pointSigns struct {
	e evaluator
	t point
}

func (p pointSigns) sign(x Surd) (int, error)           { return p.e.sign(x, p.t) }
func (p pointSigns) polySign(q *poly.Poly) (int, error) { return p.e.polySign(q, p.t) }
func (p pointSigns) ratSign(f poly.RatFunc) (int, error) {
	return p.e.ratSign(f, p.t)
}

// centred is a set of parameter values with a rational centre: a box.
type centred interface {
	centre() signs
}

// signsAt returns the signs of xs under e.
func signsAt(e signs, xs []Surd) ([]int, error) {
	out := make([]int, len(xs))
	for i, x := range xs {
		s, err := e.sign(x)
		if err != nil {
			return nil, err
		}
		out[i] = s
	}
	return out, nil
}

// ratSigns decides signs exactly at a rational point of every ring
// variable.
type ratSigns struct{ at []*big.Rat }

func (s ratSigns) polySign(p *poly.Poly) (int, error) { return p.Eval(s.at).Sign(), nil }

func (s ratSigns) ratSign(f poly.RatFunc) (int, error) {
	v, err := f.Eval(s.at)
	if err != nil {
		return 0, errDivZero
	}
	return v.Sign(), nil
}

func (s ratSigns) sign(x Surd) (int, error) {
	a, err := x.A.Eval(s.at)
	if err != nil {
		return 0, errDivZero
	}
	if x.B.IsZero() {
		return a.Sign(), nil
	}
	b, err1 := x.B.Eval(s.at)
	w, err2 := x.W.Eval(s.at)
	if err1 != nil || err2 != nil {
		return 0, errDivZero
	}
	if w.Sign() < 0 {
		return 0, errors.New("square root of a negative number")
	}
	nm := new(big.Rat).Mul(a, a)
	nm.Sub(nm, new(big.Rat).Mul(new(big.Rat).Mul(b, b), w))
	return surdSign(a.Sign(), b.Sign(), w.Sign(), nm.Sign()), nil
}
