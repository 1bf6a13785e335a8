package poly

import "math/big"

// MaxLyapunovStates bounds the order n for which LyapunovRat is tried: its
// linear system has n(n+1)/2 unknowns and dense exact elimination costs
// their cube in operations on integers that grow with every step.
const MaxLyapunovStates = 16

// LyapunovRat solves the Lyapunov equation AᵀP + PA = −Q (continuous time)
// or the Stein equation AᵀPA − P = −Q (maps) exactly for the symmetric P,
// given a rational square A and a symmetric rational Q. The equation is
// linear in the n(n+1)/2 entries Pᵢⱼ, i ≤ j; entry (i, j) of its left side
// is Σₖ aₖᵢPₖⱼ + Σₖ Pᵢₖaₖⱼ (respectively Σₖₗ aₖᵢPₖₗaₗⱼ − Pᵢⱼ), and the
// system is solved by SolveRat (fraction-free elimination). It is
// nonsingular exactly when no two eigenvalues of A satisfy λᵢ + λⱼ = 0
// (λᵢλⱼ = 1 for maps): the operator X ↦ AᵀX + XA has the eigenvalues
// λᵢ + λⱼ, and X ↦ AᵀXA − X the eigenvalues λᵢλⱼ − 1 (Kronecker products,
// common practice); ok is false
// otherwise, or when n exceeds MaxLyapunovStates.
func LyapunovRat(a, q [][]*big.Rat, discrete bool) (p [][]*big.Rat, ok bool) {
	n := len(a)
	if n == 0 || n > MaxLyapunovStates {
		return nil, false
	}
	idx := make([][]int, n)
	for i := range idx {
		idx[i] = make([]int, n)
	}
	m := 0
	for i := range n {
		for j := i; j < n; j++ {
			idx[i][j], idx[j][i] = m, m
			m++
		}
	}
	sys := make([][]*big.Rat, m)
	rhs := make([]*big.Rat, m)
	t := new(big.Rat)
	for i := range n {
		for j := i; j < n; j++ {
			row := make([]*big.Rat, m)
			for u := range row {
				row[u] = new(big.Rat)
			}
			if discrete {
				for k := range n {
					if a[k][i].Sign() == 0 {
						continue
					}
					for l := range n {
						if a[l][j].Sign() != 0 {
							row[idx[k][l]].Add(row[idx[k][l]], t.Mul(a[k][i], a[l][j]))
						}
					}
				}
				e := row[idx[i][j]]
				e.Sub(e, big.NewRat(1, 1))
			} else {
				for k := range n {
					row[idx[k][j]].Add(row[idx[k][j]], a[k][i])
					row[idx[i][k]].Add(row[idx[i][k]], a[k][j])
				}
			}
			sys[idx[i][j]] = row
			rhs[idx[i][j]] = new(big.Rat).Neg(q[i][j])
		}
	}
	x, ok := SolveRat(sys, rhs)
	if !ok {
		return nil, false
	}
	p = make([][]*big.Rat, n)
	for i := range n {
		p[i] = make([]*big.Rat, n)
		for j := range n {
			p[i][j] = x[idx[i][j]]
		}
	}
	return p, true
}
