package direct

import (
	"context"
	"errors"
	"fmt"
	"maps"
	"math/big"
	"slices"
	"strings"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/certify/pave"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// PaveOptions control how CheckPaving paves a region in several parameters.
// The zero value paves the model's own ranges at DefaultResolution.
type PaveOptions struct {
	// Box overrides the allowed range of parameters for the paving: name →
	// [lo, hi], closed, clipped to the parameter's allowed range (whose
	// open ends stay open). A parameter named here is paved even when the
	// conditions do not involve it.
	Box map[string][2]*big.Rat
	// Resolution: boxes are halved until every side is at most Resolution
	// times the corresponding side of the box (rounded down to a power of
	// two). Nil means DefaultResolution.
	Resolution *big.Rat
	// Workers, Progress and MaxBoxes are passed to pave.PaveRegion.
	Workers  int
	Progress pave.Progress
	MaxBoxes int
	// Plan, if not nil, is told the paved parameters (in the order of the
	// certificate's paving) once they are known and before the paving
	// starts; an error from it stops the check before the costly part,
	// wrapped in ErrPaveOptions. The command line uses it to refuse a plot
	// that cannot be drawn without paving first.
	Plan func(params []string) error
}

// DefaultResolution is the default finest box side, relative to each side of
// the box.
var DefaultResolution = big.NewRat(1, 256)

// ErrPaveOptions wraps errors in PaveOptions (a usage error).
var ErrPaveOptions = errors.New("bad paving option")

// CheckPaving is Check with a context and paving options: when the
// conditions that remain involve two or more parameters (or Box names more
// parameters), and every one of them has a bounded range or a Box, the
// region is paved (set inversion, pave.PaveRegion), its inside boxes are
// re-checked exactly by checker.Verify, and when every condition
// involves at most one parameter the region is also given in closed form as
// a product of one-parameter regions. A parameter without a bounded range
// leaves the exact conditions and witness points, with Result.PavingNote
// saying why no paving was done.
//
// It returns an error wrapping ErrPaveOptions for a Box entry that is not a
// free parameter, is empty or misses the allowed range, or a resolution
// that is not in [2^-50, ∞); the paving's own errors (cancellation,
// pave.ErrTooManyBoxes) are returned as they are.
func CheckPaving(ctx context.Context, m *model.Model, source string, opts PaveOptions) (*Result, error) {
	if opts.Resolution == nil {
		opts.Resolution = DefaultResolution
	}
	if _, err := pave.Level(opts.Resolution); err != nil {
		return nil, fmt.Errorf("%w: --resolution: %w", ErrPaveOptions, err)
	}
	for _, name := range slices.Sorted(maps.Keys(opts.Box)) {
		if _, err := boxSide(m, name, opts.Box[name]); err != nil {
			return nil, fmt.Errorf("%w: --box %s: %w", ErrPaveOptions, name, err)
		}
	}
	return runCheck(ctx, m, source, opts)
}

// boxSide returns the side of the paving for a parameter with a --box
// [lo, hi]: its intersection with the allowed range, an end of the range
// keeping its openness.
func boxSide(m *model.Model, name string, b [2]*big.Rat) (poly.Interval, error) {
	p, ok := m.Param(name)
	if !ok {
		return poly.Interval{}, fmt.Errorf("the model has no parameter %s", name)
	}
	if p.Fixed != nil {
		return poly.Interval{}, fmt.Errorf("%s is fixed to %s", name, p.Fixed.RatString())
	}
	lo, hi := b[0], b[1]
	if lo.Cmp(hi) >= 0 {
		return poly.Interval{}, fmt.Errorf("the box %s:%s is empty or a point; give lo < hi", lo.RatString(), hi.RatString())
	}
	r := p.Range
	side := poly.Interval{Lo: poly.Bound{Value: lo}, Hi: poly.Bound{Value: hi}}
	if r.Lo.Inf == 0 && lo.Cmp(r.Lo.Value) <= 0 {
		side.Lo = poly.Bound{Value: r.Lo.Value, Open: r.Lo.Open}
	}
	if r.Hi.Inf == 0 && hi.Cmp(r.Hi.Value) >= 0 {
		side.Hi = poly.Bound{Value: r.Hi.Value, Open: r.Hi.Open}
	}
	if side.Lo.Value.Cmp(side.Hi.Value) >= 0 {
		return poly.Interval{}, fmt.Errorf("the box %s:%s does not meet the allowed range %s", lo.RatString(), hi.RatString(), r)
	}
	return side, nil
}

// wantsPaving reports whether the region is to be paved: two or more
// parameters among those the conditions involve and those given a box.
func (res *Result) wantsPaving(vars []int, opts PaveOptions) bool {
	return len(res.pavedVars(vars, opts)) >= 2
}

func (res *Result) pavedVars(vars []int, opts PaveOptions) []int {
	set := slices.Clone(vars)
	for name := range opts.Box {
		if i, ok := res.Model.Ring.Index(name); ok && !slices.Contains(set, i) {
			set = append(set, i)
		}
	}
	slices.Sort(set)
	return set
}

// paveRegion paves the box of the parameters and sets the region, the
// witnesses and the verdict; without a bounded box it falls back to the
// one-parameter region or the witnesses.
func (res *Result) paveRegion(ctx context.Context, vars []int, opts PaveOptions) error {
	m := res.Model
	r := m.Ring
	paved := res.pavedVars(vars, opts)
	var box []pave.Side
	var unbounded []string
	for _, v := range paved {
		name := r.Name(v)
		p, _ := m.Param(name)
		side := p.Range
		if b, ok := opts.Box[name]; ok {
			side, _ = boxSide(m, name, b) // checked by CheckPaving
		} else if side.Lo.Inf != 0 || side.Hi.Inf != 0 {
			unbounded = append(unbounded, fmt.Sprintf("%s has the unbounded range %s", name, side))
			continue
		}
		box = append(box, pave.Side{Var: v, Range: side})
	}
	if len(unbounded) > 0 {
		res.PavingNote = fmt.Sprintf("no paving: %s; give --box NAME=LO..HI for it", strings.Join(unbounded, ", "))
		res.Notes = append(res.Notes, res.PavingNote)
		if len(vars) == 1 {
			res.regionFor(r.Name(vars[0]))
		} else {
			res.witnesses(vars)
		}
		res.Reason += "; " + res.PavingNote
		return nil
	}
	level, _ := pave.Level(opts.Resolution)
	var conds []*poly.Poly
	for _, c := range res.Conds {
		conds = append(conds, c.Q)
	}
	if opts.Plan != nil {
		var names []string
		for _, s := range box {
			names = append(names, r.Name(s.Var))
		}
		if err := opts.Plan(names); err != nil {
			return fmt.Errorf("%w: %w", ErrPaveOptions, err)
		}
	}
	pv, err := pave.PaveRegion(ctx, conds, box, level, pave.Options{Workers: opts.Workers, Progress: opts.Progress, MaxBoxes: opts.MaxBoxes})
	if err != nil {
		return err
	}
	res.Paving = pv
	doc := &claims.Paving{
		Resolution: new(big.Rat).SetFrac(big.NewInt(1), new(big.Int).Lsh(big.NewInt(1), uint(level))).RatString(),
		Tree:       pv.Tree,
	}
	for _, s := range box {
		doc.Params = append(doc.Params, r.Name(s.Var))
		doc.Box = append(doc.Box, claims.Interval{
			Lo: s.Range.Lo.Value.RatString(), Hi: s.Range.Hi.Value.RatString(),
			LoClosed: !s.Range.Lo.Open, HiClosed: !s.Range.Hi.Open,
		})
	}
	sum, err := certificates.Summarize(doc)
	if err != nil {
		return fmt.Errorf("internal error: the paving tree is malformed: %w", err)
	}
	res.Region = &Region{Paving: doc}

	// The product form, when every condition involves at most one parameter.
	separable := true
	for _, c := range res.Conds {
		separable = separable && len(c.Q.VarsUsed()) <= 1
	}
	productAll, productEmpty, productFails := true, false, false
	if separable {
		for _, s := range box {
			var us []poly.Univariate
			for _, c := range res.Conds {
				if u, ok := c.Q.Univariate(s.Var); ok {
					us = append(us, u)
				}
			}
			pieces := OneParamRegion(r, s.Var, us, s.Range)
			doc.Product = append(doc.Product, claims.SturmRegion{Param: r.Name(s.Var), Intervals: Intervals(pieces), Pieces: pieces})
			holds, fails := false, false
			for _, pc := range pieces {
				holds = holds || pc.Holds
				fails = fails || !pc.Holds
			}
			productAll = productAll && !fails
			productEmpty = productEmpty || !holds
			productFails = productFails || fails
		}
	}

	// Witness points, and a failing one from the paving or the product when
	// the grid has none.
	verdict, reason := res.Verdict, res.Reason
	res.witnesses(vars)
	res.Verdict, res.Reason = verdict, reason
	wHolds, wFails := false, false
	for _, w := range res.Witnesses {
		wHolds = wHolds || w.Holds
		wFails = wFails || !w.Holds
	}
	if !wFails {
		if w, ok := res.failingWitness(vars, box); ok {
			res.Witnesses = append(res.Witnesses, w)
			wFails = true
		}
	}

	cover := true
	for _, s := range box {
		if slices.Contains(vars, s.Var) {
			p, _ := m.Param(r.Name(s.Var))
			cover = cover && sameRange(s.Range, p.Range)
		}
	}
	holdsSomewhere := sum.Inside > 0 || wHolds || (separable && !productEmpty)
	failsSomewhere := sum.Outside > 0 || wFails || (separable && productFails)
	names := strings.Join(doc.Params, ", ")
	summary := fmt.Sprintf("paving of (%s) at resolution %s: %d inside, %d outside, %d undecided boxes",
		names, doc.Resolution, sum.Inside, sum.Outside, sum.Undecided)
	switch {
	case cover && separable && productAll, cover && !separable && sum.Outside == 0 && sum.Undecided == 0:
		res.Verdict = checker.VerdictHolds
		res.Reason = fmt.Sprintf("the conditions hold for every allowed value of %s (%s)", names, summary)
	case cover && separable && productEmpty, cover && !separable && sum.Inside == 0 && sum.Undecided == 0:
		res.Verdict = checker.VerdictFails
		res.Reason = fmt.Sprintf("the conditions fail for every allowed value of %s (%s)", names, summary)
	case holdsSomewhere && failsSomewhere:
		res.Verdict = checker.VerdictOnRegion
		res.Reason = fmt.Sprintf("the conditions hold on part of the box and fail on another part (%s)", summary)
	default:
		res.Verdict = checker.VerdictUndecided
		res.Reason = fmt.Sprintf("the paving proves neither where the conditions hold and fail across the allowed range (%s)", summary)
	}
	if !cover {
		res.Notes = append(res.Notes, "the paved box is smaller than the allowed range; outside it nothing is proven by the paving")
	}
	return nil
}

// sameRange reports that a bounded side equals the range r.
func sameRange(side, r poly.Interval) bool {
	return r.Lo.Inf == 0 && r.Hi.Inf == 0 &&
		side.Lo.Value.Cmp(r.Lo.Value) == 0 && side.Lo.Open == r.Lo.Open &&
		side.Hi.Value.Cmp(r.Hi.Value) == 0 && side.Hi.Open == r.Hi.Open
}

// failingWitness returns a point where some condition fails: the centre of
// the first outside box of the paving, or a point of a failing piece of the
// product form, with the parameters the conditions involve.
func (res *Result) failingWitness(vars []int, box []pave.Side) (claims.Witness, bool) {
	r := res.Model.Ring
	try := func(point map[int]*big.Rat) (claims.Witness, bool) {
		vals := map[int]*big.Rat{}
		w := claims.Witness{Params: map[string]string{}, Values: []string{}}
		for _, v := range vars {
			vals[v] = point[v]
			w.Params[r.Name(v)] = point[v].RatString()
		}
		all := true
		for _, c := range res.Conds {
			x := new(poly.Poly).EvalVars(c.Q, vals).ConstTerm()
			w.Values = append(w.Values, x.RatString())
			all = all && x.Sign() > 0
		}
		w.Holds = all
		return w, !all
	}
	centre := map[int]*big.Rat{}
	for _, s := range box {
		centre[s.Var] = s.Range.Mid()
	}
	if leaves, err := certificates.Leaves(res.Region.Paving); err == nil {
		for _, lf := range leaves {
			if lf.Class != claims.PaveOutside {
				continue
			}
			point := map[int]*big.Rat{}
			for i, s := range box {
				m := new(big.Rat).Add(lf.Lo[i], lf.Hi[i])
				point[s.Var] = m.Quo(m, big.NewRat(2, 1))
			}
			if w, ok := try(point); ok {
				return w, true
			}
			break
		}
	}
	for k, f := range res.Region.Paving.Product {
		for _, pc := range f.Pieces {
			isPoint := pc.Lo == pc.Hi && pc.LoPoly == pc.HiPoly && pc.LoClosed && pc.HiClosed
			if pc.Holds || (isPoint && pc.LoPoly != "") {
				continue
			}
			point := maps.Clone(centre)
			point[box[k].Var] = samplePoint(pc.Interval)
			if w, ok := try(point); ok {
				return w, true
			}
		}
	}
	return claims.Witness{}, false
}
