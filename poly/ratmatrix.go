package poly

import "math/big"

// Consts returns the entries of a as rationals when every entry is a
// constant (no variable, no denominator); ok is false otherwise.
func (a Matrix) Consts() (c [][]*big.Rat, ok bool) {
	c = make([][]*big.Rat, len(a))
	for i := range a {
		c[i] = make([]*big.Rat, len(a[i]))
		for j, e := range a[i] {
			if !e.IsPoly() || !e.Num.IsConst() {
				return nil, false
			}
			c[i][j] = e.Num.ConstTerm()
		}
	}
	return c, true
}

// EqualLDL reports a = L·diag(d)·Lᵀ exactly, for square a and L of the same
// size and len(d) rows of them. When every entry is a rational constant the
// identity is decided by the uniqueness of the factorization where it
// applies (a symmetric, its leading minors non-zero, L unit lower
// triangular: L and d are compared with those of Bareiss' elimination of
// a, see equalUniqueLDL), and otherwise checked in rational arithmetic,
// Σₖ (Lᵢₖ·dₖ)·Lⱼₖ for j ≤ i and a symmetric a, at O(n³) products of
// numbers; entries with parameters are compared as an identity of rational
// functions.
func (a Matrix) EqualLDL(l Matrix, d []RatFunc) bool {
	n := len(a)
	if len(l) != n || len(d) != n {
		return false
	}
	for i := range n {
		if len(a[i]) != n || len(l[i]) != n {
			return false
		}
	}
	ac, ok1 := a.Consts()
	lc, ok2 := l.Consts()
	dc, ok3 := Matrix{d}.Consts()
	if !ok1 || !ok2 || !ok3 {
		dm := NewMatrix(a[0][0].Ring(), n)
		for i := range n {
			dm[i][i] = d[i]
		}
		return l.Mul(dm).Mul(l.Transpose()).Equal(a)
	}
	if eq, decided := equalUniqueLDL(ac, lc, dc[0]); decided {
		return eq
	}
	return equalLDLSums(ac, lc, dc[0])
}

// equalUniqueLDL decides a = L·diag(d)·Lᵀ for rational a, L and d without
// forming the products, when it can: a symmetric matrix whose leading
// minors are all non-zero has exactly one such factorization with L unit
// lower triangular (Golub & Van Loan, Matrix Computations, 4th ed., Thm.
// 4.1.3), and Bareiss' elimination of a's integer form over a common
// denominator c gives it: dₖ = Δₖ₊₁/(Δₖ·c), Lᵢₖ = bᵢₖ⁽ᵏ⁾/Δₖ₊₁ (see
// PositiveLDL). So the identity holds iff L and d are those, compared by
// cross-multiplication. decided is false (the caller forms the sums) when L
// is not unit lower triangular, when a has a zero leading minor, or when
// its entries have no short common denominator.
func equalUniqueLDL(a, l [][]*big.Rat, d []*big.Rat) (eq, decided bool) {
	n := len(a)
	for i := range n {
		for j := range n {
			switch {
			case j > i && l[i][j].Sign() != 0, i == j && !isOne(l[i][j]):
				return false, false
			case j < i && a[i][j].Cmp(a[j][i]) != 0:
				return false, true // L·D·Lᵀ is symmetric
			}
		}
	}
	lower := make([][]*big.Rat, n)
	for i := range a {
		lower[i] = a[i][:i+1]
	}
	b, c, ok := CommonDenominator(lower, 1<<14)
	if !ok || bareissLower(b, false) >= 0 {
		return false, false
	}
	prev := big.NewInt(1)
	x, y := new(big.Int), new(big.Int)
	for k := range n {
		piv := b[k][k]
		// dₖ·Δₖ·c = Δₖ₊₁
		x.Mul(d[k].Num(), prev)
		x.Mul(x, c)
		if y.Mul(d[k].Denom(), piv); x.Cmp(y) != 0 {
			return false, true
		}
		for i := k + 1; i < n; i++ {
			// Lᵢₖ·Δₖ₊₁ = bᵢₖ⁽ᵏ⁾
			x.Mul(l[i][k].Num(), piv)
			if y.Mul(l[i][k].Denom(), b[i][k]); x.Cmp(y) != 0 {
				return false, true
			}
		}
		prev = piv
	}
	return true, true
}

