package basin

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/big"

	"github.com/lyacert/lyacert/certify/direct"
	"github.com/lyacert/lyacert/certify/sdp"
	"github.com/lyacert/lyacert/certify/sos"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

// errNoSProcedure says that the S-procedure found no level: numerical
// evidence at most, never a proof that there is none.
var errNoSProcedure = errors.New("the S-procedure certified no level")

// sproc is the S-procedure's search for one model: V and −V̇ in y = x − x*,
// the bases of the multiplier s (z₁) and of σ (z₀) as exponents over the
// ring's variables, and the margin's monomials yᵢ².
type sproc struct {
	r          *poly.Ring
	v, nvd     *poly.Poly
	z0, z1     [][]int
	margin     [][]int
	scale      float64 // the largest coefficient of −V̇, for tolerances
	solves     int     // semidefinite programs solved
	degS, degR int     // the degrees of s and σ
}

// newSProc sets up the search: s of degree 2d₁ with 2d₁ + deg V ≥ deg(−V̇)
// (d₁ ≥ 1, raised by extra), σ of the degree 2d₀ of the identity's other terms, both in
// every monomial of degree 1 to d (s and σ vanish at y = 0, as the identity
// forces: there −V̇ = V = 0).
func newSProc(d *direct.Result, extra int) (*sproc, error) {
	v, nvd := d.Shifted.V, d.Shifted.Vdot.Neg()
	if !v.IsPoly() || !nvd.IsPoly() || nvd.Num.IsZero() {
		return nil, errors.New("V and V̇ must be polynomials")
	}
	r := v.Num.Ring()
	if r.NumVars() != r.NumStates() {
		return nil, errors.New("the S-procedure needs every parameter fixed")
	}
	dv, dd := v.Num.Degree(), nvd.Num.Degree()
	d1 := max(1, (dd-dv+1)/2) + extra
	d0 := (max(dd, 2*d1+dv) + 1) / 2
	p := &sproc{r: r, v: v.Num, nvd: nvd.Num, z0: sos.Monomials(r.NumStates(), 1, d0), z1: sos.Monomials(r.NumStates(), 1, d1), degS: 2 * d1, degR: 2 * d0}
	if len(p.z0)+len(p.z1) > 300 {
		return nil, fmt.Errorf("Gram matrices of order %d and %d, too large", len(p.z0), len(p.z1))
	}
	for i := range r.NumStates() {
		e := make([]int, r.NumStates())
		e[i] = 2
		p.margin = append(p.margin, e)
	}
	for _, t := range p.nvd.Terms() {
		f, _ := t.Coef.Float64()
		p.scale = max(p.scale, math.Abs(f))
	}
	return p, nil
}

// problem is the SDP at level c: blocks G₀ (σ), G₁ (s) and (ε, slack);
// one equation per monomial γ,
//
//	[z₀ᵀG₀z₀]_γ + [z₁ᵀG₁z₁·(c − V)]_γ + ε·[γ in the margin] = [−V̇]_γ,
//
// and ε + slack = scale; maximise ε.
func (p *sproc) problem(c float64) *sdp.Problem {
	prob := &sdp.Problem{Blocks: []int{len(p.z0), len(p.z1), -2}}
	row := sos.NewRows(prob).Row
	for _, t := range p.nvd.Terms() {
		prob.B[row(t.Exp)], _ = t.Coef.Float64()
	}
	for i := range p.z0 {
		for j := i; j < len(p.z0); j++ {
			at := row(sos.AddExp(p.z0[i], p.z0[j]))
			prob.A[at] = append(prob.A[at], sdp.Entry{Block: 0, I: i, J: j, V: 1})
		}
	}
	cv := new(poly.Poly).Sub(poly.Const(p.r, new(big.Rat).SetFloat64(c)), p.v)
	for i := range p.z1 {
		for j := i; j < len(p.z1); j++ {
			for _, t := range cv.Terms() {
				f, _ := t.Coef.Float64()
				at := row(sos.AddExp(sos.AddExp(p.z1[i], p.z1[j]), t.Exp))
				prob.A[at] = append(prob.A[at], sdp.Entry{Block: 1, I: i, J: j, V: f})
			}
		}
	}
	for _, e := range p.margin {
		at := row(e)
		prob.A[at] = append(prob.A[at], sdp.Entry{Block: 2, I: 0, J: 0, V: 1})
	}
	prob.A = append(prob.A, sdp.Matrix{{Block: 2, I: 0, J: 0, V: 1}, {Block: 2, I: 1, J: 1, V: 1}})
	prob.B = append(prob.B, p.scale)
	prob.C = sdp.Matrix{{Block: 2, I: 0, J: 0, V: 1}}
	return prob
}

// marginAt solves the SDP at level c and returns the largest ε found (0
// when the solver does not reach optimality) with the problem.
func (p *sproc) marginAt(ctx context.Context, c float64) (float64, *sdp.Problem, error) {
	prob := p.problem(c)
	p.solves++
	res, err := sdp.Solve(ctx, prob, nil)
	if err != nil {
		return 0, nil, err
	}
	if res.Status != sdp.Optimal {
		return 0, prob, nil
	}
	return res.X[2].Data[0], prob, nil
}

// feasible is the bisection's test: a margin clearly above the solver's
// tolerance, so that rounding has room.
func (p *sproc) feasible(eps float64) bool { return eps > 1e-7*p.scale }

