package sos_test

import (
	"math/big"
	"testing"

	"github.com/lyacert/lyacert/certify/sos"
)

// TestLDLBothWays: the tridiagonal matrix [2 1 0; 1 2 1; 0 1 2+ε] has the
// pivots 2, 3/2 and 4/3 + ε and L₂₁ = 1/2, L₃₂ = 2/3 (worked by hand,
// common practice). With ε = 1/8 the entries share a short denominator and
// the factorization runs in integers; with ε = 2⁻²⁰⁰⁰⁰ the denominator is
// too long for that and the rational elimination runs: the same values.
func TestLDLBothWays(t *testing.T) {
	for _, eps := range []*big.Rat{big.NewRat(1, 8), new(big.Rat).SetFrac(big.NewInt(1), new(big.Int).Lsh(big.NewInt(1), 20000))} {
		r := func(n, d int64) *big.Rat { return big.NewRat(n, d) }
		a := [][]*big.Rat{
			{r(2, 1), r(1, 1), r(0, 1)},
			{r(1, 1), r(2, 1), r(1, 1)},
			{r(0, 1), r(1, 1), new(big.Rat).Add(r(2, 1), eps)},
		}
		var f sos.LDL
		if !f.Factorize(a) {
			t.Fatalf("ε = %s: not positive definite", eps.RatString()[:min(20, len(eps.RatString()))])
		}
		want := []*big.Rat{r(2, 1), r(3, 2), new(big.Rat).Add(r(4, 3), eps)}
		for i := range want {
			if f.D[i].Cmp(want[i]) != 0 {
				t.Errorf("pivot %d: got %s", i, f.D[i].RatString())
			}
		}
		if f.L[1][0].Cmp(r(1, 2)) != 0 || f.L[2][1].Cmp(r(2, 3)) != 0 || f.L[2][0].Sign() != 0 {
			t.Errorf("L = %v", f.L)
		}
		// A negative pivot stops the factorization there.
		a[2][2] = r(1, 3)
		if f.Factorize(a) || len(f.D) != 3 || f.D[2].Cmp(r(-1, 3)) != 0 {
			t.Errorf("indefinite: pivots %v", f.D)
		}
	}
}
