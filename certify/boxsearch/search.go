package boxsearch

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/big"
	"time"

	"github.com/lyacert/lyacert/certify"
	"github.com/lyacert/lyacert/certify/boxsos"
	"github.com/lyacert/lyacert/certify/direct"
	"github.com/lyacert/lyacert/certify/sdp"
	"github.com/lyacert/lyacert/certify/sos"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// Options control Search.
type Options struct {
	// Degree is the degree 2d of V, even and at least 2.
	Degree int
	// Source names the model in the certificate.
	Source string
	// SDP is passed to the solver of the search (not to boxsos's own).
	SDP *sdp.Options
}

// The methods that can prove the rounded V (Result.Method).
const (
	// MethodDirect: the direct method alone (certify/direct) proves V̇ < 0
	// on the whole box.
	MethodDirect = "direct"
	// MethodBoxSOS: the direct method proves V's form, and a sum of squares
	// with multipliers of the box (certify/boxsos) proves V̇ < 0 on it.
	MethodBoxSOS = "box-multiplier-sos"
)

// Sizes describe the work of a search.
type Sizes struct {
	BasisV      int      // monomials of z₁ (V = z₁ᵀG₁z₁)
	Multipliers []int    // orders of the Gram matrices of σ₀, σ₁, … in the search
	Factors     []string // the parameter whose box factor each σ multiplies ("" for σ₀)
	Low         int      // 1: margins of the lowest pure powers; 2: of degree 4 (see Search)
	Constraints int      // equations of the search's SDP
	Blocks      []int    // the SDP's blocks as solved (negative: a diagonal block)
	Iterations  int      // of the search's SDP
	Margin      float64
	Bits        int // V's coefficients rounded to multiples of 2^−Bits (relative)
	Roundings   int // rounded V tried
	Solve       time.Duration
	Round       time.Duration // rounding and every exact step after it
}

// Result is the outcome of Search. Doc is the certificate, re-checked by
// the kernel with the verdict "holds" over the whole box; nil when none was
// found, and then Reason says why.
type Result struct {
	V       poly.RatFunc   // the rounded V proven, or the last one tried (the zero value, unusable, when none was)
	Direct  *direct.Result // the direct method on that V
	Doc     *claims.Document
	Outcome checker.Outcome // the kernel's outcome for Doc
	Method  string          // MethodDirect or MethodBoxSOS
	Sizes   Sizes
	Status  sdp.Status
	Problem *sdp.Problem // the search's SDP, for export
	Reason  string
}

