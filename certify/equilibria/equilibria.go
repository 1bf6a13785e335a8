package equilibria

import (
	"cmp"
	"fmt"
	"math"
	"math/big"
	"math/cmplx"
	"math/rand/v2"
	"slices"
	"strings"

	"gonum.org/v1/gonum/mat"

	"github.com/lyacert/lyacert/certify"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// Equilibrium statuses.
const (
	// EquilibriumExact: a rational point where the equations vanish exactly.
	EquilibriumExact = "exact"
	// EquilibriumEnclosed: a box that contains exactly one equilibrium,
	// proven by the Krawczyk test with exact rational intervals.
	EquilibriumEnclosed = "enclosed"
	// EquilibriumApproximate: Newton's method converged in floating point,
	// but the Krawczyk test failed (for example at a singular Jacobian); the
	// point is not proven to be near an equilibrium.
	EquilibriumApproximate = "approximate"
)

// Equilibrium is one equilibrium of a model without free parameters: x' = 0
// in continuous time, a fixed point of the map in discrete time.
type Equilibrium struct {
	Status string
	// Point holds the coordinates of an exact equilibrium.
	Point []*big.Rat
	// Box, Y and K are the Krawczyk data of an enclosed equilibrium: the box
	// X, the rational preconditioner Y ≈ J(mid X)⁻¹ and K(X) ⊂ int X.
	Box []poly.Interval
	Y   [][]*big.Rat
	K   []poly.Interval
	// Approx is the point in floating point (the exact point rounded, the
	// centre of the box, or Newton's last iterate).
	Approx []float64
	// Jacobian of the equations at Approx in floating point; ExactJacobian
	// at Point (exact equilibria only).
	Jacobian      *mat.Dense
	ExactJacobian [][]*big.Rat
	// Eigenvalues of the Jacobian (mat.Eigen), by decreasing real part, then
	// decreasing imaginary part.
	Eigenvalues []complex128
	// Class names the kind of equilibrium the linearization shows (see Classify).
	Class string
}

// EquilibriumSearch is what FindEquilibria found.
type EquilibriumSearch struct {
	// Equilibria, without duplicates, ordered by their coordinates.
	Equilibria []Equilibrium
	// Complete reports that exact elimination accounted for every real
	// solution: the list is all isolated equilibria.
	Complete bool
	// NonIsolated reports a curve or surface of equilibria (a free state
	// after elimination); its points are not listed.
	NonIsolated bool
}

// limits of the exact elimination.
const (
	maxEliminationTerms = 5000
	maxEliminationSteps = 400
	// maxRootDegree bounds the degree of a univariate polynomial whose real
	// roots are isolated exactly: elimination in a chain of cubic equations
	// gives degree 3ⁿ, whose Sturm sequence costs far more than Newton's
	// method from many starts.
	maxRootDegree      = 60
	newtonStartsPerBox = 12
)

// FindEquilibria finds the equilibria of a model whose parameters are all
// fixed:
//
//  1. exact elimination: a state that occurs linearly with a constant
//     coefficient in some equation is solved for and substituted; an
//     equation in one state alone is solved by exact real-root isolation
//     (Sturm), branching on every rational root (poly.RationalRoots) and,
//     when it is the last equation, on every irrational root. When every
//     branch ends this way the search is complete. Equations that are all
//     affine are solved at once (poly.SolveRat); a substitution or a
//     univariate polynomial of degree above maxRootDegree leaves the search
//     incomplete instead.
//  2. otherwise Newton's method from deterministic starting points at
//     several scales.
//
// Every irrational point is then enclosed by the Krawczyk test, which
// proves exactly one equilibrium in a small box; points where the test
// fails are kept as approximate. The model's "at" point is always included
// when it is an equilibrium.
func FindEquilibria(m *model.Model) (*EquilibriumSearch, error) {
	if err := requireFixed(m, "finding equilibria"); err != nil {
		return nil, err
	}
	g, err := model.EquilibriumEquations(m.F, m.Discrete)
	if err != nil {
		return nil, err
	}
	n := len(g)
	jac := poly.Jacobian(g)
	el := &eliminator{n: n, r: m.Ring}
	if pt, ok := solveAffine(g); ok {
		el.exact = append(el.exact, pt)
	} else {
		el.solve(g, make([]*poly.Poly, n))
	}
	search := &EquilibriumSearch{Complete: !el.incomplete, NonIsolated: el.nonIsolated}
	cands := el.approx
	fg, fj := floatSystem(g, jac)
	if el.incomplete {
		cands = append(cands, newtonCandidates(fg, fj, n)...)
	}
	var found []Equilibrium
	addExact := func(pt []*big.Rat) {
		for _, e := range found {
			if e.Status == EquilibriumExact && slices.EqualFunc(e.Point, pt, func(a, b *big.Rat) bool { return a.Cmp(b) == 0 }) {
				return
			}
		}
		found = append(found, Equilibrium{Status: EquilibriumExact, Point: pt, Approx: ratsToFloats(pt)})
	}
	if m.AtGiven {
		if err := m.CheckEquilibrium(); err == nil {
			addExact(atPoint(m))
		}
	}
	for _, pt := range el.exact {
		addExact(pt)
	}
	for _, c := range cands {
		if !finiteWithin(c, math.Inf(1)) {
			// An elimination root or a Newton iterate beyond float64:
			// nothing to snap or enclose (the exact equilibria stay).
			search.Complete = false
			continue
		}
		if pt, ok := snapRational(g, c); ok {
			addExact(pt)
			continue
		}
		if slices.ContainsFunc(found, func(e Equilibrium) bool { return e.covers(c) }) {
			continue
		}
		if box, y, k, ok := encloseZero(g, jac, fj, c); ok {
			mid := make([]float64, n)
			for i := range box {
				mid[i], _ = box[i].Mid().Float64()
			}
			found = append(found, Equilibrium{Status: EquilibriumEnclosed, Box: box, Y: y, K: k, Approx: mid})
			continue
		}
		found = append(found, Equilibrium{Status: EquilibriumApproximate, Approx: slices.Clone(c)})
	}
	// An exact point inside a box is the box's unique equilibrium.
	found = slices.DeleteFunc(found, func(e Equilibrium) bool {
		if e.Status != EquilibriumEnclosed {
			return false
		}
		return slices.ContainsFunc(found, func(x Equilibrium) bool {
			return x.Status == EquilibriumExact && inBox(x.Point, e.Box)
		})
	})
	slices.SortStableFunc(found, func(a, b Equilibrium) int {
		for i := range a.Approx {
			if c := cmp.Compare(a.Approx[i], b.Approx[i]); c != 0 {
				return c
			}
		}
		return 0
	})
	for i := range found {
		found[i].linearize(fj, jac, m.Discrete)
	}
	search.Equilibria = found
	return search, nil
}

// solveAffine returns the one equilibrium of equations that all have degree
// ≤ 1 in the states, g = A·x + c, by SolveRat (A·x = −c, fraction-free); ok
// is false for other equations or a singular A, which the elimination then
// handles (no equilibrium, or a line or plane of them). Substituting one
// state at a time would make every coefficient a long rational.
func solveAffine(g []*poly.Poly) ([]*big.Rat, bool) {
	n := len(g)
	a := make([][]*big.Rat, n)
	c := make([]*big.Rat, n)
	for i, gi := range g {
		if gi.Degree() > 1 {
			return nil, false
		}
		a[i] = make([]*big.Rat, n)
		for j := range a[i] {
			a[i][j] = new(big.Rat)
		}
		c[i] = new(big.Rat)
		for _, t := range gi.Terms() {
			j := slices.Index(t.Exp, 1)
			switch {
			case j < 0:
				c[i].Neg(t.Coef)
			case j < n:
				a[i][j] = t.Coef
			default:
				return nil, false // a parameter: not a model with all of them fixed
			}
		}
	}
	if !slices.ContainsFunc(c, func(x *big.Rat) bool { return x.Sign() != 0 }) && poly.NonsingularModPrime(a) {
		// A·x = 0 with A proven nonsingular: the origin, without the long
		// minors of exact elimination.
		pt := make([]*big.Rat, n)
		for i := range pt {
			pt[i] = new(big.Rat)
		}
		return pt, true
	}
	return poly.SolveRat(a, c)
}

// requireFixed returns an input error naming the free parameters, if any.
func requireFixed(m *model.Model, what string) error {
	free := m.FreeParams()
	if len(free) == 0 {
		return nil
	}
	var errs poly.ErrorList
	for _, p := range free {
		errs.Add(p.Pos, "parameter %s is free; %s works at one parameter point: fix it (--set %s=VALUE) or sweep it (--grid %s=LO..HI --points N)", p.Name, what, p.Name, p.Name)
	}
	return errs.Err()
}

// atPoint returns the model's equilibrium as rationals (no free parameters).
// IsOwn reports whether e is the model's own equilibrium: its "at" point,
// or the origin, found exactly.
func IsOwn(m *model.Model, e *Equilibrium) bool {
	return e.Status == EquilibriumExact && slices.EqualFunc(e.Point, atPoint(m), func(a, b *big.Rat) bool { return a.Cmp(b) == 0 })
}

func atPoint(m *model.Model) []*big.Rat {
	zero := make([]*big.Rat, m.Ring.NumVars())
	for i := range zero {
		zero[i] = new(big.Rat)
	}
	pt := make([]*big.Rat, len(m.States))
	for i, a := range m.At {
		v, err := a.Eval(zero)
		if err != nil {
			v = new(big.Rat)
		}
		pt[i] = v
	}
	return pt
}

func ratsToFloats(x []*big.Rat) []float64 {
	out := make([]float64, len(x))
	for i, v := range x {
		out[i], _ = v.Float64()
	}
	return out
}

func inBox(pt []*big.Rat, box []poly.Interval) bool {
	for i, v := range pt {
		if !box[i].Contains(v) {
			return false
		}
	}
	return true
}

// covers reports whether the float point c is this equilibrium found again.
func (e Equilibrium) covers(c []float64) bool {
	for i, x := range c {
		if math.Abs(x-e.Approx[i]) > 1e-7*(1+math.Abs(x)) {
			return false
		}
	}
	return true
}

// eliminator solves a polynomial system by substitution and univariate
// root isolation. vals[k] is nil for an unresolved state, otherwise the
// expression of state k in the unresolved states.
type eliminator struct {
	n           int
	r           *poly.Ring
	exact       [][]*big.Rat
	approx      [][]float64
	incomplete  bool
	nonIsolated bool
	steps       int
}

func (s *eliminator) solve(eqs, vals []*poly.Poly) {
	s.steps++
	if s.steps > maxEliminationSteps {
		s.incomplete = true
		return
	}
	var live []*poly.Poly
	for _, e := range eqs {
		switch {
		case e.IsZero():
			continue
		case e.IsConst():
			return // a non-zero constant: no solution on this branch
		case e.NumTerms() > maxEliminationTerms:
			s.incomplete = true
			return
		}
		live = append(live, e)
	}
	if len(live) == 0 {
		pt := make([]*big.Rat, s.n)
		for i, v := range vals {
			if v == nil {
				s.nonIsolated = true
				return
			}
			pt[i] = v.ConstTerm()
		}
		s.exact = append(s.exact, pt)
		return
	}
	order := make([]int, len(live))
	for i := range order {
		order[i] = i
	}
	slices.SortStableFunc(order, func(a, b int) int { return cmp.Compare(live[a].NumTerms(), live[b].NumTerms()) })
	nv := s.r.NumVars()
	for _, ei := range order {
		e := live[ei]
		for k := 0; k < s.n; k++ {
			if vals[k] != nil || !e.UsesVar(k) {
				continue
			}
			mask := make([]bool, nv)
			mask[k] = true
			if e.DegreeIn(mask) != 1 {
				continue
			}
			exp := make([]int, nv)
			exp[k] = 1
			c := e.Coefficient(exp, mask)
			if !c.IsConst() {
				continue
			}
			// e = c·x_k + rest  ⇒  x_k = −rest/c.
			expr := e.Homogeneous(0, mask)
			expr.Scale(expr, new(big.Rat).Neg(new(big.Rat).Inv(c.ConstTerm())))
			rest := slices.Delete(slices.Clone(live), ei, ei+1)
			for _, r := range rest {
				if r.DegreeIn(mask)*expr.Degree()+r.Degree() > maxRootDegree {
					// The substitution would raise the degree past what
					// root isolation takes (a chain of cubics: 3ⁿ).
					s.incomplete = true
					return
				}
			}
			s.solve(substitute(rest, k, expr), substituteVals(vals, k, expr))
			return
		}
	}
	for j := 0; j < s.n; j++ {
		var us []poly.Univariate
		var rest []*poly.Poly
		for _, e := range live {
			if vs := e.VarsUsed(); len(vs) == 1 && vs[0] == j {
				u, _ := e.Univariate(j)
				us = append(us, u)
			} else {
				rest = append(rest, e)
			}
		}
		if len(us) == 0 {
			continue
		}
		gcd := us[0]
		for _, u := range us[1:] {
			gcd = poly.UnivariateGCD(gcd, u)
		}
		if gcd.Degree() <= 0 {
			return // no common root
		}
		if gcd.Degree() > maxRootDegree {
			s.incomplete = true // Newton's method and the Krawczyk test take over
			return
		}
		for _, root := range gcd.IsolateRoots() {
			if root.Exact != nil {
				q := poly.Const(s.r, root.Exact)
				s.solve(substitute(rest, j, q), substituteVals(vals, j, q))
				continue
			}
			if len(rest) > 0 {
				s.incomplete = true // an irrational value cannot be substituted exactly
				continue
			}
			free := false
			for i, v := range vals {
				if i != j && v == nil {
					free = true
				}
			}
			if free {
				s.nonIsolated = true
				continue
			}
			s.approx = append(s.approx, s.evalAtRoot(vals, j, root))
		}
		return
	}
	s.incomplete = true
}

// evalAtRoot evaluates the resolved states, polynomials in state j, at a
// rational point within 2⁻⁴⁵·(1+|root|) of the irrational root (enough for a
// box of relative half-width 10⁻¹⁰ around it).
func (s *eliminator) evalAtRoot(vals []*poly.Poly, j int, root poly.URoot) []float64 {
	w := new(big.Rat).Abs(root.Lo)
	if a := new(big.Rat).Abs(root.Hi); a.Cmp(w) > 0 {
		w = a
	}
	w.Add(w, big.NewRat(1, 1))
	w.Mul(w, new(big.Rat).SetFrac(big.NewInt(1), new(big.Int).Lsh(big.NewInt(1), 45)))
	rr := root.Refine(w)
	mid := new(big.Rat).Add(rr.Lo, rr.Hi)
	mid.Quo(mid, big.NewRat(2, 1))
	pt := make([]*big.Rat, s.r.NumVars())
	for i := range pt {
		pt[i] = new(big.Rat)
	}
	pt[j] = mid
	out := make([]float64, s.n)
	for i, v := range vals {
		if i == j {
			out[i], _ = mid.Float64()
			continue
		}
		out[i], _ = v.Eval(pt).Float64()
	}
	return out
}

func substitute(eqs []*poly.Poly, k int, expr *poly.Poly) []*poly.Poly {
	out := make([]*poly.Poly, len(eqs))
	for i, e := range eqs {
		out[i] = new(poly.Poly).Substitute(e, k, expr)
	}
	return out
}

func substituteVals(vals []*poly.Poly, k int, expr *poly.Poly) []*poly.Poly {
	out := make([]*poly.Poly, len(vals))
	for i, v := range vals {
		if v != nil {
			out[i] = new(poly.Poly).Substitute(v, k, expr)
		}
	}
	out[k] = expr.Clone()
	return out
}

func floatSystem(g []*poly.Poly, jac [][]*poly.Poly) ([]certify.FloatPoly, [][]certify.FloatPoly) {
	fg := make([]certify.FloatPoly, len(g))
	fj := make([][]certify.FloatPoly, len(g))
	for i := range g {
		fg[i] = newFloat(g[i])
		fj[i] = make([]certify.FloatPoly, len(g))
		for j := range g {
			fj[i][j] = newFloat(jac[i][j])
		}
	}
	return fg, fj
}

func evalJacobian(fj [][]certify.FloatPoly, x []float64) *mat.Dense {
	n := len(fj)
	a := mat.NewDense(n, n, nil)
	for i := range fj {
		for j := range fj[i] {
			a.Set(i, j, fj[i][j].Eval(x))
		}
	}
	return a
}

// newtonCandidates runs damped Newton iterations from deterministic starting
// points (the origin and pseudo-random points in boxes of half-width 1/2, 2,
// 8, 32 and 128) and returns the distinct limits.
func newtonCandidates(fg []certify.FloatPoly, fj [][]certify.FloatPoly, n int) [][]float64 {
	rng := rand.New(rand.NewPCG(1969, 1977))
	starts := [][]float64{make([]float64, n)}
	for _, s := range []float64{0.5, 2, 8, 32, 128} {
		for k := 0; k < newtonStartsPerBox; k++ {
			x := make([]float64, n)
			for i := range x {
				x[i] = s * (2*rng.Float64() - 1)
			}
			starts = append(starts, x)
		}
	}
	var out [][]float64
	for _, x0 := range starts {
		x, ok := newton(fg, fj, x0)
		if !ok {
			continue
		}
		dup := false
		for _, y := range out {
			if (Equilibrium{Approx: y}).covers(x) {
				dup = true
				break
			}
		}
		if !dup {
			out = append(out, x)
		}
	}
	return out
}

// newton runs damped Newton's method (step halving on the max-norm of the
// residual) and reports convergence: a residual below 1e-10 of the size of
// the terms at the point.
func newton(fg []certify.FloatPoly, fj [][]certify.FloatPoly, x0 []float64) ([]float64, bool) {
	n := len(fg)
	x := slices.Clone(x0)
	res := func(x []float64) float64 {
		r := 0.0
		for _, f := range fg {
			r = math.Max(r, math.Abs(f.Eval(x)))
		}
		return r
	}
	rx := res(x)
	gv := mat.NewVecDense(n, nil)
	var step mat.VecDense
	for it := 0; it < 80; it++ {
		for i, f := range fg {
			gv.SetVec(i, f.Eval(x))
		}
		var lu mat.LU
		lu.Factorize(evalJacobian(fj, x))
		if lu.Det() == 0 || math.IsNaN(lu.Det()) {
			return nil, false
		}
		if err := lu.SolveVecTo(&step, false, gv); err != nil {
			return nil, false
		}
		t := 1.0
		var y []float64
		ry := math.Inf(1)
		for h := 0; h < 40; h++ {
			y = make([]float64, n)
			for i := range y {
				y[i] = x[i] - t*step.AtVec(i)
			}
			if ry = res(y); ry < rx || ry == 0 {
				break
			}
			t /= 2
		}
		small := true
		for i := range y {
			if math.Abs(y[i]-x[i]) > 1e-15*(1+math.Abs(x[i])) {
				small = false
			}
		}
		if math.IsNaN(ry) || math.IsInf(ry, 0) {
			return nil, false
		}
		if ry <= rx {
			x, rx = y, ry
		}
		if small || rx == 0 {
			break
		}
	}
	scale := 0.0
	for _, f := range fg {
		scale = math.Max(scale, f.Magnitude(x))
	}
	for _, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) || math.Abs(v) > 1e12 {
			return nil, false
		}
	}
	return x, rx <= 1e-10*math.Max(scale, 1e-300) || rx == 0
}

