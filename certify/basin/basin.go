package basin

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/big"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/certify"
	"github.com/lyacert/lyacert/certify/direct"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// Options bound the search; zero fields take the defaults.
type Options struct {
	// Gap is the relative gap (c_hi − c_lo)/c_hi at which the branch and
	// bound stops (default 0.01).
	Gap float64
	// MaxBoxes bounds the leaves of the bisection tree (default 300000).
	MaxBoxes int
	// MaxLevel bounds the halvings of every side (default 30, at most
	// claims.MaxPavingLevel − 1).
	MaxLevel int
}

// Result is an estimate of the region of attraction by sublevel sets of V.
type Result struct {
	Direct      *direct.Result // the direct method's analysis, whose claims the certificate carries
	Equilibrium []*big.Rat
	// Level is c_lo: the component of {V ≤ Level} around the equilibrium
	// lies in its region of attraction (certified).
	Level *big.Rat
	// Upper is c_hi = V(Counterexample), a rational point other than the
	// equilibrium with V̇ = CounterVdot ≥ 0; nil when the rays found none.
	Upper          *big.Rat
	Counterexample []*big.Rat
	CounterVdot    *big.Rat
	// Params names the free parameters, in the ring's order, and ParamBox
	// holds their ranges: Level is certified for every value in the box.
	// CounterParams is the parameter value at which the counterexample has
	// V̇ ≥ 0 (nil without free parameters or without c_hi).
	Params        []string
	ParamBox      []poly.Interval
	CounterParams []*big.Rat
	Claim         *claims.SublevelBasin
	Doc           *claims.Document
	Check         checker.Outcome
	// Boxes counts the tree's leaves: Inside where V̇ < 0 was proven,
	// Outside where V > Level; NearTests the boxes at the equilibrium on
	// which the quadratic bound was tried.
	Inside, Outside, NearTests int
	Method                     string
	// Note says why the gap was not closed, when it was not.
	Note string
}

// Gap returns (c_hi − c_lo)/c_hi, or NaN without c_hi.
func (r *Result) Gap() float64 {
	if r.Upper == nil {
		return math.NaN()
	}
	d := new(big.Rat).Sub(r.Upper, r.Level)
	d.Quo(d, r.Upper)
	f, _ := d.Float64()
	return f
}

