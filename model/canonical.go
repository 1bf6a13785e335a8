package model

import (
	"fmt"
	"math/big"
	"strings"

	"github.com/lyacert/lyacert/poly"
)

// RangeText returns the assumption as it is written in a model file, without
// the "parameter name" prefix: "> 0", "in [0, 4)", "= 8/3", or "" for no assumption.
func RangeText(p Param) string {
	if p.Fixed != nil {
		return "= " + p.Fixed.RatString()
	}
	lo, hi := p.Range.Lo, p.Range.Hi
	switch {
	case lo.Inf < 0 && hi.Inf > 0:
		return ""
	case hi.Inf > 0 && lo.Open:
		return "> " + lo.Value.RatString()
	case hi.Inf > 0:
		return ">= " + lo.Value.RatString()
	case lo.Inf < 0 && hi.Open:
		return "< " + hi.Value.RatString()
	case lo.Inf < 0:
		return "<= " + hi.Value.RatString()
	}
	return "in " + p.Range.String()
}

// Canonical returns the model as canonical text: one declaration a line,
// fixed parameters and let names substituted into the equations, every
// expression in poly's canonical form. Parsing the text gives back the same
// model.
func (m *Model) Canonical() string {
	var b strings.Builder
	fmt.Fprintf(&b, "state %s\n", strings.Join(m.States, ", "))
	for _, p := range m.Params {
		if t := RangeText(p); t != "" {
			fmt.Fprintf(&b, "parameter %s %s\n", p.Name, t)
		} else {
			fmt.Fprintf(&b, "parameter %s\n", p.Name)
		}
	}
	for i, s := range m.States {
		if m.Discrete {
			fmt.Fprintf(&b, "%s+ = %s\n", s, m.F[i])
		} else {
			fmt.Fprintf(&b, "%s' = %s\n", s, m.F[i])
		}
	}
	if m.V != nil {
		fmt.Fprintf(&b, "V = %s\n", m.V)
	}
	if m.AtGiven {
		parts := make([]string, len(m.States))
		for i, s := range m.States {
			parts[i] = s + " = " + m.At[i].String()
		}
		fmt.Fprintf(&b, "at %s\n", strings.Join(parts, ", "))
	}
	return b.String()
}

// Residual returns f(at) for continuous time, f(at) − at for discrete time:
// what must vanish at an equilibrium, one rational function of the
// parameters per state.
func (m *Model) Residual() []poly.RatFunc {
	n := len(m.States)
	has := make([]bool, m.Ring.NumVars())
	for i := 0; i < n; i++ {
		has[i] = true
	}
	sub := make([]poly.RatFunc, m.Ring.NumVars())
	copy(sub, m.At)
	out := make([]poly.RatFunc, n)
	for i, f := range m.F {
		out[i] = f.ComposeStates(sub, has)
		if m.Discrete {
			out[i] = out[i].Sub(m.At[i])
		}
	}
	return out
}

// AtPoint returns the equilibrium (the "at" point, or the origin) as
// rationals, for a model whose parameters are all fixed: its coordinates are
// then constants, evaluated exactly.
func (m *Model) AtPoint() ([]*big.Rat, error) {
	zero := make([]*big.Rat, m.Ring.NumVars())
	for i := range zero {
		zero[i] = new(big.Rat)
	}
	pt := make([]*big.Rat, len(m.States))
	for i := range pt {
		v, err := m.At[i].Eval(zero)
		if err != nil {
			return nil, fmt.Errorf("coordinate %s of the equilibrium: %w", m.States[i], err)
		}
		pt[i] = v
	}
	return pt, nil
}

// ConstantAt returns the equilibrium as rationals, for a model whose
// equilibrium is the same for every parameter value.
func (m *Model) ConstantAt() ([]*big.Rat, error) {
	for i, a := range m.At {
		if !a.IsPoly() || !a.Num.IsConst() {
			return nil, fmt.Errorf("the equilibrium's %s = %s depends on the parameters", m.States[i], a)
		}
	}
	return m.AtPoint()
}

// CheckEquilibrium returns an error unless the equilibrium makes every
// residual vanish identically in the parameters (exact). When the residuals
// involve one parameter only, the error says for which allowed values of it
// the point is an equilibrium (the real roots common to all residuals).
func (m *Model) CheckEquilibrium() error {
	var errs poly.ErrorList
	res := m.Residual()
	where := m.equilibriumValues(res)
	for i, r := range res {
		if !r.IsZero() {
			what := m.States[i] + "'"
			if m.Discrete {
				what = m.States[i] + "+ - " + m.States[i]
			}
			pos := m.AtPos
			if !m.AtGiven {
				pos = m.FPos[i]
			}
			errs.Add(pos, "not an equilibrium: at this point %s = %s, not 0 for every allowed parameter value%s", what, r, where)
		}
	}
	return errs.Err()
}

// equilibriumValues describes where all residuals vanish when they involve
// a single parameter: ""  when they involve none or several.
func (m *Model) equilibriumValues(res []poly.RatFunc) string {
	param := -1
	var g poly.Univariate
	first := true
	for _, r := range res {
		if r.IsZero() {
			continue
		}
		vars := r.Num.VarsUsed()
		if len(vars) != 1 || (param >= 0 && vars[0] != param) {
			return ""
		}
		param = vars[0]
		u, _ := r.Num.Univariate(param)
		if first {
			g, first = u, false
		} else {
			g = poly.UnivariateGCD(g, u)
		}
	}
	if param < 0 {
		return ""
	}
	name := m.Ring.Name(param)
	p, _ := m.Param(name)
	var vals []string
	if g.Degree() >= 1 {
		for _, root := range g.IsolateRoots() {
			if root.Exact != nil {
				if p.Range.Contains(root.Exact) {
					vals = append(vals, root.Exact.RatString())
				}
				continue
			}
			lo, hi := p.Range.Lo, p.Range.Hi
			if (lo.Inf == 0 && root.CompareRat(lo.Value) <= 0) || (hi.Inf == 0 && root.CompareRat(hi.Value) >= 0) {
				continue
			}
			vals = append(vals, "≈"+root.Decimal(15)+" (a root of "+poly.FromUnivariate(m.Ring, param, g).String()+")")
		}
	}
	if len(vals) == 0 {
		return fmt.Sprintf("; it is an equilibrium for no allowed %s", name)
	}
	return fmt.Sprintf("; it is an equilibrium only for %s = %s", name, strings.Join(vals, ", "))
}
