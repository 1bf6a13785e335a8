package sos

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/big"
	"slices"

	"github.com/lyacert/lyacert/certify/sdp"
	"github.com/lyacert/lyacert/poly"
)

// Options control Find. The zero value asks for the defaults.
type Options struct {
	// Margin asks for a certificate of p − ε·Σᵢ xᵢ^{2k} (2k = deg p) with a
	// rational ε > 0 chosen by the method, so that p is proven to exceed a
	// positive definite form rather than only to be non-negative.
	Margin bool
	// MaxBasis bounds the number of candidate monomials (default 2000).
	MaxBasis int
	// SDP is passed to the solver.
	SDP *sdp.Options
}

// Certificate is an exact Gram certificate p = zᵀ·G·z with G ≻ 0.
type Certificate struct {
	Gram    [][]*big.Rat
	Factor  LDL      // G = L·D·Lᵀ, every D[k] > 0
	Min     *big.Rat // the smallest pivot
	Epsilon *big.Rat // with Options.Margin: G is the Gram matrix of p − ε·Σ xᵢ^{2k}
	Bits    int      // rounding precision: entries were rounded to multiples of 2^−Bits before the projection
}

// Separation proves that p is not a sum of squares: a linear functional L
// on the monomials of the classes (L(x^γ) = Moments[γ]) with L(p) < 0 whose
// moment matrix M_ab = L(z_a·z_b) is positive definite. If p = zᵀGz with
// G ⪰ 0, then L(p) = ⟨M, G⟩ ≥ 0, a contradiction. The argument rests on
// the basis containing every monomial a Gram matrix of p can use (the
// half Newton polytope, Reznick 1978); a checker must re-derive that too.
type Separation struct {
	Moments map[string]*big.Rat // by the key of the exponent (see Key)
	Moment  [][]*big.Rat        // M in the basis
	Factor  LDL                 // M = L·D·Lᵀ, every D[k] > 0 (or M = 0, Factor empty)
	Value   *big.Rat            // L(p) < 0
	// Functional is Σ_γ L(x^γ)·x^γ, the same values as a polynomial of
	// p's ring (see poly.Pairing: L(p) = Pairing(p, Functional)).
	Functional *poly.Poly
}

// Sizes describes the work done.
type Sizes struct {
	Candidates  int   // monomials before pruning
	Basis       int   // monomials after pruning
	Constraints int   // equations of the Gram family (monomial classes)
	Blocks      []int // block orders of the solved SDP
	Iterations  int
	Margin      float64 // the solver's margin t: λmin(G) ≈ t
	// MarginIterations are those of the SDP of the margin form, when solved.
	MarginIterations int
}

// Result is the outcome of Find: a Certificate, a Separation proof, or neither
// (the method found no proof either way).
type Result struct {
	Vars        []int   // ring indices of the variables of the basis exponents
	Basis       [][]int // exponents of the monomials z, over Vars
	Certificate *Certificate
	NotSOS      *Separation
	// Margin is a certificate of p − ε·Σ z_a² ⪰ 0 (z_a the pure powers of
	// the basis), tried when there is neither a Certificate nor a Separation.
	Margin *MarginCertificate
	// Outside is a monomial of p (by Key) that no product of the basis
	// reaches: then no Gram matrix exists in it, plainly.
	Outside string
	Sizes   Sizes
	// SolverStatus is the status of the margin SDP.
	SolverStatus sdp.Status
	// Problem is the SDP that was solved (sdp.MarginProblem of the Gram
	// family), for export; nil when none was.
	Problem *sdp.Problem
}

// Key encodes an exponent vector for maps.
func Key(e []int) string { return fmt.Sprint(e) }

// Gram is the affine family {G : p = zᵀGz}: one equation per monomial
// class γ, Σ_{z_a z_b = x^γ} G_ab = p_γ over ordered pairs (a, b).
type Gram struct {
	Vars    []int
	Basis   [][]int
	Classes []Class
	// Outside lists the exponents of terms of p no product z_a z_b reaches.
	Outside [][]int
}

// Class is the set of positions (a ≤ b) whose monomial z_a·z_b is x^Exp,
// and the coefficient of x^Exp in p.
type Class struct {
	Exp   []int
	Pairs [][2]int
	Coef  *big.Rat
	// Count is the number of ordered pairs: two for a < b, one for a = b.
	Count int
}