// Find estimates the region of attraction of m's equilibrium by sublevel
// sets of m's V (see the package documentation) and returns the certified
// level with a certificate that checker.Verify has accepted.
func Find(ctx context.Context, m *model.Model, source string, o Options) (*Result, error) {
	if o.Gap <= 0 {
		o.Gap = 0.01
	}
	if o.MaxBoxes <= 0 {
		o.MaxBoxes = 300000
	}
	if o.MaxLevel <= 0 {
		o.MaxLevel = 30
	}
	o.MaxLevel = min(o.MaxLevel, claims.MaxPavingLevel-1)
	pos := poly.Pos{File: m.File, Line: 1, Col: 1}
	switch {
	case m.Discrete:
		return nil, &poly.Error{Pos: pos, Msg: "basin: the model is a map; sublevel basins are for continuous time (x' = ...)"}
	case len(m.FreeParams()) > maxParams:
		return nil, &poly.Error{Pos: pos, Msg: fmt.Sprintf("basin: at most %d free parameters (free: %s); fix the others with --set", maxParams, paramNames(m.FreeParams()))}
	case m.V == nil:
		return nil, &poly.Error{Pos: pos, Msg: "the model has no candidate V (add a line \"V = ...\")"}
	case !m.V.IsPoly():
		return nil, &poly.Error{Pos: m.VPos, Msg: "basin: V must be a polynomial"}
	}
	for i, f := range m.F {
		if !f.IsPoly() {
			return nil, &poly.Error{Pos: m.FPos[i], Msg: "basin: the right-hand sides must be polynomials"}
		}
	}
	for _, p := range m.FreeParams() {
		if !p.Range.Compact() {
			return nil, &poly.Error{Pos: p.Pos, Msg: fmt.Sprintf("basin: the range of %s must be closed and bounded, as in \"parameter %s in [1, 2]\" (it is %s)", p.Name, p.Name, p.Range)}
		}
	}
	d, err := direct.CheckPaving(ctx, m, source, direct.PaveOptions{})
	if err != nil {
		return nil, err
	}
	n := len(m.States)
	res := &Result{Direct: d}
	for i := range n {
		a, err := m.At[i].EvalVars(nil)
		if err != nil || !a.IsPoly() || !a.Num.IsConst() {
			return nil, errors.New("basin: the equilibrium is not a rational point the same for every parameter value")
		}
		res.Equilibrium = append(res.Equilibrium, a.Num.ConstTerm())
	}
	near := d.Shifted.Vdot.Neg().Num
	if _, _, ok := poly.QuadraticParts(near); !ok {
		return nil, &poly.Error{Pos: m.VPos, Msg: "basin: V̇ has a constant or linear part at the equilibrium"}
	}
	for _, p := range m.FreeParams() {
		res.Params = append(res.Params, p.Name)
		res.ParamBox = append(res.ParamBox, p.Range)
	}
	// c_hi: the least V found at a point with V̇ ≥ 0, made exact, over a
	// grid of parameter values (the level must hold at each of them).
	var at []float64
	for _, a := range res.Equilibrium {
		f, _ := a.Float64()
		at = append(at, f)
	}
	target, ext, err := upper(m, res, at)
	if err != nil {
		return nil, err
	}
	p := &paver{n: n, at: res.Equilibrium, atf: at, near: near}
	for i := range n {
		h := decimalUp(1.1*ext[i] + 1e-9)
		p.sides = append(p.sides, poly.Closed(new(big.Rat).Sub(res.Equilibrium[i], h), new(big.Rat).Add(res.Equilibrium[i], h)))
	}
	p.sides = append(p.sides, res.ParamBox...)
	root, least, err := p.run(ctx, d.V.Num, new(poly.Poly).Neg(d.Vdot.Num), target*(1-o.Gap), o.MaxLevel, o.MaxBoxes)
	if err != nil {
		return nil, err
	}
	if least == nil || least.Sign() <= 0 {
		return nil, fmt.Errorf("basin: no positive level certified within %d boxes and %d halvings per side (is the quadratic part of −V̇ positive definite at the equilibrium?)", o.MaxBoxes, o.MaxLevel)
	}
	res.Level = below(least)
	if lf, _ := res.Level.Float64(); lf < target*(1-o.Gap) && res.Note == "" {
		res.Note = fmt.Sprintf("the gap was not closed to %g: %d boxes, finest halving %d", o.Gap, p.boxes, o.MaxLevel)
	}
	tr, level, in, out := tree(root, n)
	res.Inside, res.Outside, res.NearTests = in, out, p.nearTry
	cl := &claims.SublevelBasin{Level: res.Level.RatString(), Resolution: new(big.Rat).SetFrac(big.NewInt(1), new(big.Int).Lsh(big.NewInt(1), uint(level))).RatString(), Tree: tr}
	for _, s := range p.sides[:n] {
		cl.Lo = append(cl.Lo, s.Lo.Value.RatString())
		cl.Hi = append(cl.Hi, s.Hi.Value.RatString())
	}
	res.Claim = cl
	res.Method = fmt.Sprintf("interval branch and bound: %d boxes (%d with V̇ < 0, %d with V > c_lo), exact centred forms, the quadratic bound tried on %d boxes at the equilibrium; c_hi by %s", in+out, in, out, p.nearTry, "rays, pattern search and an exact rational point")
	doc := *d.Doc
	doc.Claims = append(append([]claims.Claim(nil), d.Doc.Claims...), cl)
	doc.Signature = nil
	if err := certificates.Seal(&doc); err != nil {
		return nil, err
	}
	res.Doc = &doc
	res.Check = checker.VerifyContext(ctx, &doc)
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	if err := certify.Agrees(res.Check, d.Verdict, d.Claim); err != nil {
		return nil, err
	}
	if res.Check.Basin != cl.Level {
		return nil, fmt.Errorf("%w: the checker derives the level %q, the engine wrote %q", certify.ErrUnverified, res.Check.Basin, cl.Level)
	}
	return res, nil
}

// maxParams bounds the free parameters of a basin: the grid of c_hi has
// 5, 3 or 2 values per parameter, and the tree halves every parameter as
// often as every state.
const maxParams = 4

