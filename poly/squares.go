package poly

import "errors"

// SquaresLDL returns zᵀGz for a Gram matrix G = L·diag(d)·Lᵀ whose entries,
// and those of L and d, are rational numbers, with d ≥ 0 and L unit lower
// triangular with a zero column below every zero pivot. Then zᵀGz =
// Σₖ dₖ·((Lᵀz)ₖ)² is a sum of squares, ≥ 0 wherever it is evaluated. The
// error says which requirement fails.
func SquaresLDL(z []*Poly, g, l Matrix, d []RatFunc) (*Poly, error) {
	gc, ok1 := g.Consts()
	_, ok2 := l.Consts()
	dc, ok3 := Matrix{d}.Consts()
	if !ok1 || !ok2 || !ok3 || len(z) == 0 || len(gc) != len(z) {
		return nil, errors.New("G, L and D are not rational numbers of the basis' size")
	}
	zero := make([]bool, len(z))
	for i := range zero {
		if dc[0][i].Sign() < 0 {
			return nil, errors.New("a pivot is negative")
		}
		zero[i] = dc[0][i].Sign() == 0
	}
	if !l.UnitLower(zero) {
		return nil, errors.New("L is not unit lower triangular with a zero column below every zero pivot")
	}
	if !g.EqualLDL(l, d) {
		return nil, errors.New("L·D·Lᵀ does not reproduce G")
	}
	return Bilinear(ConstInt(z[0].Ring(), 1), gc, z), nil
}
