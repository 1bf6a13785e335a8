package checker

import (
	"fmt"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

// boxMultiplier: the S-procedure on a box (a Positivstellensatz certificate
// in Putinar's form, Putinar 1993). On the box every gᵢ = (pᵢ − loᵢ)(hiᵢ −
// pᵢ) is ≥ 0, as a product of two numbers ≥ 0, and every σ = Σₖ dₖ·qₖ² is
// ≥ 0 everywhere; so the exact identity gives −V̇ ≥ Margin there, and the
// margin Σ εⱼ·xⱼ^(2kⱼ) with every εⱼ > 0 and every state present is > 0
// away from the equilibrium. The identity is one of polynomials in the
// states and all parameters, so a parameter without a multiplier may take
// any value. −V̇ then needs no minors and no conditions: the form of V
// alone decides the rest (conclude).
func (c *run) boxMultiplier(cl claims.Claim) bool {
	bm := cl.(*claims.BoxMultiplier)
	whole, ok := c.shifted("-Vdot")
	if !ok {
		return false
	}
	const name = "box -Vdot"
	m, ok := c.parse(name, bm.Margin)
	if !ok || !c.add(name, whole.IsPoly(), "−V̇ is a polynomial in the states and the parameters") ||
		!c.add(name, m.IsPoly() && m.Num.EvenPowers(len(c.m.States)), "the margin is Σ εᵢ·xᵢ^(2kᵢ), rational εᵢ > 0, kᵢ ≥ 1, a term for every state") ||
		!c.add(name, len(bm.Terms) >= 1 && len(bm.Terms) <= 1+len(c.m.Params) && bm.Terms[0].Parameter == "", "σ₀ first, then at most one multiplier per parameter") {
		return false
	}
	sum, seen := poly.Zero(c.r), map[string]bool{}
	for k := range bm.Terms {
		t := &bm.Terms[k]
		what := fmt.Sprintf("%s σ%d", name, k)
		g, ok := c.boxFactor(what, t.Parameter, k == 0 || !seen[t.Parameter])
		seen[t.Parameter] = true
		if !ok {
			return false
		}
		sq, ok := c.squares(what, &t.SquareSum, true)
		if !ok {
			return false
		}
		sum.Add(sum, new(poly.Poly).Mul(g, sq))
	}
	if !c.add(name, sum.Equal(new(poly.Poly).Sub(whole.Num, m.Num)), "σ₀ + Σ σᵢ·(pᵢ − loᵢ)(hiᵢ − pᵢ) equals −V̇ less the margin exactly") {
		return false
	}
	c.forms["-Vdot"] = &checkedForm{basis: true} // definite on the box by the margin; no minors
	return true
}

// boxFactor returns 1 for σ₀, else (p − lo)(hi − p) for a free parameter
// p named once, whose range is the closed bounded interval [lo, hi].
func (c *run) boxFactor(what, name string, first bool) (*poly.Poly, bool) {
	if name == "" {
		return poly.ConstInt(c.r, 1), c.add(what, first, "σ₀, without a multiplier, once")
	}
	p, ok := c.m.Param(name)
	i, isVar := c.r.Index(name)
	lo, hi := p.Range.Lo, p.Range.Hi
	if !c.add(what, first && ok && isVar && p.Fixed == nil && p.Range.Compact(),
		"%s is a free parameter named once, whose range is closed and bounded", name) {
		return nil, false
	}
	x := poly.Var(c.r, i)
	return new(poly.Poly).Mul(new(poly.Poly).Sub(x, poly.Const(c.r, lo.Value)), new(poly.Poly).Sub(poly.Const(c.r, hi.Value), x)), true
}
