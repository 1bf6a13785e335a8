package interval

import (
	"fmt"
	"math"
	"math/big"
	"strconv"
)

// F is the closed interval [Lo, Hi] of reals. Lo may be -Inf and Hi +Inf;
// a valid F has Lo <= Hi, no NaN, Lo != +Inf and Hi != -Inf. Operations on
// valid F never produce NaN.
type F struct{ Lo, Hi float64 }

var (
	negInf = math.Inf(-1)
	posInf = math.Inf(1)
)

// Pt returns the point interval [x, x]. It panics if x is NaN or infinite
// (infinity is not a real number).
func Pt(x float64) F {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		panic(fmt.Sprintf("interval: Pt(%v): not a real number", x))
	}
	return F{x, x}
}

// New returns [lo, hi]. It panics unless lo <= hi, neither is NaN, lo is
// not +Inf and hi is not -Inf.
func New(lo, hi float64) F {
	if !(lo <= hi) || lo == posInf || hi == negInf {
		panic(fmt.Sprintf("interval: New(%v, %v): not a non-empty interval", lo, hi))
	}
	return F{lo, hi}
}

// String formats x as "[lo, hi]" with the shortest decimals that read back
// to the same float64 values.
func (x F) String() string {
	return "[" + strconv.FormatFloat(x.Lo, 'g', -1, 64) + ", " +
		strconv.FormatFloat(x.Hi, 'g', -1, 64) + "]"
}

// nextDown returns math.Nextafter(v, -Inf) for a finite non-zero v, by
// stepping the bit pattern (one ulp towards -Inf): the hot-path form.
func nextDown(v float64) float64 {
	u := math.Float64bits(v)
	return math.Float64frombits(u + (u>>63)<<1 - 1)
}

// nextUp returns math.Nextafter(v, +Inf) for a finite non-zero v.
func nextUp(v float64) float64 {
	u := math.Float64bits(v)
	return math.Float64frombits(u + 1 - (u>>63)<<1)
}

// down and up are math.Nextafter towards -Inf and +Inf for any v.
func down(v float64) float64 { return math.Nextafter(v, negInf) }
func up(v float64) float64   { return math.Nextafter(v, posInf) }

// minExactProduct bounds the products whose rounding error FMA measures
// exactly: for |a·b| >= 2^-960 the error a·b - fl(a·b) is a float64
// (it is a multiple of 2^(ea+eb) >= 2^-1066 with fewer than 53 bits), so
// math.FMA(a, b, -p) returns it exactly. Below, products are widened
// unconditionally.
const minExactProduct = 0x1p-960

// addDown returns the largest float64 <= the real a + b, for a, b lower
// ends (never +Inf). The rounding error of s = a + b is computed exactly by
// TwoSum (Knuth), error-free in round-to-nearest without overflow; an
// error that is not >= 0 (negative, or NaN after an intermediate overflow)
// moves s one ulp down.
func addDown(a, b float64) float64 {
	s := a + b
	if s-s != 0 { // ±Inf (or NaN): rare path
		if s == posInf && !math.IsInf(a, 0) && !math.IsInf(b, 0) {
			return math.MaxFloat64 // overflow: the real sum is > MaxFloat64
		}
		return negInf // -Inf, or NaN from invalid input: -Inf is a lower bound
	}
	bb := s - a
	if err := (a - (s - bb)) + (b - bb); err >= 0 {
		return s
	}
	if s == 0 {
		return -math.SmallestNonzeroFloat64
	}
	return nextDown(s)
}

// addUp returns the smallest float64 >= the real a + b, for a, b upper
// ends (never -Inf).
func addUp(a, b float64) float64 {
	s := a + b
	if s-s != 0 {
		if s == negInf && !math.IsInf(a, 0) && !math.IsInf(b, 0) {
			return -math.MaxFloat64
		}
		return posInf
	}
	bb := s - a
	if err := (a - (s - bb)) + (b - bb); err <= 0 {
		return s
	}
	if s == 0 {
		return math.SmallestNonzeroFloat64
	}
	return nextUp(s)
}

