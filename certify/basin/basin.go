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
	// checker.MaxPavingLevel − 1).
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
	Claim          *checker.SublevelBasin
	Doc            *checker.Document
	Check          checker.Outcome
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
	o.MaxLevel = min(o.MaxLevel, checker.MaxPavingLevel-1)
	pos := poly.Pos{File: m.File, Line: 1, Col: 1}
	switch {
	case m.Discrete:
		return nil, &poly.Error{Pos: pos, Msg: "basin: the model is a map; sublevel basins are for continuous time (x' = ...)"}
	case len(m.FreeParams()) > 0:
		return nil, &poly.Error{Pos: pos, Msg: fmt.Sprintf("basin: fix every parameter with --set (free: %s)", paramNames(m.FreeParams()))}
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
	d, err := direct.CheckPaving(ctx, m, source, direct.PaveOptions{})
	if err != nil {
		return nil, err
	}
	n := len(m.States)
	res := &Result{Direct: d}
	for i := range n {
		a, err := m.At[i].EvalVars(nil)
		if err != nil || !a.IsPoly() || !a.Num.IsConst() {
			return nil, errors.New("basin: the equilibrium is not a rational point")
		}
		res.Equilibrium = append(res.Equilibrium, a.Num.ConstTerm())
	}
	v, vdot := d.V.Num, d.Vdot.Num
	near := d.Shifted.Vdot.Neg().Num
	if _, _, ok := poly.QuadraticCofactors(near); !ok {
		return nil, &poly.Error{Pos: m.VPos, Msg: "basin: V̇ has a constant or linear part at the equilibrium"}
	}
	r := &rays{v: newFpoly(v, n), vdot: newFpoly(vdot, n)}
	for _, a := range res.Equilibrium {
		f, _ := a.Float64()
		r.at = append(r.at, f)
	}
	// c_hi: the least V found at a point with V̇ ≥ 0, made exact.
	target := 0.0
	if x, vx, ok := r.lowestRise(n); ok {
		if p, ok := exactRise(v, vdot, res.Equilibrium, x, vx); ok {
			res.Counterexample, res.Upper, res.CounterVdot = p, v.Eval(p), vdot.Eval(p)
			target, _ = res.Upper.Float64()
		}
	}
	if res.Upper == nil {
		// No point with V̇ ≥ 0 on the rays: aim at the set within radius 10.
		target = math.Inf(1)
		for _, u := range directions(n, 720) {
			target = math.Min(target, r.v.eval(r.point(u, 10)))
		}
		res.Note = fmt.Sprintf("no point with V̇ ≥ 0 was found on rays up to radius %g from the equilibrium; the level aimed at is V's least value on the sphere of radius 10", rayMax)
	}
	if !(target > 0) || math.IsInf(target, 0) {
		return nil, errors.New("basin: V is not positive away from the equilibrium on the rays searched; no sublevel set to certify")
	}
	// The box: the rays' extent of {V ≤ 1.05·target}, widened by a tenth and
	// rounded up to two significant digits.
	ext := r.extent(n, 1.05*target)
	p := &paver{at: res.Equilibrium, atf: r.at, near: near}
	for i := range n {
		h := decimalUp(1.1*ext[i] + 1e-9)
		p.sides = append(p.sides, poly.Closed(new(big.Rat).Sub(res.Equilibrium[i], h), new(big.Rat).Add(res.Equilibrium[i], h)))
	}
	root, least, err := p.run(ctx, v, new(poly.Poly).Neg(vdot), target*(1-o.Gap), o.MaxLevel, o.MaxBoxes)
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
	tr, level, in, out := tree(root)
	res.Inside, res.Outside, res.NearTests = in, out, p.nearTry
	cl := &checker.SublevelBasin{Level: res.Level.RatString(), Resolution: new(big.Rat).SetFrac(big.NewInt(1), new(big.Int).Lsh(big.NewInt(1), uint(level))).RatString(), Tree: tr}
	for _, s := range p.sides {
		cl.Lo = append(cl.Lo, s.Lo.Value.RatString())
		cl.Hi = append(cl.Hi, s.Hi.Value.RatString())
	}
	res.Claim = cl
	res.Method = fmt.Sprintf("interval branch and bound: %d boxes (%d with V̇ < 0, %d with V > c_lo), exact centred forms, the quadratic bound tried on %d boxes at the equilibrium; c_hi by %s", in+out, in, out, p.nearTry, "rays, pattern search and an exact rational point")
	doc := *d.Doc
	doc.Claims = append(append([]checker.Claim(nil), d.Doc.Claims...), cl)
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
