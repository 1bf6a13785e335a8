package model

import (
	"fmt"
	"math/big"
	"slices"

	"github.com/lyacert/lyacert/poly"
)

// FixParams returns base with the named free parameters fixed to the given
// values, as Parse with the same settings would return it: the fixed
// parameters become Fixed with a point Range, and leave the ring, whose
// remaining variables keep their order. It saves a sweep from parsing the
// model text at every grid point. Every value must lie in its parameter's
// range (CheckSweep); a denominator that vanishes at the values is an error.
func FixParams(base *Model, settings []Setting) (*Model, error) {
	m := *base
	m.Params = slices.Clone(base.Params)
	vals := map[int]*big.Rat{}
	for _, s := range settings {
		j := slices.IndexFunc(m.Params, func(p Param) bool { return p.Name == s.Name })
		if j < 0 || m.Params[j].Fixed != nil {
			return nil, fmt.Errorf("parameter %s is not a free parameter of the model", s.Name)
		}
		i, ok := base.Ring.Index(s.Name)
		if !ok {
			return nil, fmt.Errorf("parameter %s is not in the model's ring", s.Name)
		}
		v := new(big.Rat).Set(s.Value)
		m.Params[j].Fixed = v
		m.Params[j].Range = poly.Point(v)
		vals[i] = v
	}
	var free []string
	for _, p := range m.Params {
		if p.Fixed == nil {
			free = append(free, p.Name)
		}
	}
	m.Ring = poly.NewRing(m.States, free)
	relabel := make([]int, base.Ring.NumVars())
	for i := range relabel {
		relabel[i] = -1
		if j, ok := m.Ring.Index(base.Ring.Name(i)); ok {
			relabel[i] = j
		}
	}
	move := func(f poly.RatFunc, what string) (poly.RatFunc, error) {
		g, err := f.EvalVars(vals)
		if err != nil {
			return poly.RatFunc{}, fmt.Errorf("%s: %w at these parameter values", what, err)
		}
		out := poly.FromPoly(g.Num.Relabel(m.Ring, relabel))
		for _, d := range g.Den {
			out.Den = append(out.Den, poly.DenFactor{P: d.P.Relabel(m.Ring, relabel), Mult: d.Mult})
		}
		return out, nil
	}
	var err error
	m.F = make([]poly.RatFunc, len(base.F))
	for i, f := range base.F {
		if m.F[i], err = move(f, m.States[i]+"'"); err != nil {
			return nil, err
		}
	}
	m.At = make([]poly.RatFunc, len(base.At))
	for i, a := range base.At {
		if m.At[i], err = move(a, "the equilibrium's "+m.States[i]); err != nil {
			return nil, err
		}
	}
	if base.V != nil {
		v, err := move(*base.V, "V")
		if err != nil {
			return nil, err
		}
		m.V = &v
	}
	return &m, nil
}
