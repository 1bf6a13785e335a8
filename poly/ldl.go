package poly

import "math/big"

// Jacobian returns ∂gᵢ/∂xⱼ for the first len(g) variables (the states).
func Jacobian(g []*Poly) [][]*Poly {
	n := len(g)
	j := make([][]*Poly, n)
	for i := range g {
		j[i] = make([]*Poly, n)
		for k := 0; k < n; k++ {
			j[i][k] = new(Poly).Derivative(g[i], k)
		}
	}
	return j
}

// FirstNonPositivePivot runs exact LDLᵀ without pivoting on the symmetric
// rational matrix a and returns the index of the first pivot that is ≤ 0 with
// that pivot, or −1 and nil when every pivot is positive (a ≻ 0, Sylvester's
// criterion: the pivots are the ratios of consecutive leading minors). A
// negative first non-positive pivot dₖ means yᵀay = dₖ < 0 for some y, so a
// is not positive semidefinite. a is not modified.
func FirstNonPositivePivot(a [][]*big.Rat) (int, *big.Rat) {
	n := len(a)
	w := make([][]*big.Rat, n)
	for i := range a {
		w[i] = make([]*big.Rat, n)
		for j := range a[i] {
			w[i][j] = new(big.Rat).Set(a[i][j])
		}
	}
	return nonPositivePivot(w)
}

// nonPositivePivot is FirstNonPositivePivot overwriting w with the Schur
// complements.
func nonPositivePivot(w [][]*big.Rat) (int, *big.Rat) {
	n := len(w)
	t := new(big.Rat)
	for k := 0; k < n; k++ {
		d := w[k][k]
		if d.Sign() <= 0 {
			return k, new(big.Rat).Set(d)
		}
		// Schur complement: w[i][j] −= w[i][k]·w[k][j]/d for i, j > k.
		for i := k + 1; i < n; i++ {
			if w[i][k].Sign() == 0 {
				continue
			}
			l := QuoRat(new(big.Rat), w[i][k], d)
			for j := k + 1; j < n; j++ {
				SubRat(w[i][j], w[i][j], MulRat(t, l, w[k][j]))
			}
		}
	}
	return -1, nil
}
