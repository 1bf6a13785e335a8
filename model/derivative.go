package model

import (
	"math/big"

	"github.com/lyacert/lyacert/poly"
)

// Derivative returns the derivative of v along the flow: the orbital (Lie)
// derivative V̇ = Σ ∂V/∂xᵢ · fᵢ for continuous time, and the difference
// ΔV = V(f(x)) − V(x) for discrete time.
func (m *Model) Derivative(v poly.RatFunc) poly.RatFunc {
	if m.Discrete {
		has := make([]bool, m.Ring.NumVars())
		sub := make([]poly.RatFunc, m.Ring.NumVars())
		for i, f := range m.F {
			has[i], sub[i] = true, f
		}
		return v.ComposeStates(sub, has).Sub(v)
	}
	sum := poly.FromPoly(poly.Zero(m.Ring))
	for i, f := range m.F {
		d := v.Derivative(i)
		if d.IsZero() || f.IsZero() {
			continue
		}
		sum = sum.Add(d.Mul(f))
	}
	return sum
}

// Shift returns p(at + x): p in coordinates centred at the equilibrium, the
// shifted states keeping the states' names.
func (m *Model) Shift(p poly.RatFunc) poly.RatFunc {
	if !m.AtGiven {
		return p
	}
	r := m.Ring
	has := make([]bool, r.NumVars())
	sub := make([]poly.RatFunc, r.NumVars())
	for i := range m.States {
		has[i] = true
		sub[i] = poly.FromPoly(poly.Var(r, i)).Add(m.At[i])
	}
	return p.ComposeStates(sub, has)
}

// Unshift is the inverse of Shift: p(x − at), a function of the states
// measured from the equilibrium written in the model's own coordinates.
func (m *Model) Unshift(p poly.RatFunc) poly.RatFunc {
	if !m.AtGiven {
		return p
	}
	r := m.Ring
	has := make([]bool, r.NumVars())
	sub := make([]poly.RatFunc, r.NumVars())
	for i := range m.States {
		has[i] = true
		sub[i] = poly.FromPoly(poly.Var(r, i)).Sub(m.At[i])
	}
	return p.ComposeStates(sub, has)
}

// JacobianAt returns the Jacobian ∂fᵢ/∂xₖ at the states pt, as polynomials
// in the parameters, and whether f has degree ≤ 1 in the states; bad is the
// index of the first right-hand side with a denominator (then jac is nil),
// −1 when there is none.
func (m *Model) JacobianAt(pt []*big.Rat) (jac [][]*poly.Poly, affine bool, bad int) {
	states := make([]bool, m.Ring.NumVars())
	vals := map[int]*big.Rat{}
	for i, v := range pt {
		states[i], vals[i] = true, v
	}
	affine = true
	for i, f := range m.F {
		if !f.IsPoly() {
			return nil, false, i
		}
		affine = affine && f.Num.DegreeIn(states) <= 1
		row := make([]*poly.Poly, len(m.F))
		for k := range row {
			row[k] = new(poly.Poly).EvalVars(new(poly.Poly).Derivative(f.Num, k), vals)
		}
		jac = append(jac, row)
	}
	return jac, affine, -1
}

// Vertex returns a point of the ring's variables: the states at pt, the
// free parameters at vertex v of their box (parameter j of FreeParams at
// its upper end exactly when bit j of v is set; every range bounded), the
// rest 0.
func (m *Model) Vertex(pt []*big.Rat, v int) []*big.Rat {
	x := make([]*big.Rat, m.Ring.NumVars())
	for i := range x {
		x[i] = new(big.Rat)
	}
	copy(x, pt)
	for j, p := range m.FreeParams() {
		k, _ := m.Ring.Index(p.Name)
		x[k] = map[bool]*big.Rat{false: p.Range.Lo.Value, true: p.Range.Hi.Value}[v>>j&1 == 1]
	}
	return x
}
