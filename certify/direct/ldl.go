package direct

import (
	"errors"
	"math/big"
	"slices"

	"github.com/lyacert/lyacert/poly"
)

// LDL is the exact factorization G = L·diag(D)·Lᵀ of a symmetric matrix of
// rational functions of the parameters, L unit lower triangular: Lagrange's
// completing of squares, xᵀGx = Σₖ Dₖ·(xₖ + Σᵢ>ₖ Lᵢₖ xᵢ)². A pivot that is
// identically zero is kept, with a zero column of L below it, when the whole
// remaining column is identically zero too (the semidefinite case).
type LDL struct {
	L    poly.Matrix
	D    []poly.RatFunc
	Zero []bool // pivots that are identically zero

	// minors are the leading minors as the fraction-free elimination
	// found them (nil when the factorization did not eliminate so).
	minors []poly.RatFunc
}

// ErrZeroPivot reports a pivot that is identically zero while its column is
// not: the form is indefinite wherever that column entry is non-zero (a 2×2
// principal minor of the Schur complement is −a²).
var ErrZeroPivot = errors.New("zero pivot with a non-zero column")

// Factorize computes the factorization; like gonum's factorizations, a
// failure is a result: it returns false and ErrZeroPivot's column index.
func (f *LDL) Factorize(g poly.Matrix) (ok bool, col int) {
	n := len(g)
	r := g[0][0].Ring()
	a := make(poly.Matrix, n)
	for i := range g {
		a[i] = append([]poly.RatFunc(nil), g[i]...)
	}
	f.L = poly.NewMatrix(r, n)
	f.D = make([]poly.RatFunc, n)
	f.Zero = make([]bool, n)
	f.minors = nil
	if c, ok := g.Consts(); ok {
		// Constant entries: the same elimination in rational arithmetic.
		l, d, ok, col := poly.RatLDL(c)
		if !ok {
			return false, col
		}
		for i := range n {
			f.D[i], f.Zero[i] = poly.RatConst(r, d[i]), d[i].Sign() == 0
			for j := 0; j <= i; j++ {
				if l[i][j].Sign() != 0 {
					f.L[i][j] = poly.RatConst(r, l[i][j])
				}
			}
		}
		return true, -1
	}
	if pr, ok := paramRing(g); ok {
		return f.bareiss(g, pr)
	}
	one := poly.RatConst(r, big.NewRat(1, 1))
	for k := 0; k < n; k++ {
		f.L[k][k] = one
		d := a[k][k]
		f.D[k] = d
		if d.IsZero() {
			for i := k + 1; i < n; i++ {
				if !a[i][k].IsZero() {
					return false, k
				}
			}
			f.Zero[k] = true
			continue
		}
		for i := k + 1; i < n; i++ {
			if !a[i][k].IsZero() {
				f.L[i][k] = a[i][k].Quo(d)
			}
		}
		for i := k + 1; i < n; i++ {
			if f.L[i][k].IsZero() {
				continue
			}
			for j := k + 1; j <= i; j++ {
				if a[k][j].IsZero() {
					continue
				}
				a[i][j] = a[i][j].Sub(f.L[i][k].Mul(a[k][j]))
				a[j][i] = a[i][j]
			}
		}
	}
	return true, -1
}

// paramRing returns the ring of g's parameters alone when no entry of g
// involves a state (a Gram matrix of a form in the states): its
// polynomials have short exponent keys.
func paramRing(g poly.Matrix) (*poly.Ring, bool) {
	r := g[0][0].Ring()
	mask := r.StateMask()
	for i := range g {
		for _, e := range g[i] {
			if e.Num.DegreeIn(mask) > 0 {
				return nil, false
			}
		}
	}
	names := r.Names()
	return poly.NewRing(nil, names[r.NumStates():]), true
}