// mulDown returns a float64 <= the real a·b, with 0·±Inf = 0 (an end at
// zero times any real is zero): the largest such float64 unless the
// product is tiny (below minExactProduct), where it may be one ulp lower.
func mulDown(a, b float64) float64 {
	p := a * b
	if m := math.Abs(p); m >= minExactProduct && m <= math.MaxFloat64 {
		if math.FMA(a, b, -p) >= 0 {
			return p // exact, or rounded down already
		}
		return nextDown(p)
	}
	return mulRare(a, b, p, -1)
}

// mulUp returns a float64 >= the real a·b, with 0·±Inf = 0.
func mulUp(a, b float64) float64 {
	p := a * b
	if m := math.Abs(p); m >= minExactProduct && m <= math.MaxFloat64 {
		if math.FMA(a, b, -p) <= 0 {
			return p
		}
		return nextUp(p)
	}
	return mulRare(a, b, p, +1)
}

// mulRare handles a product p = a·b that is tiny, zero, infinite or NaN,
// rounding towards -Inf (dir < 0) or +Inf (dir > 0).
func mulRare(a, b, p float64, dir int) float64 {
	switch {
	case a == 0 || b == 0:
		return 0 // exact, also for 0·±Inf
	case math.IsInf(a, 0) || math.IsInf(b, 0):
		return p // exact (as an extended real)
	case p == 0: // underflow; the real product has the sign of p
		if math.Signbit(p) == (dir < 0) {
			return math.Copysign(math.SmallestNonzeroFloat64, float64(dir))
		}
		return 0
	case p == posInf: // overflow
		if dir < 0 {
			return math.MaxFloat64
		}
		return p
	case p == negInf:
		if dir > 0 {
			return -math.MaxFloat64
		}
		return p
	case dir < 0: // tiny: the error is not measured, step anyway
		return nextDown(p)
	default:
		return nextUp(p)
	}
}

// Add returns an enclosure of {s + t : s in x, t in y}.
func (x F) Add(y F) F { return F{addDown(x.Lo, y.Lo), addUp(x.Hi, y.Hi)} }

// Sub returns an enclosure of {s - t : s in x, t in y}.
func (x F) Sub(y F) F { return F{addDown(x.Lo, -y.Hi), addUp(x.Hi, -y.Lo)} }

// Neg returns {-s : s in x} (exact).
func (x F) Neg() F { return F{-x.Hi, -x.Lo} }

// Mul returns an enclosure of {s·t : s in x, t in y}.
//
// The ends are the extreme endpoint products, chosen by the signs of the
// ends (Moore's nine cases, so that only the mixed × mixed case computes
// four products), each rounded outward to the nearest float64 on its side;
// 0 × ±Inf counts as 0 (IEEE 1788-2015 set-based multiplication:
// [0, 0] × Entire = [0, 0]).
func (x F) Mul(y F) F {
	a, b, c, d := x.Lo, x.Hi, y.Lo, y.Hi
	switch {
	case a >= 0: // x >= 0
		switch {
		case c >= 0:
			return F{mulDown(a, c), mulUp(b, d)}
		case d <= 0:
			return F{mulDown(b, c), mulUp(a, d)}
		default:
			return F{mulDown(b, c), mulUp(b, d)}
		}
	case b <= 0: // x <= 0
		switch {
		case c >= 0:
			return F{mulDown(a, d), mulUp(b, c)}
		case d <= 0:
			return F{mulDown(b, d), mulUp(a, c)}
		default:
			return F{mulDown(a, d), mulUp(a, c)}
		}
	default: // a < 0 < b
		switch {
		case c >= 0:
			return F{mulDown(a, d), mulUp(b, d)}
		case d <= 0:
			return F{mulDown(b, c), mulUp(a, c)}
		default:
			return F{
				math.Min(mulDown(a, d), mulDown(b, c)),
				math.Max(mulUp(a, c), mulUp(b, d)),
			}
		}
	}
}

// Scale returns an enclosure of {c·s : s in x}. Scale(0) is [0, 0] even
// for an unbounded x. It panics if c is NaN or infinite.
func (x F) Scale(c float64) F {
	switch {
	case math.IsNaN(c) || math.IsInf(c, 0):
		panic(fmt.Sprintf("interval: Scale(%v): not a real number", c))
	case c == 0:
		return F{0, 0}
	case c > 0:
		return F{mulDown(x.Lo, c), mulUp(x.Hi, c)}
	default:
		return F{mulDown(x.Hi, c), mulUp(x.Lo, c)}
	}
}