// NewGram builds the pruned basis and the Gram family of p, which must be a
// polynomial in the state variables of its ring.
func NewGram(p *poly.Poly, maxBasis int) (*Gram, int, error) {
	if maxBasis <= 0 {
		maxBasis = 2000
	}
	r := p.Ring()
	ns := r.NumStates()
	vars := make([]int, ns)
	for i := range vars {
		vars[i] = i
	}
	terms := p.Terms()
	if len(terms) == 0 {
		return nil, 0, errors.New("sos: the zero polynomial")
	}
	supp := make([][]int, len(terms))
	coef := map[string]*big.Rat{}
	for t, term := range terms {
		for i := ns; i < len(term.Exp); i++ {
			if term.Exp[i] != 0 {
				return nil, 0, fmt.Errorf("sos: parameter %s occurs; fix the parameters first", r.Name(i))
			}
		}
		supp[t] = term.Exp[:ns]
		coef[Key(supp[t])] = term.Coef
	}
	lo, hi := make([]int, ns), make([]int, ns)
	dlo, dhi := math.MaxInt, 0
	for i := range lo {
		lo[i] = math.MaxInt
	}
	for _, e := range supp {
		d := 0
		for i, v := range e {
			lo[i], hi[i] = min(lo[i], v), max(hi[i], v)
			d += v
		}
		dlo, dhi = min(dlo, d), max(dhi, d)
	}
	// Candidates: 2α in the bounding box and the degree slab of the Newton
	// polytope N(p), a superset of the lattice points of ½N(p).
	var cand [][]int
	cur := make([]int, ns)
	var rec func(i, d int) error
	rec = func(i, d int) error {
		if i == ns {
			if 2*d >= dlo && 2*d <= dhi {
				cand = append(cand, slices.Clone(cur))
				if len(cand) > maxBasis {
					return fmt.Errorf("sos: more than %d candidate monomials", maxBasis)
				}
			}
			return nil
		}
		for v := (lo[i] + 1) / 2; 2*v <= hi[i] && 2*(d+v) <= dhi; v++ {
			cur[i] = v
			if err := rec(i+1, d+v); err != nil {
				return err
			}
		}
		cur[i] = 0
		return nil
	}
	if err := rec(0, 0); err != nil {
		return nil, 0, err
	}
	ncand := len(cand)
	// Diagonal-consistency pruning: if x^{2α} has coefficient 0 in p and
	// no two distinct basis elements multiply to it, G_αα = 0 is forced, so
	// for G ⪰ 0 the whole row vanishes and α can be dropped. At the fixed
	// point every vertex α of conv(basis) has p_{2α} ≠ 0 (a vertex is no
	// midpoint of two other points), so the basis lies in ½N(p).
	in := map[string]bool{}
	for _, a := range cand {
		in[Key(a)] = true
	}
	for changed := true; changed; {
		changed = false
		for _, a := range cand {
			ka := Key(a)
			if !in[ka] {
				continue
			}
			two := make([]int, ns)
			for i := range a {
				two[i] = 2 * a[i]
			}
			if c, ok := coef[Key(two)]; ok && c.Sign() != 0 {
				continue
			}
			reached := false
			other := make([]int, ns)
			for _, b := range cand {
				kb := Key(b)
				if !in[kb] || kb == ka {
					continue
				}
				ok := true
				for i := range b {
					other[i] = two[i] - b[i]
					if other[i] < 0 {
						ok = false
						break
					}
				}
				if ok && in[Key(other)] {
					reached = true
					break
				}
			}
			if !reached {
				delete(in, ka)
				changed = true
			}
		}
	}
	g := &Gram{Vars: vars}
	for _, a := range cand {
		if in[Key(a)] {
			g.Basis = append(g.Basis, a)
		}
	}
	idx := map[string]int{}
	for a := range g.Basis {
		for b := a; b < len(g.Basis); b++ {
			e := make([]int, ns)
			for i := range e {
				e[i] = g.Basis[a][i] + g.Basis[b][i]
			}
			k := Key(e)
			c, ok := idx[k]
			if !ok {
				c = len(g.Classes)
				idx[k] = c
				cf := new(big.Rat)
				if v, ok := coef[k]; ok {
					cf.Set(v)
				}
				g.Classes = append(g.Classes, Class{Exp: e, Coef: cf})
			}
			g.Classes[c].Pairs = append(g.Classes[c].Pairs, [2]int{a, b})
			if a == b {
				g.Classes[c].Count++
			} else {
				g.Classes[c].Count += 2
			}
		}
	}
	for _, e := range supp {
		if _, ok := idx[Key(e)]; !ok {
			g.Outside = append(g.Outside, e)
		}
	}
	return g, ncand, nil
}