// snapRational tries small-denominator rationals near c and keeps them when
// the equations vanish there exactly.
func snapRational(g []*poly.Poly, c []float64) ([]*big.Rat, bool) {
	if !finiteWithin(c, math.Inf(1)) {
		return nil, false
	}
	pt := make([]*big.Rat, len(c))
	for i, x := range c {
		pt[i] = rationalize(x, 1e-9*(1+math.Abs(x)))
	}
	for _, gi := range g {
		if gi.Eval(pt).Sign() != 0 {
			return nil, false
		}
	}
	return pt, true
}

// rationalize returns the first continued-fraction convergent p/q of x with
// |p/q − x| ≤ tol, or x exactly (a dyadic rational) when tol ≤ 0 or no
// convergent with |p|, q < 2⁵³ is that close. x must be finite. The
// expansion runs in floating point: rounding only proposes numbers, which
// exact arithmetic then checks.
func rationalize(x, tol float64) *big.Rat {
	if tol <= 0 {
		return new(big.Rat).SetFloat64(x)
	}
	const limit = 1 << 53
	h0, h1 := 0.0, 1.0
	k0, k1 := 1.0, 0.0
	r := x
	for i := 0; i < 64; i++ {
		a := math.Floor(r)
		h2, k2 := a*h1+h0, a*k1+k0
		if math.Abs(h2) >= limit || k2 >= limit {
			break
		}
		if math.Abs(h2/k2-x) <= tol {
			return new(big.Rat).SetFrac(big.NewInt(int64(h2)), big.NewInt(int64(k2)))
		}
		f := r - a
		if f == 0 {
			break
		}
		r = 1 / f
		h0, h1, k0, k1 = h1, h2, k1, k2
	}
	return new(big.Rat).SetFloat64(x)
}