// bareiss is Factorize by fraction-free elimination (Bareiss 1968) over
// Z[params]: with Δ a common denominator of the entries (their
// denominator factors and an integer) and A = Δ·G, every
// entry after k steps is the minor of A on the rows 1…k, i and the columns
// 1…k, j, got from the previous step by an exact division by the previous
// pivot; so the pivots are A's leading minors Mₖ, no rational function is
// formed inside the loop, and G's pivots and L are quotients of these
// minors formed once at the end: Dₖ = Mₖ/(Mₖ₋₁·Δ), Lᵢₖ = Aᵢₖ⁽ᵏ⁾/Mₖ.
//
// An entry that a step does not change (its row or column of the pivot
// column is zero) is only scaled by Mₖ/Mₖ₋₁, so it is kept with the step it
// belongs to and brought up to date, by one product and one exact
// division, when it is next read: a sparse matrix costs what its fill-in
// costs. A zero pivot with a zero column leaves the rest unchanged (the
// elimination goes on as on the submatrix without that index).
func (f *LDL) bareiss(g poly.Matrix, pr *poly.Ring) (bool, int) {
	n := len(g)
	r := g[0][0].Ring()
	ns := r.NumStates()
	down := make([]int, r.NumVars()) // full ring → parameter ring
	up := make([]int, pr.NumVars())  // parameter ring → full ring
	for i := range down {
		down[i] = i - ns
	}
	for i := range up {
		up[i] = ns + i
	}
	toParams := func(p *poly.Poly) *poly.Poly { return p.Relabel(pr, down) }
	toFull := func(q poly.RatFunc) poly.RatFunc {
		out := poly.RatFunc{Num: q.Num.Relabel(r, up)}
		for _, d := range q.Den {
			out.Den = append(out.Den, poly.DenFactor{P: d.P.Relabel(r, up), Mult: d.Mult})
		}
		return out
	}
	// Δ: every denominator factor at its highest multiplicity.
	var delta []poly.DenFactor
	for i := range g {
		for j := 0; j <= i; j++ {
			for _, d := range g[i][j].Den {
				k := slices.IndexFunc(delta, func(e poly.DenFactor) bool { return e.P.Equal(d.P) })
				switch {
				case k < 0:
					delta = append(delta, d)
				case d.Mult > delta[k].Mult:
					delta[k].Mult = d.Mult
				}
			}
		}
	}
	deltaPoly := poly.ConstInt(pr, 1)
	for _, d := range delta {
		deltaPoly.Mul(deltaPoly, new(poly.Poly).Pow(toParams(d.P), d.Mult))
	}
	// The lower triangle of A (nil: zero) and the step of each entry.
	a := make([][]*poly.Poly, n)
	at := make([][]int, n)
	for i := range a {
		a[i] = make([]*poly.Poly, i+1)
		at[i] = make([]int, i+1)
		for j := 0; j <= i; j++ {
			e := g[i][j]
			if e.IsZero() {
				continue
			}
			p := toParams(e.Num)
			for _, d := range delta {
				m := d.Mult
				if k := slices.IndexFunc(e.Den, func(x poly.DenFactor) bool { return x.P.Equal(d.P) }); k >= 0 {
					m -= e.Den[k].Mult
				}
				if m > 0 {
					p.Mul(p, new(poly.Poly).Pow(toParams(d.P), m))
				}
			}
			a[i][j] = p
		}
	}
	// The least integer that clears the coefficients' denominators joins
	// Δ, so that A and every minor of it lie in Z[params].
	den := big.NewInt(1)
	for i := range a {
		for _, p := range a[i] {
			if p != nil {
				c, _ := p.Content()
				g := new(big.Int).GCD(nil, nil, den, c.Denom())
				den.Mul(den, new(big.Int).Quo(c.Denom(), g))
			}
		}
	}
	if den.Cmp(big.NewInt(1)) != 0 {
		k := new(big.Rat).SetInt(den)
		for i := range a {
			for j, p := range a[i] {
				if p != nil {
					a[i][j] = new(poly.Poly).Scale(p, k)
				}
			}
		}
		deltaPoly.Scale(deltaPoly, k)
	}
	// scale[t] is the last non-zero pivot before step t (1 at first):
	// an entry kept at step s is, at step t, a[i][j]·scale[t]/scale[s].
	scale := make([]*poly.Poly, n+1)
	scale[0] = poly.ConstInt(pr, 1)
	current := func(i, j, t int) *poly.Poly {
		p := a[i][j]
		if p == nil || at[i][j] == t {
			return p
		}
		if s := scale[at[i][j]]; s != scale[t] {
			p = new(poly.Poly).Mul(p, scale[t])
			if s.IsConst() {
				p.Scale(p, new(big.Rat).Inv(s.ConstTerm()))
			} else if !p.DivExact(p, s) {
				panic("direct: inexact division in fraction-free elimination")
			}
		}
		a[i][j], at[i][j] = p, t
		return p
	}
	one := poly.RatConst(r, big.NewRat(1, 1))
	dpoly := poly.FromPoly(deltaPoly)
	dk := poly.FromPoly(poly.ConstInt(pr, 1)) // Δ^(pivots so far)
	for k := 0; k < n; k++ {
		f.L[k][k] = one
		prev := scale[k]
		p := current(k, k, k)
		var col []int // rows below k with a non-zero entry in column k
		for i := k + 1; i < n; i++ {
			if a[i][k] != nil {
				current(i, k, k)
				col = append(col, i)
			}
		}
		if p == nil {
			f.D[k] = poly.FromPoly(poly.Zero(r))
			if len(col) > 0 {
				return false, k
			}
			f.Zero[k] = true
			scale[k+1] = prev
			continue
		}
		pf := poly.FromPoly(p)
		f.D[k] = toFull(pf.Quo(poly.FromPoly(prev).Mul(dpoly)))
		dk = dk.Mul(dpoly)
		f.minors = append(f.minors, toFull(pf.Quo(dk)))
		for _, i := range col {
			f.L[i][k] = toFull(poly.FromPoly(a[i][k]).Quo(pf))
		}
		for x, i := range col {
			for _, j := range col[:x+1] {
				v := new(poly.Poly).Mul(a[i][k], a[j][k])
				if e := current(i, j, k); e != nil {
					v.Sub(new(poly.Poly).Mul(p, e), v)
				} else {
					v.Neg(v)
				}
				if !v.DivExact(v, prev) {
					panic("direct: inexact division in fraction-free elimination")
				}
				a[i][j], at[i][j] = v, k+1
				if v.IsZero() {
					a[i][j] = nil
				}
			}
		}
		scale[k+1] = p
	}
	return true, -1
}