// Problem returns the Gram feasibility problem as an SDP: one block of the
// basis' order, one constraint per class, C = 0.
func (g *Gram) Problem() *sdp.Problem {
	p := &sdp.Problem{Blocks: []int{len(g.Basis)}}
	for _, c := range g.Classes {
		var a sdp.Matrix
		for _, pr := range c.Pairs {
			a = append(a, sdp.Entry{Block: 0, I: pr[0], J: pr[1], V: 1})
		}
		f, _ := c.Coef.Float64()
		p.A = append(p.A, a)
		p.B = append(p.B, f)
	}
	return p
}

// Project sets G to its orthogonal (Frobenius) projection onto the affine
// family with coefficients coef (by class): the classes partition the
// entries and each equation sums one class with unit weights, so the
// projection adds (p_γ − Σ_class G)/Count to every entry of class γ
// (Peyrl & Parrilo 2008).
func (g *Gram) Project(G [][]*big.Rat, coef []*big.Rat) {
	s, d := new(big.Rat), new(big.Rat)
	for ci, c := range g.Classes {
		s.SetInt64(0)
		for _, pr := range c.Pairs {
			if pr[0] == pr[1] {
				s.Add(s, G[pr[0]][pr[0]])
			} else {
				s.Add(s, G[pr[0]][pr[1]])
				s.Add(s, G[pr[0]][pr[1]])
			}
		}
		d.Sub(coef[ci], s)
		if d.Sign() == 0 {
			continue
		}
		d.Quo(d, new(big.Rat).SetInt64(int64(c.Count)))
		for _, pr := range c.Pairs {
			v := new(big.Rat).Add(G[pr[0]][pr[1]], d)
			G[pr[0]][pr[1]] = v
			G[pr[1]][pr[0]] = v
		}
	}
}

// roundGram rounds x (dense, row-major n×n) to multiples of 2^−bits.
func roundGram(x []float64, n, bits int) [][]*big.Rat {
	den := new(big.Int).Lsh(big.NewInt(1), uint(bits))
	G := make([][]*big.Rat, n)
	for i := range G {
		G[i] = make([]*big.Rat, n)
	}
	for i := 0; i < n; i++ {
		for j := i; j < n; j++ {
			v := (x[i*n+j] + x[j*n+i]) / 2
			num, _ := new(big.Float).SetFloat64(math.Round(math.Ldexp(v, bits))).Int(nil)
			q := new(big.Rat).SetFrac(num, den)
			G[i][j], G[j][i] = q, q
		}
	}
	return G
}

