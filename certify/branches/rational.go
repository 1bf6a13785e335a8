package branches

import (
	"context"
	"errors"
	"fmt"
	"math/big"
	"slices"
	"strings"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// ErrNoReparametrization says that a branch with a square root has no
// rational parametrization of the kind Reparametrize builds.
var ErrNoReparametrization = errors.New("no rational parametrization")

// Reparametrization is a rational parametrization of a branch
// x = A(p) + B(p)·√w(p): when w is of degree one in a free parameter p,
// w = c·p + d with c free of p, the new parameter u = √w > 0 gives
//
//	p = (u² − d)/c,
//
// and the model in u (and the other parameters) has the branch
// x = A + B·u, rational in u. Its linearization, its P(u) and their exact
// region are those of an ordinary model; a certificate for it is a
// certificate about the reparametrized model, and a region in u maps back
// to p through that relation (monotone in u > 0 when c is a constant).
type Reparametrization struct {
	Branch   int    // the branch of the original analysis
	Param    string // p, replaced
	NewParam string // u
	// C and D give w = C·p + D (polynomials in the other parameters);
	// Expr is (u² − D)/C written in the reparametrized model's names.
	C, D *poly.Poly
	Expr string
	// Text is the reparametrized model, Model its parse, Analysis its
	// analysis and Index the branch there that is the original one.
	Text     string
	Model    *model.Model
	Analysis *Analysis
	Index    int
}

// Relation writes p = (u^2 - d)/c.
func (rp *Reparametrization) Relation() string {
	return fmt.Sprintf("%s = %s", rp.Param, rp.expr())
}

func (rp *Reparametrization) expr() string { return rp.Expr }

// Reparametrize builds the rational parametrization of branch i of an (see
// Reparametrization). It prefers the classified parameter an.Param.
func Reparametrize(ctx context.Context, m *model.Model, an *Analysis, i int) (*Reparametrization, error) {
	if i < 0 || i >= len(an.Branches) {
		return nil, fmt.Errorf("branch %d: %w", i+1, ErrNoReparametrization)
	}
	b := an.Branches[i]
	if b.W == nil || !b.Isolated() {
		return nil, fmt.Errorf("branch %d has no square root: %w", i+1, ErrNoReparametrization)
	}
	if !b.W.IsPoly() {
		return nil, fmt.Errorf("branch %d: sqrt(%s) has a denominator: %w", i+1, b.W, ErrNoReparametrization)
	}
	w := b.W.Num
	r := m.Ring
	free := m.FreeParams()
	slices.SortStableFunc(free, func(x, y model.Param) int {
		switch {
		case x.Name == an.Param:
			return -1
		case y.Name == an.Param:
			return 1
		}
		return 0
	})
	var p model.Param
	var c, d *poly.Poly
	for _, q := range free {
		pi, _ := r.Index(q.Name)
		mask := make([]bool, r.NumVars())
		mask[pi] = true
		if w.DegreeIn(mask) != 1 {
			continue
		}
		e := make([]int, r.NumVars())
		e[pi] = 1
		p, c, d = q, w.Coefficient(e, mask), w.Coefficient(make([]int, r.NumVars()), mask)
		break
	}
	if c == nil {
		return nil, fmt.Errorf("branch %d: sqrt(%s) is of degree one in no free parameter: %w", i+1, w, ErrNoReparametrization)
	}
	u := "u"
	for k := 1; slices.Contains(r.Names(), u); k++ {
		u = fmt.Sprintf("u%d", k)
	}
	rp := &Reparametrization{Branch: i, Param: p.Name, NewParam: u, C: c, D: d}
	{
		// (u² − d)/c printed in a ring of u and the parameters.
		names := append([]string{u}, r.Names()[len(m.States):]...)
		pr := poly.NewRing(nil, names)
		to := make([]int, r.NumVars())
		for k := range to {
			to[k], _ = pr.Index(r.Name(k))
		}
		u2 := new(poly.Poly).Mul(poly.Var(pr, 0), poly.Var(pr, 0))
		rp.Expr = poly.FromPoly(new(poly.Poly).Sub(u2, d.Relabel(pr, to))).Quo(poly.FromPoly(c.Relabel(pr, to))).String()
	}

	var sb strings.Builder
	fmt.Fprintf(&sb, "# %s with %s = sqrt(%s) > 0 in place of %s (the square root of branch %d): %s.\n", baseName(m.File), u, w, p.Name, i+1, rp.Relation())
	fmt.Fprintf(&sb, "state %s\n", strings.Join(m.States, ", "))
	fmt.Fprintf(&sb, "parameter %s > 0\n", u)
	for _, q := range m.FreeParams() {
		if q.Name == p.Name {
			continue
		}
		if t := model.RangeText(q); t != "" {
			fmt.Fprintf(&sb, "parameter %s %s\n", q.Name, t)
		} else {
			fmt.Fprintf(&sb, "parameter %s\n", q.Name)
		}
	}
	fmt.Fprintf(&sb, "let %s = %s\n", p.Name, rp.expr())
	for k, s := range m.States {
		op := "'"
		if m.Discrete {
			op = "+"
		}
		fmt.Fprintf(&sb, "%s%s = %s\n", s, op, m.F[k])
	}
	rp.Text = sb.String()
	m2, err := model.Parse(fmt.Sprintf("%s (%s)", m.File, rp.Relation()), []byte(rp.Text))
	if err != nil {
		return nil, fmt.Errorf("branch %d: the model in %s is refused (%v): %w", i+1, u, err, ErrNoReparametrization)
	}
	rp.Model = m2
	an2, err := Analyze(ctx, m2, Options{})
	if err != nil {
		return nil, err
	}
	if !an2.ClosedForm {
		return nil, fmt.Errorf("branch %d: no closed form in %s (%s): %w", i+1, u, an2.Reason, ErrNoReparametrization)
	}
	rp.Analysis = an2

	// The branch in u: A + B·u with p → (u² − d)/c, in the new ring.
	names := append(slices.Clone(m2.Ring.Names()), p.Name)
	big3 := poly.NewRing(m.States, names[len(m.States):])
	up, _ := big3.Index(u)
	pp, _ := big3.Index(p.Name)
	to3 := make([]int, r.NumVars())
	for k := range to3 {
		to3[k], _ = big3.Index(r.Name(k))
	}
	to2 := make([]int, big3.NumVars())
	for k := range to2 {
		to2[k] = -1
		if j, ok := m2.Ring.Index(big3.Name(k)); ok {
			to2[k] = j
		}
	}
	u2 := new(poly.Poly).Mul(poly.Var(big3, up), poly.Var(big3, up))
	expr := poly.FromPoly(new(poly.Poly).Sub(u2, d.Relabel(big3, to3))).Quo(poly.FromPoly(c.Relabel(big3, to3)))
	subst := func(f poly.RatFunc) poly.RatFunc {
		sub := make([]poly.RatFunc, big3.NumVars())
		has := make([]bool, big3.NumVars())
		sub[pp], has[pp] = expr, true
		out := poly.FromPoly(f.Num.Relabel(big3, to3)).ComposeStates(sub, has)
		for _, df := range f.Den {
			den := poly.FromPoly(df.P.Relabel(big3, to3)).ComposeStates(sub, has)
			out = out.Quo(den.Pow(df.Mult))
		}
		return out
	}
	var target []poly.RatFunc
	for _, x := range b.Coords {
		v := subst(x.A).Add(subst(x.B).Mul(poly.FromPoly(poly.Var(big3, up))))
		back := poly.FromPoly(v.Num.Relabel(m2.Ring, to2))
		for _, df := range v.Den {
			back.Den = append(back.Den, poly.DenFactor{P: df.P.Relabel(m2.Ring, to2), Mult: df.Mult})
		}
		target = append(target, back)
	}
	rp.Index = -1
	for j, b2 := range an2.Branches {
		if !b2.Isolated() || b2.W != nil {
			continue
		}
		same := true
		for k, x := range b2.Coords {
			if !x.A.Equal(target[k]) {
				same = false
				break
			}
		}
		if same {
			rp.Index = j
			break
		}
	}
	if rp.Index < 0 {
		return nil, fmt.Errorf("branch %d: the branch is not among the rational branches in %s: %w", i+1, u, ErrNoReparametrization)
	}
	return rp, nil
}

// MapBack maps an interval of u (a claims.Interval of the reparametrized
// model's region, u > 0) to the interval of p it is, p = (u² − d)/c, when c
// and d are constants: the map is monotone on u ≥ 0. The result is in the
// original model's ring (index pi of p) and is clipped to rng, p's range.
func (rp *Reparametrization) MapBack(iv claims.Interval, rng poly.Interval) (poly.Span, bool, error) {
	if !rp.C.IsConst() || !rp.D.IsConst() {
		return poly.Span{}, false, fmt.Errorf("%s depends on other free parameters: no interval of %s", rp.expr(), rp.Param)
	}
	c, d := rp.C.ConstTerm(), rp.D.ConstTerm()
	ui, _ := rp.Model.Ring.Index(rp.NewParam)
	lo, err := rp.mapEnd(iv.Lo, iv.LoPoly, iv.LoIsolating, iv.LoClosed, ui, c, d)
	if err != nil {
		return poly.Span{}, false, err
	}
	hi, err := rp.mapEnd(iv.Hi, iv.HiPoly, iv.HiIsolating, iv.HiClosed, ui, c, d)
	if err != nil {
		return poly.Span{}, false, err
	}
	if c.Sign() < 0 {
		lo, hi = hi, lo
		lo.Inf, hi.Inf = -lo.Inf, -hi.Inf
	}
	s := poly.Span{Lo: lo, Hi: hi}
	return clipSpan(s, rng)
}

// mapEnd maps one end of u to p.
func (rp *Reparametrization) mapEnd(v, polyText string, iso *[2]string, closed bool, ui int, c, d *big.Rat) (poly.End, error) {
	at := func(q *big.Rat) *big.Rat { // (q² − d)/c
		x := new(big.Rat).Mul(q, q)
		return x.Sub(x, d).Quo(x, c)
	}
	switch v {
	case "inf", "+inf":
		return poly.End{Inf: 1}, nil
	case "-inf":
		return poly.End{}, errors.New("an interval of u below 0")
	}
	if polyText == "" {
		q, ok := poly.ParseRat(v)
		if !ok {
			return poly.End{}, fmt.Errorf("end %q", v)
		}
		if q.Sign() < 0 {
			return poly.End{}, errors.New("an interval of u below 0")
		}
		return poly.End{Value: at(q), Closed: closed}, nil
	}
	f, err := poly.Parse(rp.Model.Ring, polyText)
	if err != nil || iso == nil {
		return poly.End{}, fmt.Errorf("end %s: %v", polyText, err)
	}
	uq, ok := f.Num.Univariate(ui)
	a, ok1 := poly.ParseRat(iso[0])
	b, ok2 := poly.ParseRat(iso[1])
	if !ok || !ok1 || !ok2 || a.Sign() < 0 {
		return poly.End{}, fmt.Errorf("end %s", polyText)
	}
	// q(u) = E(u²) + u·O(u²) and u² = c·p + d: the root p of
	// E(s)² − s·O(s)², s = c·p + d.
	s := poly.NewUnivariate(d, c)
	coeffs := uq.Coeffs()
	e, o := poly.NewUnivariate(), poly.NewUnivariate()
	for k := len(coeffs) - 1; k >= 0; k-- {
		if k%2 == 0 {
			e = e.Mul(s).Add(poly.NewUnivariate(coeffs[k]))
		}
	}
	for k := len(coeffs) - 1; k >= 0; k-- {
		if k%2 == 1 {
			o = o.Mul(s).Add(poly.NewUnivariate(coeffs[k]))
		}
	}
	rpoly := e.Mul(e).Sub(s.Mul(o).Mul(o)).SquareFree()
	root := poly.URoot{Poly: uq, Lo: a, Hi: b}
	for range 200 {
		pl, ph := at(root.Lo), at(root.Hi)
		if c.Sign() < 0 {
			pl, ph = ph, pl
		}
		if root.Exact != nil {
			return poly.End{Value: at(root.Exact), Closed: closed}, nil
		}
		for _, q := range rpoly.RationalRoots() {
			if q.Cmp(pl) >= 0 && q.Cmp(ph) <= 0 && rpoly.CountRoots(poly.UBoundClosed(pl), poly.UBoundClosed(ph)) == 1 {
				return poly.End{Value: q, Closed: closed}, nil
			}
		}
		if rpoly.CountRoots(poly.UBoundClosed(pl), poly.UBoundClosed(ph)) == 1 && pl.Cmp(ph) < 0 && rpoly.Sign(pl) != 0 && rpoly.Sign(ph) != 0 {
			return poly.End{P: rpoly, A: pl, B: ph, Closed: closed}, nil
		}
		w := new(big.Rat).Sub(root.Hi, root.Lo)
		root = root.Refine(w.Quo(w, big.NewRat(2, 1)))
	}
	return poly.End{}, fmt.Errorf("end %s: not isolated", polyText)
}

// clipSpan intersects s with the range; ok is false when they do not meet.
func clipSpan(s poly.Span, rng poly.Interval) (poly.Span, bool, error) {
	lo, hi := boundEnd(rng.Lo), boundEnd(rng.Hi)
	if cmpEnds(lo, s.Lo, true) > 0 {
		s.Lo = lo
	}
	if cmpEnds(hi, s.Hi, false) < 0 {
		s.Hi = hi
	}
	c := cmpEnds(s.Lo, s.Hi, true)
	if c > 0 || (c == 0 && !(s.Lo.Closed && s.Hi.Closed)) {
		return s, false, nil
	}
	return s, true, nil
}

// cmpEnds compares two ends as numbers, an equal pair by openness: for
// lower ends (lower true) an open end is the larger one.
func cmpEnds(a, b poly.End, lower bool) int {
	switch {
	case a.Inf != 0 || b.Inf != 0:
		if a.Inf == b.Inf {
			return 0
		}
		if a.Inf < b.Inf {
			return -1
		}
		return 1
	}
	pa, pb := endPoint(a), endPoint(b)
	c := poly.CompareRoots(pa, pb)
	if c != 0 {
		return c
	}
	switch {
	case a.Closed == b.Closed:
		return 0
	case lower == a.Closed:
		return -1
	}
	return 1
}

// Region maps the certified region of the reparametrized model back to p:
// the pieces that hold (whole: every u > 0 holds), each through MapBack,
// clipped to p's range rng.
func (rp *Reparametrization) Region(pieces []claims.Piece, whole bool, rng poly.Interval) ([]poly.Span, error) {
	var ivs []claims.Interval
	if whole {
		ivs = []claims.Interval{{Lo: "0", Hi: "inf"}}
	}
	for _, pc := range pieces {
		if pc.Holds {
			ivs = append(ivs, pc.Interval)
		}
	}
	var out []poly.Span
	for _, iv := range ivs {
		s, ok, err := rp.MapBack(iv, rng)
		if err != nil {
			return nil, err
		}
		if ok {
			out = append(out, s)
		}
	}
	return out, nil
}