// Semidefinite reports whether some pivot is identically zero.
func (f *LDL) Semidefinite() bool {
	for _, z := range f.Zero {
		if z {
			return true
		}
	}
	return false
}

// Minors returns the products of the first non-zero pivots: the leading
// principal minors of G (Sylvester's criterion), or, when some pivot is zero,
// those of G's principal submatrix on the non-zero pivots.
func (f *LDL) Minors() []poly.RatFunc {
	if f.minors != nil {
		return slices.Clone(f.minors)
	}
	var out []poly.RatFunc
	var p poly.RatFunc
	for i, d := range f.D {
		if f.Zero[i] {
			continue
		}
		if out == nil {
			p = d
		} else {
			p = p.Mul(d)
		}
		out = append(out, p)
	}
	return out
}

// Kernel returns a basis of {x : Lᵀ rows of the non-zero pivots vanish at x},
// which is the kernel of G when the non-zero pivots are positive: one vector
// per zero pivot, 1 at that coordinate and 0 at the other zero pivots.
func (f *LDL) Kernel() [][]poly.RatFunc {
	n := len(f.D)
	r := f.L[0][0].Ring()
	var basis [][]poly.RatFunc
	for z := 0; z < n; z++ {
		if !f.Zero[z] {
			continue
		}
		x := make([]poly.RatFunc, n)
		for i := range x {
			x[i] = poly.FromPoly(poly.Zero(r))
		}
		x[z] = poly.RatConst(r, big.NewRat(1, 1))
		for j := n - 1; j >= 0; j-- {
			if f.Zero[j] {
				continue
			}
			s := poly.FromPoly(poly.Zero(r))
			for i := j + 1; i < n; i++ {
				if !f.L[i][j].IsZero() && !x[i].IsZero() {
					s = s.Add(f.L[i][j].Mul(x[i]))
				}
			}
			x[j] = s.Neg()
		}
		basis = append(basis, x)
	}
	return basis
}

// ratLDL factors a rational symmetric matrix without pivoting and returns the
// first index k whose pivot is ≤ 0 together with a vector y with yᵀGy equal
// to that pivot (y = L⁻ᵀeₖ restricted to the leading k+1 coordinates), or
// -1 when every pivot is positive.
func ratLDL(g [][]*big.Rat) (int, []*big.Rat, *big.Rat) {
	n := len(g)
	a := make([][]*big.Rat, n)
	for i := range g {
		a[i] = make([]*big.Rat, n)
		for j := range g[i] {
			a[i][j] = new(big.Rat).Set(g[i][j])
		}
	}
	l := make([][]*big.Rat, n)
	for i := range l {
		l[i] = make([]*big.Rat, n)
		for j := range l[i] {
			l[i][j] = new(big.Rat)
		}
		l[i][i].SetInt64(1)
	}
	for k := 0; k < n; k++ {
		d := a[k][k]
		if d.Sign() <= 0 {
			// Solve Lᵀ y = w by back substitution, w = eₖ; or, for a zero
			// pivot coupled to a later row j, w = s·eₖ + eⱼ with
			// wᵀAw = a_jj + 2s·a_kj = −1 in the remaining block A: a
			// strictly negative direction.
			y := make([]*big.Rat, n)
			for i := range y {
				y[i] = new(big.Rat)
			}
			y[k].SetInt64(1)
			val := new(big.Rat).Set(d)
			if j := slices.IndexFunc(a[k][k+1:], func(x *big.Rat) bool { return x.Sign() != 0 }); d.Sign() == 0 && j >= 0 {
				j += k + 1
				sk := new(big.Rat).Add(a[j][j], big.NewRat(1, 1))
				sk.Quo(sk, new(big.Rat).Mul(big.NewRat(-2, 1), a[k][j]))
				y[k], y[j] = sk, big.NewRat(1, 1)
				val.SetInt64(-1)
			}
			for j := k - 1; j >= 0; j-- {
				s := new(big.Rat)
				for i := j + 1; i < n; i++ {
					s.Add(s, new(big.Rat).Mul(l[i][j], y[i]))
				}
				y[j].Neg(s)
			}
			return k, y, val
		}
		for i := k + 1; i < n; i++ {
			l[i][k].Quo(a[i][k], d)
		}
		for i := k + 1; i < n; i++ {
			for j := k + 1; j < n; j++ {
				a[i][j].Sub(a[i][j], new(big.Rat).Mul(l[i][k], a[k][j]))
			}
		}
	}
	return -1, nil, nil
}
