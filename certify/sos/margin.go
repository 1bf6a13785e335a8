package sos

import (
	"context"
	"math"
	"math/big"

	"github.com/lyacert/lyacert/certify/sdp"
	"github.com/lyacert/lyacert/poly"
)

// MarginCertificate is p − ε·Σ_{a ∈ Pure} z_a² = zᵀGz with G ⪰ 0 proven by
// exact LDLᵀ: G = L·diag(D)·Lᵀ, D ≥ 0, a zero pivot only with a zero
// column of L below it. Pure are the basis elements that are pure powers
// of one variable, so the margin ε·Σ z_a² is a sum of pure even powers.
// G may be singular: then no positive definite Gram matrix of p need
// exist, yet p ≥ ε·Σ z_a².
type MarginCertificate struct {
	Gram    [][]*big.Rat
	L       [][]*big.Rat
	D       []*big.Rat
	Epsilon *big.Rat
	Pure    []int
	Bits    int
	// Optimum is the solver's largest margin ε*; Epsilon is a power of two
	// at most ε*/2.
	Optimum float64
}

// pureIndices returns the basis elements that are powers of one variable.
func (g *Gram) pureIndices() []int {
	var pure []int
	for a, e := range g.Basis {
		nz := 0
		for _, k := range e {
			if k != 0 {
				nz++
			}
		}
		if nz == 1 {
			pure = append(pure, a)
		}
	}
	return pure
}

// findMargin solves max ε subject to p − ε·Σ_{a ∈ pure} z_a² = zᵀGz, G ⪰ 0,
// 0 ≤ ε ≤ εmax, takes ε a power of two at most ε*/2, moves the rest of the
// margin back onto G's pure diagonal (G + (ε* − ε)·E, further inside the
// cone), rounds to multiples of 2^−bits, projects exactly onto the family
// of p − ε·Σ z_a² and factors exactly, semidefinite allowed. Low precisions
// come first: entries that vanish at the optimum (the kernel of a singular
// G) round to exact zeros there.
func (g *Gram) findMargin(ctx context.Context, p *poly.Poly, o *sdp.Options) (*MarginCertificate, int, error) {
	pure := g.pureIndices()
	n := len(g.Basis)
	if len(pure) == 0 {
		return nil, 0, nil
	}
	diag := map[int]bool{} // classes of the margin: z_a² for pure a
	emax := math.Inf(1)
	for ci, c := range g.Classes {
		for _, pr := range c.Pairs {
			if pr[0] == pr[1] && contains(pure, pr[0]) {
				diag[ci] = true
				f, _ := c.Coef.Float64()
				emax = math.Min(emax, f)
			}
		}
	}
	if !(emax > 0) {
		return nil, 0, nil
	}
	prob := g.Problem()
	prob.Blocks = append(prob.Blocks, -2) // ε, and w = εmax − ε
	for ci := range g.Classes {
		if diag[ci] {
			prob.A[ci] = append(prob.A[ci], sdp.Entry{Block: 1, I: 0, J: 0, V: 1})
		}
	}
	prob.A = append(prob.A, sdp.Matrix{{Block: 1, I: 0, J: 0, V: 1}, {Block: 1, I: 1, J: 1, V: 1}})
	prob.B = append(prob.B, emax)
	prob.C = sdp.Matrix{{Block: 1, I: 0, J: 0, V: 1}}
	r, err := sdp.Solve(ctx, prob, o)
	if err != nil {
		return nil, 0, err
	}
	best := r.X[1].Data[0]
	if r.Status != sdp.Optimal || !(best > 1e-9*emax) {
		return nil, r.Iterations, nil
	}
	eps := new(big.Rat).SetFloat64(math.Ldexp(1, math.Ilogb(best/2)))
	ef, _ := eps.Float64()
	x := append([]float64(nil), r.X[0].Data...)
	for _, a := range pure {
		x[a*n+a] += best - ef
	}
	coef := make([]*big.Rat, len(g.Classes))
	for ci, c := range g.Classes {
		coef[ci] = new(big.Rat).Set(c.Coef)
		if diag[ci] {
			coef[ci].Sub(coef[ci], eps)
		}
	}
	for _, bits := range []int{6, 10, 14, 20, 26, 34, 44} {
		G := roundGram(x, n, bits)
		g.Project(G, coef)
		l, d, ok, _ := poly.RatLDL(G)
		for k := 0; ok && k < n; k++ {
			ok = d[k].Sign() >= 0
		}
		if ok {
			return &MarginCertificate{Gram: G, L: l, D: d, Epsilon: eps, Pure: pure, Bits: bits, Optimum: best}, r.Iterations, nil
		}
	}
	return nil, r.Iterations, nil
}

func contains(s []int, v int) bool {
	for _, x := range s {
		if x == v {
			return true
		}
	}
	return false
}
