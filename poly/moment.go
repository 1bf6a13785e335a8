package poly

import "math/big"

// Pairing returns Σ_γ p_γ·y_γ, the sum over the monomials x^γ of the
// products of p's and y's coefficients there. Read with y as the list of
// values y_γ = L(x^γ) of a linear functional L on polynomials, it is L(p);
// that is how moment (dual) certificates evaluate a functional. It treats
// every variable alike, parameters included.
func Pairing(p, y *Poly) *big.Rat {
	p.check(y)
	s, t := new(big.Rat), new(big.Rat)
	if len(y.terms) < len(p.terms) {
		p, y = y, p
	}
	for k, c := range p.terms {
		if d, ok := y.terms[k]; ok {
			AddRat(s, s, MulRat(t, c, d))
		}
	}
	return s
}

// MomentMatrix returns M_ab = L(z_a·z_b) = Pairing(z_a·z_b, y), the moment
// matrix of the functional L that y lists (see Pairing) in the basis z. For
// a monomial basis its entries depend on the product monomial only (a
// Hankel-type structure). If p = zᵀGz then L(p) = Σ G_ab·M_ab = tr(G·M),
// which is ≥ 0 when G ⪰ 0 and M ⪰ 0: the duality behind moment
// certificates that p is no sum of squares (Lasserre 2001; Parrilo 2003).
func MomentMatrix(y *Poly, z []*Poly) Matrix {
	n := len(z)
	m := NewMatrix(y.ring, n)
	for a := range n {
		for b := a; b < n; b++ {
			v := Pairing(new(Poly).Mul(z[a], z[b]), y)
			m[a][b] = RatConst(y.ring, v)
			m[b][a] = m[a][b]
		}
	}
	return m
}

// EvenPowers reports that p = Σₖ cₖ·x_{iₖ}^(2mₖ) with every cₖ > 0 and
// mₖ ≥ 1, each term a power of one of the first n variables, and each of
// them present. Such a p is positive away from the origin and tends to
// infinity with |x| (each term is ≥ 0, and the largest |xᵢ| makes its own
// terms grow): a margin that makes a function it bounds from below
// positive definite and radially unbounded.
func (p *Poly) EvenPowers(n int) bool {
	seen := make([]bool, n)
	for k, c := range p.terms {
		e, at := unkey(k), -1
		for i, x := range e {
			if x != 0 && at >= 0 || x != 0 && (i >= n || x%2 != 0) {
				return false
			}
			if x != 0 {
				at = i
			}
		}
		if at < 0 || c.Sign() <= 0 {
			return false
		}
		seen[at] = true
	}
	for _, s := range seen {
		if !s {
			return false
		}
	}
	return n > 0
}
