package sossearch

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/big"
	"time"

	"github.com/lyacert/lyacert/certify/direct"
	"github.com/lyacert/lyacert/certify/sdp"
	"github.com/lyacert/lyacert/certify/sos"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// Options control Search.
type Options struct {
	// Degree is the degree 2d of V, even and at least 2.
	Degree int
	// Source names the model in the certificate.
	Source string
	// SDP is passed to the solver.
	SDP *sdp.Options
}

// Sizes describe the work of a search.
type Sizes struct {
	BasisV      int // monomials of z₁ (V = z₁ᵀG₁z₁)
	BasisVdot   int // monomials of z₂ (−V̇ = z₂ᵀG₂z₂), after pruning
	Low         int // ℓ: the lowest degree in z₂, −V̇ ≥ t·Σyᵢ^{2ℓ}
	Constraints int
	Blocks      []int
	Iterations  int
	Margin      float64 // the solver's t
	Bits        int     // V's coefficients rounded to multiples of 2^−Bits (relative)
	Solve       time.Duration
	Round       time.Duration // rounding and the exact check (direct.Check)
}

// Result is the outcome of Search. Check is the direct method's result for
// the rounded V (its certificate re-checked by the kernel); nil when the
// SDP found no V with a positive margin.
type Result struct {
	V       poly.RatFunc
	Check   *direct.Result
	Sizes   Sizes
	Status  sdp.Status
	Problem *sdp.Problem // the last SDP solved, for export
	Reason  string       // why no V was proven, "" when one was
}