// Search looks for V of degree opts.Degree that decreases along the flow
// for every parameter value in the box of the model's ranges (see the
// package documentation). Errors are for models it cannot apply to, for a
// stopped context, and certify.ErrUnverified for a certificate the kernel
// did not accept as the engine built it.
func Search(ctx context.Context, m *model.Model, opts Options) (*Result, error) {
	free := m.FreeParams()
	if len(free) == 0 {
		return nil, errors.New("--box-sos needs free parameters with closed bounded ranges; with every parameter fixed use --degree alone")
	}
	for _, p := range free {
		if !p.Range.Compact() {
			return nil, &poly.Error{Pos: p.Pos, Msg: fmt.Sprintf("parameter %s has range %q; --box-sos needs a closed bounded interval such as `in [1, 4]`", p.Name, model.RangeText(p))}
		}
	}
	if opts.Degree < 2 || opts.Degree%2 != 0 {
		return nil, fmt.Errorf("--degree %d: the degree of V must be even and at least 2", opts.Degree)
	}
	if err := m.CheckEquilibrium(); err != nil {
		return nil, err
	}
	r := m.Ring
	ns := len(m.States)
	for i, a := range m.At {
		if a.DegreeIn(r.ParamMask()) > 0 || !a.IsPoly() {
			return nil, &poly.Error{Pos: m.AtPos, Msg: fmt.Sprintf("the equilibrium's %s = %s depends on the parameters; --box-sos searches V with constant coefficients, which needs an equilibrium free of them", m.States[i], a)}
		}
	}
	for i, f := range m.F {
		if !f.IsPoly() {
			return nil, &poly.Error{Pos: m.FPos[i], Msg: fmt.Sprintf("the right-hand side of %s has a denominator; --box-sos needs polynomials", m.States[i])}
		}
	}
	z1 := monomials(ns, r.NumVars(), opts.Degree/2)
	if len(z1) > 200 {
		return nil, fmt.Errorf("--degree %d with %d states: %d monomials in V's basis, too many", opts.Degree, ns, len(z1))
	}
	deriv, all, err := derivatives(m, z1)
	if err != nil {
		return nil, err
	}
	res := &Result{}
	res.Sizes.BasisV = len(z1)
	if all.IsZero() {
		res.Reason = "V̇ vanishes identically for every V of this degree"
		return res, nil
	}
	mults, marg, err := boxsos.Multipliers(m, all)
	if err != nil {
		return nil, fmt.Errorf("--box-sos: %w", err)
	}
	// First the margin t·Σyⱼ^(2kⱼ) of the lowest pure powers; when the SDP
	// finds none, the margins of degree 4 without the multipliers' state
	// monomials of degree 1 (a centre linearization, whose −V̇ has no
	// definite quadratic part, as in certify/sossearch).
	var sol *sdp.Result
	var t float64
	for low := 1; low <= 2; low++ {
		ms, mg := mults, marg
		if low == 2 {
			if ms, mg = quartic(mults, ns); ms == nil {
				break
			}
		}
		res.Sizes.Low, res.Sizes.Multipliers, res.Sizes.Factors = low, nil, nil
		for _, b := range ms {
			res.Sizes.Multipliers = append(res.Sizes.Multipliers, len(b.Basis))
			res.Sizes.Factors = append(res.Sizes.Factors, b.Param)
		}
		prob := program(z1, deriv, ms, mg)
		res.Problem = prob
		res.Sizes.Constraints = len(prob.A)
		res.Sizes.Blocks = prob.Blocks
		start := time.Now()
		sol, err = sdp.Solve(ctx, prob, opts.SDP)
		res.Sizes.Solve += time.Since(start)
		if err != nil {
			return nil, err
		}
		t = sol.X[len(prob.Blocks)-1].Data[0]
		res.Status, res.Sizes.Iterations, res.Sizes.Margin = sol.Status, sol.Iterations, t
		if st := sol.Status; (st == sdp.Optimal || st == sdp.Stalled || st == sdp.IterationLimit) && t > 1e-7 {
			break
		}
		sol = nil
	}
	if sol == nil {
		res.Reason = fmt.Sprintf("the SDP found no V of degree %d with V and −V̇ positive definite on the whole box (solver: %v, margin %.3g); numerical evidence, not a proof that none exists", opts.Degree, res.Status, res.Sizes.Margin)
		return res, nil
	}
	start := time.Now()
	err = res.prove(ctx, m, opts, z1, sol.X[0], t)
	res.Sizes.Round = time.Since(start)
	return res, err
}

// quartic returns the multipliers without the monomials of state degree 1
// (a multiplier left empty is dropped), and the margin's terms yⱼ⁴; nil
// when σ₀ has no yⱼ² to carry them.
func quartic(mults []boxsos.Multiplier, ns int) ([]boxsos.Multiplier, [][]int) {
	var out []boxsos.Multiplier
	for k, mu := range mults {
		var basis [][]int
		for _, e := range mu.Basis {
			if sos.Degree(e[:ns]) >= 2 {
				basis = append(basis, e)
			}
		}
		if len(basis) == 0 && k == 0 {
			return nil, nil
		}
		if len(basis) > 0 {
			out = append(out, boxsos.Multiplier{Param: mu.Param, Basis: basis, G: mu.G})
		}
	}
	var marg [][]int
	for j := range ns {
		found := false
		for _, e := range out[0].Basis {
			found = found || e[j] == 2 && sos.Degree(e) == 2
		}
		if !found {
			return nil, nil
		}
		e := make([]int, len(out[0].Basis[0]))
		e[j] = 4
		marg = append(marg, e)
	}
	return out, marg
}

