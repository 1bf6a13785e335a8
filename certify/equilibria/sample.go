package equilibria

import (
	"context"
	"fmt"
	"math/big"

	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// DefaultSamplePoints is the grid size of Sample when none is given.
const DefaultSamplePoints = 41

// sampleWindow is the width sampled on an unbounded side of a parameter's
// range.
const sampleWindow = 10

// SampleOptions tune Sample.
type SampleOptions struct {
	// Points is the number of grid points (DefaultSamplePoints when ≤ 0;
	// at least 2).
	Points int
	// Q is the diagonal of Q in the Lyapunov equation; nil for I.
	Q []*big.Rat
}

// Sampling is the equilibria of a model with one free parameter at the
// points of a grid over its range: at each point the equilibria are found
// and each is certified from its linearization as at fixed parameters, so
// every point's list, class and verdict is what find says there. Between
// the grid points nothing is known: a branch, a bifurcation or a change of
// stability can lie between two of them.
type Sampling struct {
	Param string
	// Lo and Hi are the ends of the grid; Window says why they are not the
	// range's own ends ("" when they are).
	Lo, Hi *big.Rat
	Window string
	Points []SamplePoint
}

// SamplePoint is the outcome at one grid value.
type SamplePoint struct {
	Value *big.Rat
	// Result holds the equilibria found and one linearization
	// certification per equilibrium (Certs[i] for Equilibria[i]); nil when
	// Err is set.
	Result *FindResult
	// Err says why the point was not analysed (a denominator of the model
	// vanishes there, or the search failed).
	Err string
}

// Stability words of a sampled equilibrium, from its certification's
// verdict at that grid point.
const (
	SampleStable       = "stable"
	SampleUnstable     = "unstable"
	SampleUndetermined = "undetermined"
)

// SampleStability is the stability of equilibrium i at a grid point:
// stable or unstable when a linearization certificate, re-checked by the
// checker, shows it; undetermined otherwise.
func (p *SamplePoint) SampleStability(i int) string {
	if p.Result == nil || i >= len(p.Result.Certs) || p.Result.Certs[i] == nil {
		return SampleUndetermined
	}
	switch p.Result.Certs[i].Verdict {
	case checker.VerdictHolds:
		return SampleStable
	case checker.VerdictFails:
		return SampleUnstable
	}
	return SampleUndetermined
}

// Sample analyses a model with exactly one free parameter on a grid of
// opts.Points rational values spread evenly over the parameter's range
// (inside it: an open end is not sampled; an unbounded side is cut to a
// window of width 10 from the finite end, or [−10, 10] for the whole line,
// said in Window). It is the fallback where the branches have no closed
// form: each point is exact, the picture between them is not.
func Sample(ctx context.Context, m *model.Model, opts SampleOptions) (*Sampling, error) {
	free := m.FreeParams()
	if len(free) != 1 {
		return nil, fmt.Errorf("sampling needs exactly one free parameter, and the model has %d", len(free))
	}
	n := opts.Points
	if n <= 0 {
		n = DefaultSamplePoints
	}
	if n < 2 {
		return nil, fmt.Errorf("sampling needs at least 2 points, not %d", n)
	}
	p := free[0]
	s := &Sampling{Param: p.Name}
	lo, hi, window := gridEnds(p.Range)
	s.Lo, s.Hi, s.Window = lo, hi, window
	// An open end is left out: the grid is the n points strictly inside,
	// spaced as if that end were one more grid point.
	a, b := int64(0), int64(0)
	if p.Range.Lo.Inf == 0 && p.Range.Lo.Open && window == "" {
		a = 1
	}
	if p.Range.Hi.Inf == 0 && p.Range.Hi.Open && window == "" {
		b = 1
	}
	steps := big.NewRat(int64(n)-1+a+b, 1)
	width := new(big.Rat).Sub(hi, lo)
	if lo.Cmp(hi) == 0 {
		n = 1
	}
	for k := range n {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		v := new(big.Rat).Mul(width, big.NewRat(int64(k)+a, 1))
		if steps.Sign() != 0 {
			v.Quo(v, steps)
		}
		v.Add(v, lo)
		s.Points = append(s.Points, samplePoint(ctx, m, p.Name, v, opts))
	}
	return s, nil
}

// gridEnds chooses the grid's ends in a range: its own finite ends, or a
// window where it is unbounded.
func gridEnds(r poly.Interval) (lo, hi *big.Rat, window string) {
	switch {
	case r.Lo.Inf == 0 && r.Hi.Inf == 0:
		return new(big.Rat).Set(r.Lo.Value), new(big.Rat).Set(r.Hi.Value), ""
	case r.Lo.Inf == 0:
		lo = new(big.Rat).Set(r.Lo.Value)
		hi = new(big.Rat).Add(lo, big.NewRat(sampleWindow, 1))
		return lo, hi, fmt.Sprintf("the range is unbounded above; the grid covers [%s, %s] (bound the parameter in the model, e.g. \"in [a, b]\", to sample elsewhere)", lo.RatString(), hi.RatString())
	case r.Hi.Inf == 0:
		hi = new(big.Rat).Set(r.Hi.Value)
		lo = new(big.Rat).Sub(hi, big.NewRat(sampleWindow, 1))
		return lo, hi, fmt.Sprintf("the range is unbounded below; the grid covers [%s, %s] (bound the parameter in the model, e.g. \"in [a, b]\", to sample elsewhere)", lo.RatString(), hi.RatString())
	}
	lo, hi = big.NewRat(-sampleWindow, 1), big.NewRat(sampleWindow, 1)
	return lo, hi, fmt.Sprintf("the range is the whole line; the grid covers [%s, %s] (bound the parameter in the model, e.g. \"in [a, b]\", to sample elsewhere)", lo.RatString(), hi.RatString())
}

// samplePoint finds the equilibria at one grid value and certifies each
// from its linearization (no full check: the grid asks for stability, and
// the linearization decides it at hyperbolic equilibria).
func samplePoint(ctx context.Context, base *model.Model, name string, v *big.Rat, opts SampleOptions) SamplePoint {
	sp := SamplePoint{Value: v}
	m, err := model.FixParams(base, []model.Setting{{Name: name, Value: v}})
	if err != nil {
		sp.Err = err.Error()
		return sp
	}
	search, err := FindEquilibria(m)
	if err != nil {
		sp.Err = err.Error()
		return sp
	}
	res := &FindResult{Model: m, Search: search, Target: -1, Certs: make([]*Certification, len(search.Equilibria))}
	co := CertifyOptions{Q: opts.Q}
	for i := range search.Equilibria {
		c, err := CertifyEquilibrium(ctx, m, &search.Equilibria[i], co)
		if err != nil {
			sp.Err = err.Error()
			return sp
		}
		res.Certs[i] = c
	}
	sp.Result = res
	return sp
}
