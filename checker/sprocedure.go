package checker

import (
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

// sublevelSProcedure: the S-procedure on a sublevel set (Khalil, Nonlinear Systems,
// §8.2). With y = x − x*, s, σ sums of squares and m = Σ εᵢyᵢ^(2kᵢ), −V̇ − m − s·(c − V)
// = σ gives −V̇ ≥ m > 0 on Ω = {V ≤ c} but at x*. V's form (its minors' conditions
// positive constants) makes V positive definite and radially unbounded for every
// parameter value: Ω is compact and positively invariant (V decreases where a solution
// would leave it), and its solutions tend to the largest invariant set in {V̇ = 0} ∩ Ω,
// {x*} (LaSalle): all of Ω lies in the region of attraction.
func (c *run) sublevelSProcedure(cl claims.Claim) bool {
	sp, fv, what := cl.(*claims.SublevelSProcedure), c.forms["V"], "sublevel-sprocedure"
	ok := c.derived && !c.m.Discrete && c.basin == "" && fv != nil && !fv.semidef && (!c.higherV || fv.basis)
	vs, ds := c.v, c.vdot // shifted only after the derivative
	if ok {
		vs, ds = c.m.Shift(c.v), c.m.Shift(c.vdot).Neg()
		ok = vs.IsPoly() && ds.IsPoly()
	}
	for k, w := range c.minors {
		ok = ok && (w.form != "V" || k < len(c.conds) && c.conds[k].Num.IsConst() && c.conds[k].Num.ConstTerm().Sign() > 0)
	}
	level, okl := poly.ParseRat(sp.Level)
	m, okm := c.parse(what, sp.Margin)
	if !c.add(what, ok, "continuous time, one basin claim, V positive definite and radially unbounded by its form for every parameter value") || !okm ||
		!c.add(what, okl && level.RatString() == sp.Level && level.Sign() > 0 && m.IsPoly() && m.Num.EvenPowers(len(c.m.States)),
			"the level %q is a canonical rational > 0, the margin Σ εᵢ·yᵢ^(2kᵢ) with rational εᵢ > 0, kᵢ ≥ 1, a term for every state", sp.Level) {
		return false
	}
	s, ok1 := c.squares(what+" s", &sp.Multiplier, false)
	sigma, ok2 := c.squares(what+" σ", &sp.Remainder, false)
	rhs := new(poly.Poly).Sub(ds.Num, m.Num)
	if !ok1 || !ok2 || !c.add(what, sigma.Equal(rhs.Sub(rhs, new(poly.Poly).Mul(s, new(poly.Poly).Sub(poly.Const(c.r, level), vs.Num)))),
		"σ equals −V̇ − margin − s·(level − V) exactly") {
		return false
	}
	c.basin = sp.Level
	return true
}

// squares reads a sum of squares zᵀGz in a basis of monomials in the states
// (all: in the states and the parameters).
func (c *run) squares(what string, q *claims.SquareSum, all bool) (*poly.Poly, bool) {
	z, ok := c.monomials(what, q.Basis, all)
	g, ok1 := c.matrix(what, q.Gram, len(z), "the Gram matrix")
	l, ok2 := c.matrix(what, q.L, len(z), "L")
	d, ok3 := c.list(what, q.D, len(z), "pivots")
	if !ok || !ok1 || !ok2 || !ok3 {
		return nil, false
	}
	p, err := poly.SquaresLDL(z, g, l, d)
	return p, c.add(what, err == nil, "G = L·D·Lᵀ, rational, D ≥ 0, L unit lower with zero columns below zero pivots: zᵀGz ≥ 0%s", errSuffix(err))
}
