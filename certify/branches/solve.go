package branches

import (
	"context"
	"errors"
	"fmt"
	"math/big"
	"slices"

	"github.com/lyacert/lyacert/poly"
)

// errNoClosedForm marks a system the elimination does not bring to closed
// form within the limits.
var errNoClosedForm = errors.New("no closed form")

// subst records x_V = Expr, Expr a rational function of the states not yet
// eliminated and of the parameters.
type subst struct {
	V    int
	Expr poly.RatFunc
}

// rawBranch is one solution of the triangular system before back-substitution.
type rawBranch struct {
	steps   []subst
	last    int  // the state solved last, −1 when none
	value   Surd // its value
	free    []int
	nonzero []*poly.Poly
	pair    bool // value is one of u ± v√w (the + one when plus)
	plus    bool
}

type solver struct {
	ctx     context.Context
	ring    *poly.Ring
	n       int
	lim     Options
	splits  int
	out     []rawBranch
	notes   []string
	reasons []string
	// further are the parameter polynomials e met as equations: where
	// e = 0 a further branch may exist.
	further []*poly.Poly
}

func (s *solver) stateMask(j int) []bool {
	m := make([]bool, s.ring.NumVars())
	m[j] = true
	return m
}

// states returns the states that occur in p.
func (s *solver) states(p *poly.Poly) []int {
	var out []int
	for i := 0; i < s.n; i++ {
		if p.UsesVar(i) {
			out = append(out, i)
		}
	}
	return out
}

func appendCond(conds []*poly.Poly, c *poly.Poly) []*poly.Poly {
	if c.IsConst() {
		return conds
	}
	_, q := c.PrimitivePart()
	for _, d := range conds {
		if d.Equal(q) {
			return conds
		}
	}
	return append(slices.Clone(conds), q)
}

// solve is one node of the triangular decomposition: it splits a product
// by a state monomial, eliminates a state that occurs linearly with a
// coefficient in the parameters only, or solves the last state from a
// polynomial of degree at most two.
func (s *solver) solve(eqs []*poly.Poly, steps []subst, conds []*poly.Poly) error {
	if err := s.ctx.Err(); err != nil {
		return err
	}
	var live []*poly.Poly
	for _, e := range eqs {
		if e.IsZero() {
			continue
		}
		if e.NumTerms() > s.lim.MaxTerms {
			return fmt.Errorf("%w: an eliminant has %d terms (limit %d)", errNoClosedForm, e.NumTerms(), s.lim.MaxTerms)
		}
		if len(s.states(e)) == 0 {
			// A non-zero condition on the parameters alone: no equilibrium
			// here for generic parameters.
			if !e.IsConst() {
				s.notes = append(s.notes, fmt.Sprintf("equilibria exist on a further branch only where %s = 0", e))
				s.further = appendCond(s.further, e)
			}
			return nil
		}
		live = append(live, e)
	}
	solved := make([]bool, s.n)
	for _, st := range steps {
		solved[st.V] = true
	}
	if len(live) == 0 {
		var free []int
		for i := 0; i < s.n; i++ {
			if !solved[i] {
				free = append(free, i)
			}
		}
		s.out = append(s.out, rawBranch{steps: steps, last: -1, free: free, nonzero: conds})
		return nil
	}
	// A product x_j^k·h: split into x_j = 0 and h = 0.
	for i, e := range live {
		for _, j := range s.states(e) {
			k := minExp(e, j)
			if k == 0 {
				continue
			}
			h := new(poly.Poly)
			h.DivExact(e, new(poly.Poly).Pow(poly.Var(s.ring, j), k))
			xj := poly.Var(s.ring, j)
			if len(s.states(h)) == 0 {
				if k == 1 && h.IsConst() {
					continue // already linear in x_j
				}
				next := slices.Clone(live)
				next[i] = xj
				return s.solve(next, steps, appendCond(conds, h))
			}
			s.splits++
			if s.splits > s.lim.MaxSplits {
				return fmt.Errorf("%w: more than %d case splits", errNoClosedForm, s.lim.MaxSplits)
			}
			a := slices.Clone(live)
			a[i] = xj
			if err := s.solve(a, steps, conds); err != nil {
				return err
			}
			b := slices.Clone(live)
			b[i] = h
			return s.solve(b, steps, conds)
		}
	}
	// Linear elimination: the state with a coefficient in the parameters
	// only, from the smallest equation.
	best, bj := -1, -1
	var bc *poly.Poly
	for i, e := range live {
		for _, j := range s.states(e) {
			mask := s.stateMask(j)
			if e.DegreeIn(mask) != 1 {
				continue
			}
			e1 := make([]int, s.ring.NumVars())
			e1[j] = 1
			c := e.Coefficient(e1, mask)
			if len(s.states(c)) != 0 {
				continue
			}
			if best < 0 || e.NumTerms() < live[best].NumTerms() {
				best, bj, bc = i, j, c
			}
		}
	}
	if best >= 0 {
		e := live[best]
		mask := s.stateMask(bj)
		rest := e.Coefficient(make([]int, s.ring.NumVars()), mask)
		expr := poly.FromPoly(new(poly.Poly).Neg(rest)).Quo(poly.FromPoly(bc))
		sub := make([]poly.RatFunc, s.ring.NumVars())
		has := make([]bool, s.ring.NumVars())
		sub[bj], has[bj] = expr, true
		var next []*poly.Poly
		for i, f := range live {
			if i == best {
				continue
			}
			g := poly.FromPoly(f).ComposeStates(sub, has)
			next = append(next, g.Num)
		}
		return s.solve(next, append(slices.Clone(steps), subst{bj, expr}), appendCond(conds, bc))
	}
	// One state left in every equation: solve the smallest, keep the roots
	// the others share.
	k := -1
	for _, e := range live {
		for _, j := range s.states(e) {
			if k >= 0 && j != k {
				return fmt.Errorf("%w: no state occurs linearly with a coefficient free of states", errNoClosedForm)
			}
			k = j
		}
	}
	mask := s.stateMask(k)
	slices.SortFunc(live, func(a, b *poly.Poly) int { return a.DegreeIn(mask) - b.DegreeIn(mask) })
	roots, rconds, err := s.roots(live[0], k)
	if err != nil {
		return err
	}
	conds = slices.Clone(conds)
	for _, c := range rconds {
		conds = appendCond(conds, c)
	}
	var free []int
	for i := 0; i < s.n; i++ {
		if !solved[i] && i != k {
			free = append(free, i)
		}
	}
	for _, r := range roots {
		ok := true
		for _, e := range live[1:] {
			if !evalAt(poly.FromPoly(e), s.n, map[int]Surd{k: r.value}).IsZero() {
				ok = false
				break
			}
		}
		if !ok {
			s.notes = append(s.notes, fmt.Sprintf("a root %s = %s of one equation solves the others only for special parameters", s.ring.Name(k), r.value))
			continue
		}
		s.out = append(s.out, rawBranch{steps: steps, last: k, value: r.value, free: free, nonzero: conds, pair: r.pair, plus: r.plus})
	}
	return nil
}

