package boxsos

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/big"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/certify/sdp"
	"github.com/lyacert/lyacert/certify/sos"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// ErrNotFound says that the search found no certificate: numerical
// evidence at most, never a proof that none exists.
var ErrNotFound = errors.New("no box multiplier certificate found")

// maxOrder bounds the sum of the orders of the Gram matrices.
const maxOrder = 400

// block is one sum of squares: its basis (exponents over the ring's
// variables) and its multiplier g (1 for σ₀).
type block struct {
	param string
	basis [][]int
	g     *poly.Poly
}

// Find looks for a box-multiplier certificate of −V̇ for m's candidate V.
// Every free parameter with a closed bounded range gets a multiplier.
func Find(ctx context.Context, m *model.Model) (*claims.BoxMultiplier, error) {
	if m.V == nil {
		return nil, errors.New("the model states no candidate V")
	}
	d := m.Shift(m.Derivative(*m.V)).Neg()
	if !d.IsPoly() {
		return nil, errors.New("−V̇ is not a polynomial at the equilibrium")
	}
	p, r := d.Num, d.Num.Ring()
	blocks, zx, pure, err := layout(m, p)
	if err != nil {
		return nil, err
	}
	// emax, the largest coefficient of −V̇, bounds ε for the solver only.
	emax := 0.0
	for _, t := range p.Terms() {
		f, _ := t.Coef.Float64()
		emax = max(emax, math.Abs(f))
	}
	marginExps := marginExponents(r, zx, pure)
	prob, rows := problem(p, blocks, marginExps, emax)
	for _, a := range prob.A {
		if len(a) == 0 {
			return nil, ErrNotFound // a term of −V̇ no product reaches
		}
	}
	res, err := sdp.Solve(ctx, prob, nil)
	if err != nil {
		return nil, err
	}
	nb := len(blocks)
	best := res.X[nb].Data[0]
	if res.Status != sdp.Optimal || !(best > 1e-9*emax) {
		return nil, ErrNotFound
	}
	eps := new(big.Rat).SetFloat64(math.Ldexp(1, math.Ilogb(best/2)))
	ef, _ := eps.Float64()
	// With ε fixed, a point deep inside the cones: X − tI ⪰ 0.
	fixed := &sdp.Problem{Blocks: prob.Blocks[:nb], B: append([]float64(nil), prob.B[:len(rows)]...)}
	for k, a := range prob.A[:len(rows)] {
		var row sdp.Matrix
		for _, e := range a {
			if e.Block < nb {
				row = append(row, e)
			} else {
				fixed.B[k] -= ef
			}
		}
		fixed.A = append(fixed.A, row)
	}
	xs := res.X[:nb]
	if mr, err := sdp.SolvePositiveMargin(ctx, fixed, emax, nil); err == nil && mr.Inner.Status == sdp.Optimal && mr.T > 0 {
		xs = mr.X
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	target := new(poly.Poly).Sub(p, marginPoly(r, zx, pure, eps))
	for _, bits := range []int{8, 12, 16, 20, 26, 34, 44} {
		if cl := exact(r, blocks, xs, target, bits); cl != nil {
			cl.Margin = marginPoly(r, zx, pure, eps).String()
			return cl, nil
		}
	}
	return nil, ErrNotFound
}

// layout returns the blocks of a certificate for a −V̇ with p's terms: σ₀
// and one σᵢ per free parameter with a closed bounded range (see the
// package comment for the bases), the state basis Z_x and, per state, the
// index in Z_x of its lowest pure power.
func layout(m *model.Model, p *poly.Poly) ([]block, [][]int, []int, error) {
	r := p.Ring()
	zx, err := stateBasis(p)
	if err != nil {
		return nil, nil, nil, err
	}
	pure, err := margin(p, zx)
	if err != nil {
		return nil, nil, nil, err
	}
	var params []int
	for i := r.NumStates(); i < r.NumVars(); i++ {
		params = append(params, i)
	}
	dp := max(1, (p.DegreeIn(r.ParamMask())+1)/2)
	blocks := []block{{basis: product(zx, paramMonomials(r.NumVars(), params, dp)), g: poly.ConstInt(r, 1)}}
	for _, pr := range m.Params {
		i, ok := r.Index(pr.Name)
		lo, hi := pr.Range.Lo, pr.Range.Hi
		if !ok || pr.Fixed != nil || lo.Inf != 0 || hi.Inf != 0 || lo.Open || hi.Open {
			continue
		}
		x := poly.Var(r, i)
		g := new(poly.Poly).Mul(new(poly.Poly).Sub(x, poly.Const(r, lo.Value)), new(poly.Poly).Sub(poly.Const(r, hi.Value), x))
		blocks = append(blocks, block{param: pr.Name, basis: product(zx, paramMonomials(r.NumVars(), params, dp-1)), g: g})
	}
	if len(blocks) == 1 {
		return nil, nil, nil, errors.New("no parameter has a closed bounded range")
	}
	order := 0
	for _, b := range blocks {
		order += len(b.basis)
	}
	if order > maxOrder {
		return nil, nil, nil, fmt.Errorf("Gram matrices of total order %d, more than %d", order, maxOrder)
	}
	return blocks, zx, pure, nil
}

// marginExponents returns the exponents of the margin's terms x_j^(2k_j),
// one per state, from the lowest pure powers of Z_x.
func marginExponents(r *poly.Ring, zx [][]int, pure []int) [][]int {
	var out [][]int
	for _, a := range pure {
		e := make([]int, r.NumVars())
		for j, k := range zx[a] {
			e[j] = 2 * k
		}
		out = append(out, e)
	}
	return out
}

// Multiplier is one sum of squares σ = zᵀGz of a box certificate: the
// exponents of its basis z over the ring's variables, and the factor it
// multiplies, (p − lo)(hi − p) for the parameter Param, 1 for σ₀ (Param "").
type Multiplier struct {
	Param string
	Basis [][]int
	G     *poly.Poly
}

// Multipliers returns the sums of squares a box certificate of a −V̇ with
// the terms of p would use (σ₀ first), and the exponents of the margin's
// terms, one per state. A search that does not know −V̇'s coefficients
// yet (V unknown) passes a p with every term −V̇ can have.
func Multipliers(m *model.Model, p *poly.Poly) ([]Multiplier, [][]int, error) {
	blocks, zx, pure, err := layout(m, p)
	if err != nil {
		return nil, nil, err
	}
	out := make([]Multiplier, len(blocks))
	for i, b := range blocks {
		out[i] = Multiplier{Param: b.param, Basis: b.basis, G: b.g}
	}
	return out, marginExponents(p.Ring(), zx, pure), nil
}

// stateBasis returns Z_x: exponents over all variables, zero on the
// parameters, pruned by diagonal consistency (see the package comment).
func stateBasis(p *poly.Poly) ([][]int, error) {
	r := p.Ring()
	ns, nv := r.NumStates(), r.NumVars()
	top := make([]int, ns)
	lo, hi := math.MaxInt, 0
	have := map[string]bool{}
	for _, t := range p.Terms() {
		deg := 0
		for j := range ns {
			top[j] = max(top[j], t.Exp[j])
			deg += t.Exp[j]
		}
		lo, hi = min(lo, deg), max(hi, deg)
		have[fmt.Sprint(t.Exp[:ns])] = true
	}
	if p.IsZero() || lo < 2 {
		return nil, errors.New("−V̇ has terms of degree below 2 in the states")
	}
	var out [][]int
	e := make([]int, nv)
	var walk func(j, deg int)
	walk = func(j, deg int) {
		if j == ns {
			if 2*deg >= lo && 2*deg <= hi {
				out = append(out, append([]int(nil), e...))
			}
			return
		}
		for k := 0; 2*k <= top[j] && 2*(deg+k) <= hi; k++ {
			e[j] = k
			walk(j+1, deg+k)
		}
		e[j] = 0
	}
	walk(0, 0)
	for changed := true; changed; {
		changed = false
		for a := range out {
			double := make([]int, ns)
			for j := range ns {
				double[j] = 2 * out[a][j]
			}
			if have[fmt.Sprint(double)] {
				continue
			}
			reached := false
			for b := range out {
				for c := b + 1; c < len(out) && !reached; c++ {
					same := b != a && c != a
					for j := 0; same && j < ns; j++ {
						same = out[b][j]+out[c][j] == double[j]
					}
					reached = same
				}
			}
			if !reached {
				out = append(out[:a], out[a+1:]...)
				changed = true
				break
			}
		}
	}
	if len(out) == 0 {
		return nil, errors.New("no monomial basis in the states")
	}
	return out, nil
}

// margin picks, for every state, the lowest pure power x_j^k of Z_x: the
// margin's term for that state is ε·x_j^(2k).
func margin(p *poly.Poly, zx [][]int) ([]int, error) {
	ns := p.Ring().NumStates()
	pure := make([]int, ns)
	for j := range ns {
		pure[j] = -1
		for a, e := range zx {
			deg := 0
			for _, k := range e {
				deg += k
			}
			if e[j] == deg && (pure[j] < 0 || e[j] < zx[pure[j]][j]) {
				pure[j] = a
			}
		}
		if pure[j] < 0 {
			return nil, fmt.Errorf("no pure power of state %s in the basis", p.Ring().Name(j))
		}
	}
	return pure, nil
}

func marginPoly(r *poly.Ring, zx [][]int, pure []int, eps *big.Rat) *poly.Poly {
	m := poly.Zero(r)
	for _, a := range pure {
		e := make([]int, r.NumVars())
		for j, k := range zx[a] {
			e[j] = 2 * k
		}
		m = new(poly.Poly).Add(m, poly.Monomial(r, e, eps))
	}
	return m
}

// paramMonomials lists the exponents of the monomials of degree ≤ d in the
// parameters params.
func paramMonomials(nv int, params []int, d int) [][]int {
	out := [][]int{make([]int, nv)}
	for range d {
		var next [][]int
		for _, e := range out {
			last := -1
			for k, i := range params {
				if e[i] > 0 {
					last = k
				}
			}
			deg := 0
			for _, i := range params {
				deg += e[i]
			}
			if deg < d {
				for k := max(last, 0); k < len(params); k++ {
					f := append([]int(nil), e...)
					f[params[k]]++
					next = append(next, f)
				}
			}
		}
		out = append(out, next...)
		if len(next) == 0 {
			break
		}
		out = dedupe(out)
	}
	return out
}

func dedupe(es [][]int) [][]int {
	seen, out := map[string]bool{}, [][]int(nil)
	for _, e := range es {
		if k := fmt.Sprint(e); !seen[k] {
			seen[k] = true
			out = append(out, e)
		}
	}
	return out
}

func product(xs, ps [][]int) [][]int {
	var out [][]int
	for _, x := range xs {
		for _, q := range ps {
			e := make([]int, len(x))
			for i := range e {
				e[i] = x[i] + q[i]
			}
			out = append(out, e)
		}
	}
	return out
}

// problem sets up: one equation per monomial γ of (x, p),
// Σ_blocks Σ_{a≤b} w·G_ab = p_γ − ε·[γ in the margin], maximise ε ≤ emax.
func problem(p *poly.Poly, blocks []block, marginExps [][]int, emax float64) (*sdp.Problem, map[string]int) {
	prob := &sdp.Problem{}
	rs := sos.NewRows(prob)
	rows, row := rs.Index, rs.Row
	for _, t := range p.Terms() {
		f, _ := t.Coef.Float64()
		prob.B[row(t.Exp)] = f
	}
	for k, b := range blocks {
		prob.Blocks = append(prob.Blocks, len(b.basis))
		gs := b.g.Terms()
		for i := range b.basis {
			for j := i; j < len(b.basis); j++ {
				for _, gt := range gs {
					f, _ := gt.Coef.Float64()
					at := row(sos.AddExp(sos.AddExp(b.basis[i], b.basis[j]), gt.Exp))
					prob.A[at] = append(prob.A[at], sdp.Entry{Block: k, I: i, J: j, V: f})
				}
			}
		}
	}
	nb := len(blocks)
	prob.Blocks = append(prob.Blocks, -2) // ε and the slack of ε ≤ emax
	for _, e := range marginExps {
		at := row(e)
		prob.A[at] = append(prob.A[at], sdp.Entry{Block: nb, I: 0, J: 0, V: 1})
	}
	prob.A = append(prob.A, sdp.Matrix{{Block: nb, I: 0, J: 0, V: 1}, {Block: nb, I: 1, J: 1, V: 1}})
	prob.B = append(prob.B, emax)
	prob.C = sdp.Matrix{{Block: nb, I: 0, J: 0, V: 1}}
	return prob, rows
}

// exact rounds the σᵢ (i ≥ 1) to multiples of 2^−bits, makes σ₀ the
// Gram matrix of the exact residual by the projection onto its classes,
// and factors every Gram matrix exactly; nil when a pivot is negative or
// a monomial of the residual is out of σ₀'s reach.
func exact(r *poly.Ring, blocks []block, xs []sdp.Block, target *poly.Poly, bits int) *claims.BoxMultiplier {
	resid := target
	cl := &claims.BoxMultiplier{}
	grams := make([][][]*big.Rat, len(blocks))
	for k := len(blocks) - 1; k >= 0; k-- {
		b := blocks[k]
		z := make([]*poly.Poly, len(b.basis))
		for i, e := range b.basis {
			z[i] = poly.Monomial(r, e, big.NewRat(1, 1))
		}
		g := sos.RoundBlock(xs[k], bits)
		if k == 0 && !sos.ProjectOnto(g, b.basis, resid) {
			return nil
		}
		l, d, ok, _ := poly.RatLDL(g)
		for i := 0; ok && i < len(d); i++ {
			ok = d[i].Sign() >= 0
		}
		if !ok {
			return nil
		}
		grams[k] = g
		resid = new(poly.Poly).Sub(resid, poly.Bilinear(b.g, g, z))
		t := claims.Multiplied{Parameter: b.param, SquareSum: claims.SquareSum{Gram: strings(g), L: strings(l), D: []string{}}}
		for i := range z {
			t.Basis = append(t.Basis, z[i].String())
			t.D = append(t.D, d[i].RatString())
		}
		cl.Terms = append([]claims.Multiplied{t}, cl.Terms...)
	}
	if !resid.IsZero() {
		return nil
	}
	return cl
}

func strings(m [][]*big.Rat) [][]string {
	out := make([][]string, len(m))
	for i := range m {
		out[i] = make([]string, len(m[i]))
		for j, v := range m[i] {
			out[i][j] = v.RatString()
		}
	}
	return out
}

// Certify returns a certificate of the same model as doc, a certificate
// by the direct method: its derivative, V's form and V's conditions, with
// −V̇'s form, its conditions and every claim resting on them (regions,
// kernels, refutations) replaced by bm. The result is sealed, not checked.
func Certify(doc *claims.Document, bm *claims.BoxMultiplier) (*claims.Document, error) {
	out := *doc
	out.Digest, out.Signature, out.Claims = "", nil, []claims.Claim{}
	for _, c := range doc.Claims {
		switch c := c.(type) {
		case *claims.OrbitalDerivative:
			out.Claims = append(out.Claims, c)
		case *claims.QuadraticPart:
			if c.Of == "V" {
				out.Claims = append(out.Claims, c, bm)
			}
		case *claims.MonomialGram:
			if c.Of == "V" {
				out.Claims = append(out.Claims, c, bm)
			}
		case *claims.MarginGram:
			if c.Of == "V" {
				out.Claims = append(out.Claims, c, bm)
			}
		case *claims.MinorCondition:
			if c.Form == "V" {
				out.Claims = append(out.Claims, c)
			}
		}
	}
	if len(out.Claims) < 3 {
		return nil, errors.New("the certificate has no form of V")
	}
	return &out, certificates.Seal(&out)
}