// derivatives returns, for every exponent e = z_a + z_b of z₁'s products
// (keyed by sos.Key), the derivative S_e of yᵉ in coordinates at the
// equilibrium, a polynomial in the states and the parameters; and a
// polynomial with coefficient 1 on every term that some S_e has.
func derivatives(m *model.Model, z1 [][]int) (map[string]*poly.Poly, *poly.Poly, error) {
	r := m.Ring
	unshift, has := centred(m)
	deriv := map[string]*poly.Poly{}
	all := poly.Zero(r)
	seen := map[string]bool{}
	for a := range z1 {
		for b := a; b < len(z1); b++ {
			e := sos.AddExp(z1[a], z1[b])
			k := sos.Key(e)
			if _, ok := deriv[k]; ok {
				continue
			}
			mono := poly.FromPoly(poly.Monomial(r, e, big.NewRat(1, 1)))
			if m.AtGiven {
				mono = mono.ComposeStates(unshift, has)
			}
			s := m.Shift(m.Derivative(mono))
			if !s.IsPoly() {
				return nil, nil, errors.New("--box-sos needs a polynomial vector field (it has denominators)")
			}
			deriv[k] = s.Num
			for _, t := range s.Num.Terms() {
				if tk := sos.Key(t.Exp); !seen[tk] {
					seen[tk] = true
					all = new(poly.Poly).Add(all, poly.Monomial(r, t.Exp, big.NewRat(1, 1)))
				}
			}
		}
	}
	return deriv, all, nil
}

// program sets up the search: blocks G₁′ (V = z₁ᵀ(G₁′ + tE)z₁, E the
// identity on the monomials of degree 1 and zero elsewhere: V − t·Σyᵢ² is
// a sum of squares), one Gram matrix per multiplier, and the diagonal
// block (t, w). One equation per monomial γ of (y, p),
//
//	Σ_k Σ_{a≤b} [γ](g_k·w_a w_b)·(G_k)_ab + t·[γ]M + Σ_{a≤b} [γ]S_{z_a z_b}·(G₁)_ab = 0
//
// (σ₀ + Σσᵢgᵢ + t·M = −V̇, M the margin; off-diagonal entries count
// twice, as in the SDPA format), tr G₁ = n₁ and t + w = 1; maximise t.
func program(z1 [][]int, deriv map[string]*poly.Poly, mults []boxsos.Multiplier, marg [][]int) *sdp.Problem {
	prob := &sdp.Problem{Blocks: []int{len(z1)}}
	nb := 1 + len(mults)
	rs := sos.NewRows(prob)
	row := rs.Row
	put := func(e []int, en sdp.Entry) {
		i := row(e)
		prob.A[i] = append(prob.A[i], en)
	}
	for k, mu := range mults {
		prob.Blocks = append(prob.Blocks, len(mu.Basis))
		gs := mu.G.Terms()
		for i := range mu.Basis {
			for j := i; j < len(mu.Basis); j++ {
				for _, gt := range gs {
					f, _ := gt.Coef.Float64()
					put(sos.AddExp(sos.AddExp(mu.Basis[i], mu.Basis[j]), gt.Exp), sdp.Entry{Block: 1 + k, I: i, J: j, V: f})
				}
			}
		}
	}
	tcoef := map[string]float64{}
	for _, e := range marg {
		row(e)
		tcoef[sos.Key(e)]++
	}
	for a := range z1 {
		for b := a; b < len(z1); b++ {
			for _, t := range deriv[sos.Key(sos.AddExp(z1[a], z1[b]))].Terms() {
				f, _ := t.Coef.Float64()
				put(t.Exp, sdp.Entry{Block: 0, I: a, J: b, V: f})
				if a == b && sos.Degree(z1[a]) == 1 {
					row(t.Exp)
					tcoef[sos.Key(t.Exp)] += f
				}
			}
		}
	}
	for k, i := range rs.Index {
		if c := tcoef[k]; c != 0 {
			prob.A[i] = append(prob.A[i], sdp.Entry{Block: nb, I: 0, J: 0, V: c})
		}
	}
	var tr sdp.Matrix
	for i := range z1 {
		tr = append(tr, sdp.Entry{Block: 0, I: i, J: i, V: 1})
	}
	n1, linear := float64(len(z1)), 0.0
	for _, e := range z1 {
		if sos.Degree(e) == 1 {
			linear++
		}
	}
	prob.A = append(prob.A, append(tr, sdp.Entry{Block: nb, I: 0, J: 0, V: linear}))
	prob.B = append(prob.B, n1)
	prob.A = append(prob.A, sdp.Matrix{{Block: nb, I: 0, J: 0, V: 1}, {Block: nb, I: 1, J: 1, V: 1}})
	prob.B = append(prob.B, 1)
	prob.Blocks = append(prob.Blocks, -2)
	prob.C = sdp.Matrix{{Block: nb, I: 0, J: 0, V: 1}}
	return prob
}

