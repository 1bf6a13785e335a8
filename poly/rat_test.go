package poly

import (
	"math/big"
	"testing"

	"github.com/shopspring/decimal"
)

// TestSmallRatArithmetic compares the int64 fast path with math/big on
// operands at and around its limits, in both lowest-terms value and sign.
func TestSmallRatArithmetic(t *testing.T) {
	lim := int64(smallLimit)
	vals := []*big.Rat{
		big.NewRat(0, 1), big.NewRat(1, 1), big.NewRat(-1, 1), // common practice, no source
		big.NewRat(2, 3), big.NewRat(-5, 6), big.NewRat(7, 4), // common practice, no source
		big.NewRat(lim-1, 1), big.NewRat(-(lim - 1), 1), // largest small integers
		big.NewRat(1, lim-1), big.NewRat(-(lim - 2), lim-1), // largest small denominators
		big.NewRat(lim, 1), big.NewRat(1, lim), // just beyond the fast path
		new(big.Rat).SetFrac(new(big.Int).Lsh(big.NewInt(1), 100), big.NewInt(3)), // large
	}
	ops := []struct {
		name string
		fast func(z, x, y *big.Rat) *big.Rat
		ref  func(z, x, y *big.Rat) *big.Rat
	}{
		{"mul", MulRat, (*big.Rat).Mul},
		{"add", AddRat, (*big.Rat).Add},
		{"sub", SubRat, (*big.Rat).Sub},
		{"quo", QuoRat, (*big.Rat).Quo},
	}
	for _, op := range ops {
		for _, x := range vals {
			for _, y := range vals {
				if op.name == "quo" && y.Sign() == 0 {
					continue
				}
				want := op.ref(new(big.Rat), x, y)
				// A fresh result, a result that held a fraction, and an
				// aliased operand must all give the same.
				got := op.fast(new(big.Rat), x, y)
				dirty := op.fast(big.NewRat(-7, 9), x, y)
				alias := new(big.Rat).Set(x)
				op.fast(alias, alias, y)
				for _, g := range []*big.Rat{got, dirty, alias} {
					if g.Cmp(want) != 0 || g.RatString() != want.RatString() || g.Num().Sign() != want.Sign() {
						t.Errorf("%s(%s, %s) = %s, want %s", op.name, x.RatString(), y.RatString(), g.RatString(), want.RatString())
					}
				}
			}
		}
	}
}

// TestRatStringFast compares RatString with math/big's RatString.
func TestRatStringFast(t *testing.T) {
	lim := int64(smallLimit)
	for _, x := range []*big.Rat{
		big.NewRat(0, 1), big.NewRat(-3, 1), big.NewRat(22, 7), big.NewRat(-1, 1000), // common practice, no source
		big.NewRat(lim-1, lim-2), big.NewRat(-(lim - 1), 1), big.NewRat(lim, 3), // at and beyond the fast path
	} {
		if got, want := RatString(x), x.RatString(); got != want {
			t.Errorf("RatString(%s) = %q", want, got)
		}
	}
}

// TestParseNumberShort checks that the short decimal path agrees with the
// general decimal reader, and leaves every other form to it.
func TestParseNumberShort(t *testing.T) {
	for _, s := range []string{
		"0", "7", "007", "0.35", "12.500", "123456789012345678", // common practice, no source
		"1234567890123456789", "1.", ".5", "1.2.3", "1e-3", "2.5E+2", "", // general path or errors
	} {
		q, err := ParseNumber(s)
		d, derr := decimal.NewFromString(s)
		if (err != nil) != (derr != nil) {
			t.Errorf("ParseNumber(%q) error %v, decimal error %v", s, err, derr)
			continue
		}
		if err == nil && q.Cmp(d.Rat()) != 0 {
			t.Errorf("ParseNumber(%q) = %s, want %s", s, q.RatString(), d.Rat().RatString())
		}
	}
}
