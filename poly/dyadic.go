package poly

import (
	"math/big"
	"slices"
)

// DyadicBox is a box of a bisection of the unit cube: side i is
// [A[i], A[i]+1]·2^-K[i]. Set-inversion pavings halve boxes along SplitDim,
// the lower half first.
type DyadicBox struct {
	A []int64
	K []int
}

// SplitDim returns the coordinate along which a box that has been halved
// k[i] times along coordinate i is halved next: the first with the fewest
// halvings (the widest relative to the paved box).
func SplitDim(k []int) int {
	dim := 0
	for i, x := range k {
		if x < k[dim] {
			dim = i
		}
	}
	return dim
}

// Halves returns the lower and the upper half of g along dim.
func (g DyadicBox) Halves(dim int) (DyadicBox, DyadicBox) {
	lo := DyadicBox{slices.Clone(g.A), slices.Clone(g.K)}
	lo.A[dim] *= 2
	lo.K[dim]++
	hi := DyadicBox{slices.Clone(lo.A), slices.Clone(lo.K)}
	hi.A[dim]++
	return lo, hi
}

// MinLevel returns the fewest halvings of any side.
func (g DyadicBox) MinLevel() int { return g.K[SplitDim(g.K)] }

// OpenFacesOn returns the faces of g that lie on an open face of the unit
// cube whose open faces are box.
func (g DyadicBox) OpenFacesOn(box OpenFaces) OpenFaces {
	var f OpenFaces
	for i := range g.A {
		if box.Lo&(1<<i) != 0 && g.A[i] == 0 {
			f.Lo |= 1 << i
		}
		if box.Hi&(1<<i) != 0 && g.A[i] == int64(1)<<g.K[i]-1 {
			f.Hi |= 1 << i
		}
	}
	return f
}

// Corner returns lo + (hi − lo)·a/2^k for a bounded side [lo, hi].
func Corner(side Interval, a int64, k int) *big.Rat {
	w, _ := side.Width()
	s := new(big.Rat).SetFrac(big.NewInt(a), new(big.Int).Lsh(big.NewInt(1), uint(k)))
	return s.Mul(s, w).Add(s, side.Lo.Value)
}