func minExp(p *poly.Poly, j int) int {
	m := -1
	for _, t := range p.Terms() {
		if m < 0 || t.Exp[j] < m {
			m = t.Exp[j]
		}
	}
	return max(m, 0)
}

type root struct {
	value      Surd
	pair, plus bool
}

// roots solves h(x_k) = 0, h of degree at most two in x_k over Q(p) (any
// degree when h has rational coefficients and its roots of degree above two
// are rational); conds are the leading coefficients that must not vanish.
func (s *solver) roots(h *poly.Poly, k int) ([]root, []*poly.Poly, error) {
	mask := s.stateMask(k)
	deg := h.DegreeIn(mask)
	coef := make([]*poly.Poly, deg+1)
	for d := range coef {
		e := make([]int, s.ring.NumVars())
		e[k] = d
		coef[d] = h.Coefficient(e, mask)
	}
	r := s.ring
	conds := []*poly.Poly{coef[deg]}
	if deg > 2 {
		// Rational coefficients: take out rational roots (rational root
		// theorem, as in poly.Univariate.RationalRoots), solve the rest
		// if it is at most quadratic.
		u, ok := h.Univariate(k)
		if !ok {
			return nil, nil, fmt.Errorf("%w: %s has degree %d in %s", errNoClosedForm, h, deg, r.Name(k))
		}
		var out []root
		for _, q := range u.RationalRoots() {
			out = append(out, root{value: intSurd(r, 0).Add(Rational(poly.RatConst(r, q)))})
			u, _ = u.DivMod(poly.NewUnivariate(new(big.Rat).Neg(q), big.NewRat(1, 1)))
		}
		u = u.SquareFree()
		if u.Degree() > 2 {
			return nil, nil, fmt.Errorf("%w: %s has an irreducible factor of degree %d", errNoClosedForm, h, u.Degree())
		}
		if u.Degree() >= 1 {
			more, _, err := s.roots(poly.FromUnivariate(r, k, u), k)
			if err != nil {
				return nil, nil, err
			}
			out = append(out, more...)
		}
		return out, nil, nil
	}
	switch deg {
	case 1:
		v := poly.FromPoly(new(poly.Poly).Neg(coef[0])).Quo(poly.FromPoly(coef[1]))
		return []root{{value: Rational(v)}}, conds, nil
	case 2:
	default:
		return nil, nil, fmt.Errorf("%w: degree %d", errNoClosedForm, deg)
	}
	// h₂x² + h₁x + h₀ = 0: x = −h₁/(2h₂) ± √(h₁² − 4h₂h₀)/(2h₂).
	two := new(poly.Poly).Scale(coef[2], big.NewRat(2, 1))
	u := poly.FromPoly(new(poly.Poly).Neg(coef[1])).Quo(poly.FromPoly(two))
	disc := new(poly.Poly).Mul(coef[1], coef[1])
	disc.Sub(disc, new(poly.Poly).Scale(new(poly.Poly).Mul(coef[2], coef[0]), big.NewRat(4, 1)))
	if disc.IsZero() {
		return []root{{value: Rational(u)}}, conds, nil
	}
	c, q := disc.PrimitivePart()
	outer, inner := sqrtPoly(q) // √q = outer·√inner
	cs, cin := sqrtRat(c)       // √c = cs·√cin
	v := poly.FromPoly(new(poly.Poly).Scale(outer, cs)).Quo(poly.FromPoly(two))
	inner.Scale(inner, cin)
	if inner.IsConst() && inner.ConstTerm().Cmp(big.NewRat(1, 1)) == 0 {
		return []root{{value: Rational(u.Add(v))}, {value: Rational(u.Sub(v))}}, conds, nil
	}
	w := poly.FromPoly(inner)
	plus := Surd{A: u, B: v, W: &w}
	return []root{{value: plus, pair: true, plus: true}, {value: plus.Conj(), pair: true}}, conds, nil
}