// upper finds c_hi (see the package documentation) at every value of a
// grid over the parameter box, keeping the least, and returns the level to
// aim at with the rays' extent of {V ≤ 1.05·target} over the grid, side by
// side. With free parameters the counterexample's parameter values go to
// res.CounterParams.
func upper(m *model.Model, res *Result, at []float64) (float64, []float64, error) {
	n := len(m.States)
	type sample struct {
		m    *model.Model
		vals []*big.Rat
		r    *rays
	}
	var samples []sample
	for _, vals := range grid(res.ParamBox) {
		mp := m
		if len(vals) > 0 {
			var set []model.Setting
			for i, name := range res.Params {
				set = append(set, model.Setting{Name: name, Value: vals[i]})
			}
			var err error
			if mp, err = model.FixParams(m, set); err != nil {
				return 0, nil, fmt.Errorf("basin: %w", err)
			}
		}
		v := mp.V.Num
		vdot := mp.Derivative(*mp.V).Num
		samples = append(samples, sample{mp, vals, &rays{v: certify.NewFloatPoly(v, n), vdot: certify.NewFloatPoly(vdot, n), at: at}})
		r := samples[len(samples)-1].r
		x, vx, ok := r.lowestRise(n)
		if !ok {
			continue
		}
		pt, ok := exactRise(v, vdot, res.Equilibrium, x, vx)
		if !ok {
			continue
		}
		if c := v.Eval(pt); res.Upper == nil || c.Cmp(res.Upper) < 0 {
			res.Counterexample, res.Upper, res.CounterVdot, res.CounterParams = pt, c, vdot.Eval(pt), vals
		}
	}
	target := 0.0
	if res.Upper != nil {
		target, _ = res.Upper.Float64()
	} else {
		// No point with V̇ ≥ 0 on the rays: aim at the set within radius 10.
		target = math.Inf(1)
		for _, s := range samples {
			for _, u := range directions(n, 720) {
				target = math.Min(target, s.r.v.Eval(s.r.point(u, 10)))
			}
		}
		res.Note = fmt.Sprintf("no point with V̇ ≥ 0 was found on rays up to radius %g from the equilibrium; the level aimed at is V's least value on the sphere of radius 10", rayMax)
	}
	if !(target > 0) || math.IsInf(target, 0) {
		return 0, nil, errors.New("basin: V is not positive away from the equilibrium on the rays searched; no sublevel set to certify")
	}
	// The box: the rays' extent of {V ≤ 1.05·target}, widened later by a
	// tenth and rounded up to two significant digits.
	ext := make([]float64, n)
	for _, s := range samples {
		for i, e := range s.r.extent(n, 1.05*target) {
			ext[i] = math.Max(ext[i], e)
		}
	}
	return target, ext, nil
}

// grid returns the values of a grid over the box with its corners: 5 values
// per side for one parameter, 3 for two, 2 beyond; one empty point for an
// empty box.
func grid(box []poly.Interval) [][]*big.Rat {
	k := map[int]int64{1: 5, 2: 3}[len(box)]
	if k == 0 {
		k = 2
	}
	out := [][]*big.Rat{nil}
	for _, s := range box {
		var next [][]*big.Rat
		for _, pre := range out {
			for j := range k {
				w, _ := s.Width()
				x := new(big.Rat).Mul(w, big.NewRat(int64(j), k-1))
				next = append(next, append(append([]*big.Rat(nil), pre...), x.Add(x, s.Lo.Value)))
			}
		}
		out = next
	}
	return out
}

// below returns a short decimal just below x > 0: x truncated to six
// significant digits, less one unit in the last place when that equals x.
func below(x *big.Rat) *big.Rat {
	f, _ := x.Float64()
	e := int(math.Floor(math.Log10(f))) - 5
	scale := new(big.Rat).SetInt(new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(abs(e))), nil))
	if e > 0 {
		scale.Inv(scale)
	}
	y := new(big.Rat).Mul(x, scale)
	q := new(big.Int).Quo(y.Num(), y.Denom()) // floor for y > 0
	out := new(big.Rat).SetInt(q)
	if out.Cmp(y) == 0 {
		out.Sub(out, big.NewRat(1, 1))
	}
	return out.Quo(out, scale)
}

// decimalUp rounds h > 0 up to two significant digits.
func decimalUp(h float64) *big.Rat {
	e := int(math.Floor(math.Log10(h))) - 1
	m := math.Ceil(h/math.Pow(10, float64(e)) - 1e-9)
	r := new(big.Rat).SetFloat64(m)
	p := new(big.Rat).SetInt(new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(abs(e))), nil))
	if e >= 0 {
		return r.Mul(r, p)
	}
	return r.Quo(r, p)
}

func paramNames(ps []model.Param) string {
	s := ""
	for i, p := range ps {
		if i > 0 {
			s += ", "
		}
		s += p.Name
	}
	return s
}
