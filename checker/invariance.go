package checker

import (
	"fmt"
	"slices"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

// invariance: the invariance principle (LaSalle 1960; Barbashin and
// Krasovskii 1952). Where −V̇ = Σ dₖ·qₖ² with every dₖ > 0 (the conditions),
// V̇ = 0 forces every qₖ = 0; on a solution that stays in {V̇ = 0} each qₖ
// vanishes identically, and so does every time derivative of it, L_fʲqₖ.
// Each g = Σ cⱼ·L_f^{oⱼ}q_{kⱼ} then vanishes along it, so every state sits
// at the only real root of its g, the equilibrium: the largest invariant
// set in {V̇ = 0} is the equilibrium, and bounded solutions tend to it.
func (c *run) invariance(cl claims.Claim) bool {
	iv := cl.(*claims.Invariance)
	f := c.forms["-Vdot"]
	if !c.once("invariance") || !c.add("invariance", !c.m.Discrete && f != nil && f.semidef && (f.basis || !c.higherD && c.hasKernel),
		"follows a semidefinite −V̇, exactly quadratic with its kernel or a Gram form of the whole, in continuous time") {
		return false
	}
	n := len(c.m.States)
	// Each derivative along the flow multiplies terms and degrees: bounded
	// by the reading limits before it is computed.
	lim, fTerms, fDeg := poly.DefaultLimits(), 0, 0
	for _, f := range c.m.F {
		fTerms, fDeg = fTerms+f.Num.NumTerms(), max(fDeg, f.Num.Degree())
	}
	var gens []poly.RatFunc
	for j, t := range iv.Lie {
		if !c.add("invariance", t.Square >= 1 && t.Square <= len(f.z) && !f.zero[t.Square-1] && t.Order >= 0 && t.Order <= n,
			"generator %d: square %d of −V̇ with a non-zero pivot, derivative of order %d ≤ %d", j+1, t.Square, t.Order, n) {
			return false
		}
		h := poly.SquareBase(f.l, f.z, t.Square-1)
		for range t.Order {
			if !c.add("invariance", h.Num.NumTerms()*fTerms <= lim.Terms && h.Num.Degree()+fDeg <= lim.Degree,
				"generator %d stays within the limits terms=%d and degree=%d", j+1, lim.Terms, lim.Degree) {
				return false
			}
			h = c.m.Derivative(h)
		}
		gens = append(gens, h)
	}
	used := make([]bool, len(gens))
	if !c.add("invariance", len(iv.States) == n, "one identity per state") {
		return false
	}
	for i, v := range iv.States {
		what := fmt.Sprintf("invariance %s", v.State)
		g, ok := c.parse(what, v.Poly)
		cs, ok2 := c.list(what, v.Cofactors, len(gens), "cofactors")
		if !ok || !ok2 || !c.add(what, v.State == c.m.States[i], "the states in order") {
			return false
		}
		u, uni := g.Num.Univariate(i)
		at, err := c.m.At[i].EvalVars(nil)
		sum := poly.FromPoly(poly.Zero(c.r))
		for j, cj := range cs {
			sum = sum.Add(cj.Mul(gens[j]))
			used[j] = used[j] || !cj.IsZero()
		}
		if !c.add(what, g.IsPoly() && uni && err == nil && at.IsPoly() && at.Num.IsConst() && u.OnlyRealRoot(at.Num.ConstTerm()),
			"%s is a polynomial in %s alone whose only real root is the equilibrium's coordinate (Sturm)", v.Poly, v.State) ||
			!c.add(what, !slices.ContainsFunc(cs, func(q poly.RatFunc) bool { return !q.DenNonzeroOn(c.box) }) && sum.Equal(g),
				"%s = Σ cofactor·generator exactly, the cofactors defined on the parameter box", v.Poly) {
			return false
		}
	}
	c.invariant = c.add("invariance", !slices.Contains(used, false), "every generator has a non-zero cofactor")
	return c.invariant
}