// sqrtRat writes √c = s·√t with rational s and a square-free integer t > 0
// (square factors below 1000 are taken out; c > 0).
func sqrtRat(c *big.Rat) (*big.Rat, *big.Rat) {
	if c.Sign() < 0 {
		s, t := sqrtRat(new(big.Rat).Neg(c))
		return s, t.Neg(t)
	}
	// √(n/d) = √(n·d)/d.
	m := new(big.Int).Mul(c.Num(), c.Denom())
	s := new(big.Rat).SetFrac(big.NewInt(1), c.Denom())
	if r := new(big.Int).Sqrt(m); new(big.Int).Mul(r, r).Cmp(m) == 0 {
		return s.Mul(s, new(big.Rat).SetInt(r)), big.NewRat(1, 1)
	}
	q, rem := new(big.Int), new(big.Int)
	for p := int64(2); p < 1000; p++ {
		pp := big.NewInt(p * p)
		for {
			q.QuoRem(m, pp, rem)
			if rem.Sign() != 0 {
				break
			}
			m.Set(q)
			s.Mul(s, big.NewRat(p, 1))
		}
	}
	return s, new(big.Rat).SetInt(m)
}

// sqrtPoly writes a primitive q as outer²·inner, outer the exact square root
// of q when q is a perfect square (inner = 1), else outer = 1, inner = q.
// The square root is found term by term in the graded order of poly (the
// leading term of S² is the square of that of S), then checked.
func sqrtPoly(q *poly.Poly) (*poly.Poly, *poly.Poly) {
	r := q.Ring()
	one := poly.ConstInt(r, 1)
	if s, ok := exactSqrt(q); ok {
		return s, one
	}
	return one, q.Clone()
}

func exactSqrt(p *poly.Poly) (*poly.Poly, bool) {
	r := p.Ring()
	lt := p.Lead()
	e := make([]int, len(lt.Exp))
	for i, x := range lt.Exp {
		if x%2 != 0 {
			return nil, false
		}
		e[i] = x / 2
	}
	c, t := sqrtRat(lt.Coef)
	if t.Cmp(big.NewRat(1, 1)) != 0 {
		return nil, false
	}
	s := poly.Monomial(r, e, c)
	ls := s.Lead()
	for range p.NumTerms() + 8 {
		rem := new(poly.Poly).Sub(p, new(poly.Poly).Mul(s, s))
		if rem.IsZero() {
			return s, true
		}
		lr := rem.Lead()
		te := make([]int, len(lr.Exp))
		for i := range te {
			te[i] = lr.Exp[i] - ls.Exp[i]
			if te[i] < 0 {
				return nil, false
			}
		}
		tc := new(big.Rat).Quo(lr.Coef, new(big.Rat).Mul(big.NewRat(2, 1), ls.Coef))
		s.Add(s, poly.Monomial(r, te, tc))
	}
	return nil, false
}

// evalAt substitutes surds for the states in vals (the other states stay)
// into f and returns the result; the denominator of f is free of states.
func evalAt(f poly.RatFunc, n int, vals map[int]Surd) Surd {
	r := f.Ring()
	var w *poly.RatFunc
	for _, v := range vals {
		if v.W != nil {
			w = v.W
		}
	}
	pows := map[[2]int]Surd{}
	pow := func(i, k int) Surd {
		if p, ok := pows[[2]int{i, k}]; ok {
			return p
		}
		p := vals[i].Pow(k)
		pows[[2]int{i, k}] = p
		return p
	}
	sum := intSurd(r, 0)
	sum.W = w
	for _, t := range f.Num.Terms() {
		rest := slices.Clone(t.Exp)
		for i := range n {
			if _, ok := vals[i]; ok {
				rest[i] = 0
			}
		}
		term := Rational(poly.FromPoly(poly.Monomial(r, rest, t.Coef)))
		term.W = w
		for i := range n {
			if _, ok := vals[i]; ok && t.Exp[i] > 0 {
				term = term.Mul(pow(i, t.Exp[i]))
			}
		}
		sum = sum.Add(term)
	}
	if len(f.Den) > 0 {
		den := poly.RatFunc{Num: poly.ConstInt(r, 1), Den: f.Den}
		sum = sum.Mul(Rational(den))
	}
	return sum
}
