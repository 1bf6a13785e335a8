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
// time) for rational matrices J and P, exactly.
func DecayAt(j [][]*big.Rat, discrete bool, p [][]*big.Rat) [][]*big.Rat {
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
