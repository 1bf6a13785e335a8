package poly

// Exact extended rational interval arithmetic.
//
// An Interval is a non-empty connected set of reals whose ends are finite
// rationals or ±infinity, each end either attained (closed) or not (open).
// This is the set-based flavor of IEEE 1788-2015 (intervals are sets of
// reals; infinity is never an element, only a bound), extended with open
// ends so that a strict assumption such as g > 0 stays strict through the
// arithmetic: (0, 1] × (0, 1] = (0, 1], not [0, 1].
//
// Every operation returns the exact range of the real operation over the
// operand sets — the tightest result, with each end's openness right — so
// the containment property of IEEE 1788-2015 (the result contains f(x, y)
// for every x in the first operand and y in the second) holds with
// equality rather than as an enclosure.
//
// Values are immutable: operations allocate new *big.Rat ends (or share
// ends of their operands) and never modify an existing one. Callers must
// not modify Bound.Value of an Interval they did not build themselves.
//
// Helper names in this file carry the prefix "iv" because other files of
// package poly are written independently.

import (
	"errors"
	"fmt"
	"math/big"
)

// Bound is one end of an interval: a finite rational, or ±infinity; Open
// reports that the end is not attained (infinite ends are always open).
//
// For a finite end Inf is 0 and Value is non-nil. For an infinite end Inf
// is -1 (lower end) or +1 (upper end); Value and Open are then ignored and
// the constructors store Value nil and Open true.
type Bound struct {
	Value *big.Rat
	Inf   int // -1, 0, +1
	Open  bool
}

// Interval is a non-empty connected set of reals with Bound ends (IEEE
// 1788-2015 set-based flavor, extended with open ends so that strict
// assumptions like g > 0 stay strict). The zero value is not valid; use
// the constructors Point, Closed, Entire or NewInterval.
//
// Division is deliberately not provided: lyacert never divides by
// intervals, and division by an interval containing zero (whose IEEE
// 1788-2015 result is a union of two intervals, or the whole line) is
// refused by design. Recip gives the exact reciprocal of an interval that
// does not contain zero and an error otherwise.
type Interval struct {
	Lo, Hi Bound
}

var (
	ivNegInf = Bound{Inf: -1, Open: true}
	ivPosInf = Bound{Inf: +1, Open: true}
	ivRatOne = big.NewRat(1, 1)
)

// ivClosedAt reports whether b is a finite, attained end.
func ivClosedAt(b Bound) bool { return b.Inf == 0 && !b.Open }

// ivOpenAt reports whether b is not attained (infinite ends always are not).
func ivOpenAt(b Bound) bool { return b.Inf != 0 || b.Open }

// ivFin returns a finite bound.
func ivFin(v *big.Rat, open bool) Bound { return Bound{Value: v, Open: open} }

// Point returns the degenerate interval [x, x]. It panics if x is nil.
func Point(x *big.Rat) Interval {
	if x == nil {
		panic("poly: Point(nil)")
	}
	v := new(big.Rat).Set(x)
	return Interval{ivFin(v, false), ivFin(v, false)}
}

// Closed returns [lo, hi]. It panics if lo or hi is nil or lo > hi; use
// NewInterval for checked construction.
func Closed(lo, hi *big.Rat) Interval {
	if lo == nil || hi == nil {
		panic("poly: Closed with nil end")
	}
	if lo.Cmp(hi) > 0 {
		panic(fmt.Sprintf("poly: Closed(%s, %s) is empty", lo.RatString(), hi.RatString()))
	}
	return Interval{ivFin(new(big.Rat).Set(lo), false), ivFin(new(big.Rat).Set(hi), false)}
}

// Entire returns (-inf, +inf), the set of all reals.
func Entire() Interval { return Interval{ivNegInf, ivPosInf} }

