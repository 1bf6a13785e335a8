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

// SignOn returns an interval that holds the sign of f on the box where f is
// defined: the numerator's exact enclosure times DenSign.
func (f RatFunc) SignOn(box []Interval) Interval {
	return f.Num.Enclose(box).Mul(f.DenSign(box))
}

// LowestAlong is f's behaviour along a ray out of the origin of the
// variables selected by in: with those variables set to the direction v
// and the other variables of vals substituted, it returns h_d(v) for the
// least d such that the part h_d of f homogeneous of degree d in the
// selected variables does not vanish at v, and d; the zero function and −1
// when every part vanishes there (f(t·v) ≡ 0). Since f(t·v) = Σ tᵈ·h_d(v),
// for small t > 0 f(t·v) has the sign of h_d(v). The denominator of f must
// be free of the selected variables; ok is false otherwise, or when it
// vanishes at vals.
func (f RatFunc) LowestAlong(in []bool, vals map[int]*big.Rat) (h RatFunc, d int, ok bool) {
	for _, df := range f.Den {
		if df.P.DegreeIn(in) > 0 {
			return RatFunc{}, 0, false
		}
	}
	for d := range f.DegreeIn(in) + 1 {
		hv, err := f.Homogeneous(d, in).EvalVars(vals)
		if err != nil {
			return RatFunc{}, 0, false
		}
		if !hv.IsZero() {
			return hv, d, true
		}
	}
	return FromPoly(Zero(f.Ring())), -1, true
}
