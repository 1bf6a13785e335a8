package poly

import "math/big"

// Univariate returns p as a polynomial in variable i alone; false when
// another variable occurs in p.
func (p *Poly) Univariate(i int) (Univariate, bool) {
	deg := 0
	for k := range p.terms {
		e := unkey(k)
		for j, x := range e {
			if j != i && x != 0 {
				return Univariate{}, false
			}
		}
		deg = max(deg, e[i])
	}
	c := make([]*big.Rat, deg+1)
	for j := range c {
		c[j] = new(big.Rat)
	}
	for k, a := range p.terms {
		c[unkey(k)[i]].Set(a)
	}
	return NewUnivariate(c...), true
}

// FromUnivariate returns u as a polynomial in variable i of r.
func FromUnivariate(r *Ring, i int, u Univariate) *Poly {
	p := Zero(r)
	for j, c := range u.Coeffs() {
		if c.Sign() == 0 {
			continue
		}
		e := make([]int, r.NumVars())
		e[i] = j
		p.Add(p, Monomial(r, e, c))
	}
	return p
}
