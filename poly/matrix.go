package poly

import "math/big"

// Matrix is a dense matrix of rational functions of the parameters.
type Matrix [][]RatFunc

// NewMatrix returns the n×n zero matrix over r.
func NewMatrix(r *Ring, n int) Matrix {
	m := make(Matrix, n)
	for i := range m {
		m[i] = make([]RatFunc, n)
		for j := range m[i] {
			m[i][j] = FromPoly(Zero(r))
		}
	}
	return m
}

// GramMatrix returns the symmetric matrix G with q(x) = xᵀ G x for a quadratic
// form q in the first n variables (the states): G_ii is the coefficient of
// x_i², G_ij = G_ji half the coefficient of x_i x_j. Terms of q of another
// degree in the states are ignored; callers split q first.
func GramMatrix(q RatFunc, n int) Matrix {
	r := q.Ring()
	g := NewMatrix(r, n)
	// One pass over q's terms, each sent to its entry by the states in its
	// key (the coefficient of x_i·x_j is the terms with exactly those state
	// exponents, the states cleared from the key), rather than one pass of
	// Coefficient per entry.
	ns := r.nstates
	coef := map[[2]int]map[string]*big.Rat{}
	for k, c := range q.Num.terms {
		var idx [2]int
		deg := 0
		for v := 0; v < ns && deg <= 2; v++ {
			e := int(k[2*v])<<8 | int(k[2*v+1])
			for range e {
				if deg < 2 {
					idx[deg] = v
				}
				deg++
			}
		}
		if deg != 2 || idx[1] >= n {
			continue
		}
		b := []byte(k)
		clear(b[:2*ns])
		m := coef[idx]
		if m == nil {
			m = map[string]*big.Rat{}
			coef[idx] = m
		}
		m[string(b)] = c // shared (see Poly)
	}
	half := FromPoly(ConstInt(r, 2))
	for idx, m := range coef {
		i, j := idx[0], idx[1]
		c := RatFunc{Num: &Poly{ring: r, terms: m}}
		for _, df := range q.Den {
			c.Den = append(c.Den, DenFactor{df.P.Clone(), df.Mult})
		}
		c = c.cancel()
		if i != j {
			c = c.Quo(half)
		}
		g[i][j], g[j][i] = c, c
	}
	return g
}

// QuadraticForm returns xᵀ G x in the first len(G) variables.
func QuadraticForm(g Matrix, r *Ring) RatFunc {
	sum := FromPoly(Zero(r))
	for i := range g {
		for j := range g {
			xij := new(Poly).Mul(Var(r, i), Var(r, j))
			sum = sum.Add(g[i][j].Mul(FromPoly(xij)))
		}
	}
	return sum
}

// Mul returns a·b.
func (a Matrix) Mul(b Matrix) Matrix {
	n, k, m := len(a), len(b), len(b[0])
	r := b[0][0].Ring()
	c := make(Matrix, n)
	for i := 0; i < n; i++ {
		c[i] = make([]RatFunc, m)
		for j := 0; j < m; j++ {
			s := FromPoly(Zero(r))
			for l := 0; l < k; l++ {
				if a[i][l].IsZero() || b[l][j].IsZero() {
					continue
				}
				s = s.Add(a[i][l].Mul(b[l][j]))
			}
			c[i][j] = s
		}
	}
	return c
}

// Transpose returns aᵀ.
func (a Matrix) Transpose() Matrix {
	t := make(Matrix, len(a[0]))
	for j := range t {
		t[j] = make([]RatFunc, len(a))
		for i := range a {
			t[j][i] = a[i][j]
		}
	}
	return t
}

// Equal reports entrywise equality as rational functions.
func (a Matrix) Equal(b Matrix) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if len(a[i]) != len(b[i]) {
			return false
		}
		for j := range a[i] {
			if !a[i][j].Equal(b[i][j]) {
				return false
			}
		}
	}
	return true
}

// Strings returns the canonical text of every entry.
func (a Matrix) Strings() [][]string {
	out := make([][]string, len(a))
	for i := range a {
		out[i] = make([]string, len(a[i]))
		for j := range a[i] {
			out[i][j] = a[i][j].String()
		}
	}
	return out
}

// QuadraticFormIn returns zᵀ G z for the vector z of polynomials (a monomial
// basis, say): Σᵢⱼ Gᵢⱼ zᵢ zⱼ.
func QuadraticFormIn(g Matrix, z []*Poly) RatFunc {
	r := z[0].Ring()
	sum := FromPoly(Zero(r))
	for i := range g {
		for j := range g {
			if g[i][j].IsZero() {
				continue
			}
			sum = sum.Add(g[i][j].Mul(FromPoly(new(Poly).Mul(z[i], z[j]))))
		}
	}
	return sum
}

// SquareBase returns zₖ + Σᵢ>ₖ Lᵢₖ·zᵢ, the expression squared in the k-th
// term of the completed squares zᵀ(L·D·Lᵀ)z = Σ Dₖ·(zₖ + Σᵢ>ₖ Lᵢₖ·zᵢ)²
// (Lagrange), for L unit lower triangular and z the basis of the form. For a
// semidefinite form, the bases of the non-zero pivots vanish exactly on its
// kernel.
func SquareBase(l Matrix, z []RatFunc, k int) RatFunc {
	lin := z[k]
	for i := k + 1; i < len(z); i++ {
		if !l[i][k].IsZero() {
			lin = lin.Add(l[i][k].Mul(z[i]))
		}
	}
	return lin
}

// StateBasis returns the first n variables of r (the states) as a basis.
func StateBasis(r *Ring, n int) []RatFunc {
	z := make([]RatFunc, n)
	for i := range z {
		z[i] = FromPoly(Var(r, i))
	}
	return z
}

// QuadraticAbout returns (x − a)ᵀP(x − a) in the first len(P) variables
// (the states) for a symmetric rational P and a point a, expanded as
// xᵀPx − 2(Pa)ᵀx + aᵀPa and built in one term map: O(n²) coefficients, where
// summing n² products of polynomials would copy the growing sum each time.
func QuadraticAbout(r *Ring, p [][]*big.Rat, a []*big.Rat) *Poly {
	n := len(p)
	out := Zero(r)
	e := make([]int, r.NumVars())
	set := func(c *big.Rat) {
		if c.Sign() != 0 {
			out.terms[key(e)] = c
		}
	}
	pa := make([]*big.Rat, n) // P·a
	t := new(big.Rat)
	for i := range n {
		pa[i] = new(big.Rat)
		for j := range n {
			if p[i][j].Sign() != 0 && a[j].Sign() != 0 {
				AddRat(pa[i], pa[i], MulRat(t, p[i][j], a[j]))
			}
		}
	}
	apa := new(big.Rat)
	for i := range n {
		e[i] = 2
		set(new(big.Rat).Set(p[i][i]))
		e[i] = 1
		for j := i + 1; j < n; j++ {
			e[j] = 1
			set(new(big.Rat).Add(p[i][j], p[j][i]))
			e[j] = 0
		}
		set(new(big.Rat).Mul(pa[i], big.NewRat(-2, 1)))
		e[i] = 0
		AddRat(apa, apa, MulRat(t, a[i], pa[i]))
	}
	set(apa)
	return out
}
