package poly

import (
	"math/big"
)

// boxPoint returns the point of a box of single points.
func boxPoint(box []Interval) ([]*big.Rat, bool) {
	pt := make([]*big.Rat, len(box))
	for i, iv := range box {
		if iv.Lo.Inf != 0 || iv.Hi.Inf != 0 || iv.Lo.Value.Cmp(iv.Hi.Value) != 0 {
			return nil, false
		}
		pt[i] = iv.Lo.Value
	}
	return pt, true
}

// DecayAt returns M = −(JᵀP + PJ) (continuous time) or P − JᵀPJ (discrete
// time) for rational matrices J and P, exactly. When J = Jₙ/d and P = Pₙ/e
// have short common denominators the products are integer products
// (IntProduct): M = −(JₙᵀPₙ + PₙJₙ)/(d·e), or (d²·Pₙ − JₙᵀPₙJₙ)/(d²·e), and
// only the n² results are reduced to lowest terms.
func DecayAt(j [][]*big.Rat, discrete bool, p [][]*big.Rat) [][]*big.Rat {
	if jn, d, ok := CommonDenominator(j, 256); ok {
		if pn, e, ok := CommonDenominator(p, 256); ok {
			return decayInt(jn, d, discrete, pn, e)
		}
	}
	return decayRat(j, discrete, p)
}

func decayInt(jn [][]*big.Int, d *big.Int, discrete bool, pn [][]*big.Int, e *big.Int) [][]*big.Rat {
	n := len(jn)
	pj := IntProduct(pn, jn)
	den := new(big.Int).Mul(d, e)
	var jpj [][]*big.Int
	if discrete {
		jpj = IntProduct(IntTranspose(jn), pj)
		den.Mul(den, d)
	}
	d2 := new(big.Int).Mul(d, d)
	m := make([][]*big.Rat, n)
	for i := range m {
		m[i] = make([]*big.Rat, n)
	}
	for i := range n {
		for k := i; k < n; k++ {
			v := new(big.Int)
			if discrete {
				v.Sub(v.Mul(d2, pn[i][k]), jpj[i][k])
			} else {
				v.Neg(v.Add(pj[k][i], pj[i][k]))
			}
			m[i][k] = new(big.Rat).SetFrac(v, den)
			m[k][i] = m[i][k]
		}
	}
	return m
}

func decayRat(j [][]*big.Rat, discrete bool, p [][]*big.Rat) [][]*big.Rat {
	n := len(j)
	pj := make([][]*big.Rat, n) // P·J
	for i := 0; i < n; i++ {
		pj[i] = make([]*big.Rat, n)
		for k := 0; k < n; k++ {
			s := new(big.Rat)
			t := new(big.Rat)
			for l := 0; l < n; l++ {
				if p[i][l].Sign() != 0 && j[l][k].Sign() != 0 {
					AddRat(s, s, MulRat(t, p[i][l], j[l][k]))
				}
			}
			pj[i][k] = s
		}
	}
	m := make([][]*big.Rat, n)
	for i := range m {
		m[i] = make([]*big.Rat, n)
	}
	t := new(big.Rat)
	for i := 0; i < n; i++ {
		for k := i; k < n; k++ {
			v := new(big.Rat)
			if discrete {
				// (JᵀPJ)ᵢₖ = Σₗ Jₗᵢ (PJ)ₗₖ
				for l := 0; l < n; l++ {
					if j[l][i].Sign() != 0 {
						SubRat(v, v, MulRat(t, j[l][i], pj[l][k]))
					}
				}
				AddRat(v, v, p[i][k])
			} else {
				// (JᵀP)ᵢₖ = (PJ)ₖᵢ
				v.Neg(AddRat(v, pj[k][i], pj[i][k]))
			}
			m[i][k], m[k][i] = v, v
		}
	}
	return m
}