// linearize sets the Jacobians, eigenvalues and class.
func (e *Equilibrium) linearize(fj [][]certify.FloatPoly, jac [][]*poly.Poly, discrete bool) {
	n := len(fj)
	if e.Status == EquilibriumExact {
		pt := slices.Clone(e.Point)
		e.ExactJacobian = make([][]*big.Rat, n)
		e.Jacobian = mat.NewDense(n, n, nil)
		for i := range jac {
			e.ExactJacobian[i] = make([]*big.Rat, n)
			for j := range jac[i] {
				v := jac[i][j].Eval(pt)
				if discrete && i == j {
					v.Add(v, big.NewRat(1, 1)) // the map's Jacobian, not that of f − x
				}
				e.ExactJacobian[i][j] = v
				fv, _ := v.Float64()
				e.Jacobian.Set(i, j, fv)
			}
		}
	} else {
		e.Jacobian = evalJacobian(fj, e.Approx)
		if discrete {
			for i := 0; i < n; i++ {
				e.Jacobian.Set(i, i, e.Jacobian.At(i, i)+1)
			}
		}
	}
	if !finiteWithin(e.Jacobian.RawMatrix().Data, FloatRange) {
		// LAPACK overflows (and may panic) on such entries; the exact
		// Jacobian stays, the floating-point guide does not.
		e.Class = ClassOutOfRange
		return
	}
	e.Eigenvalues = eigenvalues(e.Jacobian)
	e.Class = Classify(e.Jacobian, e.ExactJacobian, e.Eigenvalues, discrete)
}

