package direct

import (
	"context"
	"fmt"
	"math/big"
	"slices"
	"strings"

	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// monomialGram writes a polynomial p in the states (coefficients in the
// parameters) as zᵀGz for a basis z of monomials: the z with z² a monomial
// of p. Each monomial m of p goes to the diagonal when m = z², otherwise its
// coefficient is shared equally by the pairs zᵢzⱼ = m. This is one Gram
// matrix among many (finding the best is a semidefinite program); it is
// exact, and when it is positive definite and z holds a pure power of every
// state, p > 0 away from the origin. ok is false when some monomial of p is
// no product of two basis elements, or, with needPure, a state has no pure
// power in z.
func monomialGram(p poly.RatFunc, nstates int, needPure bool) (basis []*poly.Poly, g poly.Matrix, ok bool) {
	r := p.Ring()
	mask := r.StateMask()
	type term struct {
		e []int
		c poly.RatFunc
	}
	var terms []term
	seen := map[string]bool{}
	for _, t := range p.Num.Terms() {
		se := make([]int, r.NumVars())
		for i := 0; i < nstates; i++ {
			se[i] = t.Exp[i]
		}
		k := poly.Monomial(r, se, big.NewRat(1, 1)).String()
		if seen[k] {
			continue
		}
		seen[k] = true
		terms = append(terms, term{se, p.Coefficient(se, mask)})
	}
	var half [][]int
	for _, t := range terms {
		even, zero := true, true
		h := make([]int, len(t.e))
		for i, x := range t.e {
			even = even && x%2 == 0
			zero = zero && x == 0
			h[i] = x / 2
		}
		if even && !zero {
			half = append(half, h)
		}
	}
	// The graded order, lower degrees first.
	slices.SortFunc(half, poly.GradedCompare)
	for i := 0; i < nstates && needPure; i++ {
		if !slices.ContainsFunc(half, func(h []int) bool {
			for j, x := range h {
				if (j == i) != (x > 0) {
					return false
				}
			}
			return true
		}) {
			return nil, nil, false
		}
	}
	n := len(half)
	g = poly.NewMatrix(r, n)
	for _, t := range terms {
		var pairs [][2]int
		diag := -1
		for i := 0; i < n; i++ {
			for j := i; j < n; j++ {
				sum := true
				for k := range t.e {
					if half[i][k]+half[j][k] != t.e[k] {
						sum = false
						break
					}
				}
				if !sum {
					continue
				}
				if i == j {
					diag = i
				} else {
					pairs = append(pairs, [2]int{i, j})
				}
			}
		}
		switch {
		case diag >= 0:
			g[diag][diag] = g[diag][diag].Add(t.c)
		case len(pairs) == 0:
			return nil, nil, false
		default:
			share := t.c.ScaleRat(big.NewRat(1, int64(2*len(pairs))))
			for _, pr := range pairs {
				g[pr[0]][pr[1]] = g[pr[0]][pr[1]].Add(share)
				g[pr[1]][pr[0]] = g[pr[0]][pr[1]]
			}
		}
	}
	basis = make([]*poly.Poly, n)
	for i, h := range half {
		basis[i] = poly.Monomial(r, h, big.NewRat(1, 1))
	}
	if !poly.QuadraticFormIn(g, basis).Equal(p) {
		return nil, nil, false // cannot happen: every term was placed
	}
	return basis, g, true
}

// tryBasis upgrades a local or inconclusive quadratic result: V and −V̇ as
// wholes, each as a Gram matrix in a monomial basis where it has terms of
// degree above two. It returns the upgraded result when that holds for every
// allowed parameter value (global asymptotic stability), else nil.
func (res *Result) tryBasis(ctx context.Context, opts PaveOptions) *Result {
	applicable := len(res.Forms) == 2 &&
		((res.Claim == checker.KindLocal && res.Verdict == checker.VerdictHolds) ||
			res.Verdict == checker.VerdictUndecided)
	if !applicable || (res.HigherV.IsZero() && res.HigherD.IsZero()) {
		return nil
	}
	m := res.Model
	n := len(m.States)
	nr := &Result{Model: m, V: res.V, Vdot: res.Vdot, Shifted: res.Shifted, HigherV: res.HigherV, HigherD: res.HigherD}
	semi := false // −V̇'s form is only semidefinite: stability, then the invariance principle
	wholes := []poly.RatFunc{res.Shifted.V, res.Shifted.Vdot.Neg()}
	higher := []bool{!res.HigherV.IsZero(), !res.HigherD.IsZero()}
	for i, f := range res.Forms {
		if !higher[i] {
			if f.LDL.Semidefinite() && (i == 0 || res.Invariance == nil) {
				return nil
			}
			if f.LDL.Semidefinite() { // −V̇ exactly quadratic and ≥ 0, settled by the invariance principle
				semi, nr.Kernel = true, res.Kernel
			}
			nr.Forms = append(nr.Forms, f)
			nr.Methods = append(nr.Methods, Method{Form: f.Name, Name: MethodQuadratic, Basis: len(f.Gram)})
			continue
		}
		basis, g, ok := monomialGram(wholes[i], n, i == 0)
		var l LDL
		var semiForm *Form // −V̇ ≥ 0 by a semidefinite Gram form: stability, kept in case nothing definite is found
		var order []string
		if ok {
			fac, _ := l.Factorize(g)
			ok = fac && !l.Semidefinite() && !nonPositivePivot(l) && allPure(basis, n)
			if fac && !ok && !negativePivot(l) {
				basis, g, l, order = triangular(m, basis, g, l)
				ok = order != nil
			}
			if i == 1 && fac && !ok && !negativePivot(l) && (l.Semidefinite() || !allPure(basis, n)) {
				semiForm = &Form{Name: f.Name, Basis: basis, Gram: g, LDL: l, Minors: l.Minors()}
			}
		}
		if ok {
			nr.Forms = append(nr.Forms, Form{Name: f.Name, Basis: basis, Gram: g, LDL: l, Minors: l.Minors(), Triangular: order})
			if order != nil {
				nr.Notes = append(nr.Notes, fmt.Sprintf("the Gram matrix of %s as a whole is only semidefinite, but its squares solve for %s in turn (each a non-zero multiple of a new state plus terms in the states before it): %s vanishes only at the equilibrium and is radially unbounded", formWord(f.Name), strings.Join(order, ", "), formWord(f.Name)))
			}
			nr.Methods = append(nr.Methods, Method{Form: f.Name, Name: MethodCanonical, Basis: len(basis)})
			continue
		}
		// The canonical Gram matrix fails: search the whole family.
		sf, method, prob, ns, why := sosGram(wholes[i], n)
		if prob != nil {
			res.SDP, nr.SDP = prob, prob
		}
		if ns != nil {
			ns.Of = f.Name
			res.NotSOS = append(res.NotSOS, *ns)
		}
		if why != "" && semiForm != nil {
			semi = true
			nr.Forms = append(nr.Forms, *semiForm)
			nr.Methods = append(nr.Methods, Method{Form: f.Name, Name: MethodCanonical, Basis: len(semiForm.Basis)})
			continue
		}
		if why != "" {
			res.Notes = append(res.Notes, fmt.Sprintf("no Gram certificate of %s as a whole: %s", formWord(f.Name), why))
			res.refutePoints()
			return nil
		}
		sf.Name, method.Form = f.Name, f.Name
		nr.Forms = append(nr.Forms, sf)
		nr.Methods = append(nr.Methods, method)
	}
	nr.Claim = checker.KindGlobal
	if semi {
		nr.Claim = checker.KindStable
	}
	nr.conditions()
	if err := nr.decide(ctx, opts); err != nil || nr.Verdict != checker.VerdictHolds {
		return nil
	}
	nr.Reason = "V and −V̇ are positive definite as wholes: each is zᵀGz with G ≻ 0 in a monomial basis z holding a pure power of every state"
	for _, f := range nr.Forms {
		if f.Margin != nil {
			nr.Reason = "V and −V̇ are positive definite as wholes: each is zᵀGz in a monomial basis z, with G ≻ 0 and a pure power of every state in z, or with G ⪰ 0 after subtracting a margin Σ εᵢ·xᵢ^(2kᵢ), εᵢ > 0"
		}
	}
	if semi {
		nr.Reason = "V is positive definite and −V̇ = zᵀGz ≥ 0 with G ⪰ 0 in a monomial basis: V̇ ≤ 0 everywhere"
		if nr.Invariance = nr.invariance(); nr.Invariance != nil {
			nr.Claim = checker.KindLocal
			if !res.HigherV.IsZero() && nr.Forms[0].Basis == nil {
				return nr
			}
			nr.Claim = checker.KindGlobal
		}
	}
	return nr
}

// allPure reports that a monomial basis holds a pure power of each of the
// n states.
func allPure(basis []*poly.Poly, n int) bool {
	pure := make([]bool, n)
	for _, b := range basis {
		if vs := b.VarsUsed(); len(vs) == 1 && vs[0] < n {
			pure[vs[0]] = true
		}
	}
	return !slices.Contains(pure, false)
}

// negativePivot reports a pivot that is a negative constant.
func negativePivot(l LDL) bool {
	for _, d := range l.D {
		if d.IsPoly() && d.Num.IsConst() && d.Num.ConstTerm().Sign() < 0 {
			return true
		}
	}
	return false
}

// nonPositivePivot reports a pivot that is a constant ≤ 0: that Gram
// matrix is not positive definite, though another of the family may be.
func nonPositivePivot(l LDL) bool {
	for _, d := range l.D {
		if d.IsPoly() && d.Num.IsConst() && d.Num.ConstTerm().Sign() <= 0 {
			return true
		}
	}
	return false
}

// triangular looks for an order of the basis whose semidefinite Gram form
// has square bases that solve for the states in turn (triangularOrder):
// the given order first, then every order of the degree-one monomials in
// front (up to 5 states), the rest after them as given. It returns the
// basis, Gram matrix and factorization it found, with the order of the
// states, or the inputs and nil.
func triangular(m *model.Model, basis []*poly.Poly, g poly.Matrix, l LDL) ([]*poly.Poly, poly.Matrix, LDL, []string) {
	if order := triangularOrder(m, basis, l); order != nil {
		return basis, g, l, order
	}
	var lin, rest []int
	for i, b := range basis {
		if b.Degree() == 1 {
			lin = append(lin, i)
		} else {
			rest = append(rest, i)
		}
	}
	if len(lin) > 5 {
		return basis, g, l, nil
	}
	var found []string
	var fb []*poly.Poly
	var fg poly.Matrix
	var fl LDL
	var perm func(k int) bool
	perm = func(k int) bool {
		if k == len(lin) {
			idx := append(slices.Clone(lin), rest...)
			pb := make([]*poly.Poly, len(idx))
			pg := make(poly.Matrix, len(idx))
			for a, i := range idx {
				pb[a], pg[a] = basis[i], make([]poly.RatFunc, len(idx))
				for b, j := range idx {
					pg[a][b] = g[i][j]
				}
			}
			var pl LDL
			if ok, _ := pl.Factorize(pg); !ok || negativePivot(pl) {
				return false
			}
			if order := triangularOrder(m, pb, pl); order != nil {
				found, fb, fg, fl = order, pb, pg, pl
				return true
			}
			return false
		}
		for i := k; i < len(lin); i++ {
			lin[k], lin[i] = lin[i], lin[k]
			if perm(k + 1) {
				return true
			}
			lin[k], lin[i] = lin[i], lin[k]
		}
		return false
	}
	if perm(0) {
		return fb, fg, fl, found
	}
	return basis, g, l, nil
}

// triangularOrder returns the states in the order in which the square bases
// of a semidefinite Gram form (those with non-zero pivots, in order) solve
// for them: the k-th is c·s + h with c a non-zero rational and h without
// constant term in the states before s. Then the form vanishes only at the
// equilibrium and is radially unbounded (the kernel's triangular-squares
// rule). Nil when the first len(states) squares do not solve so.
func triangularOrder(m *model.Model, basis []*poly.Poly, l LDL) []string {
	n, r := len(m.States), m.Ring
	z := make([]poly.RatFunc, len(basis))
	for i, b := range basis {
		z[i] = poly.FromPoly(b)
	}
	solved := make([]bool, n)
	var order []string
	for i := 0; i < len(l.D) && len(order) < n; i++ {
		if l.Zero[i] {
			continue
		}
		q := poly.SquareBase(l.L, z, i)
		found := -1
		for s := 0; s < n && found < 0; s++ {
			e := make([]int, r.NumVars())
			e[s] = 1
			lin := q.Coefficient(e, r.StateMask())
			h := q.Sub(lin.Mul(poly.FromPoly(poly.Var(r, s))))
			later := slices.ContainsFunc(h.Num.VarsUsed(), func(v int) bool { return v < n && !solved[v] })
			if !solved[s] && lin.IsPoly() && lin.Num.IsConst() && !lin.IsZero() && !later && h.Homogeneous(0, r.StateMask()).IsZero() {
				found = s
			}
		}
		if found < 0 {
			return nil
		}
		solved[found] = true
		order = append(order, m.States[found])
	}
	if len(order) < n {
		return nil
	}
	return order
}