// equalLDLSums is EqualLDL's check for rational entries by the sums
// Σₖ (Lᵢₖ·dₖ)·Lⱼₖ, j ≤ i.
func equalLDLSums(ac, lc [][]*big.Rat, dc []*big.Rat) bool {
	n := len(ac)
	ld := make([][]*big.Rat, n) // L·diag(d)
	for i := range n {
		ld[i] = make([]*big.Rat, n)
		for k := range n {
			ld[i][k] = MulRat(new(big.Rat), lc[i][k], dc[k])
		}
	}
	s, t := new(big.Rat), new(big.Rat)
	for i := range n {
		for j := 0; j <= i; j++ {
			s.SetInt64(0)
			for k := range n {
				if ld[i][k].Sign() != 0 && lc[j][k].Sign() != 0 {
					AddRat(s, s, MulRat(t, ld[i][k], lc[j][k]))
				}
			}
			if s.Cmp(ac[i][j]) != 0 || ac[i][j].Cmp(ac[j][i]) != 0 {
				return false
			}
		}
	}
	return true
}

// RatLDL factors a symmetric rational matrix exactly without pivoting,
// a = L·diag(D)·Lᵀ with L unit lower triangular (Lagrange's completing of
// squares). A zero pivot is kept, with a zero column of L below it, when the
// rest of its column is zero too; otherwise ok is false and col is its
// index. a is not modified.
func RatLDL(a [][]*big.Rat) (l [][]*big.Rat, d []*big.Rat, ok bool, col int) {
	n := len(a)
	w := make([][]*big.Rat, n)
	l = make([][]*big.Rat, n)
	for i := range a {
		w[i], l[i] = make([]*big.Rat, n), make([]*big.Rat, n)
		for j := range a[i] {
			w[i][j], l[i][j] = new(big.Rat).Set(a[i][j]), new(big.Rat)
		}
		l[i][i].SetInt64(1)
	}
	d = make([]*big.Rat, n)
	t := new(big.Rat)
	for k := range n {
		d[k] = w[k][k]
		if d[k].Sign() == 0 {
			for i := k + 1; i < n; i++ {
				if w[i][k].Sign() != 0 {
					return nil, nil, false, k
				}
			}
			continue
		}
		for i := k + 1; i < n; i++ {
			if w[i][k].Sign() != 0 {
				QuoRat(l[i][k], w[i][k], d[k])
			}
		}
		// Schur complement, lower triangle: w[i][j] −= l[i][k]·w[j][k].
		for i := k + 1; i < n; i++ {
			if l[i][k].Sign() == 0 {
				continue
			}
			for j := k + 1; j <= i; j++ {
				if w[j][k].Sign() != 0 {
					SubRat(w[i][j], w[i][j], MulRat(t, l[i][k], w[j][k]))
					w[j][i] = w[i][j]
				}
			}
		}
	}
	return l, d, true, -1
}

