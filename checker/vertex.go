package checker

import (
	"math/big"
	"slices"

	"github.com/lyacert/lyacert/poly"
)

// VertexLyapunov certifies the model's equilibrium x* for every value of its
// free parameters p in their box at once, with one quadratic V (quadratic
// stability). The model is in continuous time, x* (its "at" point, or the
// origin) is free of p and an equilibrium for every p, and every entry of
// the Jacobian A(p) = ∂f/∂x(x*, p) is affine in p. The rule requires P ≻ 0
// and M(v) = −(A(v)ᵀP + P·A(v)) ≻ 0 at every vertex v of the box. M is
// affine in A and A in p, so M(p) is a convex combination of the M(v) (the
// box is the convex hull of its vertices) and M(p) ≻ 0 on the whole box:
// Lyapunov's indirect method then gives local asymptotic stability for every
// p, with V = (x − x*)ᵀP(x − x*); when f has degree ≤ 1 in the states,
// f = A(p)(x − x*) exactly and stability is global (the direct method).
// Maps are refused: P − AᵀPA is not affine in A, and its vertices prove
// nothing of the box.
// Decay restates M(v) at each vertex, vertex v having parameter j at its
// upper end exactly when bit j of v is set.
type VertexLyapunov struct {
	P     [][]string   `json:"p"`     // symmetric, one P for the whole box
	Decay [][][]string `json:"decay"` // M(v) per vertex, recomputed
}

func (*VertexLyapunov) Rule() string { return "vertex-lyapunov" }

// maxVertexParams bounds the vertices the kernel enumerates (2¹²).
const maxVertexParams = 12

// vertexLyapunov: quadratic stability over the parameter box, checked at its
// vertices.
func (c *run) vertexLyapunov(cl Claim) bool {
	vl := cl.(*VertexLyapunov)
	m := c.m
	n := len(m.States)
	free := m.FreeParams()
	if !c.once("vertex-lyapunov") ||
		!c.add("vertex", !m.Discrete, "the model is in continuous time (P − AᵀPA is not affine in A)") ||
		!c.add("vertex", m.V == nil, "the model states no candidate V") ||
		!c.add("vertex", len(free) > 0 && len(free) <= maxVertexParams, "the model has 1 to %d free parameters (%d)", maxVertexParams, len(free)) {
		return false
	}
	for _, p := range free {
		lo, hi := p.Range.Lo, p.Range.Hi
		if !c.add("vertex", lo.Inf == 0 && hi.Inf == 0 && !lo.Open && !hi.Open, "the range of %s is a closed bounded interval", p.Name) {
			return false
		}
	}
	constant := !slices.ContainsFunc(m.At, func(a poly.RatFunc) bool { return !a.IsPoly() || !a.Num.IsConst() })
	err := m.CheckEquilibrium()
	if !c.add("equilibrium", constant, "the equilibrium does not depend on the parameters") ||
		!c.add("equilibrium", err == nil, "f(x*) = 0 for every parameter value%s", errSuffix(err)) {
		return false
	}
	pt, err := m.AtPoint()
	if !c.add("equilibrium", err == nil, "the point is defined") {
		return false
	}
	affine, linear := true, true
	states := make([]bool, m.Ring.NumVars())
	vals := map[int]*big.Rat{}
	for i, v := range pt {
		states[i], vals[i] = true, v
	}
	jac := make([][]*poly.Poly, n)
	for i, f := range m.F {
		affine = affine && f.IsPoly()
		if !affine {
			break
		}
		linear = linear && f.Num.DegreeIn(states) <= 1
		jac[i] = make([]*poly.Poly, n)
		for k := range n {
			jac[i][k] = new(poly.Poly).EvalVars(new(poly.Poly).Derivative(f.Num, k), vals)
			affine = affine && jac[i][k].Degree() <= 1 // the states are gone: degree in p
		}
	}
	if !c.add("vertex", affine, "f is polynomial and its Jacobian at x* is affine in the parameters (no powers or products of them)") {
		return false
	}
	p, ok := c.rationalMatrix("P", vl.P, n)
	if !ok {
		return false
	}
	symmetric := true
	for i := range n {
		for j := range n {
			symmetric = symmetric && p[i][j].Cmp(p[j][i]) == 0
		}
	}
	if k, _ := poly.FirstNonPositivePivot(p); !c.add("vertex", symmetric, "P is symmetric") ||
		!c.add("vertex", k < 0, "P is positive definite (exact LDLᵀ pivots)") {
		return false
	}
	x := make([]*big.Rat, m.Ring.NumVars())
	for i := range x {
		x[i] = new(big.Rat)
	}
	copy(x, pt)
	for v := range 1 << len(free) {
		if err := c.ctx.Err(); err != nil {
			return c.add("vertex", false, "stopped at vertex %d: %v", v+1, err)
		}
		for j, fp := range free {
			end := fp.Range.Lo.Value
			if v>>j&1 == 1 {
				end = fp.Range.Hi.Value
			}
			k, _ := m.Ring.Index(fp.Name)
			x[k] = end
		}
		a := make([][]*big.Rat, n)
		for i := range n {
			for k := range n {
				a[i] = append(a[i], jac[i][k].Eval(x))
			}
		}
		mv := poly.DecayAt(a, false, p)
		if !c.add("vertex", v < len(vl.Decay) && slices.EqualFunc(vl.Decay[v], mv, func(s []string, r []*big.Rat) bool {
			return slices.EqualFunc(s, r, func(s string, r *big.Rat) bool { return s == poly.RatString(r) })
		}), "M at vertex %d equals the recomputed one", v+1) {
			return false
		}
		if k, _ := poly.FirstNonPositivePivot(mv); k >= 0 {
			return c.add("vertex", false, "−(AᵀP + PA) is positive definite at vertex %d (pivot %d is not positive)", v+1, k+1)
		}
	}
	if !c.add("vertex", len(vl.Decay) == 1<<len(free), "−(AᵀP + PA) is positive definite at all %d vertices of the box (exact LDLᵀ pivots)", 1<<len(free)) {
		return false
	}
	c.linear = map[bool]string{false: KindLocal, true: KindGlobal}[linear]
	return true
}
