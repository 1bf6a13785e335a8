package poly

import (
	"math/big"
	"strconv"
	"strings"
)

// Exact rational arithmetic with a fast path for small operands.
//
// math/big normalizes every Rat result with a greatest common divisor that
// allocates, even for integers. Most coefficients met in practice have a
// numerator and a denominator far below 2³¹; for those the result is
// computed exactly in int64 (products and sums of such numbers stay below
// 2⁶³) and reduced by Euclid's algorithm, which gives the same value in the
// same lowest terms as math/big. Larger operands take math/big's path.

// smallLimit bounds the magnitude of a numerator or denominator for the
// int64 path.
const smallLimit = 1 << 31

// smallRat returns x = n/d (d > 0, lowest terms) when |n| and d are below
// smallLimit.
func smallRat(x *big.Rat) (n, d int64, ok bool) {
	a := x.Num() // a reference, no allocation
	if !a.IsInt64() {
		return 0, 0, false
	}
	n = a.Int64()
	if n <= -smallLimit || n >= smallLimit {
		return 0, 0, false
	}
	if x.IsInt() {
		return n, 1, true
	}
	b := x.Denom() // a reference: the denominator is not 1
	if !b.IsInt64() {
		return 0, 0, false
	}
	d = b.Int64()
	if d >= smallLimit {
		return 0, 0, false
	}
	return n, d, true
}

// setSmallFrac sets z = n/d for d > 0 and |n|, d < 2⁶³, reduced to lowest
// terms, and returns z.
func setSmallFrac(z *big.Rat, n, d int64) *big.Rat {
	a := uint64(n)
	if n < 0 {
		a = uint64(-n)
	}
	b := uint64(d)
	for b != 0 { // Euclid: gcd(|n|, d)
		a, b = b, a%b
	}
	if a > 1 {
		n /= int64(a)
		d /= int64(a)
	}
	if d == 1 && z.IsInt() {
		// The denominator is already 1: set the numerator alone.
		z.Num().SetInt64(n)
		return z
	}
	z.SetInt64(n) // the denominator is now 1, stored, so Denom is a reference
	if d != 1 {
		z.Denom().SetInt64(d)
	}
	return z
}

// MulRat sets z = x·y and returns z, like (*big.Rat).Mul (the same value
// in the same lowest terms), without allocating beyond z's own storage when
// every numerator and denominator is below 2³¹ in magnitude. Operands may
// alias z.
func MulRat(z, x, y *big.Rat) *big.Rat {
	if xn, xd, ok := smallRat(x); ok {
		if yn, yd, ok := smallRat(y); ok {
			return setSmallFrac(z, xn*yn, xd*yd)
		}
	}
	return z.Mul(x, y)
}

// AddRat sets z = x + y and returns z, like (*big.Rat).Add; fast for small
// operands as MulRat. Operands may alias z.
func AddRat(z, x, y *big.Rat) *big.Rat {
	if xn, xd, ok := smallRat(x); ok {
		if yn, yd, ok := smallRat(y); ok {
			if xd == yd {
				return setSmallFrac(z, xn+yn, xd)
			}
			return setSmallFrac(z, xn*yd+yn*xd, xd*yd)
		}
	}
	return z.Add(x, y)
}

// SubRat sets z = x − y and returns z, like (*big.Rat).Sub; fast for small
// operands as MulRat. Operands may alias z.
func SubRat(z, x, y *big.Rat) *big.Rat {
	if xn, xd, ok := smallRat(x); ok {
		if yn, yd, ok := smallRat(y); ok {
			if xd == yd {
				return setSmallFrac(z, xn-yn, xd)
			}
			return setSmallFrac(z, xn*yd-yn*xd, xd*yd)
		}
	}
	return z.Sub(x, y)
}

// isOne reports whether x = 1.
func isOne(x *big.Rat) bool {
	return x.IsInt() && x.Num().IsInt64() && x.Num().Int64() == 1
}

// RatString returns x.RatString() ("a" for integers, "a/b" otherwise),
// formatted without math/big's general conversion for small x.
func RatString(x *big.Rat) string {
	n, d, ok := smallRat(x)
	if !ok {
		return x.RatString()
	}
	if d == 1 {
		return strconv.FormatInt(n, 10)
	}
	var buf [24]byte
	b := strconv.AppendInt(buf[:0], n, 10)
	b = append(b, '/')
	b = strconv.AppendInt(b, d, 10)
	return string(b)
}

// QuoRat sets z = x/y for y ≠ 0 and returns z, like (*big.Rat).Quo (which
// panics for y = 0); fast for small operands as MulRat. Operands may alias z.
func QuoRat(z, x, y *big.Rat) *big.Rat {
	if xn, xd, ok := smallRat(x); ok {
		if yn, yd, ok := smallRat(y); ok && yn != 0 {
			if yn < 0 {
				xn, yn = -xn, -yn
			}
			return setSmallFrac(z, xn*yd, xd*yn)
		}
	}
	return z.Quo(x, y)
}

// ParseRat reads an exact number, "p/q" or a decimal
// (big.Rat.SetString), refusing white space, the empty string and texts over
// 100,000 bytes.
func ParseRat(s string) (*big.Rat, bool) {
	if s == "" || len(s) > 100000 || strings.ContainsAny(s, " \t\n") {
		return nil, false
	}
	q, ok := new(big.Rat).SetString(s)
	return q, ok
}
