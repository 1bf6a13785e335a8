package checker

import (
	"math/big"
	"slices"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

// maxBasis bounds the bases these rules read, so that the exact LDLᵀ
// identity (n³ products) stays within a reader's patience.
const maxBasis = 400

// monomials reads a basis of 1 to maxBasis distinct monomials with
// coefficient 1: in the states alone, each of degree ≥ 1, or (all) in the
// states and the parameters.
func (c *run) monomials(name string, ss []string, all bool) ([]*poly.Poly, bool) {
	if !c.add(name, len(ss) >= 1 && len(ss) <= maxBasis, "a basis of 1 to %d monomials", maxBasis) {
		return nil, false
	}
	z, seen := make([]*poly.Poly, len(ss)), map[string]bool{}
	for i, s := range ss {
		b, ok := c.parse(name, s)
		if !ok || !c.add(name, b.IsPoly() && b.Num.IsMonomial() && b.Num.Lead().Coef.Cmp(big.NewRat(1, 1)) == 0 && !seen[b.Num.String()] &&
			(all || b.Num.DegreeIn(c.r.ParamMask()) == 0 && b.Num.Degree() >= 1),
			"basis element %s is a new monomial with coefficient 1 (in the states alone: %v)", s, !all) {
			return nil, false
		}
		seen[b.Num.String()], z[i] = true, b.Num
	}
	return z, true
}

// marginGram: p − m = zᵀGz with G = L·D·Lᵀ ⪰ 0 (D ≥ 0 through the minors'
// conditions, a zero pivot only with a zero column) gives p ≥ m, and
// m = Σ εᵢ·xᵢ^(2kᵢ) with every εᵢ > 0 and every state present is > 0 away
// from the origin and tends to ∞ with |x|: p is positive definite and
// radially unbounded (the margin form of a Gram certificate, Peyrl &
// Parrilo 2008). G may be singular: the margin, not G, makes p definite.
func (c *run) marginGram(cl claims.Claim) bool {
	mg := cl.(*claims.MarginGram)
	whole, ok := c.shifted(mg.Of)
	if !ok {
		return false
	}
	g, ok := c.marginIdentity(mg, whole)
	if !ok {
		return false
	}
	cf, ok := c.form(&mg.LDLForm, g)
	cf.basis, cf.semidef = true, false // definite by the margin
	c.forms[mg.Of] = cf
	return ok
}

// marginIdentity reads the basis z (monomials in the states), the margin
// Σ εᵢ·xᵢ^(2kᵢ) (rational εᵢ > 0, a term for every state) and G (entries
// free of the states) of a margin form, and checks zᵀGz = whole − margin.
func (c *run) marginIdentity(mg *claims.MarginGram, whole poly.RatFunc) (poly.Matrix, bool) {
	name := "margin " + mg.Of
	z, ok1 := c.monomials(name, mg.Basis, false)
	m, ok2 := c.parse(name, mg.Margin)
	if !ok1 || !ok2 || !c.add(name, m.IsPoly() && m.Num.EvenPowers(len(c.m.States)), "the margin is Σ εᵢ·xᵢ^(2kᵢ), rational εᵢ > 0, kᵢ ≥ 1, a term for every state") {
		return nil, false
	}
	g, ok := c.matrix(name, mg.Gram, len(z), "the Gram matrix")
	for i := 0; ok && i < len(z); i++ {
		for j := range z {
			ok = ok && g[i][j].DegreeIn(c.r.StateMask()) <= 0
		}
	}
	return g, c.add(name, ok, "the Gram matrix has %d rows of entries free of states", len(z)) &&
		c.add(name, poly.QuadraticFormIn(g, z).Equal(whole.Sub(m)), "zᵀGz equals the whole function less the margin exactly")
}

// momentSeparation: a linear functional L with L(p) < 0 whose moment
// matrix M_ab = L(z_a·z_b) is L·diag(D)·Lᵀ with D ≥ 0, so M ⪰ 0. If p were
// zᵀGz with G ⪰ 0, then L(p) = tr(G·M) ≥ 0 (the trace of a product of
// positive semidefinite matrices): p is no sum of squares of polynomials in
// the span of z (semidefinite duality, Parrilo 2003). It decides no
// verdict; it says that no Gram certificate exists in that basis.
func (c *run) momentSeparation(cl claims.Claim) bool {
	ns := cl.(*claims.NotSOS)
	name := "moments " + ns.Of
	if !c.add(name, c.derived && (ns.Of == "V" || ns.Of == "-Vdot"), "of V or −V̇, after the derivative") || !c.once("moment-separation "+ns.Of) {
		return false
	}
	p := c.m.Shift(c.v)
	if ns.Of == "-Vdot" {
		p = c.m.Shift(c.vdot).Neg()
	}
	z, ok1 := c.monomials(name, ns.Basis, false)
	y, ok2 := c.parse(name, ns.Moments)
	if !ok1 || !ok2 || !c.add(name, p.IsPoly() && p.Num.DegreeIn(c.r.ParamMask()) == 0 && y.IsPoly() && y.Num.DegreeIn(c.r.ParamMask()) == 0,
		"the function and the moments are polynomials in the states alone") {
		return false
	}
	mom := poly.MomentMatrix(y.Num, z)
	claimed, ok1 := c.matrix(name, ns.Moment, len(z), "the moment matrix")
	l, ok2 := c.matrix(name, ns.L, len(z), "L")
	d, ok3 := c.list(name, ns.D, len(z), "pivots")
	if !ok1 || !ok2 || !ok3 || !c.add(name, claimed.Equal(mom), "the moment matrix is L(z_a·z_b), recomputed") {
		return false
	}
	dc, ok := poly.Matrix{d}.Consts()
	zero := make([]bool, len(z))
	for k := 0; ok && k < len(z); k++ {
		ok, zero[k] = dc[0][k].Sign() >= 0, dc[0][k].Sign() == 0
	}
	// L with zero columns below zero pivots, and the functional supported
	// on products of the basis: every stated number then matters.
	ok = ok && l.UnitLower(zero) && y.Num.InProducts(z)
	v, okv := poly.ParseRat(ns.Value)
	value := poly.Pairing(p.Num, y.Num)
	if !c.add(name, ok, "the pivots are rational numbers ≥ 0, L is unit lower triangular with zero columns below zero pivots, and the moments lie on products of the basis") ||
		!c.add(name, mom.EqualLDL(l, d), "L·diag(D)·Lᵀ reproduces the moment matrix exactly, so it is ⪰ 0") ||
		!c.add(name, okv && v.Cmp(value) == 0 && v.Sign() < 0, "L(%s) = %s < 0: no Gram matrix G ⪰ 0 in this basis", ns.Of, value.RatString()) {
		return false
	}
	c.notSOS = append(c.notSOS, ns.Of)
	return true
}

// triangular: the square bases qₖ with non-zero pivots (> 0 where the
// conditions hold) of a semidefinite Gram form in a monomial basis vanish
// together only at the equilibrium and grow without bound with the
// states. In Order the k-th of them is c·s + h, c a non-zero rational and h
// a polynomial without constant term in the states before s (measured
// from the equilibrium): by induction all qₖ = 0 forces every state to 0,
// and all qₖ bounded every state bounded. So Σ dₖ·qₖ² is positive definite
// and radially unbounded (a triangular system of squares).
func (c *run) triangular(cl claims.Claim) bool {
	ts := cl.(*claims.TriangularSquares)
	f, what, n := c.forms[ts.Of], "triangular "+ts.Of, len(c.m.States)
	if !c.once(what) || !c.add(what, f != nil && f.basis && f.semidef && len(ts.Order) == n, "follows a semidefinite Gram form in a monomial basis, with an order of the %d states", n) {
		return false
	}
	solved, k := make([]bool, n), 0
	for i := 0; i < len(f.d) && k < n; i++ {
		s, ok := c.r.Index(ts.Order[k])
		if f.zero[i] {
			continue
		} else if !c.add(what, ok && s < n && !solved[s], "%s is a state not yet solved for", ts.Order[k]) {
			return false
		}
		e := make([]int, c.r.NumVars())
		e[s] = 1
		q := c.m.Shift(poly.SquareBase(f.l, f.z, i))
		lin := q.Coefficient(e, c.r.StateMask())
		h := q.Sub(lin.Mul(poly.FromPoly(poly.Var(c.r, s))))
		later := slices.ContainsFunc(h.Num.VarsUsed(), func(v int) bool { return v < n && !solved[v] })
		if !c.add(what, lin.IsPoly() && lin.Num.IsConst() && !lin.IsZero() && !later && h.Homogeneous(0, c.r.StateMask()).IsZero(),
			"square %d is c·%s + h, c a non-zero rational, h without constant term in the states before it", i+1, ts.Order[k]) {
			return false
		}
		solved[s], k = true, k+1
	}
	f.semidef = false
	return c.add(what, k == n, "the squares solve for every state in turn: the form vanishes only at the equilibrium and is radially unbounded")
}
