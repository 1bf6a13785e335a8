package basin

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/big"
	"slices"
	"strings"

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
	// Method chooses how c_lo is certified: MethodAuto (""), MethodBranch
	// or MethodSOS.
	Method string
}

// The methods for c_lo. MethodBranch is interval branch and bound (kernel
// rule sublevel-basin); MethodSOS the S-procedure (sublevel-sprocedure),
// which needs every parameter fixed and V proven positive definite and
// radially unbounded by the direct method. MethodAuto tries the
// S-procedure first where it applies and runs the branch and bound unless
// the S-procedure already closed the gap, keeping the larger level.
const (
	MethodAuto   = "auto"
	MethodBranch = "bb"
	MethodSOS    = "sos"
)

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
	// Claim is the branch and bound's claim, SProcedure the S-procedure's:
	// the one that proved Level, the other nil.
	Claim      *claims.SublevelBasin
	SProcedure *claims.SublevelSProcedure
	// Box is the box of the states around the equilibrium that the branch
	// and bound paves (also set when the S-procedure proved the level: the
	// rays' extent of the sublevel set, for pictures).
	Box   []poly.Interval
	Doc   *claims.Document
	Check checker.Outcome
	// Boxes counts the tree's leaves: Inside where V̇ < 0 was proven,
	// Outside where V > Level; NearTests the boxes at the equilibrium on
	// which the quadratic bound was tried.
	Inside, Outside, NearTests int
	// Method says how the level was proven, with the sizes of the work;
	// Rule names the kernel rule (sublevel-basin or sublevel-sprocedure).
	Method, Rule string
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
	p := &paver{n: n, at: res.Equilibrium, atf: at, near: near, directed: len(res.Params) > 0 && n+len(res.Params) <= claims.MaxDirected}
	for i := range n {
		h := decimalUp(1.1*ext[i] + 1e-9)
		p.sides = append(p.sides, poly.Closed(new(big.Rat).Sub(res.Equilibrium[i], h), new(big.Rat).Add(res.Equilibrium[i], h)))
	}
	res.Box = p.sides
	p.sides = append(p.sides, res.ParamBox...)
	var cl claims.Claim
	if o.Method != MethodBranch {
		sp, err := res.sprocedure(ctx, d, target, o.Gap, o.Method == MethodSOS)
		if err != nil {
			return nil, err
		}
		if sp != nil {
			cl = sp
		}
	}
	if o.Method != MethodSOS && !res.closed(target, o.Gap) {
		bb, err := res.branch(ctx, p, d, target, o)
		switch {
		case err != nil && cl == nil:
			return nil, err
		case err == nil:
			cl = bb
		}
	}
	doc := *d.Doc
	doc.Claims = append(append([]claims.Claim(nil), d.Doc.Claims...), cl)
	level := res.Level.RatString()
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
	if res.Check.Basin != level {
		return nil, fmt.Errorf("%w: the checker derives the level %q, the engine wrote %q", certify.ErrUnverified, res.Check.Basin, level)
	}
	return res, nil
}

// closed reports a level within gap of target.
func (res *Result) closed(target, gap float64) bool {
	if res.Level == nil {
		return false
	}
	lf, _ := res.Level.Float64()
	return lf >= target*(1-gap)
}

// branch runs the interval branch and bound and, when its level beats the
// one res holds (if any), makes it res's level and returns its claim; nil
// when it does not beat it.
func (res *Result) branch(ctx context.Context, p *paver, d *direct.Result, target float64, o Options) (*claims.SublevelBasin, error) {
	n := p.n
	root, least, err := p.run(ctx, d.V.Num, new(poly.Poly).Neg(d.Vdot.Num), target*(1-o.Gap), o.MaxLevel, o.MaxBoxes)
	if err != nil {
		return nil, err
	}
	if least == nil || least.Sign() <= 0 {
		return nil, fmt.Errorf("basin: no positive level certified within %d boxes and %d halvings per side (is the quadratic part of −V̇ positive definite at the equilibrium?)", o.MaxBoxes, o.MaxLevel)
	}
	level := below(least)
	if res.Level != nil && level.Cmp(res.Level) <= 0 {
		return nil, errors.New("basin: the branch and bound's level is not larger")
	}
	res.Level, res.SProcedure, res.Rule = level, nil, "sublevel-basin"
	note := ""
	if lf, _ := res.Level.Float64(); lf < target*(1-o.Gap) {
		note = fmt.Sprintf("the gap was not closed to %g: %d boxes, finest halving %d", o.Gap, p.boxes, o.MaxLevel)
	}
	if res.Note == "" || strings.HasPrefix(res.Note, "the gap") || strings.HasPrefix(res.Note, "the S-procedure") {
		res.Note = note
	}
	tr, depth, in, out := tree(root, n)
	res.Inside, res.Outside, res.NearTests = in, out, p.nearTry
	cl := &claims.SublevelBasin{Level: res.Level.RatString(), Resolution: new(big.Rat).SetFrac(big.NewInt(1), new(big.Int).Lsh(big.NewInt(1), uint(depth))).RatString(), Tree: tr}
	for _, s := range p.sides[:n] {
		cl.Lo = append(cl.Lo, s.Lo.Value.RatString())
		cl.Hi = append(cl.Hi, s.Hi.Value.RatString())
	}
	res.Claim = cl
	res.Method = fmt.Sprintf("interval branch and bound: %d boxes (%d with V̇ < 0, %d with V > c_lo), exact centred forms, the quadratic bound tried on %d boxes at the equilibrium; c_hi by %s", in+out, in, out, p.nearTry, "rays, pattern search and an exact rational point")
	return cl, nil
}