// search bisects on c in [lo, hi] (lo feasible or 0) until the bracket is
// within rel of hi, then rounds to an exact certificate at a short decimal
// level just below the best feasible one, stepping down when rounding
// fails. It returns the claim and its level.
func (p *sproc) search(ctx context.Context, lo, hi, rel float64) (*claims.SublevelSProcedure, *big.Rat, error) {
	top := hi
	for hi-lo > rel*hi && p.solves < 40 && (lo > 0 || hi > 1e-6*top) {
		mid := (lo + hi) / 2
		if lo == 0 {
			mid = hi / 2
		}
		eps, _, err := p.marginAt(ctx, mid)
		if err != nil {
			return nil, nil, err
		}
		if p.feasible(eps) {
			lo = mid
		} else {
			hi = mid
		}
	}
	for try := 0; try < 6 && lo > 0; try++ {
		c := below(new(big.Rat).SetFloat64(lo))
		cf, _ := c.Float64()
		cl, err := p.exact(ctx, c)
		if err != nil {
			return nil, nil, err
		}
		if cl != nil {
			return cl, c, nil
		}
		lo = cf * (1 - rel/2)
	}
	return nil, nil, errNoSProcedure
}

// exact finds the certificate at the exact level c: ε a power of two at
// most half the SDP's, a point deep inside the cones with ε fixed
// (sdp.SolvePositiveMargin), G₁ rounded to multiples of 2^−bits, and G₀
// the projection of its rounding onto the Gram matrices of the exact
// residual −V̇ − m − s·(c − V) (sos.Gram.Project); exact LDLᵀ with D ≥ 0
// must then hold for both. nil when no precision gives one.
func (p *sproc) exact(ctx context.Context, c *big.Rat) (*claims.SublevelSProcedure, error) {
	cf, _ := c.Float64()
	best, prob, err := p.marginAt(ctx, cf)
	if err != nil || !p.feasible(best) {
		return nil, err
	}
	eps := new(big.Rat).SetFloat64(math.Ldexp(1, math.Ilogb(best/2)))
	ef, _ := eps.Float64()
	fixed := &sdp.Problem{Blocks: prob.Blocks[:2], B: append([]float64(nil), prob.B[:len(prob.B)-1]...)}
	for k, a := range prob.A[:len(prob.A)-1] {
		var row sdp.Matrix
		for _, e := range a {
			if e.Block < 2 {
				row = append(row, e)
			} else {
				fixed.B[k] -= ef
			}
		}
		fixed.A = append(fixed.A, row)
	}
	p.solves++
	mr, err := sdp.SolvePositiveMargin(ctx, fixed, p.scale, nil)
	if err != nil {
		return nil, err
	}
	if mr.Inner.Status != sdp.Optimal || !(mr.T > 0) {
		return nil, nil
	}
	m := poly.Zero(p.r)
	for _, e := range p.margin {
		m = new(poly.Poly).Add(m, poly.Monomial(p.r, e, eps))
	}
	target := new(poly.Poly).Sub(p.nvd, m)
	cv := new(poly.Poly).Sub(poly.Const(p.r, c), p.v)
	for _, bits := range []int{10, 14, 18, 24, 30, 38} {
		g1 := sos.RoundBlock(mr.X[1], bits)
		s := poly.Bilinear(poly.ConstInt(p.r, 1), g1, p.monos(p.z1))
		resid := new(poly.Poly).Sub(target, new(poly.Poly).Mul(s, cv))
		g0 := sos.RoundBlock(mr.X[0], bits)
		if !sos.ProjectOnto(g0, p.z0, resid) {
			continue
		}
		sq1, ok1 := p.squares(p.z1, g1)
		sq0, ok0 := p.squares(p.z0, g0)
		if ok0 && ok1 {
			return &claims.SublevelSProcedure{Level: c.RatString(), Margin: m.String(), Multiplier: sq1, Remainder: sq0}, nil
		}
	}
	return nil, nil
}

func (p *sproc) monos(z [][]int) []*poly.Poly {
	out := make([]*poly.Poly, len(z))
	for i, e := range z {
		out[i] = poly.Monomial(p.r, e, big.NewRat(1, 1))
	}
	return out
}

// squares factors g exactly and writes zᵀgz without the basis elements
// whose rows of g vanish (they add nothing, and a claim should hold no
// number that does not matter); false unless g = LDLᵀ with D ≥ 0.
func (p *sproc) squares(z [][]int, g [][]*big.Rat) (claims.SquareSum, bool) {
	var keep []int
	for i := range g {
		for j := range g[i] {
			if g[i][j].Sign() != 0 {
				keep = append(keep, i)
				break
			}
		}
	}
	if len(keep) == 0 {
		return claims.SquareSum{}, false
	}
	h := make([][]*big.Rat, len(keep))
	for a, i := range keep {
		for _, j := range keep {
			h[a] = append(h[a], g[i][j])
		}
	}
	l, d, ok, _ := poly.RatLDL(h)
	for i := 0; ok && i < len(d); i++ {
		ok = d[i].Sign() >= 0
	}
	if !ok {
		return claims.SquareSum{}, false
	}
	var out claims.SquareSum
	for a, i := range keep {
		out.Basis = append(out.Basis, poly.Monomial(p.r, z[i], big.NewRat(1, 1)).String())
		out.Gram, out.L = append(out.Gram, ratStrings(h[a])), append(out.L, ratStrings(l[a]))
		out.D = append(out.D, d[a].RatString())
	}
	return out, true
}

func ratStrings(xs []*big.Rat) []string {
	out := make([]string, len(xs))
	for i, x := range xs {
		out[i] = x.RatString()
	}
	return out
}
