package poly

import "math/big"

// Spread returns, for each coordinate i, Σ |A_α| over the exponents α
// with α_i > 0: how much of the enclosure's width (before Scale) the terms
// in t_i make, an upper bound on what halving along i alone can remove.
// A bisection may halve where it is largest; the value decides nothing.
func (f *CenteredForm) Spread() []*big.Int {
	out := make([]*big.Int, len(f.shape.deg))
	for i := range out {
		out[i] = new(big.Int)
	}
	abs := new(big.Int)
	for k := 1; k < len(f.coef); k++ {
		if f.coef[k].Sign() == 0 {
			continue
		}
		abs.Abs(&f.coef[k])
		for i, e := range f.shape.exps[k] {
			if e > 0 {
				out[i].Add(out[i], abs)
			}
		}
	}
	return out
}
