// Package interval is fast float64 interval arithmetic with outward
// rounding, for the float side of lyacert (floats propose, exact
// arithmetic decides): its results are rigorous enclosures, cheap enough
// for pruning and screening, while the exact rational intervals of
// package poly (poly.Interval) remain the arithmetic that decides.
//
// An F is the closed interval [Lo, Hi] of reals; Lo may be -Inf and Hi
// +Inf (unbounded ends), following the set-based flavor of IEEE 1788-2015:
// an interval is a set of reals and never contains an infinity, so
// 0 × [1, +Inf] = [0, 0], never NaN. NaN is never produced from valid
// input; constructors panic on invalid input (NaN, Lo > Hi, Lo = +Inf or
// Hi = -Inf).
//
// Rounding. Go's float64 arithmetic rounds to nearest, so every computed
// end is rounded outward: when the float result is not exact it is moved
// one ulp outward (the step of math.Nextafter, done on the bit pattern).
// The error of a rounded-to-nearest result is at most half the gap to its
// neighbour on the side of the exact value, so one step outward always
// reaches past the exact value, and the result contains the exact result of
// the real operation on any points of the operands (the containment
// property of IEEE 1788-2015).
//
// Whether a result is exact is decided error-free, not guessed: TwoSum
// (Knuth) gives the exact error of a sum, math.FMA(a, b, -a*b) the exact
// error of a product (for |a*b| >= 2^-960; smaller non-zero products are
// always widened). The step is taken only towards the exact value's side,
// so Add, Sub, Mul and Scale give the tightest float64 enclosure of each
// end (up to one ulp more for products below 2^-960), and exact float
// computations stay exact: [-2, 1]^2 = [0, 4], [2, 2] + [3, 3] = [5, 5].
// Pow rounds once per multiplication of its binary powering, so its ends
// may be a few ulps wide.
//
// Special ends are exact by construction: a product with a zero factor is
// 0, also against an infinite end (0 × ±Inf = 0: an interval never
// contains infinity); ends involving an infinite operand end stay infinite;
// Neg is exact. An overflowing end is brought back: a lower end that
// rounds to +Inf becomes MaxFloat64, an upper end that rounds to -Inf
// becomes -MaxFloat64. A product that underflows to 0 gives 0 on the side
// of its sign and ±SmallestNonzeroFloat64 on the other.
//
// Not provided: division (lyacert never divides by intervals) and the
// mean-value form (built on top of this package elsewhere).
package interval
