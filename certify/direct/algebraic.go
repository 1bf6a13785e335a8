package direct

import (
	"math/big"
	"slices"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

// algebraicPoint tries to settle an undecided point piece at an irrational
// value α of parameter i (the root of pc.LoPoly in its isolating interval),
// where a condition vanishes and a quadratic part is only semidefinite, by
// margin Gram forms of V and −V̇ whose pivots are ≥ 0 at α: for instance a
// semidefinite quadratic part whose kernel the next, quartic, part makes
// definite. It returns the claim, or nil when that test fails.
func (res *Result) algebraicPoint(i int, pc claims.Piece) *claims.AlgebraicPoint {
	r := res.Model.Ring
	if res.HigherV.IsZero() && res.HigherD.IsZero() {
		return nil // quadratic forms only semidefinite at α: no margin fits
	}
	f, err := poly.Parse(r, pc.LoPoly)
	if err != nil || pc.LoIsolating == nil || !f.IsPoly() {
		return nil
	}
	u, ok := f.Num.Univariate(i)
	a, ok1 := poly.ParseRat(pc.LoIsolating[0])
	b, ok2 := poly.ParseRat(pc.LoIsolating[1])
	near, ok3 := poly.ParseRat(pc.Lo) // α to 15 digits: proposes the margins
	if !ok || !ok1 || !ok2 || !ok3 {
		return nil
	}
	end := poly.End{P: poly.NewSturm(u).P, A: a, B: b, Closed: true}
	ap := &claims.AlgebraicPoint{Param: r.Name(i), Value: pc.Lo, Poly: pc.LoPoly, Isolating: *pc.LoIsolating}
	for _, whole := range []poly.RatFunc{res.Model.Shift(res.V), res.Model.Shift(res.Vdot).Neg()} {
		mg := marginAt(whole, len(res.Model.States), i, near, end)
		if mg == nil {
			return nil
		}
		ap.Forms = append(ap.Forms, *mg)
	}
	ap.Forms[0].Of, ap.Forms[1].Of = "V", "-Vdot"
	return ap
}

// marginAt writes p − m = zᵀGz with the margin m = Σ εⱼ·xⱼ^(2kⱼ) on the
// highest pure power of each state, εⱼ a power of two at most a quarter of
// its coefficient near α, and G = L·D·Lᵀ with every denominator non-zero
// and every pivot ≥ 0 at α (decided exactly, as the kernel does).
func marginAt(p poly.RatFunc, nstates, param int, near *big.Rat, end poly.End) *claims.MarginGram {
	r := p.Ring()
	at := make([]*big.Rat, r.NumVars())
	for k := range at {
		at[k] = new(big.Rat)
	}
	at[param] = near
	margin := poly.Zero(r)
	for j := range nstates {
		var best *poly.Poly
		for _, t := range p.Num.Terms() {
			pure := t.Exp[j] > 0 && t.Exp[j]%2 == 0
			for k := range nstates {
				pure = pure && (k == j || t.Exp[k] == 0)
			}
			if !pure || best != nil && best.Degree() >= t.Exp[j] {
				continue
			}
			e := make([]int, r.NumVars())
			e[j] = t.Exp[j]
			c, err := p.Coefficient(e, r.StateMask()).Eval(at)
			if err != nil || c.Sign() <= 0 {
				continue
			}
			eps := big.NewRat(1, 1)
			for c.Cmp(new(big.Rat).Mul(eps, big.NewRat(4, 1))) < 0 {
				eps.Quo(eps, big.NewRat(2, 1))
			}
			best = poly.Monomial(r, e, eps)
		}
		if best == nil {
			return nil
		}
		margin.Add(margin, best)
	}
	basis, g, ok := monomialGram(p.Sub(poly.FromPoly(margin)), nstates, false)
	var f LDL
	if !ok || len(basis) > 60 {
		return nil
	}
	if ok, _ := f.Factorize(g); !ok {
		return nil
	}
	if !poly.NonNegativeAt(end, param, slices.Concat(slices.Concat(g...), slices.Concat(f.L...)), f.D) {
		return nil
	}
	mg := &claims.MarginGram{Margin: margin.String(), LDLForm: claims.LDLForm{Gram: g.Strings(), L: f.L.Strings(), D: []string{}, Minors: []string{}}}
	for _, z := range basis {
		mg.Basis = append(mg.Basis, z.String())
	}
	for _, d := range f.D {
		mg.D = append(mg.D, d.String())
	}
	return mg
}