// Find looks for an exact Gram certificate of p ≥ 0, and when there is
// none, for an exact proof that p is not a sum of squares in the pruned
// basis. Floating point only proposes (the SDP); both results are exact and
// checked here by exact LDLᵀ; an independent checker should recheck them.
func Find(ctx context.Context, p *poly.Poly, opts *Options) (*Result, error) {
	var o Options
	if opts != nil {
		o = *opts
	}
	g, ncand, err := NewGram(p, o.MaxBasis)
	if err != nil {
		return nil, err
	}
	res := &Result{Vars: g.Vars, Basis: g.Basis}
	res.Sizes.Candidates, res.Sizes.Basis, res.Sizes.Constraints = ncand, len(g.Basis), len(g.Classes)
	if len(g.Outside) > 0 {
		// A term of p that no product of the basis reaches: no Gram matrix
		// exists in it, plainly, and no certificate is needed for that (the
		// kernel's moment separation reads functionals on products of the
		// basis only).
		res.Outside = Key(g.Outside[0])
		return res, nil
	}
	if len(g.Basis) == 0 {
		return res, nil
	}
	prob := g.Problem()
	n := len(g.Basis)
	var trace float64
	for _, c := range g.Classes {
		if c.Pairs[0][0] == c.Pairs[0][1] || hasDiag(c) {
			f, _ := c.Coef.Float64()
			trace += f
		}
	}
	tmax := math.Max(1, 2*math.Abs(trace)/float64(n))
	res.Problem = sdp.MarginProblem(prob, tmax)
	mr, err := sdp.SolveMargin(ctx, prob, tmax, o.SDP)
	if err != nil {
		return nil, err
	}
	res.SolverStatus = mr.Inner.Status
	for _, b := range mr.Inner.X {
		if b.Diag {
			res.Sizes.Blocks = append(res.Sizes.Blocks, -b.N)
		} else {
			res.Sizes.Blocks = append(res.Sizes.Blocks, b.N)
		}
	}
	res.Sizes.Iterations = mr.Inner.Iterations
	res.Sizes.Margin = mr.T
	scale := math.Max(1, math.Abs(trace)/float64(n))
	if mr.T > 1e-9*scale {
		coef := make([]*big.Rat, len(g.Classes))
		for ci, c := range g.Classes {
			coef[ci] = c.Coef
		}
		var eps *big.Rat
		if o.Margin {
			// G − ε·Σ E_{x_i^k} ⪰ G − εI ≻ 0 when ε < t: take ε a power of
			// two at most t/2.
			eps = new(big.Rat).SetFloat64(math.Ldexp(1, math.Ilogb(mr.T/2)))
			coef, err = g.marginCoef(p, eps)
			if err != nil {
				return nil, err
			}
		}
		if c := g.round(mr.X[0].Data, coef, mr.T); c != nil {
			c.Epsilon = eps
			res.Certificate = c
			return res, nil
		}
	}
	if mr.T < 0 {
		if res.NotSOS = g.refute(mr.Y); res.NotSOS != nil {
			res.NotSOS.Functional = g.functional(p.Ring(), res.NotSOS.Moments)
		}
	}
	if res.NotSOS == nil && !o.Margin {
		// No positive definite Gram matrix came out: perhaps every Gram
		// matrix of p is singular, yet p exceeds a sum of pure even powers.
		res.Margin, res.Sizes.MarginIterations, err = g.findMargin(ctx, p, o.SDP)
		if err != nil {
			return nil, err
		}
	}
	return res, nil
}

func hasDiag(c Class) bool {
	for _, pr := range c.Pairs {
		if pr[0] == pr[1] {
			return true
		}
	}
	return false
}

func zeroMatrix(n int) [][]*big.Rat {
	m := make([][]*big.Rat, n)
	for i := range m {
		m[i] = make([]*big.Rat, n)
		for j := range m[i] {
			m[i][j] = new(big.Rat)
		}
	}
	return m
}

// marginCoef returns the class coefficients of p − ε·Σᵢ xᵢ^{2k}, 2k = deg p;
// every xᵢ^{2k} must be the square of a basis element.
func (g *Gram) marginCoef(p *poly.Poly, eps *big.Rat) ([]*big.Rat, error) {
	deg := p.Degree()
	if deg%2 != 0 {
		return nil, fmt.Errorf("sos: margin asked for a polynomial of odd degree %d", deg)
	}
	ns := len(g.Vars)
	coef := make([]*big.Rat, len(g.Classes))
	for ci, c := range g.Classes {
		coef[ci] = new(big.Rat).Set(c.Coef)
	}
	for i := 0; i < ns; i++ {
		e := make([]int, ns)
		e[i] = deg
		found := false
		for ci, c := range g.Classes {
			if Key(c.Exp) == Key(e) && hasDiag(c) {
				coef[ci].Sub(coef[ci], eps)
				found = true
			}
		}
		if !found {
			return nil, fmt.Errorf("sos: margin: %s^%d is not a square of the basis", p.Ring().Name(g.Vars[i]), deg/2)
		}
	}
	return coef, nil
}

