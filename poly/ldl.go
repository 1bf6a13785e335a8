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
	return bareissPivot(a)
}
