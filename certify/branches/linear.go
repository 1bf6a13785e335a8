package branches

import (
	"context"
	"errors"

	"github.com/lyacert/lyacert/poly"
)

// Matrix is a square matrix of surds.
type Matrix [][]Surd

func cloneMatrix(a Matrix) Matrix {
	out := make(Matrix, len(a))
	for i := range a {
		out[i] = append([]Surd(nil), a[i]...)
	}
	return out
}

// bareiss brings a (n rows, at least n columns) to upper triangular form
// by fraction-free elimination (Bareiss 1968): with the previous pivot d,
// a_ij ← (a_kk·a_ij − a_ik·a_kj)/d, a division that is exact by Sylvester's
// identity, so entries stay minors of a. It returns the determinant of the
// leading n×n block (0 when singular) and the reduced matrix.
func bareiss(ctx context.Context, a Matrix) (Surd, Matrix, error) {
	m := cloneMatrix(a)
	n := len(m)
	r := m[0][0].Ring()
	prev := intSurd(r, 1)
	sign := 1
	for k := range n {
		if err := ctx.Err(); err != nil {
			return Surd{}, nil, err
		}
		p := k
		for p < n && m[p][k].IsZero() {
			p++
		}
		if p == n {
			return intSurd(r, 0), m, nil
		}
		if p != k {
			m[p], m[k] = m[k], m[p]
			sign = -sign
		}
		for i := k + 1; i < n; i++ {
			for j := k + 1; j < len(m[i]); j++ {
				v := m[k][k].Mul(m[i][j]).Sub(m[i][k].Mul(m[k][j]))
				q, err := v.Quo(prev)
				if err != nil {
					return Surd{}, nil, err
				}
				m[i][j] = q
			}
			m[i][k] = intSurd(r, 0)
		}
		prev = m[k][k]
	}
	det := m[n-1][n-1]
	if sign < 0 {
		det = det.Neg()
	}
	return det, m, nil
}

// Det returns the determinant of a square surd matrix.
func Det(ctx context.Context, a Matrix) (Surd, error) {
	if len(a) == 0 {
		return Surd{}, errors.New("empty matrix")
	}
	d, _, err := bareiss(ctx, a)
	return d, err
}

// solveLinear solves a·x = b over Q(p)(√w): Bareiss elimination of [a | b],
// then back-substitution. It fails when a is singular.
func solveLinear(ctx context.Context, a Matrix, b []Surd) ([]Surd, Surd, error) {
	n := len(a)
	aug := make(Matrix, n)
	for i := range a {
		aug[i] = append(append([]Surd(nil), a[i]...), b[i])
	}
	det, m, err := bareiss(ctx, aug)
	if err != nil {
		return nil, Surd{}, err
	}
	if det.IsZero() {
		return nil, det, errors.New("singular system")
	}
	x := make([]Surd, n)
	for i := n - 1; i >= 0; i-- {
		s := m[i][n]
		for j := i + 1; j < n; j++ {
			s = s.Sub(m[i][j].Mul(x[j]))
		}
		if x[i], err = s.Quo(m[i][i]); err != nil {
			return nil, Surd{}, err
		}
	}
	return x, det, nil
}

func identity(r *poly.Ring, w *poly.RatFunc, n int) Matrix {
	m := make(Matrix, n)
	for i := range m {
		m[i] = make([]Surd, n)
		for j := range m[i] {
			m[i][j] = intSurd(r, 0)
			if i == j {
				m[i][j] = intSurd(r, 1)
			}
			m[i][j].W = w
		}
	}
	return m
}

func mulMatrix(a, b Matrix) Matrix {
	n := len(a)
	out := make(Matrix, n)
	for i := range n {
		out[i] = make([]Surd, n)
		for j := range n {
			s := a[i][0].Mul(b[0][j])
			for k := 1; k < n; k++ {
				s = s.Add(a[i][k].Mul(b[k][j]))
			}
			out[i][j] = s
		}
	}
	return out
}

// CharPoly returns the coefficients c₀ … cₙ (cₙ = 1) of det(λI − a) by the
// Faddeev–LeVerrier recursion: M₁ = I, c_{n−k} = −tr(a·M_k)/k,
// M_{k+1} = a·M_k + c_{n−k}·I.
func CharPoly(ctx context.Context, a Matrix) ([]Surd, error) {
	n := len(a)
	r := a[0][0].Ring()
	var w *poly.RatFunc
	for _, row := range a {
		for _, x := range row {
			if x.W != nil {
				w = x.W
			}
		}
	}
	c := make([]Surd, n+1)
	c[n] = intSurd(r, 1)
	c[n].W = w
	m := identity(r, w, n)
	for k := 1; k <= n; k++ {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		am := mulMatrix(a, m)
		tr := am[0][0]
		for i := 1; i < n; i++ {
			tr = tr.Add(am[i][i])
		}
		q, err := tr.Neg().Quo(intSurd(r, int64(k)))
		if err != nil {
			return nil, err
		}
		c[n-k] = q
		if k < n {
			for i := range n {
				am[i][i] = am[i][i].Add(q)
			}
			m = am
		}
	}
	return c, nil
}

