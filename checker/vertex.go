package checker

import (
	"math/big"
	"slices"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

// maxVertexParams bounds the vertices the kernel enumerates (2¹²).
const maxVertexParams = 12

// vertexLyapunov: quadratic stability over the parameter box, checked at its
// vertices.
func (c *run) vertexLyapunov(cl claims.Claim) bool {
	vl := cl.(*claims.VertexLyapunov)
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
		if !c.add("vertex", p.Range.Compact(), "the range of %s is a closed bounded interval", p.Name) {
			return false
		}
	}
	pt, err := m.ConstantAt()
	if !c.add("equilibrium", err == nil, "the equilibrium is a rational point, free of the parameters%s", errSuffix(err)) {
		return false
	}
	err = m.CheckEquilibrium()
	if !c.add("equilibrium", err == nil, "f(x*) = 0 for every parameter value%s", errSuffix(err)) {
		return false
	}
	jac, linear, bad := m.JacobianAt(pt)
	affine := bad < 0
	for i := 0; affine && i < n*n; i++ {
		affine = jac[i/n][i%n].Degree() <= 1 // the states are gone: degree in p
	}
	if !c.add("vertex", affine, "f is polynomial and its Jacobian at x* is affine in the parameters (no powers or products of them)") {
		return false
	}
	p, ok := c.rationalMatrix("P", vl.P, n)
	if !ok {
		return false
	}
	if k, _ := poly.FirstNonPositivePivot(p); !c.add("vertex", k < 0, "P is positive definite (exact LDLᵀ pivots)") {
		return false
	}
	for v := range 1 << len(free) {
		if err := c.ctx.Err(); err != nil {
			return c.add("vertex", false, "stopped at vertex %d: %v", v+1, err)
		}
		x := m.Vertex(pt, v)
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