// NewInterval returns the interval with the given ends. Finite Values are
// copied; infinite ends are normalized (Value nil, Open true). It returns
// an error if an end is malformed (Inf outside {-1, 0, +1}, or finite with
// a nil Value) or if the set is empty: lo > hi, lo == hi with an open end,
// a lower end at +inf or an upper end at -inf.
func NewInterval(lo, hi Bound) (Interval, error) {
	var err error
	if lo, err = ivNormBound(lo, "lower"); err != nil {
		return Interval{}, err
	}
	if hi, err = ivNormBound(hi, "upper"); err != nil {
		return Interval{}, err
	}
	if lo.Inf == +1 || hi.Inf == -1 {
		return Interval{}, fmt.Errorf("poly: empty interval: lower end %s, upper end %s",
			ivBoundString(lo), ivBoundString(hi))
	}
	if lo.Inf == 0 && hi.Inf == 0 {
		c := lo.Value.Cmp(hi.Value)
		if c > 0 || (c == 0 && (lo.Open || hi.Open)) {
			return Interval{}, errors.New("poly: empty interval " + Interval{lo, hi}.String())
		}
	}
	return Interval{lo, hi}, nil
}

func ivNormBound(b Bound, which string) (Bound, error) {
	switch b.Inf {
	case -1, +1:
		return Bound{Inf: b.Inf, Open: true}, nil
	case 0:
		if b.Value == nil {
			return Bound{}, fmt.Errorf("poly: finite %s end with nil Value", which)
		}
		return ivFin(new(big.Rat).Set(b.Value), b.Open), nil
	default:
		return Bound{}, fmt.Errorf("poly: %s end has Inf = %d, want -1, 0 or +1", which, b.Inf)
	}
}

func ivBoundString(b Bound) string {
	switch {
	case b.Inf < 0:
		return "-inf"
	case b.Inf > 0:
		return "+inf"
	default:
		return RatString(b.Value)
	}
}

// String formats x as in "[0, 1)", "(-inf, 3/2]", "[2, 2]".
func (x Interval) String() string {
	l, r := "[", "]"
	if ivOpenAt(x.Lo) {
		l = "("
	}
	if ivOpenAt(x.Hi) {
		r = ")"
	}
	return l + ivBoundString(x.Lo) + ", " + ivBoundString(x.Hi) + r
}

// Add returns the exact range of s + t for s in x, t in y. An end is
// attained iff both summed ends are; an infinite end stays infinite.
func (x Interval) Add(y Interval) Interval {
	return Interval{ivAddBound(x.Lo, y.Lo, -1), ivAddBound(x.Hi, y.Hi, +1)}
}

func ivAddBound(a, b Bound, inf int) Bound {
	if a.Inf != 0 || b.Inf != 0 {
		return Bound{Inf: inf, Open: true}
	}
	return ivFin(new(big.Rat).Add(a.Value, b.Value), a.Open || b.Open)
}

// Neg returns {-s : s in x}.
func (x Interval) Neg() Interval {
	return Interval{ivNegBound(x.Hi), ivNegBound(x.Lo)}
}

func ivNegBound(b Bound) Bound {
	if b.Inf != 0 {
		return Bound{Inf: -b.Inf, Open: true}
	}
	return ivFin(new(big.Rat).Neg(b.Value), b.Open)
}

// Sub returns the exact range of s - t for s in x, t in y.
func (x Interval) Sub(y Interval) Interval { return x.Add(y.Neg()) }

// ivExt is an extended rational candidate end: a finite value v (inf == 0)
// or ±infinity, and whether the value is attained by elements of the sets.
type ivExt struct {
	v      *big.Rat
	inf    int
	closed bool
}

func ivExtOf(b Bound) ivExt {
	if b.Inf != 0 {
		return ivExt{inf: b.Inf}
	}
	return ivExt{v: b.Value, closed: !b.Open}
}

func (e ivExt) isZero() bool { return e.inf == 0 && e.v.Sign() == 0 }

func (e ivExt) sign() int {
	if e.inf != 0 {
		return e.inf
	}
	return e.v.Sign()
}

// ivCmpExt compares extended values, ignoring attainment.
func ivCmpExt(a, b ivExt) int {
	switch {
	case a.inf != 0 || b.inf != 0:
		if a.inf == b.inf {
			return 0
		}
		if a.inf < b.inf {
			return -1
		}
		return +1
	default:
		return a.v.Cmp(b.v)
	}
}