// sprocedure looks for a level by the S-procedure when it applies (every
// parameter fixed, V's form global), bisecting on c below target to a
// quarter of the gap; it sets res's level and returns the claim, or nil
// when it does not apply or finds none. With required, either is an error.
func (res *Result) sprocedure(ctx context.Context, d *direct.Result, target, gap float64, required bool) (*claims.SublevelSProcedure, error) {
	fail := func(err error) (*claims.SublevelSProcedure, error) {
		if required {
			return nil, fmt.Errorf("basin --method sos: %w", err)
		}
		return nil, nil
	}
	if len(res.Params) > 0 {
		return fail(errors.New("the S-procedure needs every parameter fixed (use --set)"))
	}
	if err := globalV(d); err != nil {
		return fail(err)
	}
	// Multipliers of the least degree first, then one degree more (their
	// bases hold the lower ones, so the level found is a feasible start)
	// while the gap stays open.
	var cl *claims.SublevelSProcedure
	var level *big.Rat
	var sp *sproc
	solves, lo, tried := 0, 0.0, 0
	for extra := 0; extra < 2 && !res.closed(target, gap); extra++ {
		q, err := newSProc(d, extra)
		if err != nil {
			if extra == 0 {
				return fail(err)
			}
			break
		}
		if extra > 0 && len(q.z0)+len(q.z1) > maxRaised {
			break
		}
		c, l, err := q.search(ctx, lo, target, gap/4)
		solves, tried = solves+q.solves, q.degS
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		if err != nil {
			if extra == 0 && !required {
				res.Note = "the S-procedure certified no level: " + err.Error()
			}
			if extra == 0 {
				return fail(err)
			}
			break
		}
		if level == nil || l.Cmp(level) > 0 {
			cl, level, sp = c, l, q
			lo, _ = l.Float64()
			res.Level, res.SProcedure, res.Rule = level, cl, "sublevel-sprocedure"
		}
	}
	res.Method = fmt.Sprintf("S-procedure: −V̇ − ε·Σyᵢ² − s·(c − V) = σ with s (degree %d, %d monomials) and σ (degree %d, %d monomials) sums of squares, bisection on c (%d semidefinite programs), exact rounding and LDLᵀ; c_hi by rays, pattern search and an exact rational point",
		sp.degS, len(cl.Multiplier.Basis), sp.degR, len(cl.Remainder.Basis), solves)
	if !res.closed(target, gap) && res.Note == "" {
		res.Note = fmt.Sprintf("the S-procedure's level is not within %g of c_hi (multipliers up to degree %d)", gap, tried)
	}
	return cl, nil
}

// globalV says why the direct method's certificate does not prove V
// positive definite and radially unbounded for the sublevel-sprocedure
// rule, or nil when it does: a form of V (its quadratic part when V is
// quadratic, or a Gram form of the whole V) without zero pivots, and every
// condition of its minors a positive constant.
func globalV(d *direct.Result) error {
	form := false
	for _, c := range d.Doc.Claims {
		var f *claims.LDLForm
		switch c := c.(type) {
		case *claims.QuadraticPart:
			if d.HigherV.IsZero() {
				f = &c.LDLForm
			}
		case *claims.MonomialGram:
			f = &c.LDLForm
		case *claims.MarginGram:
			f = &c.LDLForm
		case *claims.MinorCondition:
			if q, err := poly.Parse(d.Model.Ring, c.Condition); c.Form == "V" && (err != nil || !q.IsPoly() || !q.Num.IsConst() || q.Num.ConstTerm().Sign() <= 0) {
				return errors.New("V is not proven positive definite for every parameter value")
			}
		}
		if f != nil && f.Of == "V" {
			form = !slices.Contains(f.D, "0")
		}
	}
	if !form {
		return errors.New("V is not proven positive definite and radially unbounded (a quadratic V, or a Gram form of V with a pure power of every state)")
	}
	return nil
}

// maxRaised bounds the orders of the Gram matrices (σ's and s's together)
// when the S-procedure raises the multipliers' degree, so that the
// bisection's SDPs stay small; the branch and bound follows when the gap
// is still open.
const maxRaised = 80

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