// FloatRange bounds the entries of a Jacobian given to the floating-point
// solvers (eigenvalues, the Lyapunov equation): their products must stay
// finite, so it is about √MaxFloat64.
const FloatRange = 1e150

// ClassOutOfRange is the class of an equilibrium whose linearization has
// entries beyond FloatRange: it is not classified, and not certified.
const ClassOutOfRange = "unknown (the linearization has entries beyond floating-point range)"

// finiteWithin reports that every x is finite with |x| ≤ bound.
func finiteWithin(xs []float64, bound float64) bool {
	for _, x := range xs {
		if math.IsNaN(x) || math.IsInf(x, 0) || math.Abs(x) > bound {
			return false
		}
	}
	return true
}

// eigenvalues returns the eigenvalues of a (mat.Eigen) by decreasing real
// part, then decreasing imaginary part; nil if the factorization fails.
func eigenvalues(a *mat.Dense) []complex128 {
	if !finiteWithin(a.RawMatrix().Data, FloatRange) {
		return nil
	}
	var eg mat.Eigen
	if !eg.Factorize(a, mat.EigenNone) {
		return nil
	}
	ev := eg.Values(nil)
	slices.SortStableFunc(ev, func(x, y complex128) int {
		if c := cmp.Compare(real(y), real(x)); c != 0 {
			return c
		}
		return cmp.Compare(imag(y), imag(x))
	})
	return ev
}