// ivMulExt multiplies two candidate ends.
//
// A zero factor gives 0 whatever the other factor, including ±infinity:
// an interval never contains infinity, so an end at 0 times any element
// of an unbounded set is still 0 (IEEE 1788-2015 set-based multiplication:
// [0, 0] × Entire = [0, 0]). That product is attained iff a factor is an
// attained 0. Otherwise the product is attained iff both factor ends are.
func ivMulExt(a, b ivExt) ivExt {
	az, bz := a.isZero(), b.isZero()
	if az || bz {
		return ivExt{v: new(big.Rat), closed: (az && a.closed) || (bz && b.closed)}
	}
	if a.inf != 0 || b.inf != 0 {
		return ivExt{inf: a.sign() * b.sign()}
	}
	return ivExt{v: new(big.Rat).Mul(a.v, b.v), closed: a.closed && b.closed}
}

// ivBoundOfExt converts a candidate back to a Bound.
func ivBoundOfExt(e ivExt) Bound {
	if e.inf != 0 {
		return Bound{Inf: e.inf, Open: true}
	}
	return ivFin(e.v, !e.closed)
}

// Mul returns the exact range of s·t for s in x, t in y.
//
// Rules (IEEE 1788-2015 set-based multiplication, extended with open ends):
//
//   - The value of each end is the minimum (maximum) of the endpoint
//     products over the four combinations (x.Lo or x.Hi) × (y.Lo or y.Hi).
//     For s·t with s, t ≠ 0 an extremum over a rectangle is reached only at
//     its corners, so nothing else can be smaller (larger).
//   - 0 × ±inf contributes 0: real intervals never contain infinity, and an
//     end at 0 times any real is 0.
//   - A candidate is attained (closed) iff both factors' ends are attained,
//     or one of them is an attained 0 (then 0 = 0·t for every t in the
//     other set, which is non-empty). A product of ends one of which is
//     open is a limit that no element pair reaches.
//   - When two candidates tie in value, the attained one wins: the end is
//     closed if any candidate of that value is.
func (x Interval) Mul(y Interval) Interval {
	xl, xh, yl, yh := ivExtOf(x.Lo), ivExtOf(x.Hi), ivExtOf(y.Lo), ivExtOf(y.Hi)
	c := [4]ivExt{ivMulExt(xl, yl), ivMulExt(xl, yh), ivMulExt(xh, yl), ivMulExt(xh, yh)}
	lo, hi := c[0], c[0]
	for _, e := range c[1:] {
		if k := ivCmpExt(e, lo); k < 0 || (k == 0 && e.closed) {
			lo = e
		}
		if k := ivCmpExt(e, hi); k > 0 || (k == 0 && e.closed) {
			hi = e
		}
	}
	return Interval{ivBoundOfExt(lo), ivBoundOfExt(hi)}
}

// ScaleRat returns {c·s : s in x}. Scaling by 0 gives [0, 0] even for an
// unbounded x. It panics if c is nil.
func (x Interval) ScaleRat(c *big.Rat) Interval {
	if c == nil {
		panic("poly: ScaleRat(nil)")
	}
	switch c.Sign() {
	case 0:
		return Point(c)
	case -1:
		return x.Neg().ScaleRat(new(big.Rat).Neg(c))
	}
	sc := func(b Bound) Bound {
		if b.Inf != 0 {
			return b
		}
		return ivFin(new(big.Rat).Mul(b.Value, c), b.Open)
	}
	return Interval{sc(x.Lo), sc(x.Hi)}
}

// ivRatPow returns r^n for n >= 0 as a new value.
func ivRatPow(r *big.Rat, n int) *big.Rat {
	e := big.NewInt(int64(n))
	num := new(big.Int).Exp(r.Num(), e, nil)
	den := new(big.Int).Exp(r.Denom(), e, nil)
	return new(big.Rat).SetFrac(num, den)
}

// ivPowBound returns b^n for n >= 1, keeping b's openness.
func ivPowBound(b Bound, n int) Bound {
	if b.Inf != 0 {
		inf := b.Inf
		if n%2 == 0 {
			inf = +1
		}
		return Bound{Inf: inf, Open: true}
	}
	return ivFin(ivRatPow(b.Value, n), b.Open)
}

