package poly

import (
	"math/big"
	"math/rand/v2"
	"testing"
)

// TestRatLDLAndBareiss: on random symmetric rational matrices, RatLDL's
// factors reproduce the matrix (EqualLDL), a changed entry is caught, and the
// fraction-free pivot search agrees with the rational elimination's first
// pivot ≤ 0 (both are ratios of consecutive leading minors, Sylvester's
// criterion; Bareiss 1968 for the fraction-free step).
func TestRatLDLAndBareiss(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 1))
	r := NewRing([]string{"x"}, nil)
	for trial := range 60 {
		n := 1 + trial%9
		a := make([][]*big.Rat, n)
		for i := range a {
			a[i] = make([]*big.Rat, n)
		}
		for i := range n {
			for j := 0; j <= i; j++ {
				v := big.NewRat(int64(rng.IntN(41)-20), int64(1+rng.IntN(12)))
				if i == j && trial%2 == 0 {
					v.Add(v, big.NewRat(int64(10*n), 1)) // often definite
				}
				a[i][j], a[j][i] = v, v
			}
		}
		l, d, ok, _ := RatLDL(a)
		if ok {
			gm, lm, dm := NewMatrix(r, n), NewMatrix(r, n), make([]RatFunc, n)
			for i := range n {
				dm[i] = RatConst(r, d[i])
				for j := range n {
					gm[i][j], lm[i][j] = RatConst(r, a[i][j]), RatConst(r, l[i][j])
				}
			}
			if !gm.EqualLDL(lm, dm) {
				t.Fatalf("trial %d: L·D·Lᵀ differs from the matrix", trial)
			}
			gm[n-1][0] = RatConst(r, new(big.Rat).Add(a[n-1][0], big.NewRat(1, 3)))
			if gm.EqualLDL(lm, dm) {
				t.Fatalf("trial %d: a changed entry passes", trial)
			}
		}
		want := -1
		for k := 0; ok && k < n; k++ {
			if d[k].Sign() <= 0 {
				want = k
				break
			}
		}
		k, p := FirstNonPositivePivot(a)
		if ok && (k != want || (k >= 0 && p.Cmp(d[k]) != 0)) {
			t.Errorf("trial %d: first pivot ≤ 0 at %d (%v), want %d", trial, k, p, want)
		}
	}
}

// TestEqualLDLRefusesUnsymmetric: a matrix whose lower triangle is that of
// L·D·Lᵀ but whose upper triangle is not is no L·D·Lᵀ, however it is
// decided (common practice: L·D·Lᵀ is symmetric). [[1, 100], [0, 1]] has
// the leading minors of I, so the uniqueness of the factorization alone
// would take it for I = L·D·Lᵀ with L = I, D = (1, 1); its quadratic form
// x² + 100xy + y² is indefinite.
func TestEqualLDLRefusesUnsymmetric(t *testing.T) {
	r := NewRing([]string{"x", "y"}, nil)
	q := func(v int64) RatFunc { return RatConst(r, big.NewRat(v, 1)) }
	a := Matrix{{q(1), q(100)}, {q(0), q(1)}}
	l := Matrix{{q(1), q(0)}, {q(0), q(1)}}
	if a.EqualLDL(l, []RatFunc{q(1), q(1)}) {
		t.Error("an unsymmetric matrix is taken for L·D·Lᵀ")
	}
	if b := (Matrix{{q(1), q(0)}, {q(0), q(1)}}); !b.EqualLDL(l, []RatFunc{q(1), q(1)}) {
		t.Error("I = L·D·Lᵀ with L = I, D = (1, 1) is refused")
	}
}