// MaxRealPart returns the largest real part of the eigenvalues, NaN for none.
func MaxRealPart(ev []complex128) float64 {
	if len(ev) == 0 {
		return math.NaN()
	}
	m := math.Inf(-1)
	for _, l := range ev {
		m = math.Max(m, real(l))
	}
	return m
}

// SpectralRadius returns the largest modulus of the eigenvalues, NaN for none.
func SpectralRadius(ev []complex128) float64 {
	if len(ev) == 0 {
		return math.NaN()
	}
	m := 0.0
	for _, l := range ev {
		m = math.Max(m, cmplx.Abs(l))
	}
	return m
}

// eigenTolerance is the relative size below which a real part (continuous
// time) or |λ| − 1 (discrete time) counts as zero in Classify.
const eigenTolerance = 1e-9

// Classify names the equilibrium by its linearization J (the Jacobian of
// the vector field, or of the map in discrete time).
//
// Continuous time, two states: by trace τ and determinant Δ (exactly when J
// is exact): Δ < 0 saddle; Δ = 0 degenerate (a zero eigenvalue); Δ > 0 and
// τ = 0 centre of the linearization; otherwise stable (τ < 0) or unstable
// (τ > 0) node (τ² > 4Δ), degenerate node (τ² = 4Δ) or focus (τ² < 4Δ).
// More states: the numbers of eigenvalues with real part < 0, = 0 and > 0,
// "= 0" meaning within eigenTolerance·(1 + ‖J‖) and said so.
//
// Discrete time: the numbers of eigenvalues inside, on (within tolerance)
// and outside the unit circle; for two states also node (real eigenvalues)
// or focus (complex).
func Classify(j *mat.Dense, exact [][]*big.Rat, ev []complex128, discrete bool) string {
	n, _ := j.Dims()
	if ev == nil {
		return "unknown (eigenvalues not computed)"
	}
	if !discrete && n == 2 && exact != nil {
		tr := new(big.Rat).Add(exact[0][0], exact[1][1])
		det := new(big.Rat).Sub(new(big.Rat).Mul(exact[0][0], exact[1][1]), new(big.Rat).Mul(exact[0][1], exact[1][0]))
		disc := new(big.Rat).Sub(new(big.Rat).Mul(tr, tr), new(big.Rat).Mul(big.NewRat(4, 1), det))
		return classify2(tr.Sign(), det.Sign(), disc.Sign(), "")
	}
	norm := mat.Norm(j, math.Inf(1))
	tol := eigenTolerance * (1 + norm)
	if !discrete && n == 2 {
		tr := j.At(0, 0) + j.At(1, 1)
		det := j.At(0, 0)*j.At(1, 1) - j.At(0, 1)*j.At(1, 0)
		disc := tr*tr - 4*det
		note := ""
		sgn := func(x, t float64) int {
			switch {
			case x > t:
				return 1
			case x < -t:
				return -1
			}
			if x != 0 {
				note = " (within tolerance)"
			}
			return 0
		}
		ts, ds, cs := sgn(tr, tol), sgn(det, tol*(1+norm)), sgn(disc, tol*(1+norm))
		return classify2(ts, ds, cs, note)
	}
	var neg, zero, pos int
	complexPair := false
	for _, l := range ev {
		x := real(l)
		if discrete {
			x = cmplx.Abs(l) - 1
		}
		switch {
		case x < -tol:
			neg++
		case x > tol:
			pos++
		default:
			zero++
		}
		if math.Abs(imag(l)) > tol {
			complexPair = true
		}
	}
	counts := func() string {
		var parts []string
		what := [3]string{"Re < 0", "Re ≈ 0", "Re > 0"}
		if discrete {
			what = [3]string{"|λ| < 1", "|λ| ≈ 1", "|λ| > 1"}
		}
		for i, k := range []int{neg, zero, pos} {
			if k > 0 {
				parts = append(parts, fmt.Sprintf("%d with %s", k, what[i]))
			}
		}
		return strings.Join(parts, ", ")
	}
	kind := ""
	if discrete && n == 2 {
		kind = " node"
		if complexPair {
			kind = " focus"
		}
	}
	switch {
	case zero > 0:
		return "non-hyperbolic (" + counts() + ", within tolerance)"
	case pos == 0:
		if kind != "" {
			return "stable" + kind
		}
		return "sink (" + counts() + ")"
	case neg == 0:
		if kind != "" {
			return "unstable" + kind
		}
		return "source (" + counts() + ")"
	}
	return "saddle (" + counts() + ")"
}

func classify2(tr, det, disc int, note string) string {
	switch {
	case det < 0:
		return "saddle" + note
	case det == 0:
		return "degenerate (a zero eigenvalue)" + note
	case tr == 0:
		return "centre of the linearization (nonlinear terms decide)" + note
	}
	side := "stable"
	if tr > 0 {
		side = "unstable"
	}
	switch {
	case disc > 0:
		return side + " node" + note
	case disc == 0:
		return side + " degenerate node" + note
	}
	return side + " focus" + note
}

// newFloat is p in float64, every variable kept.
func newFloat(p *poly.Poly) certify.FloatPoly { return certify.NewFloatPoly(p, 0) }
