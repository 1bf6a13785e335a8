package direct

import (
	"fmt"
	"math/big"
	"slices"
	"strings"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

// Limits of the search for the invariance principle's identities: the
// order of the derivatives along the flow, the degree of the cofactors
// and of the polynomial g in one state.
const (
	lieOrders      = 3
	cofactorDegree = 2
	vanishDegree   = 8 // tried only as far as max(4, the degree of f)
	maxColumns     = 240
)

// invariance looks for the identities the kernel's invariance rule checks:
// for every state s a polynomial g(s) whose only real root is the
// equilibrium's coordinate, written as Σ cⱼ·hⱼ over the generators hⱼ, the
// square bases qₖ of −V̇'s semidefinite form and their derivatives along
// the flow. The cofactors are found by exact linear algebra over the
// rational functions of the parameters: the coefficients of g (a
// combination of (s − s*)ᵉ, e ≤ vanishDegree) and of the cofactors
// (monomials in the states of degree ≤ cofactorDegree) solve a homogeneous
// linear system, one equation per monomial in the states. Nil when none is
// found within the limits.
func (res *Result) invariance() *claims.Invariance {
	m := res.Model
	if m.Discrete || len(res.Forms) != 2 || (!res.HigherD.IsZero() && res.Forms[1].Basis == nil) {
		return nil
	}
	fd := res.Forms[1]
	r := m.Ring
	n := len(m.States)
	y := make([]poly.RatFunc, n) // the states measured from the equilibrium
	at := make([]*big.Rat, n)
	has := make([]bool, r.NumVars())
	for i := range n {
		a, err := m.At[i].EvalVars(nil)
		if err != nil || !a.IsPoly() || !a.Num.IsConst() {
			return nil
		}
		at[i] = a.Num.ConstTerm()
		y[i], has[i] = poly.FromPoly(poly.Var(r, i)).Sub(a), true
	}
	z := y // the basis of −V̇'s form, in the model's coordinates
	if fd.Basis != nil {
		z = nil
		sub := append(slices.Clone(y), make([]poly.RatFunc, r.NumVars()-n)...)
		for _, b := range fd.Basis {
			z = append(z, poly.FromPoly(b).ComposeStates(sub, has))
		}
	}
	claim := &claims.Invariance{}
	var gens []poly.RatFunc
	for k := range fd.LDL.D {
		if fd.LDL.Zero[k] {
			continue
		}
		h := poly.SquareBase(fd.LDL.L, z, k)
		for o := 0; o <= min(lieOrders, n); o++ {
			if !h.IsZero() {
				gens = append(gens, h)
				claim.Lie = append(claim.Lie, claims.LieTerm{Square: k + 1, Order: o})
			}
			h = m.Derivative(h)
		}
	}
	// The cofactors' degree: the highest that keeps the linear system
	// within maxColumns unknowns (the elimination is over rational
	// functions, so its size is what costs).
	var monos []poly.RatFunc
	for d := cofactorDegree; d >= 0 && monos == nil; d-- {
		if ms := stateMonomials(r, n, d); len(gens)*len(ms)+vanishDegree <= maxColumns {
			monos = ms
		}
	}
	if monos == nil {
		return nil
	}
	top := 4
	for _, f := range m.F {
		top = min(vanishDegree, max(top, f.Num.Degree()))
	}
	for s := range n {
		v, ok := vanishing(r, s, y[s], at[s], gens, monos, top)
		if !ok {
			return nil
		}
		v.State = m.States[s]
		claim.States = append(claim.States, v)
	}
	// Only the generators some identity uses (the kernel refuses others).
	var lie []claims.LieTerm
	for j, t := range claim.Lie {
		if slices.ContainsFunc(claim.States, func(v claims.Vanish) bool { return v.Cofactors[j] != "0" }) {
			lie = append(lie, t)
		}
	}
	for i := range claim.States {
		cs := claim.States[i].Cofactors
		claim.States[i].Cofactors = nil
		for j, t := range claim.Lie {
			if slices.Contains(lie, t) {
				claim.States[i].Cofactors = append(claim.States[i].Cofactors, cs[j])
			}
		}
	}
	claim.Lie = lie
	return claim
}

// stateMonomials lists the monomials in the n states of degree ≤ d.
func stateMonomials(r *poly.Ring, n, d int) []poly.RatFunc {
	var out []poly.RatFunc
	e := make([]int, r.NumVars())
	var rec func(i, left int)
	rec = func(i, left int) {
		if i == n {
			out = append(out, poly.FromPoly(poly.Monomial(r, slices.Clone(e), big.NewRat(1, 1))))
			return
		}
		for k := 0; k <= left; k++ {
			e[i] = k
			rec(i+1, left-k)
		}
		e[i] = 0
	}
	rec(0, d)
	return out
}

// vanishing solves for g(s) = Σ_e a_e·(s − s*)ᵉ = Σ_{j,m} c_{jm}·m·hⱼ with
// the least degree of g that admits a solution, and keeps it when g's only
// real root is s*.
func vanishing(r *poly.Ring, s int, zs poly.RatFunc, at *big.Rat, gens, monos []poly.RatFunc, top int) (claims.Vanish, bool) {
	for deg := 1; deg <= top; deg++ {
		var cols []poly.RatFunc
		for e := 1; e <= deg; e++ {
			cols = append(cols, zs.Pow(e))
		}
		for _, h := range gens {
			for _, mo := range monos {
				cols = append(cols, mo.Mul(h).Neg())
			}
		}
		sol, ok := nullVector(r, cols, deg)
		if !ok {
			continue
		}
		g := poly.FromPoly(poly.Zero(r))
		for e := 1; e <= deg; e++ {
			g = g.Add(sol[e-1].Mul(zs.Pow(e)))
		}
		// g must be free of parameters: divide by a coefficient.
		lead := sol[deg-1]
		if lead.IsZero() {
			continue
		}
		g = g.Quo(lead)
		u, uni := g.Num.Univariate(s)
		if !g.IsPoly() || !uni || !u.OnlyRealRoot(at) {
			continue
		}
		v := claims.Vanish{Poly: g.String()}
		for j := range gens {
			c := poly.FromPoly(poly.Zero(r))
			for k, mo := range monos {
				c = c.Add(sol[deg+j*len(monos)+k].Mul(mo))
			}
			v.Cofactors = append(v.Cofactors, c.Quo(lead).String())
		}
		return v, true
	}
	return claims.Vanish{}, false
}

// nullVector returns a solution x ≠ 0 of Σ xᵢ·colsᵢ = 0 (identically in the
// states) with x_{deg−1} ≠ 0 — the top coefficient of g — by Gauss–Jordan
// elimination over the rational functions of the parameters; the other free
// unknowns are zero.
func nullVector(r *poly.Ring, cols []poly.RatFunc, deg int) ([]poly.RatFunc, bool) {
	// Rows: the coefficients of every monomial in the states.
	rowOf := map[string]int{}
	var a [][]poly.RatFunc
	zero := poly.FromPoly(poly.Zero(r))
	for j, c := range cols {
		for _, t := range splitStates(r, c) {
			i, ok := rowOf[t.key]
			if !ok {
				i = len(a)
				rowOf[t.key] = i
				a = append(a, slices.Repeat([]poly.RatFunc{zero}, len(cols)))
			}
			a[i][j] = a[i][j].Add(t.coef)
		}
	}
	// Gauss–Jordan with the top coefficient's column last in the pivot order,
	// so that it stays free whenever it can.
	order := []int{}
	for j := range cols {
		if j != deg-1 {
			order = append(order, j)
		}
	}
	order = append(order, deg-1)
	pivotCol := map[int]int{} // row → column
	row := 0
	for _, j := range order {
		p := -1
		for i := row; i < len(a); i++ {
			if !a[i][j].IsZero() {
				p = i
				break
			}
		}
		if p < 0 {
			continue
		}
		a[row], a[p] = a[p], a[row]
		inv := poly.RatConst(r, big.NewRat(1, 1)).Quo(a[row][j])
		for k := range a[row] {
			a[row][k] = a[row][k].Mul(inv)
		}
		for i := range a {
			if i == row || a[i][j].IsZero() {
				continue
			}
			f := a[i][j]
			for k := range a[i] {
				if !a[row][k].IsZero() {
					a[i][k] = a[i][k].Sub(f.Mul(a[row][k]))
				}
			}
		}
		pivotCol[row] = j
		row++
	}
	for _, j := range pivotCol {
		if j == deg-1 {
			return nil, false // the top coefficient is forced to zero
		}
	}
	x := slices.Repeat([]poly.RatFunc{zero}, len(cols))
	x[deg-1] = poly.RatConst(r, big.NewRat(1, 1))
	for i, j := range pivotCol {
		x[j] = a[i][deg-1].Neg()
	}
	return x, true
}

type stateTerm struct {
	key  string
	coef poly.RatFunc
}

// splitStates writes f as Σ coef·(monomial in the states), the coefficients
// rational functions of the parameters (f's denominator is free of states).
func splitStates(r *poly.Ring, f poly.RatFunc) []stateTerm {
	n := 0
	for i := range r.NumVars() {
		if r.IsState(i) {
			n++
		}
	}
	den := poly.FromPoly(f.DenPoly())
	byKey := map[string]int{}
	var out []stateTerm
	for _, t := range f.Num.Terms() {
		se := make([]int, r.NumVars())
		pe := make([]int, r.NumVars())
		copy(se[:n], t.Exp[:n])
		copy(pe[n:], t.Exp[n:])
		key := fmt.Sprint(se[:n])
		c := poly.FromPoly(poly.Monomial(r, pe, t.Coef))
		if k, ok := byKey[key]; ok {
			out[k].coef = out[k].coef.Add(c)
			continue
		}
		byKey[key] = len(out)
		out = append(out, stateTerm{key, c})
	}
	for k := range out {
		out[k].coef = out[k].coef.Quo(den)
	}
	slices.SortFunc(out, func(a, b stateTerm) int { return strings.Compare(a.key, b.key) })
	return out
}
