package model

import "github.com/lyacert/lyacert/poly"

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