// Search looks for V of degree opts.Degree with V and −V̇ positive definite
// (see the package documentation) and proves the rounded V with
// direct.Check. Errors are for models it cannot apply to.
func Search(ctx context.Context, m *model.Model, opts Options) (*Result, error) {
	if len(m.FreeParams()) > 0 {
		return nil, errors.New("find --degree needs every parameter fixed (use --set NAME=VALUE)")
	}
	if opts.Degree < 2 || opts.Degree%2 != 0 {
		return nil, fmt.Errorf("--degree %d: the degree of V must be even and at least 2", opts.Degree)
	}
	if err := m.CheckEquilibrium(); err != nil {
		return nil, err
	}
	r := m.Ring
	ns := len(m.States)
	d := opts.Degree / 2
	z1 := sos.Monomials(ns, 1, d)
	if len(z1) > 400 {
		return nil, fmt.Errorf("--degree %d with %d states: %d monomials in V's basis, too many", opts.Degree, ns, len(z1))
	}
	// Derivatives of the monomials of V, in coordinates at the equilibrium.
	has := make([]bool, r.NumVars())
	unshift := make([]poly.RatFunc, r.NumVars())
	for i := range ns {
		has[i] = true
		unshift[i] = poly.FromPoly(poly.Var(r, i)).Sub(m.At[i])
	}
	deriv := map[string]map[string]float64{}
	support := map[string][]int{}
	pairExp := func(a, b int) []int {
		e := make([]int, ns)
		for i := range e {
			e[i] = z1[a][i] + z1[b][i]
		}
		return e
	}
	for a := range z1 {
		for b := a; b < len(z1); b++ {
			e := pairExp(a, b)
			k := sos.Key(e)
			if _, ok := deriv[k]; ok {
				continue
			}
			mono := poly.FromPoly(poly.Monomial(r, full(e, r.NumVars()), big.NewRat(1, 1)))
			if m.AtGiven {
				mono = mono.ComposeStates(unshift, has)
			}
			s := m.Shift(m.Derivative(mono))
			if !s.IsPoly() {
				return nil, errors.New("find --degree needs a polynomial vector field (it has denominators)")
			}
			terms := map[string]float64{}
			for _, t := range s.Num.Terms() {
				ex := t.Exp[:ns]
				f, _ := t.Coef.Float64()
				terms[sos.Key(ex)] = f
				support[sos.Key(ex)] = append([]int(nil), ex...)
			}
			deriv[k] = terms
		}
	}
	if len(support) == 0 {
		return &Result{Reason: "V̇ vanishes identically for every V of this degree"}, nil
	}
	// The candidate basis of −V̇: certify/sos's pruning applied to a
	// polynomial with every possible term.
	all := poly.Zero(r)
	for _, e := range support {
		all.Add(all, poly.Monomial(r, full(e, r.NumVars()), big.NewRat(1, 1)))
	}
	g, _, err := sos.NewGram(all, 5000)
	if err != nil {
		return nil, err
	}
	res := &Result{}
	res.Sizes.BasisV = len(z1)
	// Attempts: the whole pruned basis (ℓ = 1); without the monomials
	// whose diagonal the first solution forces to zero (a monomial of
	// degree 1 whose square −V̇ cannot contain, as for V̇ = −2x² − 8y⁴);
	// without every monomial of degree 1 (ℓ = 2, a centre).
	var zero map[string]bool
	for attempt := 0; attempt < 3; attempt++ {
		low := 1
		if attempt == 2 {
			low = 2
		}
		var z2 [][]int
		for _, e := range g.Basis {
			if sos.Degree(e) >= low && !(attempt == 1 && zero[sos.Key(e)]) {
				z2 = append(z2, e)
			}
		}
		if len(z2) == 0 || (attempt == 1 && len(zero) == 0) {
			continue
		}
		prob := program(z1, z2, deriv, support, pairExp)
		res.Problem = sdp.PositiveMarginProblem(prob, 1)
		res.Sizes.BasisVdot, res.Sizes.Low, res.Sizes.Constraints = len(z2), low, len(prob.A)
		start := time.Now()
		// A positive margin is all a certificate can use: t ≥ 0 converges
		// where the free margin's split variable stalls; the free margin
		// (whose solution reveals the forced zeros of the next attempt)
		// only when that finds none.
		mr, err := sdp.SolvePositiveMargin(ctx, prob, 1, opts.SDP)
		if st := mr.Inner.Status; err == nil && !((st == sdp.Optimal || st == sdp.Stalled || st == sdp.IterationLimit) && mr.T > 1e-7) {
			res.Problem = sdp.MarginProblem(prob, 1)
			mr, err = sdp.SolveMargin(ctx, prob, 1, opts.SDP)
		}
		res.Sizes.Solve += time.Since(start)
		if err != nil {
			return nil, err
		}
		res.Status = mr.Inner.Status
		res.Sizes.Iterations, res.Sizes.Margin = mr.Inner.Iterations, mr.T
		res.Sizes.Blocks = res.Sizes.Blocks[:0]
		for _, b := range mr.Inner.X {
			if b.Diag {
				res.Sizes.Blocks = append(res.Sizes.Blocks, -b.N)
			} else {
				res.Sizes.Blocks = append(res.Sizes.Blocks, b.N)
			}
		}
		if mr.T <= 1e-7 {
			if attempt == 0 {
				zero = nearZeroDiagonal(z2, mr.X[1])
			}
			continue
		}
		start = time.Now()
		err = res.prove(m, opts, z1, mr.X[0], unshift, has)
		res.Sizes.Round = time.Since(start)
		return res, err
	}
	res.Reason = fmt.Sprintf("the SDP found no V of degree %d with V and −V̇ positive definite (solver: %v, margin %.3g); numerical evidence, not a proof that none exists", opts.Degree, res.Status, res.Sizes.Margin)
	return res, nil
}

