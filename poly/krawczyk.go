package poly

import "math/big"

// KrawczykImage returns the Krawczyk operator
//
//	K(X) = m − Y·g(m) + C(X)·(X − m),   m = mid X,
//
// where C(X)ᵢⱼ is the exact rational-interval enclosure (Poly.Enclose) over
// the box X of the polynomial δᵢⱼ − Σₖ Yᵢₖ·∂gₖ/∂xⱼ. The box has one bounded
// interval per variable of g's ring (the states; the ring must have no other
// variables). If K(X) lies in the interior of X, then X contains exactly one
// zero of g: by the mean value theorem applied to each component of
// φ(x) = x − Y·g(x), φ maps X into K(X) ⊂ X, so φ has a fixed point (Brouwer);
// strict inclusion makes every matrix with rows in C(X) a contraction in the
// norm max |vᵢ|/rᵢ (rᵢ the radii of X), which makes Y nonsingular and the
// zero unique (Krawczyk 1969; Moore 1977).
func KrawczykImage(g []*Poly, box []Interval, y [][]*big.Rat) []Interval {
	n := len(g)
	mid := make([]*big.Rat, n)
	dev := make([]Interval, n)
	for i := range box {
		mid[i] = box[i].Mid()
		dev[i] = box[i].Sub(Point(mid[i]))
	}
	gm := make([]*big.Rat, n)
	for i := range g {
		gm[i] = g[i].Eval(mid)
	}
	jac := Jacobian(g)
	r := g[0].Ring()
	k := make([]Interval, n)
	for i := 0; i < n; i++ {
		c := new(big.Rat).Set(mid[i])
		t := new(big.Rat)
		for l := 0; l < n; l++ {
			c.Sub(c, t.Mul(y[i][l], gm[l]))
		}
		sum := Point(c)
		for j := 0; j < n; j++ {
			cij := Zero(r)
			if i == j {
				cij = ConstInt(r, 1)
			}
			for l := 0; l < n; l++ {
				cij.Sub(cij, new(Poly).Scale(jac[l][j], y[i][l]))
			}
			sum = sum.Add(cij.Enclose(box).Mul(dev[j]))
		}
		k[i] = sum
	}
	return k
}

// DecayEnclosure returns the exact rational-interval enclosure over the box
// (Poly.Enclose of each entry, as a polynomial in the states) of
// M(x) = −(J(x)ᵀP + P·J(x)) for continuous time, or P − J(x)ᵀP·J(x) for
// discrete time, J the Jacobian of f and P symmetric. A box of points gives
// M exactly there. Entries (i, j) and (j, i) are the same interval.
func DecayEnclosure(f []*Poly, discrete bool, p [][]*big.Rat, box []Interval) [][]Interval {
	if pt, ok := boxPoint(box); ok {
		// At a point the enclosure is the exact value: evaluate J first.
		jac := Jacobian(f)
		j := make([][]*big.Rat, len(f))
		for i := range jac {
			for k := range jac[i] {
				j[i] = append(j[i], jac[i][k].Eval(pt))
			}
		}
		m := DecayAt(j, discrete, p)
		out := make([][]Interval, len(m))
		for i := range m {
			for k := range m[i] {
				out[i] = append(out[i], Point(m[i][k]))
			}
		}
		return out
	}
	n := len(f)
	jac := Jacobian(f)
	r := f[0].Ring()
	out := make([][]Interval, n)
	for i := range out {
		out[i] = make([]Interval, n)
	}
	for i := 0; i < n; i++ {
		for j := i; j < n; j++ {
			m := Zero(r)
			if discrete {
				m = Const(r, p[i][j])
				for k := 0; k < n; k++ {
					for l := 0; l < n; l++ {
						if p[k][l].Sign() == 0 {
							continue
						}
						t := new(Poly).Mul(jac[k][i], jac[l][j])
						m.Sub(m, t.Scale(t, p[k][l]))
					}
				}
			} else {
				for k := 0; k < n; k++ {
					m.Sub(m, new(Poly).Scale(jac[k][i], p[k][j]))
					m.Sub(m, new(Poly).Scale(jac[k][j], p[i][k]))
				}
			}
			e := m.Enclose(box)
			out[i][j], out[j][i] = e, e
		}
	}
	return out
}

// PositiveDefiniteOn reports whether every symmetric matrix whose entries
// lie in the closed intervals e (symmetric: e[i][j] = e[j][i]) is positive
// definite. With the midpoint matrix Mc and the radius matrix R, a symmetric
// E with |Eᵢⱼ| ≤ Rᵢⱼ has ‖E‖₂ ≤ ‖E‖∞ ≤ ρ = maxᵢ Σⱼ Rᵢⱼ, so
// λmin(Mc + E) ≥ λmin(Mc) − ρ > 0 when Mc − ρI is positive definite, which
// exact LDLᵀ decides (all pivots > 0).
func PositiveDefiniteOn(e [][]Interval) bool {
	n := len(e)
	mc := make([][]*big.Rat, n)
	rho := new(big.Rat)
	half := big.NewRat(1, 2)
	for i := range e {
		mc[i] = make([]*big.Rat, n)
		row := new(big.Rat)
		for j := range e[i] {
			x := e[i][j]
			if x.Lo.Inf == 0 && x.Hi.Inf == 0 && (x.Lo.Value == x.Hi.Value || x.Lo.Value.Cmp(x.Hi.Value) == 0) {
				// A point: its own midpoint, radius 0.
				mc[i][j] = new(big.Rat).Set(x.Lo.Value)
				continue
			}
			w, ok := x.Width()
			if !ok {
				return false
			}
			mc[i][j] = x.Mid()
			AddRat(row, row, MulRat(w, w, half))
		}
		if row.Cmp(rho) > 0 {
			rho = row
		}
	}
	for i := range mc {
		SubRat(mc[i][i], mc[i][i], rho)
	}
	k, _ := FirstNonPositivePivot(mc)
	return k < 0
}
