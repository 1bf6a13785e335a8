package poly

import (
	"fmt"
	"math/big"
	"slices"
)

// Sturm is the Sturm sequence of the square-free part of a non-zero
// polynomial P, built once: every later count of distinct real roots in an
// interval costs only the evaluation of the sequence at its two ends
// (Sturm 1829; see CountRoots).
type Sturm struct {
	P  Univariate
	st uSturm // nil for a constant
}

// NewSturm builds the Sturm sequence of p's square-free part. It panics if p
// is zero.
func NewSturm(p Univariate) *Sturm {
	if p.IsZero() {
		panic("poly: Sturm sequence of the zero polynomial")
	}
	if p.Degree() == 0 {
		return &Sturm{P: p}
	}
	return &Sturm{p, newUSturm(p.SquareFree())}
}

// Count returns the number of distinct real roots in the interval from lo to
// hi, with the conventions of CountRoots.
func (s *Sturm) Count(lo, hi UBound) int {
	if (lo.Inf == 0 && lo.Value == nil) || (hi.Inf == 0 && hi.Value == nil) {
		panic("poly: CountRoots with a nil finite bound")
	}
	if lo.Inf > 0 || hi.Inf < 0 || s.st == nil {
		return 0
	}
	zero := func(b UBound) bool { return b.Inf == 0 && s.st[0].signAt(b.Value) == 0 }
	if lo.Inf == 0 && hi.Inf == 0 {
		switch lo.Value.Cmp(hi.Value) {
		case 1:
			return 0
		case 0:
			if !lo.Open && !hi.Open && zero(lo) {
				return 1
			}
			return 0
		}
	}
	n := s.st.varAtBound(lo) - s.st.varAtBound(hi)
	if !lo.Open && zero(lo) {
		n++
	}
	if hi.Open && zero(hi) {
		n--
	}
	return n
}

// RoundsTo reports that the unique root in (a, b) lies within half a unit of
// the last digit of the decimal dec (digits, an optional point, an optional
// exponent): dec is that root correctly rounded, or one of the two roundings
// of a root at a tie.
func (s *Sturm) RoundsTo(a, b *big.Rat, dec string) bool {
	v, half, ok := parseDecimal(dec)
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
	return lo.Cmp(hi) < 0 && s.Count(UBound{Value: lo, Open: true}, UBound{Value: hi, Open: true}) == 1
}

// Isolates reads an isolating interval [a, b] (a < b, exact rationals)
// and checks that P has exactly one root in it that dec rounds (RoundsTo).
func (s *Sturm) Isolates(iso [2]string, dec string) (a, b *big.Rat, err error) {
	a, ok1 := ParseRat(iso[0])
	b, ok2 := ParseRat(iso[1])
	switch {
	case !ok1 || !ok2 || a.Cmp(b) >= 0:
		return nil, nil, fmt.Errorf("(%s, %s) is not an interval with rational ends", iso[0], iso[1])
	case s.Count(UBound{Value: a}, UBound{Value: b}) != 1:
		return nil, nil, fmt.Errorf("not exactly one root in [%s, %s]", iso[0], iso[1])
	case !s.RoundsTo(a, b, dec):
		return nil, nil, fmt.Errorf("the root does not round to %s", dec)
	}
	return a, b, nil
}

// Tiling is a list of spans in increasing order, each next one starting
// where the previous one ends, with the shared end in exactly one of them,
// and every span a point or of positive length (the caller checks this with
// End.Same and Less). Its distinct ends are then distinct numbers, in
// increasing order, with disjoint isolating intervals.
type Tiling []Span

// Signs is what Tiling.Signs tells of a polynomial on each span.
type Signs struct {
	Positive    []bool // q > 0 at every point of the span
	NonPositive []bool // q ≤ 0 at every point of the span
	Negative    []bool // q < 0 at every point of the span
}