// Hurwitz returns the Hurwitz determinants H₁ … Hₙ of the polynomial with
// coefficients c₀ … cₙ (ascending; cₙ the leading one): H_k is the leading
// k×k minor of the matrix with entries a_{2j−i} (1-based; a₀ = cₙ, a₁ =
// c_{n−1}, …, zero outside 0…n). With cₙ > 0 all roots lie in the open left
// half-plane iff H₁, …, Hₙ > 0 (Routh 1877; Hurwitz 1895).
func Hurwitz(ctx context.Context, c []Surd) ([]Surd, error) {
	n := len(c) - 1
	r := c[0].Ring()
	a := func(i int) Surd {
		if i < 0 || i > n {
			z := intSurd(r, 0)
			return z
		}
		return c[n-i]
	}
	h := make([]Surd, n)
	for k := 1; k <= n; k++ {
		m := make(Matrix, k)
		for i := range k {
			m[i] = make([]Surd, k)
			for j := range k {
				m[i][j] = a(2*(j+1) - (i + 1))
			}
		}
		d, err := Det(ctx, m)
		if err != nil {
			return nil, err
		}
		h[k-1] = d
	}
	return h, nil
}

// Bilinear returns the coefficients of q(s) = (1 − s)ⁿ·p((1 + s)/(1 − s)):
// the roots of p inside the unit disc are carried to the roots of q in the
// open left half-plane (the Möbius map behind the Schur–Cohn and Jury
// tests), and q's leading coefficient is (−1)ⁿ·p(−1), its constant p(1).
func Bilinear(c []Surd) []Surd {
	n := len(c) - 1
	r := c[0].Ring()
	out := make([]Surd, n+1)
	for i := range out {
		out[i] = intSurd(r, 0)
	}
	for k, ck := range c {
		// (1 + s)^k (1 − s)^(n−k), expanded with binomials.
		for i := 0; i <= k; i++ {
			for j := 0; j <= n-k; j++ {
				b := binom(k, i) * binom(n-k, j)
				if j%2 == 1 {
					b = -b
				}
				out[i+j] = out[i+j].Add(ck.Mul(intSurd(r, b)))
			}
		}
	}
	return out
}

func binom(n, k int) int64 {
	b := int64(1)
	for i := 1; i <= k; i++ {
		b = b * int64(n-k+i) / int64(i)
	}
	return b
}

// Lyapunov solves AᵀP + PA = −I (continuous time) or AᵀPA − P = −I (maps)
// for the symmetric P over Q(p)(√w), as a linear system in the n(n+1)/2
// entries of P solved by Bareiss elimination. It fails when the system is
// singular (two eigenvalues with λᵢ + λⱼ = 0, or λᵢλⱼ = 1 for maps).
func Lyapunov(ctx context.Context, a Matrix, discrete bool) (Matrix, Surd, error) {
	n := len(a)
	r := a[0][0].Ring()
	var w *poly.RatFunc
	for _, row := range a {
		for _, x := range row {
			if x.W != nil {
				w = x.W
			}
		}
	}
	idx := make([][]int, n)
	m := 0
	for i := range n {
		idx[i] = make([]int, n)
	}
	for i := range n {
		for j := i; j < n; j++ {
			idx[i][j], idx[j][i] = m, m
			m++
		}
	}
	sys := make(Matrix, m)
	rhs := make([]Surd, m)
	zero := intSurd(r, 0)
	zero.W = w
	for i := range n {
		for j := i; j < n; j++ {
			row := make([]Surd, m)
			for u := range row {
				row[u] = zero
			}
			e := idx[i][j]
			if discrete {
				// Σ_{k,l} a_ki P_kl a_lj − P_ij
				for k := range n {
					for l := range n {
						row[idx[k][l]] = row[idx[k][l]].Add(a[k][i].Mul(a[l][j]))
					}
				}
				row[e] = row[e].Sub(intSurd(r, 1))
			} else {
				// Σ_k a_ki P_kj + P_ik a_kj
				for k := range n {
					row[idx[k][j]] = row[idx[k][j]].Add(a[k][i])
					row[idx[i][k]] = row[idx[i][k]].Add(a[k][j])
				}
			}
			sys[e] = row
			rhs[e] = zero
			if i == j {
				rhs[e] = intSurd(r, -1)
				rhs[e].W = w
			}
		}
	}
	x, det, err := solveLinear(ctx, sys, rhs)
	if err != nil {
		return nil, det, err
	}
	p := make(Matrix, n)
	for i := range n {
		p[i] = make([]Surd, n)
		for j := range n {
			p[i][j] = x[idx[i][j]]
		}
	}
	return p, det, nil
}

// LeadingMinors returns the leading principal minors of a; a symmetric a is
// positive definite iff all are positive (Sylvester's criterion).
func LeadingMinors(ctx context.Context, a Matrix) ([]Surd, error) {
	out := make([]Surd, len(a))
	for k := 1; k <= len(a); k++ {
		m := make(Matrix, k)
		for i := range k {
			m[i] = a[i][:k]
		}
		d, err := Det(ctx, m)
		if err != nil {
			return nil, err
		}
		out[k-1] = d
	}
	return out, nil
}