// bareissPivot is FirstNonPositivePivot by fraction-free elimination
// (Bareiss 1968, FirstNonPositiveMinor). With a short common denominator L of
// the entries, B = L·a is an integer matrix with Δₖ(B) = Lᵏ·Δₖ(a), so the
// k-th pivot of a is Δₖ(B)/(Δₖ₋₁(B)·L). Otherwise row and column i are scaled
// by sᵢ, the lcm of the denominators in row i: B = S·a·S has
// Δₖ(B) = Δₖ(a)·Π sᵢ² and the k-th pivot is Δₖ(B)/(Δₖ₋₁(B)·sₖ²). Either way
// the signs of the leading minors are a's, and no gcd is taken in the loop.
func bareissPivot(a [][]*big.Rat) (int, *big.Rat) {
	if dominant(a) {
		return -1, nil
	}
	maxDen := 0
	for _, row := range a {
		for _, x := range row {
			maxDen = max(maxDen, x.Denom().BitLen())
		}
	}
	if b, l, ok := CommonDenominator(a, 2*maxDen+64); ok {
		k, minor, prev := FirstNonPositiveMinor(b)
		if k < 0 {
			return -1, nil
		}
		return k, new(big.Rat).SetFrac(minor, prev.Mul(prev, l))
	}
	n := len(a)
	s := make([]*big.Int, n)
	b := make([][]*big.Int, n)
	g := new(big.Int)
	for i := range a {
		s[i] = big.NewInt(1)
		for _, x := range a[i] {
			if d := x.Denom(); !d.IsInt64() || d.Int64() != 1 {
				g.GCD(nil, nil, s[i], d)
				s[i].Mul(s[i], new(big.Int).Quo(d, g))
			}
		}
	}
	for i := range a {
		b[i] = make([]*big.Int, n)
		for j, x := range a[i] {
			v := new(big.Int).Mul(x.Num(), s[i])
			v.Mul(v, s[j])
			b[i][j] = v.Quo(v, x.Denom())
		}
	}
	k, minor, prev := FirstNonPositiveMinor(b)
	if k < 0 {
		return -1, nil
	}
	return k, new(big.Rat).SetFrac(minor, prev.Mul(prev, new(big.Int).Mul(s[k], s[k])))
}

// dominant reports that the square matrix a is strictly diagonally dominant
// with a positive diagonal: aᵢᵢ > Σⱼ≠ᵢ |aᵢⱼ| for every row. Every principal
// submatrix is then so too, and its eigenvalues have positive real parts
// (Gershgorin's circle theorem), so its determinant is positive: every
// leading minor, and so every pivot, is positive (Levy–Desplanques). An exact
// O(n²) test that settles the common well-conditioned case before any
// elimination.
func dominant(a [][]*big.Rat) bool {
	r, t := new(big.Rat), new(big.Rat)
	for i, row := range a {
		if row[i].Sign() <= 0 {
			return false
		}
		r.SetInt64(0)
		for j, x := range row {
			if j != i && x.Sign() != 0 {
				AddRat(r, r, t.Abs(x))
				if r.Cmp(row[i]) >= 0 {
					return false
				}
			}
		}
	}
	return true
}

// UnitLower reports that l is unit lower triangular and that the column of
// l below every index k with zero[k] vanishes. With d ≥ 0 and dₖ = 0 exactly
// where zero[k], L·diag(d)·Lᵀ = Σₖ dₖ·lₖlₖᵀ is then positive semidefinite
// (a sum of non-negative multiples of rank-one squares), and the zero
// columns keep the factorization the one Lagrange's completing of squares
// gives, so that a claimed LDLᵀ cannot hide a negative direction.
func (l Matrix) UnitLower(zero []bool) bool {
	for i := range l {
		if len(l[i]) != len(l) || len(zero) != len(l) {
			return false
		}
		for j := range l[i] {
			switch {
			case j == i && !l[i][j].IsOne(), j > i && !l[i][j].IsZero(), j < i && zero[j] && !l[i][j].IsZero():
				return false
			}
		}
	}
	return true
}

// InProducts reports that every monomial of p is a product z_a·z_b of two
// polynomials of z (monomials).
func (p *Poly) InProducts(z []*Poly) bool {
	prods := map[string]bool{}
	for a := range z {
		for b := range z {
			prods[new(Poly).Mul(z[a], z[b]).String()] = true
		}
	}
	for _, t := range p.Terms() {
		if !prods[Monomial(p.Ring(), t.Exp, big.NewRat(1, 1)).String()] {
			return false
		}
	}
	return true
}

// Bilinear returns g·zᵀGz for monomials (or any polynomials) z in every
// variable of the ring, states and parameters alike, and a constant
// Gram matrix G: the term of a multiplier identity Σₖ gₖ·zₖᵀGₖzₖ.
func Bilinear(g *Poly, gram [][]*big.Rat, z []*Poly) *Poly {
	sum := Zero(g.Ring())
	for i := range gram {
		for j := range gram[i] {
			if gram[i][j].Sign() != 0 {
				sum = new(Poly).Add(sum, new(Poly).Scale(new(Poly).Mul(z[i], z[j]), gram[i][j]))
			}
		}
	}
	return new(Poly).Mul(sum, g)
}