// prove rounds V = z₁ᵀ(G₁′ + tE)z₁ to rationals with growing precision
// and tries each rounding: the direct method, then the box certificate.
// It stops at the first V the kernel accepts over the whole box.
func (res *Result) prove(ctx context.Context, m *model.Model, opts Options, z1 [][]int, g1 sdp.Block, t float64) error {
	r := m.Ring
	unshift, has := centred(m)
	coef := map[string]float64{}
	exps := map[string][]int{}
	var keys []string
	for a := range z1 {
		for b := a; b < len(z1); b++ {
			e := sos.AddExp(z1[a], z1[b])
			k := sos.Key(e)
			if _, ok := exps[k]; !ok {
				keys = append(keys, k)
				exps[k] = e
			}
			w, g := 2.0, g1.At(a, b)
			if a == b {
				w = 1
			}
			if a == b && sos.Degree(z1[a]) == 1 {
				g += t
			}
			coef[k] += w * g
		}
	}
	var cmax float64
	for _, c := range coef {
		cmax = math.Max(cmax, math.Abs(c))
	}
	prev := ""
	res.Reason = "no rounding of the SDP's V was proven"
	for _, bits := range []int{4, 6, 8, 12, 16, 24, 32} {
		if err := ctx.Err(); err != nil {
			return err
		}
		v := poly.Zero(r)
		for _, k := range keys {
			q := math.Round(math.Ldexp(coef[k]/cmax, bits))
			if q == 0 {
				continue
			}
			c := new(big.Rat).SetFrac(big.NewInt(int64(q)), new(big.Int).Lsh(big.NewInt(1), uint(bits)))
			v = new(poly.Poly).Add(v, poly.Monomial(r, exps[k], c))
		}
		vf := poly.FromPoly(v)
		if m.AtGiven {
			vf = vf.ComposeStates(unshift, has)
		}
		if s := vf.String(); s == prev {
			continue
		} else {
			prev = s
		}
		res.Sizes.Roundings++
		done, err := res.try(ctx, m, opts, vf)
		if err != nil {
			return err
		}
		if done {
			res.Sizes.Bits, res.Reason = bits, ""
			return nil
		}
	}
	return nil
}

// try proves one rounded V: the direct method, else the box certificate.
func (res *Result) try(ctx context.Context, m *model.Model, opts Options, v poly.RatFunc) (bool, error) {
	mc := *m
	mc.V = &v
	dr, err := direct.CheckPaving(ctx, &mc, opts.Source, direct.PaveOptions{})
	if err != nil {
		if ctx.Err() != nil {
			return false, ctx.Err()
		}
		res.Reason = "the direct method on the rounded V: " + err.Error()
		return false, nil
	}
	res.V, res.Direct = v, dr
	if dr.Verdict == checker.VerdictHolds && dr.Claim == checker.KindGlobal {
		// direct.CheckPaving has had the kernel agree already.
		res.Doc, res.Outcome, res.Method = dr.Doc, dr.Check, MethodDirect
		return true, nil
	}
	kind, ok := formOfV(dr)
	if !ok {
		res.Reason = "the rounded V is not proven positive definite: " + dr.Reason
		return false, nil
	}
	base := dr.Doc
	if kind == checker.KindLocal {
		// V's form is only its quadratic part: look for a Gram matrix of
		// the whole V, which makes the claim global.
		if doc, ok := wholeV(ctx, &mc, dr, opts); ok {
			base, kind = doc, checker.KindGlobal
		}
	}
	bm, err := boxsos.Find(ctx, &mc)
	if err != nil {
		if ctx.Err() != nil {
			return false, ctx.Err()
		}
		res.Reason = "no box certificate for the rounded V: " + err.Error()
		return false, nil
	}
	doc, err := boxsos.Certify(base, bm)
	if err != nil {
		res.Reason = "the box certificate for the rounded V: " + err.Error()
		return false, nil
	}
	out := checker.Verify(doc)
	if err := certify.Agrees(out, checker.VerdictHolds, kind); err != nil {
		return false, err
	}
	res.Doc, res.Outcome, res.Method = doc, out, MethodBoxSOS
	return true, nil
}

