package branches

import (
	"context"
	"errors"
	"fmt"
	"math/big"
	"slices"

	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// Options bound the work of Analyze.
type Options struct {
	// MaxTerms bounds the terms of any eliminant (default 5000).
	MaxTerms int
	// MaxSplits bounds the case splits of the decomposition (default 64).
	MaxSplits int
	// MaxStates bounds the states for which P(p) is solved (default 4;
	// the system has n(n+1)/2 unknowns).
	MaxStates int
	// Param names the parameter to classify along; the only free one by
	// default. Classification along it needs every other parameter fixed.
	Param string

	// Two or more free parameters: the map over their box (Map). Box
	// replaces a parameter's allowed range by [lo, hi] ∩ range; every
	// free parameter needs a bounded range or a Box. Resolution bounds the
	// bisection (default DefaultResolution), MaxBoxes the boxes examined
	// (default DefaultMapBoxes).
	Box        map[string][2]*big.Rat
	Resolution *big.Rat
	MaxBoxes   int

	// For the analysis at a degenerate value (Degeneracy): no
	// classification, no further degeneracies.
	noClassify, noDegenerate bool
}

func (o Options) withDefaults() Options {
	if o.MaxTerms <= 0 {
		o.MaxTerms = 5000
	}
	if o.MaxSplits <= 0 {
		o.MaxSplits = 64
	}
	if o.MaxStates <= 0 {
		o.MaxStates = 4
	}
	return o
}

// Analysis is the result of Analyze.
type Analysis struct {
	Ring     *poly.Ring
	Discrete bool
	// ClosedForm is false when elimination found no closed form within the
	// limits; Reason says why, and Branches is then empty: the caller
	// samples instead.
	ClosedForm bool
	Reason     string
	Branches   []*Branch
	Notes      []string

	// One free parameter (or none): the partition of its range.
	Param        string // "" when there is no free parameter
	Range        poly.Interval
	Pieces       []Segment
	Bifurcations []Bifurcation

	// Two or more free parameters: the labelled bisection of their box;
	// nil when a parameter has no bounded range (a note says which).
	Map *Map

	// Degenerate lists where a condition c(p) ≠ 0 of the branches fails
	// within the parameters' ranges, with the equilibria there; also where
	// a parameter polynomial that the elimination met as an equation
	// vanishes (a further branch may exist only there).
	Degenerate []Degeneracy
	further    []*poly.Poly
}

// Branch is one equilibrium branch: x = Coords(p) where the parameters p
// satisfy W ≥ 0 (when W is set) and Nonzero[i](p) ≠ 0 for every i.
type Branch struct {
	Coords  []Surd
	W       *poly.RatFunc
	Pair    int // the index of the branch with the other sign of √W; −1
	Nonzero []*poly.Poly
	// Free lists the states left free: a non-isolated set of equilibria
	// (a curve or more), with Coords in terms of them. Such a branch has
	// no linear analysis below.
	Free []int

	Jacobian Matrix
	CharPoly []Surd // c₀ … cₙ of det(λI − J), cₙ = 1
	// Two states: trace τ, determinant Δ, discriminant τ² − 4Δ.
	Trace, Det, Disc *Surd
	// Hurwitz determinants of the characteristic polynomial (continuous
	// time) or of its bilinear transform (maps; then Lead is that
	// transform's leading coefficient (−1)ⁿ·p(−1)).
	Hurwitz []Surd
	Lead    *Surd
	// Stable lists quantities whose joint positivity is equivalent to
	// every eigenvalue in the open left half-plane (unit disc for maps).
	Stable []Surd
	// Quadratic is P(p) with AᵀP + PA = −I (AᵀPA − P = −I for maps).
	Quadratic *Quadratic
}

// Isolated reports a branch of isolated equilibria.
func (b *Branch) Isolated() bool { return len(b.Free) == 0 }

// Quadratic is a symbolic quadratic certificate V = ξᵀPξ, ξ = x − x*(p).
type Quadratic struct {
	P Matrix
	// SystemDet must not vanish (the Lyapunov equation is then uniquely
	// solvable); P ≻ 0 iff every leading minor is positive (Sylvester).
	SystemDet Surd
	Minors    []Surd
	// Region: for one free parameter, the spans where P exists and is
	// positive definite.
	Region []poly.Span
	Note   string
}

// Analyze computes the equilibrium branches of m in closed form and their
// linear stability as exact functions of the free parameters; see the
// package documentation for the mathematics.
func Analyze(ctx context.Context, m *model.Model, opts Options) (*Analysis, error) {
	opts = opts.withDefaults()
	r := m.Ring
	n := len(m.States)
	an := &Analysis{Ring: r, Discrete: m.Discrete, ClosedForm: true}
	g := make([]*poly.Poly, n)
	var conds []*poly.Poly
	for i, f := range m.F {
		// The denominators of F are in the parameters only and must not
		// vanish: F = 0 iff its numerator is.
		num := f.Num.Clone()
		for _, d := range f.Den {
			conds = appendCond(conds, d.P)
		}
		if m.Discrete {
			num.Sub(num, new(poly.Poly).Mul(poly.Var(r, i), f.DenPoly()))
		}
		g[i] = num
	}
	s := &solver{ctx: ctx, ring: r, n: n, lim: opts}
	if err := s.solve(g, nil, conds); err != nil {
		if errors.Is(err, errNoClosedForm) {
			an.ClosedForm = false
			an.Reason = err.Error()
			return an, nil
		}
		return nil, err
	}
	an.Notes = s.notes
	an.further = s.further
	for _, rb := range s.out {
		b, err := backSubstitute(rb, n, r)
		if err != nil {
			return nil, err
		}
		// Check: the branch solves the equilibrium equations exactly.
		vals := map[int]Surd{}
		for i, c := range b.Coords {
			if !slices.Contains(b.Free, i) {
				vals[i] = c
			}
		}
		for i, gi := range g {
			if !evalAt(poly.FromPoly(gi), n, vals).IsZero() {
				return nil, fmt.Errorf("branch %v fails equation %d", b.Coords, i+1)
			}
		}
		if dup := slices.IndexFunc(an.Branches, func(c *Branch) bool { return sameBranch(b, c) }); dup >= 0 {
			continue
		}
		b.Pair = -1
		if rb.pair && !rb.plus && len(an.Branches) > 0 {
			last := an.Branches[len(an.Branches)-1]
			if last.W != nil && last.W == b.W {
				last.Pair, b.Pair = len(an.Branches), len(an.Branches)-1
			}
		}
		an.Branches = append(an.Branches, b)
	}
	an.Branches = dropContained(an.Branches, n)
	for _, b := range an.Branches {
		if !b.Isolated() {
			continue
		}
		if err := linearize(ctx, m, b, opts); err != nil {
			return nil, err
		}
	}
	if !opts.noDegenerate {
		if err := degeneracies(ctx, m, an, opts); err != nil {
			return nil, err
		}
	}
	if opts.noClassify {
		return an, nil
	}
	if err := classify(ctx, m, an, opts); err != nil {
		return nil, err
	}
	return an, nil
}

func sameBranch(a, b *Branch) bool {
	if len(a.Free) != len(b.Free) {
		return false
	}
	for i := range a.Coords {
		if (a.Coords[i].W == nil) != (b.Coords[i].W == nil) && !(a.Coords[i].IsRational() && b.Coords[i].IsRational()) {
			return false
		}
		if a.Coords[i].IsRational() && b.Coords[i].IsRational() {
			if !a.Coords[i].A.Equal(b.Coords[i].A) {
				return false
			}
			continue
		}
		if a.W == nil || b.W == nil || !a.W.Equal(*b.W) || !a.Coords[i].A.Equal(b.Coords[i].A) || !a.Coords[i].B.Equal(b.Coords[i].B) {
			return false
		}
	}
	return true
}

// backSubstitute evaluates the eliminated states, last eliminated first.
func backSubstitute(rb rawBranch, n int, r *poly.Ring) (*Branch, error) {
	b := &Branch{Nonzero: rb.nonzero, Free: rb.free}
	vals := map[int]Surd{}
	if rb.last >= 0 {
		vals[rb.last] = rb.value
		b.W = rb.value.W
	}
	for i := len(rb.steps) - 1; i >= 0; i-- {
		st := rb.steps[i]
		vals[st.V] = evalAt(st.Expr, n, vals)
	}
	b.Coords = make([]Surd, n)
	for i := range n {
		v, ok := vals[i]
		if !ok {
			if !slices.Contains(rb.free, i) {
				return nil, fmt.Errorf("state %d left unsolved", i)
			}
			v = Rational(poly.FromPoly(poly.Var(r, i)))
		}
		v.W = b.W
		if v.B.Ring() == nil || v.B.Num == nil {
			v.B = zeroRF(r)
		}
		b.Coords[i] = v
	}
	return b, nil
}

// linearize fills in the Jacobian and the stability quantities.
func linearize(ctx context.Context, m *model.Model, b *Branch, opts Options) error {
	n := len(m.States)
	vals := map[int]Surd{}
	for i, c := range b.Coords {
		vals[i] = c
	}
	b.Jacobian = make(Matrix, n)
	for i, f := range m.F {
		b.Jacobian[i] = make([]Surd, n)
		for j := range n {
			e := evalAt(f.Derivative(j), n, vals)
			e.W = b.W
			b.Jacobian[i][j] = e
		}
	}
	var err error
	if b.CharPoly, err = CharPoly(ctx, b.Jacobian); err != nil {
		return err
	}
	c := b.CharPoly
	if n == 2 {
		tr, det := c[1].Neg(), c[0]
		disc := tr.Mul(tr).Sub(det.Mul(intSurd(m.Ring, 4)))
		b.Trace, b.Det, b.Disc = &tr, &det, &disc
	}
	if m.Discrete {
		q := Bilinear(c)
		lead := q[n]
		b.Lead = &lead
		if b.Hurwitz, err = Hurwitz(ctx, q); err != nil {
			return err
		}
		b.Stable = append([]Surd{lead}, b.Hurwitz...)
	} else {
		if b.Hurwitz, err = Hurwitz(ctx, c); err != nil {
			return err
		}
		b.Stable = slices.Clone(b.Hurwitz)
	}
	if n <= opts.MaxStates {
		p, det, err := Lyapunov(ctx, b.Jacobian, m.Discrete)
		switch {
		case err == nil:
			minors, err := LeadingMinors(ctx, p)
			if err != nil {
				return err
			}
			b.Quadratic = &Quadratic{P: p, SystemDet: det, Minors: minors}
		case ctx.Err() != nil:
			return ctx.Err()
		default:
			b.Quadratic = &Quadratic{SystemDet: det, Note: "the Lyapunov equation is singular for every parameter value"}
		}
	}
	return nil
}

// dropContained removes the isolated branches that lie on a non-isolated
// one for all parameters (the case splits meet there), renumbering pairs.
func dropContained(bs []*Branch, n int) []*Branch {
	var keep []*Branch
	newIndex := make([]int, len(bs))
	for i, b := range bs {
		newIndex[i] = -1
		inside := false
		for _, c := range bs {
			if b.Isolated() && !c.Isolated() && b.W == nil && onSet(b, c, n) {
				inside = true
				break
			}
		}
		if !inside {
			newIndex[i] = len(keep)
			keep = append(keep, b)
		}
	}
	for _, b := range keep {
		if b.Pair >= 0 {
			b.Pair = newIndex[b.Pair]
		}
	}
	return keep
}

// onSet reports that the rational point b lies on the parametrised set c.
func onSet(b, c *Branch, n int) bool {
	vals := map[int]Surd{}
	for _, f := range c.Free {
		vals[f] = b.Coords[f]
	}
	for i := range n {
		if !evalAt(c.Coords[i].A, n, vals).Equal(b.Coords[i]) {
			return false
		}
	}
	return true
}