// Pow returns the exact range of t^n for t in x, n >= 0 (t^0 = 1).
//
// Odd n: t^n is increasing, so the ends are the powered ends with the same
// openness. Even n: on a non-negative x the ends are powered as they are;
// on a non-positive x they are powered and swapped; on an x straddling
// zero (elements of both signs) the result is [0, max(|lo|, |hi|)^n], 0
// attained at the interior zero, the upper end attained iff an end of the
// larger magnitude is attained. For example [-2, 1]^2 = [0, 4],
// (-1, 1)^2 = [0, 1), (-1, 1]^2 = [0, 1].
//
// Pow panics for n < 0: negative powers are divisions; use Recip.
func (x Interval) Pow(n int) Interval {
	switch {
	case n < 0:
		panic(fmt.Sprintf("poly: Interval.Pow(%d): negative exponent (use Recip)", n))
	case n == 0:
		return Point(ivRatOne)
	case n == 1:
		return x
	case n%2 == 1:
		return Interval{ivPowBound(x.Lo, n), ivPowBound(x.Hi, n)}
	case x.NonNegative():
		return Interval{ivPowBound(x.Lo, n), ivPowBound(x.Hi, n)}
	case x.NonPositive():
		return Interval{ivPowBound(x.Hi, n), ivPowBound(x.Lo, n)}
	}
	// x.Lo < 0 < x.Hi.
	lo := ivFin(new(big.Rat), false)
	if x.Lo.Inf != 0 || x.Hi.Inf != 0 {
		return Interval{lo, ivPosInf}
	}
	a := new(big.Rat).Neg(x.Lo.Value)
	switch k := a.Cmp(x.Hi.Value); {
	case k > 0:
		return Interval{lo, ivFin(ivRatPow(a, n), x.Lo.Open)}
	case k < 0:
		return Interval{lo, ivFin(ivRatPow(x.Hi.Value, n), x.Hi.Open)}
	default:
		return Interval{lo, ivFin(ivRatPow(a, n), x.Lo.Open && x.Hi.Open)}
	}
}

// Recip returns the exact range of 1/t for t in x. It returns an error if
// x contains zero: division by an interval containing zero is refused by
// design (lyacert never needs it, and its set-based result is not a single
// interval). An infinite end maps to an open 0 and an open end at 0 maps to
// an infinite end: (0, 2] → [1/2, +inf), [1, +inf) → (0, 1].
func (x Interval) Recip() (Interval, error) {
	if x.ContainsZero() {
		return Interval{}, errors.New("poly: Recip of " + x.String() +
			", which contains zero: division by an interval containing zero is refused")
	}
	if x.Negative() {
		r, err := x.Neg().Recip()
		return r.Neg(), err
	}
	// x > 0: 1/t is decreasing; x.Lo is finite (possibly an open 0).
	var lo, hi Bound
	if x.Hi.Inf != 0 {
		lo = ivFin(new(big.Rat), true)
	} else {
		lo = ivFin(new(big.Rat).Inv(x.Hi.Value), x.Hi.Open)
	}
	if x.Lo.Value.Sign() == 0 {
		hi = ivPosInf
	} else {
		hi = ivFin(new(big.Rat).Inv(x.Lo.Value), x.Lo.Open)
	}
	return Interval{lo, hi}, nil
}

// Positive reports whether every element of x is > 0.
func (x Interval) Positive() bool {
	if x.Lo.Inf != 0 {
		return false
	}
	s := x.Lo.Value.Sign()
	return s > 0 || (s == 0 && x.Lo.Open)
}

// Negative reports whether every element of x is < 0.
func (x Interval) Negative() bool {
	if x.Hi.Inf != 0 {
		return false
	}
	s := x.Hi.Value.Sign()
	return s < 0 || (s == 0 && x.Hi.Open)
}

// NonNegative reports whether every element of x is >= 0.
func (x Interval) NonNegative() bool { return x.Lo.Inf == 0 && x.Lo.Value.Sign() >= 0 }

// NonPositive reports whether every element of x is <= 0.
func (x Interval) NonPositive() bool { return x.Hi.Inf == 0 && x.Hi.Value.Sign() <= 0 }

// ContainsZero reports whether 0 is an element of x.
func (x Interval) ContainsZero() bool { return !x.Positive() && !x.Negative() }

