package poly

import "math/big"

// QuadraticCofactors writes p, a polynomial in the states of its ring with
// no constant and no linear term, as
//
//	p(y) = yᵀ·(G + M(y))·y,
//
// G the constant symmetric Gram matrix of p's quadratic part and M(y) a
// symmetric matrix of polynomials without constant terms that carries the
// terms of degree ≥ 3 (the split of QuadraticParts). It returns false when
// p involves a parameter or has a constant or a linear term.
func QuadraticCofactors(p *Poly) (g [][]*big.Rat, m [][]*Poly, ok bool) {
	n := p.ring.NumStates()
	for _, t := range p.sortedTerms() {
		for v := n; v < len(t.Exp); v++ {
			if t.Exp[v] > 0 {
				return nil, nil, false
			}
		}
	}
	gp, m, ok := QuadraticParts(p)
	if !ok {
		return nil, nil, false
	}
	g = make([][]*big.Rat, n)
	for i := range n {
		g[i] = make([]*big.Rat, n)
		for j := range n {
			g[i][j] = gp[i][j].ConstTerm()
		}
	}
	return g, m, true
}

// QuadraticParts writes p, a polynomial whose every term has degree ≥ 2 in
// the states y of its ring (its coefficients may be polynomials in the
// parameters q), as
//
//	p(y, q) = yᵀ·(G(q) + M(y, q))·y,
//
// G(q) symmetric with entries in the parameters only and M(y, q) symmetric
// with every term of degree ≥ 1 in y. The split is canonical: a term
// c·q^β·y^α with |α| ≥ 2 goes to the pair (i, j), i the first state in y^α
// and j the first state in y^α/yᵢ, as c·q^β·y^α/(yᵢyⱼ) on the diagonal, or
// half of it in (i, j) and in (j, i); to G when |α| = 2, to M when |α| ≥ 3.
// It returns false when some term has degree < 2 in the states.
func QuadraticParts(p *Poly) (g, m [][]*Poly, ok bool) {
	r := p.ring
	n := r.NumStates()
	g = make([][]*Poly, n)
	m = make([][]*Poly, n)
	for i := range n {
		g[i] = make([]*Poly, n)
		m[i] = make([]*Poly, n)
		for j := range n {
			g[i][j], m[i][j] = Zero(r), Zero(r)
		}
	}
	half := big.NewRat(1, 2)
	for _, t := range p.sortedTerms() {
		e := append([]int(nil), t.Exp...)
		deg, i, j := 0, -1, -1
		for _, x := range e[:n] {
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
		to := m
		if deg == 2 {
			to = g
		}
		mono := Monomial(r, e, c)
		to[i][j].Add(to[i][j], mono)
		if i != j {
			to[j][i].Add(to[j][i], mono)
		}
	}
	return g, m, true
}

// PositiveNearZero reports whether p(y, q) > 0 at every point of the box
// (one bounded interval per variable of p's ring, the states y then the
// parameters q) where y ≠ 0, for p whose every term has degree ≥ 2 in y:
// with p = yᵀ(G(q) + M(y, q))y (QuadraticParts), every symmetric matrix
// whose entries lie in Enclose(G) + Enclose(M) over the box is proven
// positive definite (PositiveDefiniteOn). At every point of the box the
// matrix G(q) + M(y, q) is one of them, so yᵀ(G + M)y > 0 for y ≠ 0. Near
// the origin the terms of degree ≥ 3 are small against the quadratic part,
// which is what makes the test succeed on small boxes around a strict
// minimum.
func (p *Poly) PositiveNearZero(box []Interval) bool {
	g, m, ok := QuadraticParts(p)
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
			x := g[i][j].Enclose(box)
			if !m[i][j].IsZero() {
				x = x.Add(m[i][j].Enclose(box))
			}
			e[i][j], e[j][i] = x, x
		}
	}
	return PositiveDefiniteOn(e)
}