// formOfV says whether the direct method proved V positive definite (a
// form of V whose minors are positive numbers: V's coefficients carry no
// parameter) and the kind of claim that form supports with a definite
// −V̇ (the kernel's rule, checker's conclude): global when V is quadratic
// at the equilibrium or its form is a Gram matrix of the whole V (radially
// unbounded), else local.
func formOfV(dr *direct.Result) (string, bool) {
	for _, f := range dr.Forms {
		if f.Name != "V" {
			continue
		}
		for _, q := range f.Minors {
			if !q.IsPoly() || !q.Num.IsConst() || q.Num.ConstTerm().Sign() <= 0 {
				return "", false
			}
		}
		if f.Basis != nil || dr.HigherV.IsZero() {
			return checker.KindGlobal, true
		}
		return checker.KindLocal, true
	}
	return "", false
}

// wholeV returns dr's certificate with V's form replaced by a Gram matrix
// of the whole V. V has constant coefficients, so its form and the minors'
// conditions are claims about V alone: the direct method proves them on
// the model with every parameter fixed at its range's lower end, where the
// search for Gram matrices of whole functions applies (it needs a
// polynomial free of parameters), and the kernel re-checks them in the
// model with the parameters free.
func wholeV(ctx context.Context, m *model.Model, dr *direct.Result, opts Options) (*claims.Document, bool) {
	var at []model.Setting
	for _, p := range m.FreeParams() {
		at = append(at, model.Setting{Name: p.Name, Value: p.Range.Lo.Value})
	}
	fixed, err := model.FixParams(m, at)
	if err != nil {
		return nil, false
	}
	fr, err := direct.CheckPaving(ctx, fixed, opts.Source, direct.PaveOptions{})
	if err != nil || fr.Doc == nil {
		return nil, false
	}
	if kind, ok := formOfV(fr); !ok || kind != checker.KindGlobal {
		return nil, false
	}
	out := *dr.Doc
	out.Claims = nil
	for _, c := range dr.Doc.Claims {
		if _, ok := c.(*claims.OrbitalDerivative); ok {
			out.Claims = append(out.Claims, c)
		}
	}
	for _, c := range fr.Doc.Claims {
		switch c := c.(type) {
		case *claims.MonomialGram:
			if c.Of == "V" {
				out.Claims = append(out.Claims, c)
			}
		case *claims.MarginGram:
			if c.Of == "V" {
				out.Claims = append(out.Claims, c)
			}
		case *claims.MinorCondition:
			if c.Form == "V" {
				out.Claims = append(out.Claims, c)
			}
		}
	}
	return &out, true
}

// centred returns the substitution xᵢ ↦ xᵢ − x*ᵢ of the states (for
// ComposeStates), which takes a polynomial in coordinates centred at the
// equilibrium to the model's coordinates.
func centred(m *model.Model) ([]poly.RatFunc, []bool) {
	r := m.Ring
	has := make([]bool, r.NumVars())
	unshift := make([]poly.RatFunc, r.NumVars())
	for i := range m.States {
		has[i] = true
		unshift[i] = poly.FromPoly(poly.Var(r, i)).Sub(m.At[i])
	}
	return unshift, has
}

// monomials returns the exponents, over the nv variables of the ring, of
// the monomials of the first ns variables (the states) of degree 1 to d,
// by degree: those of degree k are those of degree k − 1 times a state
// at or after their last one, so each comes once.
func monomials(ns, nv, d int) [][]int {
	var out, last [][]int
	last = [][]int{make([]int, nv)}
	for range d {
		var next [][]int
		for _, e := range last {
			from := 0
			for j := range ns {
				if e[j] > 0 {
					from = j
				}
			}
			for j := from; j < ns; j++ {
				f := append([]int(nil), e...)
				f[j]++
				next = append(next, f)
			}
		}
		out, last = append(out, next...), next
	}
	return out
}