// powDown returns a lower bound of a^n for a >= 0, n >= 1, by binary
// powering with every product rounded down (kept >= 0, so each step is
// monotone).
func powDown(a float64, n int) float64 {
	r, have := 0.0, false
	for {
		if n&1 == 1 {
			if have {
				r = max(mulDown(r, a), 0)
			} else {
				r, have = a, true
			}
		}
		n >>= 1
		if n == 0 {
			return r
		}
		a = max(mulDown(a, a), 0)
	}
}

// powUp returns an upper bound of a^n for a >= 0, n >= 1.
func powUp(a float64, n int) float64 {
	r, have := 0.0, false
	for {
		if n&1 == 1 {
			if have {
				r = mulUp(r, a)
			} else {
				r, have = a, true
			}
		}
		n >>= 1
		if n == 0 {
			return r
		}
		a = mulUp(a, a)
	}
}

// Pow returns an enclosure of {t^n : t in x} for n >= 0 (t^0 = 1, so
// Pow(0) is [1, 1]). Even powers of an x straddling zero start at an exact
// 0: [-2, 1]^2 = [0, 4]. Each end is computed by binary powering of its
// magnitude, every product rounded outward, so an inexact end may be a few
// ulps wide. It panics if n < 0.
func (x F) Pow(n int) F {
	switch {
	case n < 0:
		panic(fmt.Sprintf("interval: Pow(%d): negative exponent", n))
	case n == 0:
		return F{1, 1}
	case n == 1:
		return x
	}
	a, b := x.Lo, x.Hi
	if n%2 == 1 { // increasing
		var lo, hi float64
		if a >= 0 {
			lo = powDown(a, n)
		} else {
			lo = -powUp(-a, n)
		}
		if b >= 0 {
			hi = powUp(b, n)
		} else {
			hi = -powDown(-b, n)
		}
		return F{lo, hi}
	}
	switch {
	case a >= 0:
		return F{powDown(a, n), powUp(b, n)}
	case b <= 0:
		return F{powDown(-b, n), powUp(-a, n)}
	default:
		return F{0, powUp(math.Max(-a, b), n)}
	}
}

// Positive reports whether every element of x is > 0.
func (x F) Positive() bool { return x.Lo > 0 }

// Negative reports whether every element of x is < 0.
func (x F) Negative() bool { return x.Hi < 0 }

// ContainsZero reports whether 0 is in x.
func (x F) ContainsZero() bool { return x.Lo <= 0 && 0 <= x.Hi }

// Contains reports whether v is in x.
func (x F) Contains(v float64) bool { return x.Lo <= v && v <= x.Hi }

// FromRat returns the tightest F containing q: [q, q] when q is a float64,
// else the two neighbouring float64 values around q. A q beyond
// ±MaxFloat64 gives [MaxFloat64, +Inf] or [-Inf, -MaxFloat64].
// It panics if q is nil.
func FromRat(q *big.Rat) F {
	f, exact := q.Float64()
	if exact {
		return F{f, f}
	}
	switch {
	case f == posInf:
		return F{math.MaxFloat64, posInf}
	case f == negInf:
		return F{negInf, -math.MaxFloat64}
	}
	if new(big.Rat).SetFloat64(f).Cmp(q) < 0 {
		return F{f, up(f)}
	}
	return F{down(f), f}
}

// Width returns an upper bound of Hi - Lo (+Inf when x is unbounded).
func (x F) Width() float64 {
	if x.Lo == x.Hi {
		return 0
	}
	return up(x.Hi - x.Lo)
}

// Mid returns a float64 in x near its midpoint (exactly (Lo+Hi)/2 when
// that is a float64). It panics if x is unbounded.
func (x F) Mid() float64 {
	if math.IsInf(x.Lo, 0) || math.IsInf(x.Hi, 0) {
		panic("interval: Mid of unbounded interval " + x.String())
	}
	if x.Lo == x.Hi {
		return x.Lo
	}
	m := 0.5*x.Lo + 0.5*x.Hi // no overflow
	return min(max(m, x.Lo), x.Hi)
}

// Split halves x at Mid: [Lo, m] and [m, Hi]. The halves are closed, so
// they share m; their union is x. It panics if x is unbounded.
func (x F) Split() (F, F) {
	m := x.Mid()
	return F{x.Lo, m}, F{m, x.Hi}
}
