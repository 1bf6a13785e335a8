package poly

import "math/big"

// UsesVar reports whether variable i occurs in f's numerator or denominator.
func (f RatFunc) UsesVar(i int) bool {
	if f.Num.UsesVar(i) {
		return true
	}
	for _, d := range f.Den {
		if d.P.UsesVar(i) {
			return true
		}
	}
	return false
}

// DenNonzeroOn reports that no factor of f's denominator vanishes on the box,
// by exact interval enclosure (Moore 1966): f is defined at every point of it.
func (f RatFunc) DenNonzeroOn(box []Interval) bool {
	for _, d := range f.Den {
		if d.P.Enclose(box).ContainsZero() {
			return false
		}
	}
	return true
}

// DenSign returns an interval with the sign of f's denominator on the box:
// [1, 1] or [−1, −1] where the enclosure fixes it, else the whole line; so
// Num's enclosure times it has f's sign wherever f is defined.
func (f RatFunc) DenSign(box []Interval) Interval {
	if len(f.Den) == 0 {
		return Point(big.NewRat(1, 1))
	}
	switch e := f.DenPoly().Enclose(box); {
	case e.Positive():
		return Point(big.NewRat(1, 1))
	case e.Negative():
		return Point(big.NewRat(-1, 1))
	}
	return Entire()
}