// Contains reports whether q is an element of x.
func (x Interval) Contains(q *big.Rat) bool {
	if x.Lo.Inf == 0 {
		if k := x.Lo.Value.Cmp(q); k > 0 || (k == 0 && x.Lo.Open) {
			return false
		}
	}
	if x.Hi.Inf == 0 {
		if k := x.Hi.Value.Cmp(q); k < 0 || (k == 0 && x.Hi.Open) {
			return false
		}
	}
	return true
}

// Width returns hi - lo, or false when x is unbounded.
func (x Interval) Width() (*big.Rat, bool) {
	if x.Lo.Inf != 0 || x.Hi.Inf != 0 {
		return nil, false
	}
	return SubRat(new(big.Rat), x.Hi.Value, x.Lo.Value), true
}

// Compact reports whether x is [lo, hi] with both ends finite and closed
// and lo < hi: a side a bisection can halve that holds its own ends.
func (x Interval) Compact() bool {
	return ivClosedAt(x.Lo) && ivClosedAt(x.Hi) && x.Lo.Value.Cmp(x.Hi.Value) < 0
}

// Mid returns (lo + hi)/2. It panics if x is unbounded.
func (x Interval) Mid() *big.Rat {
	if x.Lo.Inf != 0 || x.Hi.Inf != 0 {
		panic("poly: Mid of unbounded interval " + x.String())
	}
	if x.Lo.Value.Cmp(x.Hi.Value) == 0 {
		return new(big.Rat).Set(x.Lo.Value)
	}
	m := AddRat(new(big.Rat), x.Lo.Value, x.Hi.Value)
	return MulRat(m, m, ratHalf)
}

// ratHalf is 1/2; never modified.
var ratHalf = big.NewRat(1, 2)

// Split halves x at its midpoint m: the left half ends at m closed, the
// right half starts at m open, so the halves partition x exactly (each
// element of x is in exactly one half): [0, 1) → [0, 1/2], (1/2, 1).
// It panics if x is unbounded or a single point (which has no partition
// into two non-empty intervals).
func (x Interval) Split() (Interval, Interval) {
	m := x.Mid()
	if x.Lo.Value.Cmp(x.Hi.Value) == 0 {
		panic("poly: Split of single-point interval " + x.String())
	}
	return Interval{x.Lo, ivFin(m, false)}, Interval{ivFin(m, true), x.Hi}
}

// WithinOpenWhere reports that side, a bounded interval, lies in r, with an
// open end exactly where it meets an open end of r.
func (side Interval) WithinOpenWhere(r Interval) bool {
	lo, hi := side.Lo, side.Hi
	okLo := r.Lo.Inf < 0 && !lo.Open
	if r.Lo.Inf == 0 {
		switch k := lo.Value.Cmp(r.Lo.Value); {
		case k > 0:
			okLo = !lo.Open
		case k == 0:
			okLo = lo.Open == r.Lo.Open
		}
	}
	okHi := r.Hi.Inf > 0 && !hi.Open
	if r.Hi.Inf == 0 {
		switch k := hi.Value.Cmp(r.Hi.Value); {
		case k < 0:
			okHi = !hi.Open
		case k == 0:
			okHi = hi.Open == r.Hi.Open
		}
	}
	return okLo && okHi
}

// SameBounded reports that side, a bounded interval, equals r.
func (side Interval) SameBounded(r Interval) bool {
	return r.Lo.Inf == 0 && r.Hi.Inf == 0 &&
		side.Lo.Value.Cmp(r.Lo.Value) == 0 && side.Lo.Open == r.Lo.Open &&
		side.Hi.Value.Cmp(r.Hi.Value) == 0 && side.Hi.Open == r.Hi.Open
}

// PowerSign is the sign of p^power on the box that p's exact enclosure
// proves: 1 when the power is even and p keeps away from zero, or odd and
// p > 0; −1 when odd and p < 0; 0 when the enclosure decides nothing.
func (p *Poly) PowerSign(power int, box []Interval) int {
	e := p.Enclose(box)
	switch {
	case power%2 == 0 && !e.ContainsZero(), power%2 == 1 && e.Positive():
		return 1
	case power%2 == 1 && e.Negative():
		return -1
	}
	return 0
}
