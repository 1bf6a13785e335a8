package sos_test

import (
	"context"
	"math/big"
	"testing"

	"github.com/lyacert/lyacert/certify/sos"
	"github.com/lyacert/lyacert/poly"
)

// checkMargin re-checks a margin certificate from scratch: the identity
// p − ε·Σ z_a² = zᵀGz over the pure powers z_a, and G = L·D·Lᵀ with D ≥ 0
// and zero columns below zero pivots.
func checkMargin(t *testing.T, p *poly.Poly, res *sos.Result) {
	t.Helper()
	c := res.Margin
	r := p.Ring()
	target := p.Clone()
	for _, a := range c.Pure {
		full := make([]int, r.NumVars())
		for i, v := range res.Vars {
			full[v] = 2 * res.Basis[a][i]
		}
		target.Sub(target, poly.Monomial(r, full, c.Epsilon))
	}
	if c.Epsilon.Sign() <= 0 || !gramPoly(p, res, c.Gram).Equal(target) {
		t.Fatalf("p − ε·Σ z_a² ≠ zᵀGz (ε = %v)", c.Epsilon)
	}
	n := len(c.Gram)
	for i := range n {
		if c.D[i].Sign() < 0 {
			t.Fatalf("pivot %d = %v", i, c.D[i])
		}
		for j := range n {
			if c.D[j].Sign() == 0 && i > j && c.L[i][j].Sign() != 0 {
				t.Fatalf("zero pivot %d with a non-zero column", j)
			}
			s := new(big.Rat)
			for k := range n {
				s.Add(s, new(big.Rat).Mul(new(big.Rat).Mul(c.L[i][k], c.D[k]), c.L[j][k]))
			}
			if s.Cmp(c.Gram[i][j]) != 0 {
				t.Fatalf("LDLᵀ ≠ G at (%d,%d)", i, j)
			}
		}
	}
}

// TestMarginSingular: p = x⁴ + y⁴ + (x²y − xy²)² (constructed,
// hand-checked). The products x²y·x²y, x²y·xy² and xy²·xy² are the only
// ways to reach x⁴y², x³y³ and x²y⁴, so every Gram matrix of p has the
// block [[1, −1], [−1, 1]] on (x²y, xy²) and is singular: no positive
// definite Gram matrix exists. Yet p − ε(x⁴ + y⁴) is a sum of squares for
// ε ≤ 1, so the margin form certifies p ≥ ε(x⁴ + y⁴).
func TestMarginSingular(t *testing.T) {
	p := parse(t, []string{"x", "y"}, "x^4 + y^4 + x^4*y^2 - 2*x^3*y^3 + x^2*y^4")
	res, err := sos.Find(context.Background(), p, nil)
	if err != nil {
		t.Fatal(err)
	}
	if res.Certificate != nil {
		t.Fatalf("a positive definite Gram matrix for a polynomial whose Gram matrices are all singular")
	}
	if res.Margin == nil {
		t.Fatalf("no margin certificate (status %v, margin %g)", res.SolverStatus, res.Sizes.Margin)
	}
	checkMargin(t, p, res)
	zero := 0
	for _, d := range res.Margin.D {
		if d.Sign() == 0 {
			zero++
		}
	}
	if zero == 0 {
		t.Errorf("G has no zero pivot; every Gram matrix of p is singular")
	}
	if res.Margin.Epsilon.Cmp(big.NewRat(1, 1)) > 0 {
		t.Errorf("ε = %v > 1, but p − ε(x⁴ + y⁴) < 0 at (1, 0) then", res.Margin.Epsilon)
	}
	t.Logf("ε = %v (optimum %.4g), %d bits, basis %v", res.Margin.Epsilon, res.Margin.Optimum, res.Margin.Bits, res.Basis)
}