// program builds the margin SDP's feasibility part: blocks G₁ (V) and G₂
// (−V̇); one equation per monomial γ of −V̇,
// Σ_{z₂ pairs} G₂ + Σ_{z₁ pairs a ≤ b} [y^γ]S_{z_a z_b}·G₁_ab = 0 (off-diagonal
// entries count twice, as in the SDPA format), and tr G₁ = n₁.
func program(z1, z2 [][]int, deriv map[string]map[string]float64, support map[string][]int, pairExp func(a, b int) []int) *sdp.Problem {
	prob := &sdp.Problem{Blocks: []int{len(z1), len(z2)}}
	rows := map[string]sdp.Matrix{}
	var order []string
	add := func(k string, e sdp.Entry) {
		if _, ok := rows[k]; !ok {
			order = append(order, k)
		}
		rows[k] = append(rows[k], e)
	}
	ns := len(z1[0])
	for a := range z2 {
		for b := a; b < len(z2); b++ {
			e := make([]int, ns)
			for i := range e {
				e[i] = z2[a][i] + z2[b][i]
			}
			add(sos.Key(e), sdp.Entry{Block: 1, I: a, J: b, V: 1})
		}
	}
	for a := range z1 {
		for b := a; b < len(z1); b++ {
			for k, c := range deriv[sos.Key(pairExp(a, b))] {
				if c != 0 {
					add(k, sdp.Entry{Block: 0, I: a, J: b, V: c})
				}
			}
		}
	}
	for _, k := range order {
		prob.A = append(prob.A, rows[k])
		prob.B = append(prob.B, 0)
	}
	var tr sdp.Matrix
	for i := range z1 {
		tr = append(tr, sdp.Entry{Block: 0, I: i, J: i, V: 1})
	}
	prob.A = append(prob.A, tr)
	prob.B = append(prob.B, float64(len(z1)))
	return prob
}

// prove rounds V = z₁ᵀG₁z₁ to rationals with growing precision and checks
// each rounding with the direct method, until one holds globally (else the
// first that holds at all, else the last).
func (res *Result) prove(m *model.Model, opts Options, z1 [][]int, g1 sdp.Block, unshift []poly.RatFunc, has []bool) error {
	r := m.Ring
	ns := len(m.States)
	coef := map[string]float64{}
	exps := map[string][]int{}
	var keys []string
	for a := range z1 {
		for b := a; b < len(z1); b++ {
			e := make([]int, ns)
			for i := range e {
				e[i] = z1[a][i] + z1[b][i]
			}
			k := sos.Key(e)
			if _, ok := exps[k]; !ok {
				keys = append(keys, k)
				exps[k] = e
			}
			w := 2.0
			if a == b {
				w = 1
			}
			coef[k] += w * g1.At(a, b)
		}
	}
	var cmax float64
	for _, c := range coef {
		cmax = math.Max(cmax, math.Abs(c))
	}
	var best *direct.Result
	var bestV poly.RatFunc
	prev := ""
	for _, bits := range []int{4, 6, 8, 12, 16, 24, 32} {
		v := poly.Zero(r)
		for _, k := range keys {
			q := math.Round(math.Ldexp(coef[k]/cmax, bits))
			if q == 0 {
				continue
			}
			c := new(big.Rat).SetFrac(new(big.Int).SetInt64(int64(q)), new(big.Int).Lsh(big.NewInt(1), uint(bits)))
			v.Add(v, poly.Monomial(r, full(exps[k], r.NumVars()), c))
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
		mc := *m
		mc.V = &vf
		cr, err := direct.Check(&mc, opts.Source)
		if err != nil {
			return err
		}
		if cr.Verdict == checker.VerdictHolds && (best == nil || best.Verdict != checker.VerdictHolds) {
			best, bestV, res.Sizes.Bits = cr, vf, bits
		}
		if cr.Verdict == checker.VerdictHolds && cr.Claim == checker.KindGlobal {
			break
		}
		if best == nil {
			best, bestV, res.Sizes.Bits = cr, vf, bits
		}
	}
	res.Check, res.V = best, bestV
	if best.Verdict != checker.VerdictHolds {
		res.Reason = "the rounded V was not proven: " + best.Reason
	}
	if best.SDP != nil {
		res.Problem = best.SDP
	}
	return nil
}

// nearZeroDiagonal returns the monomials of degree 1 whose diagonal entry
// of G₂ is negligible against the largest.
func nearZeroDiagonal(z2 [][]int, g2 sdp.Block) map[string]bool {
	var dmax float64
	for i := range z2 {
		dmax = math.Max(dmax, math.Abs(g2.At(i, i)))
	}
	out := map[string]bool{}
	for i, e := range z2 {
		if sos.Degree(e) == 1 && math.Abs(g2.At(i, i)) <= 1e-6*dmax {
			out[sos.Key(e)] = true
		}
	}
	return out
}

func full(e []int, n int) []int {
	out := make([]int, n)
	copy(out, e)
	return out
}