// round tries growing precisions: round x to multiples of 2^−bits, project
// onto the family with coefficients coef, and factor exactly.
func (g *Gram) round(x []float64, coef []*big.Rat, t float64) *Certificate {
	n := len(g.Basis)
	// The rounding moves each entry by at most 2^−bits−1, the matrix by at
	// most n·2^−bits−1 in norm; the projection moves it by no more than
	// that again. Start where this is below t/4.
	b0 := int(math.Ceil(math.Log2(4 * float64(n) / t)))
	b0 = max(4, min(b0, 50))
	for _, bits := range []int{b0, b0 + 8, b0 + 16, b0 + 30} {
		G := roundGram(x, n, bits)
		g.Project(G, coef)
		var f LDL
		if f.Factorize(G) {
			return &Certificate{Gram: G, Factor: f, Min: f.MinPivot(), Bits: bits}
		}
	}
	return nil
}

// refute turns the solver's multipliers (a moment functional with
// L(p) < 0 and positive semidefinite moment matrix, numerically) into an
// exact refutation: L is rounded and mixed with the moments of the uniform
// measure on [−1, 1]ⁿ, whose moment matrix is positive definite (monomials
// are linearly independent functions on the cube), with a weight θ small
// enough to keep L(p) < 0.
func (g *Gram) refute(y []float64) *Separation {
	n := len(g.Basis)
	ref := make([]*big.Rat, len(g.Classes))
	for ci, c := range g.Classes {
		v := big.NewRat(1, 1)
		for _, k := range c.Exp {
			if k%2 != 0 {
				v.SetInt64(0)
				break
			}
			v.Mul(v, big.NewRat(1, int64(k+1)))
		}
		ref[ci] = v
	}
	var ymax float64
	for _, v := range y {
		ymax = math.Max(ymax, math.Abs(v))
	}
	if ymax == 0 {
		return nil
	}
	for _, bits := range []int{20, 30, 40, 50} {
		l := make([]*big.Rat, len(g.Classes))
		for ci := range g.Classes {
			num, _ := new(big.Float).SetFloat64(math.Round(math.Ldexp(y[ci]/ymax, bits))).Int(nil)
			l[ci] = new(big.Rat).SetFrac(num, new(big.Int).Lsh(big.NewInt(1), uint(bits)))
		}
		val, refVal := new(big.Rat), new(big.Rat)
		for ci, c := range g.Classes {
			val.Add(val, new(big.Rat).Mul(c.Coef, l[ci]))
			refVal.Add(refVal, new(big.Rat).Mul(c.Coef, ref[ci]))
		}
		if val.Sign() >= 0 {
			continue
		}
		for th := 10; th <= 60; th += 10 {
			theta := new(big.Rat).SetFrac(big.NewInt(1), new(big.Int).Lsh(big.NewInt(1), uint(th)))
			v := new(big.Rat).Add(val, new(big.Rat).Mul(theta, refVal))
			if v.Sign() >= 0 {
				continue
			}
			mom := map[string]*big.Rat{}
			lv := make([]*big.Rat, len(g.Classes))
			for ci, c := range g.Classes {
				lv[ci] = new(big.Rat).Add(l[ci], new(big.Rat).Mul(theta, ref[ci]))
				mom[Key(c.Exp)] = lv[ci]
			}
			M := zeroMatrix(n)
			for ci, c := range g.Classes {
				for _, pr := range c.Pairs {
					M[pr[0]][pr[1]], M[pr[1]][pr[0]] = lv[ci], lv[ci]
				}
			}
			var f LDL
			if f.Factorize(M) {
				return &Separation{Moments: mom, Moment: M, Factor: f, Value: v}
			}
		}
	}
	return nil
}

// functional returns Σ_γ m[γ]·x^γ over the exponents of the classes and
// of the terms outside them (distinct exponents), in the ring r.
func (g *Gram) functional(r *poly.Ring, m map[string]*big.Rat) *poly.Poly {
	y := poly.Zero(r)
	exps := append([][]int(nil), g.Outside...)
	for _, c := range g.Classes {
		exps = append(exps, c.Exp)
	}
	for _, e := range exps {
		v, ok := m[Key(e)]
		if !ok {
			continue
		}
		full := make([]int, r.NumVars())
		for i, k := range e {
			full[g.Vars[i]] = k
		}
		y.Add(y, poly.Monomial(r, full, v))
	}
	return y
}
