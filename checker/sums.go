package checker

import (
	"math/big"

	"github.com/lyacert/lyacert/poly"
)

// MarginGram is a Gram matrix of the whole function less a margin: V or
// −V̇ minus Margin equals zᵀGz for the monomials z of Basis, with G = L·D·Lᵀ
// and D ≥ 0 (zero pivots allowed, with zero columns), and Margin
// = Σ εᵢ·xᵢ^(2kᵢ) with rational εᵢ > 0 and a term for every state.
type MarginGram struct {
	Basis  []string `json:"basis"`
	Margin string   `json:"margin"`
	LDLForm
}

// NotSOS is a moment functional separating V or −V̇ from the sums of
// squares of polynomials in the span of the monomials Basis: Moments lists
// its values, L(x^γ) = the coefficient of x^γ; Moment is M_ab = L(z_a·z_b)
// = L·diag(D)·Lᵀ with D ≥ 0; Value = L(p) < 0.
type NotSOS struct {
	Of      string     `json:"of"`
	Basis   []string   `json:"basis"`
	Moments string     `json:"moments"`
	Moment  [][]string `json:"moment"`
	L       [][]string `json:"l"`
	D       []string   `json:"d"`
	Value   string     `json:"value"`
}

func (*MarginGram) Rule() string { return "margin-gram-ldl" }
func (*NotSOS) Rule() string     { return "moment-separation" }

// maxBasis bounds the bases these rules read, so that the exact LDLᵀ
// identity (n³ products) stays within a reader's patience.
const maxBasis = 400

// monomials reads a basis of distinct monomials in the states, each of
// degree at least one with coefficient 1.
func (c *run) monomials(name string, ss []string) ([]*poly.Poly, bool) {
	if !c.add(name, len(ss) >= 1 && len(ss) <= maxBasis, "a basis of 1 to %d monomials", maxBasis) {
		return nil, false
	}
	z, seen := make([]*poly.Poly, len(ss)), map[string]bool{}
	for i, s := range ss {
		b, ok := c.parse(name, s)
		if !ok || !c.add(name, b.IsPoly() && b.Num.IsMonomial() && b.Num.Lead().Coef.Cmp(big.NewRat(1, 1)) == 0 &&
			b.Num.DegreeIn(c.r.ParamMask()) == 0 && b.Num.Degree() >= 1 && !seen[b.Num.String()],
			"basis element %s is a new monomial in the states with coefficient 1", s) {
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
func (c *run) marginGram(cl Claim) bool {
	mg := cl.(*MarginGram)
	whole, ok := c.shifted(mg.Of)
	if !ok {
		return false
	}
	name := "margin " + mg.Of
	z, ok1 := c.monomials(name, mg.Basis)
	m, ok2 := c.parse(name, mg.Margin)
	if !ok1 || !ok2 {
		return false
	}
	if !c.add(name, m.IsPoly() && m.Num.EvenPowers(len(c.m.States)), "the margin is Σ εᵢ·xᵢ^(2kᵢ), rational εᵢ > 0, kᵢ ≥ 1, a term for every state") {
		return false
	}
	g, ok := c.matrix(name, mg.Gram, len(z), "the Gram matrix")
	for i := 0; ok && i < len(z); i++ {
		for j := range z {
			ok = ok && g[i][j].DegreeIn(c.r.StateMask()) <= 0
		}
	}
	if !c.add(name, ok, "the Gram matrix has %d rows of entries free of states", len(z)) ||
		!c.add(name, poly.QuadraticFormIn(g, z).Equal(whole.Sub(m)), "zᵀGz equals the whole function less the margin exactly") {
		return false
	}
	cf, ok := c.form(&mg.LDLForm, g)
	cf.basis, cf.semidef = true, false // definite by the margin
	c.forms[mg.Of] = cf
	return ok
}

// momentSeparation: a linear functional L with L(p) < 0 whose moment
// matrix M_ab = L(z_a·z_b) is L·diag(D)·Lᵀ with D ≥ 0, so M ⪰ 0. If p were
// zᵀGz with G ⪰ 0, then L(p) = tr(G·M) ≥ 0 (the trace of a product of
// positive semidefinite matrices): p is no sum of squares of polynomials in
// the span of z (semidefinite duality, Parrilo 2003). It decides no
// verdict; it says that no Gram certificate exists in that basis.
func (c *run) momentSeparation(cl Claim) bool {
	ns := cl.(*NotSOS)
	name := "moments " + ns.Of
	if !c.add(name, c.derived && (ns.Of == "V" || ns.Of == "-Vdot"), "of V or −V̇, after the derivative") || !c.once("moment-separation "+ns.Of) {
		return false
	}
	p := c.m.Shift(c.v)
	if ns.Of == "-Vdot" {
		p = c.m.Shift(c.vdot).Neg()
	}
	z, ok1 := c.monomials(name, ns.Basis)
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
	for k := 0; ok && k < len(z); k++ {
		ok = dc[0][k].Sign() >= 0
	}
	// L unit lower triangular with a zero column below each zero pivot, and
	// the functional supported on products of the basis: every stated
	// number then matters.
	prods := map[string]bool{}
	for a := range z {
		for b := range z {
			prods[new(poly.Poly).Mul(z[a], z[b]).String()] = true
		}
	}
	for i := 0; ok && i < len(z); i++ {
		for j := range z {
			ok = ok && (j > i && l[i][j].IsZero() || j == i && l[i][j].IsOne() || j < i && (dc[0][j].Sign() != 0 || l[i][j].IsZero()))
		}
	}
	for _, t := range y.Num.Terms() {
		ok = ok && prods[poly.Monomial(c.r, t.Exp, big.NewRat(1, 1)).String()]
	}
	v, okv := parseRat(ns.Value)
	value := poly.Pairing(p.Num, y.Num)
	if !c.add(name, ok, "the pivots are rational numbers ≥ 0, L is unit lower triangular with zero columns below zero pivots, and the moments lie on products of the basis") ||
		!c.add(name, mom.EqualLDL(l, d), "L·diag(D)·Lᵀ reproduces the moment matrix exactly, so it is ⪰ 0") ||
		!c.add(name, okv && v.Cmp(value) == 0 && v.Sign() < 0, "L(%s) = %s < 0: no Gram matrix G ⪰ 0 in this basis", ns.Of, value.RatString()) {
		return false
	}
	c.notSOS = append(c.notSOS, ns.Of)
	return true
}