// Signs decides the sign of every polynomial of qs on every span of t,
// building each one's Sturm sequence once. ok[j] is false when the signs of
// qs[j] cannot be told: some real root of it in the tiled interval is not
// an end of a span.
//
// The argument: an algebraic end α (the unique root of P in (A, B)) is a
// root of q when P divides q, or else when gcd(P, q) has a root in (A, B);
// a rational end when q vanishes there. When the distinct ends that are
// roots of q are as many as q's distinct real roots in the tiled interval
// (Sturm), every root of q there is an end. Inside each span q then has no
// root and the sign of one rational sample point; at an end it is 0 where
// the end is a root, and else the sign on the neighbouring span's inside,
// by continuity.
func (t Tiling) Signs(qs []Univariate) (out []Signs, ok []bool) {
	// The distinct ends, in order; at[i] is the index of span i's lower end.
	var ends []End
	at := make([]int, len(t))
	for i, s := range t {
		if i == 0 || !s.Lo.Same(ends[len(ends)-1]) {
			ends = append(ends, s.Lo)
		}
		at[i] = len(ends) - 1
		if !s.Hi.Same(s.Lo) {
			ends = append(ends, s.Hi)
		}
	}
	// The distinct polynomials of the algebraic ends.
	var factors []Univariate
	factorOf := make([]int, len(ends))
	for k, e := range ends {
		factorOf[k] = -1
		if e.Algebraic() {
			j := 0
			for j < len(factors) && !factors[j].Equal(e.P) {
				j++
			}
			if j == len(factors) {
				factors = append(factors, e.P)
			}
			factorOf[k] = j
		}
	}
	// Which spans are points, and a rational sample inside each other one.
	point := make([]bool, len(t))
	samples := make([]*big.Rat, len(t))
	for i, s := range t {
		if point[i] = s.Point(); !point[i] {
			samples[i] = s.sample()
		}
	}
	lo, hi := t[0].Lo.inner(true), t[len(t)-1].Hi.inner(false)
	lo.Open, hi.Open = lo.Inf != 0, hi.Inf != 0
	out = make([]Signs, len(qs))
	ok = make([]bool, len(qs))
	for j, q := range qs {
		out[j] = Signs{make([]bool, len(t)), make([]bool, len(t)), make([]bool, len(t))}
		if q.IsZero() {
			ok[j] = true
			for i := range t {
				out[j].NonPositive[i] = true
			}
			continue
		}
		zero, fits := t.zeros(q, ends, factors, factorOf, lo, hi)
		if !fits {
			continue
		}
		ok[j] = true
		qi := uPrimitive(q) // the same sign as q everywhere
		inside := make([]int, len(t))
		for i := range t {
			if !point[i] {
				inside[i] = qi.signAt(samples[i])
			}
		}
		for i, s := range t {
			k := at[i]
			sign := inside[i]
			switch {
			case !point[i] && sign == 0:
				sign = 2 // a root inside: not when every root is an end
			case !point[i]:
			case zero[k]:
				sign = 0
			case s.Lo.Rational():
				sign = qi.signAt(s.Lo.Value)
			case i > 0 && !point[i-1]:
				sign = inside[i-1]
			case i+1 < len(t) && !point[i+1]:
				sign = inside[i+1]
			default:
				sign = 2 // undecided
			}
			closedZero := (s.Lo.Closed && s.Lo.Inf == 0 && zero[k]) || (s.Hi.Closed && s.Hi.Inf == 0 && zero[k+boolInt(!point[i])])
			out[j].Positive[i] = sign == 1 && !closedZero
			out[j].NonPositive[i] = sign == 0 || sign == -1
			out[j].Negative[i] = sign == -1 && !closedZero
		}
	}
	return out, ok
}

// zeros marks the ends that are roots of q and reports whether they are all
// of q's distinct real roots between lo and hi. Divisibility by an end's
// polynomial is tried first, once per polynomial; the gcd only when it does
// not account for every root.
func (t Tiling) zeros(q Univariate, ends []End, factors []Univariate, factorOf []int, lo, hi UBound) ([]bool, bool) {
	divides := make([]bool, len(factors))
	for j, f := range factors {
		if f.Degree() <= q.Degree() {
			_, r := q.DivMod(f)
			divides[j] = r.IsZero()
		}
	}
	roots := NewSturm(q).Count(lo, hi)
	zero := make([]bool, len(ends))
	mark := func(gcd bool) int {
		n := 0
		for k, e := range ends {
			switch {
			case e.Inf != 0:
			case e.Rational():
				zero[k] = q.Sign(e.Value) == 0
			case divides[factorOf[k]]:
				zero[k] = true
			case gcd && !zero[k]:
				g := UnivariateGCD(q, e.P)
				zero[k] = g.Degree() >= 1 && NewSturm(g).Count(UBound{Value: e.A, Open: true}, UBound{Value: e.B, Open: true}) == 1
			}
			n += boolInt(zero[k])
		}
		return n
	}
	return zero, mark(false) == roots || mark(true) == roots
}

func boolInt(b bool) int {
	if b {
		return 1
	}
	return 0
}

// CoprimeBasis returns square-free, pairwise coprime polynomials of degree
// ≥ 1 whose roots are together exactly the roots of the non-constant
// polynomials of ps, each dividing some of them: every p of ps has the same
// roots as the product of the elements that divide it. (A gcd-free basis:
// each new square-free p splits every element b it shares a factor
// g = gcd(p, b) with into g and b/g, and keeps what is left of p.)
func CoprimeBasis(ps []Univariate) []Univariate {
	var basis []Univariate
	for _, p := range ps {
		if p.Degree() < 1 {
			continue
		}
		p = p.SquareFree()
		var next []Univariate
		for _, b := range basis {
			g := UnivariateGCD(p, b)
			if g.Degree() < 1 {
				next = append(next, b)
				continue
			}
			next = append(next, g)
			if bg, _ := b.DivMod(g); bg.Degree() >= 1 {
				next = append(next, bg.Monic())
			}
			p, _ = p.DivMod(g)
		}
		if p.Degree() >= 1 {
			next = append(next, p.Monic())
		}
		basis = next
	}
	return basis
}

// Indefinite tells, for each span i with want[i], that a symmetric matrix
// with the leading principal minors ms (rational functions; those that
// involve variable v only are read, up to the first that does not) has a
// negative direction at every point of the span: its first leading minor
// that is not > 0 throughout is < 0 throughout. Jacobi: with Δ₁ … Δₖ₋₁ > 0
// and Δₖ < 0 the leading k×k block has exactly one negative eigenvalue. The
// minors' signs are computed in order, each once, and only until every
// wanted span has met its first minor that is not > 0. A span is false
// when the signs cannot be told.
func (t Tiling) Indefinite(ms []RatFunc, v int, want []bool) []bool {
	out := make([]bool, len(t))
	open := slices.Clone(want) // wanted spans whose first non-positive minor is still ahead
	for _, mi := range ms {
		if !slices.Contains(open, true) {
			break
		}
		u, ok := new(Poly).Mul(mi.Num, mi.DenPoly()).Univariate(v) // the sign of mi
		if !ok {
			break
		}
		signs, known := t.Signs([]Univariate{u})
		if !known[0] {
			break
		}
		for i := range t {
			if open[i] && !signs[0].Positive[i] {
				out[i], open[i] = signs[0].Negative[i], false
			}
		}
	}
	return out
}
