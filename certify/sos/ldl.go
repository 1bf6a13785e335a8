package sos

import (
	"fmt"
	"math/big"

	"github.com/lyacert/lyacert/poly"
)

// LDL is the factorization A = L·D·Lᵀ of a symmetric rational matrix, L unit
// lower triangular and D diagonal, computed exactly. All D[k] > 0 proves A
// positive definite (Sylvester's criterion: the leading principal minors are
// the products D[0]···D[k]).
type LDL struct {
	L [][]*big.Rat
	D []*big.Rat
}

// Factorize sets f to the LDLᵀ factorization of the symmetric matrix a and
// reports whether every pivot is positive. At the first pivot that is not,
// it stops and returns false with f.D holding the pivots so far (the last
// one the offending pivot).
func (f *LDL) Factorize(a [][]*big.Rat) bool {
	n := len(a)
	for i := range a {
		if len(a[i]) != n {
			panic(fmt.Sprintf("sos: row %d of a %d×%d matrix has %d entries", i, n, n, len(a[i])))
		}
	}
	// Entries with a common denominator (a rounded Gram matrix and its
	// projection): fraction-free elimination in integers, the same values.
	if l, d, k, ok := poly.PositiveLDL(a, commonBits); ok {
		f.L, f.D = l, d
		return k < 0
	}
	// w holds the Schur complement, lower triangle.
	w := make([][]*big.Rat, n)
	for i := range w {
		w[i] = make([]*big.Rat, i+1)
		for j := 0; j <= i; j++ {
			w[i][j] = new(big.Rat).Set(a[i][j])
		}
	}
	f.L = make([][]*big.Rat, n)
	f.D = f.D[:0]
	for i := range f.L {
		f.L[i] = make([]*big.Rat, n)
		for j := range f.L[i] {
			f.L[i][j] = new(big.Rat)
		}
		f.L[i][i].SetInt64(1)
	}
	t := new(big.Rat)
	for k := 0; k < n; k++ {
		d := w[k][k]
		f.D = append(f.D, new(big.Rat).Set(d))
		if d.Sign() <= 0 {
			return false
		}
		for i := k + 1; i < n; i++ {
			f.L[i][k].Quo(w[i][k], d)
		}
		for i := k + 1; i < n; i++ {
			if w[i][k].Sign() == 0 {
				continue
			}
			for j := k + 1; j <= i; j++ {
				if w[j][k].Sign() == 0 {
					continue
				}
				t.Mul(f.L[i][k], w[j][k])
				w[i][j].Sub(w[i][j], t)
			}
		}
	}
	return true
}

// commonBits bounds the common denominator of a matrix factored in
// integers; beyond it the rational elimination is used.
const commonBits = 1 << 14

// MinPivot returns the smallest pivot of D.
func (f *LDL) MinPivot() *big.Rat {
	if len(f.D) == 0 {
		return nil
	}
	m := f.D[0]
	for _, d := range f.D[1:] {
		if d.Cmp(m) < 0 {
			m = d
		}
	}
	return new(big.Rat).Set(m)
}
