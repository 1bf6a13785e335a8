package poly

import "math/big"

// QuadraticCofactors writes p, a polynomial in the states of its ring with
// no constant and no linear term, as
//
//	p(y) = yᵀ·(G + M(y))·y,
//
// G the constant symmetric Gram matrix of p's quadratic part and M(y) a
// symmetric matrix of polynomials without constant terms that carries the
// terms of degree ≥ 3. The split is canonical: a term c·y^α of degree ≥ 3
// goes to the pair (i, j), i the first state in y^α and j the first state
// in y^α/yᵢ, as c·y^α/(yᵢyⱼ) on the diagonal, or c/2 in (i, j) and in (j, i).
// It returns false when p involves a parameter or has a constant or a
// linear term.
func QuadraticCofactors(p *Poly) (g [][]*big.Rat, m [][]*Poly, ok bool) {
	r := p.ring
	n := r.NumStates()
	g = make([][]*big.Rat, n)
	m = make([][]*Poly, n)
	for i := range n {
		g[i] = make([]*big.Rat, n)
		m[i] = make([]*Poly, n)
		for j := range n {
			g[i][j], m[i][j] = new(big.Rat), Zero(r)
		}
	}
	half := big.NewRat(1, 2)
	for _, t := range p.sortedTerms() {
		e := append([]int(nil), t.Exp...)
		deg, i, j := 0, -1, -1
		for v, x := range e {
			if x > 0 && v >= n {
				return nil, nil, false
			}
			deg += x
		}
		if deg < 2 {
			return nil, nil, false
		}
		for v := range n {
			for i < 0 && e[v] > 0 {
				i = v
				e[v]--
			}
			if j < 0 && e[v] > 0 {
				j = v
				e[v]--
			}
		}
		c := new(big.Rat).Set(t.Coef)
		if i != j {
			c.Mul(c, half)
		}
		if deg == 2 {
			g[i][j].Add(g[i][j], c)
			if i != j {
				g[j][i].Add(g[j][i], c)
			}
			continue
		}
		mono := Monomial(r, e, c)
		m[i][j].Add(m[i][j], mono)
		if i != j {
			m[j][i].Add(m[j][i], mono)
		}
	}
	return g, m, true
}

// PositiveNearZero reports whether p(y) > 0 at every y ≠ 0 of the box
// (one bounded interval per variable of p's ring), for p in the states
// with no constant or linear term: with p = yᵀ(G + M(y))y
// (QuadraticCofactors), every symmetric matrix whose entries lie in
// G + Enclose(M) over the box is proven positive definite
// (PositiveDefiniteOn), so yᵀ(G + M(y))y > 0 for y ≠ 0. Near the origin the
// terms of degree ≥ 3 are small against the quadratic part, which is what
// makes the test succeed on small boxes around a strict minimum.
func (p *Poly) PositiveNearZero(box []Interval) bool {
	g, m, ok := QuadraticCofactors(p)
	if !ok || len(box) != p.ring.NumVars() {
		return false
	}
	for _, s := range box {
		if _, ok := s.Width(); !ok {
			return false
		}
	}
	n := len(g)
	e := make([][]Interval, n)
	for i := range n {
		e[i] = make([]Interval, n)
	}
	for i := range n {
		for j := i; j < n; j++ {
			x := Point(g[i][j])
			if !m[i][j].IsZero() {
				x = x.Add(m[i][j].Enclose(box))
			}
			e[i][j], e[j][i] = x, x
		}
	}
	return PositiveDefiniteOn(e)
}
