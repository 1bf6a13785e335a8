package direct

import (
	"context"
	"fmt"
	"math/big"
	"strings"

	"github.com/lyacert/lyacert/certify/sdp"
	"github.com/lyacert/lyacert/certify/sos"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

// Method says how one form of the argument was proven, with the sizes of
// the work, for people; the certificate holds the proof itself.
type Method struct {
	Form string // "V" or "-Vdot"
	Name string // one of the Method* constants
	// Basis is the order of the Gram matrix (the number of monomials).
	Basis int
	// For MethodSOS: the monomials before the Newton-polytope and
	// diagonal-consistency pruning, the equations of the Gram family, the
	// SDP's block orders (negative: a diagonal block) and iterations, the
	// solver's margin λmin(G) ≈ t, the rounding precision in bits and the
	// smallest exact pivot.
	Candidates  int
	Constraints int
	Blocks      []int
	Iterations  int
	Margin      float64
	Bits        int
	MinPivot    string
	// For MethodMargin: the margin's ε.
	Epsilon string
}

// The methods a form can be proven by.
const (
	MethodQuadratic = "quadratic part, exact LDLᵀ"
	MethodCanonical = "canonical Gram matrix in a monomial basis, exact LDLᵀ"
	MethodSOS       = "sum of squares: Gram matrix found by SDP, rounded and projected exactly, exact LDLᵀ"
	MethodMargin    = "sum of squares less a margin ε·Σ (pure powers)²: Gram matrix found by SDP, rounded and projected exactly, exact LDLᵀ with D ≥ 0"
)

// String is a one-line summary: the form, the method and the sizes.
func (m Method) String() string {
	who := "V"
	if m.Form != "V" {
		who = "−V̇"
	}
	s := fmt.Sprintf("%s: %s, basis %d", who, m.Name, m.Basis)
	if m.Name == MethodMargin {
		return s + fmt.Sprintf(" (of %d candidates), %d equations, %d iterations, ε = %s, rounded to 2^-%d", m.Candidates, m.Constraints, m.Iterations, m.Epsilon, m.Bits)
	}
	if m.Name == MethodSOS {
		blocks := make([]string, len(m.Blocks))
		for i, b := range m.Blocks {
			blocks[i] = fmt.Sprint(b)
		}
		s += fmt.Sprintf(" (of %d candidates), %d equations, SDP blocks [%s], %d iterations, margin %.3g, rounded to 2^-%d, smallest pivot %s",
			m.Candidates, m.Constraints, strings.Join(blocks, " "), m.Iterations, m.Margin, m.Bits, m.MinPivot)
	}
	return s
}

// methods fills Methods from the forms when tryBasis has not.
func (res *Result) methods() {
	if res.Methods != nil {
		return
	}
	for _, f := range res.Forms {
		name := MethodQuadratic
		if f.Basis != nil {
			name = MethodCanonical
		}
		res.Methods = append(res.Methods, Method{Form: f.Name, Name: name, Basis: len(f.Gram)})
	}
}

// sosGram searches for a positive definite Gram matrix of p, a polynomial
// in the states free of parameters, with a semidefinite program over the
// affine family of its Gram matrices in the Newton-pruned monomial basis
// (certify/sos), rounds it to rationals, projects it exactly onto the
// family and factors it exactly. The kernel's monomial-gram-ldl rule then
// applies when the basis holds a pure power of every state: zᵀGz > 0 for
// z ≠ 0, and z = 0 only at the origin. The basis always does when p is
// positive on every axis: the lowest pure power xᵢ^{2a} of p has a
// non-zero coefficient, so xᵢ^a survives the pruning. When no positive
// definite Gram matrix comes out, a Gram matrix G ⪰ 0 of p less a margin
// ε·Σ (pure powers)² will do (margin-gram-ldl). It returns the SDP it
// solved (nil when none), an exact proof that p is no sum of squares in
// the basis when the search found one, and, when it fails, why.
func sosGram(p poly.RatFunc, nstates int) (f Form, m Method, prob *sdp.Problem, ns *claims.NotSOS, why string) {
	r := p.Ring()
	if !p.IsPoly() || p.Num.DegreeIn(r.ParamMask()) > 0 {
		return f, m, nil, nil, "it involves parameters (fix them with --set for a sum-of-squares search)"
	}
	if d := p.Num.Degree(); d%2 != 0 {
		return f, m, nil, nil, fmt.Sprintf("its degree %d is odd", d)
	}
	res, err := sos.Find(context.Background(), p.Num, nil)
	if err != nil {
		return f, m, nil, nil, err.Error()
	}
	m = Method{Name: MethodSOS, Basis: res.Sizes.Basis, Candidates: res.Sizes.Candidates, Constraints: res.Sizes.Constraints,
		Blocks: res.Sizes.Blocks, Iterations: res.Sizes.Iterations, Margin: res.Sizes.Margin}
	prob = res.Problem
	n := len(res.Basis)
	basis := make([]*poly.Poly, n)
	for i, e := range res.Basis {
		full := make([]int, r.NumVars())
		for j, k := range e {
			full[res.Vars[j]] = k
		}
		basis[i] = poly.Monomial(r, full, big.NewRat(1, 1))
	}
	if res.Outside != "" {
		return f, m, prob, nil, "it has a term that no product of monomials of its Newton basis reaches (of odd degree in some state, say), so it is no sum of squares: no Gram matrix exists"
	}
	if res.NotSOS != nil {
		ns = notSOSClaim(basis, res.NotSOS)
		why = fmt.Sprintf("it is not a sum of squares in the %d-monomial Newton basis (an exact moment matrix separates it: a moment-separation claim)", res.Sizes.Basis)
		return f, m, prob, ns, why
	}
	if res.Certificate == nil && res.Margin == nil {
		why = fmt.Sprintf("the SDP found no positive definite Gram matrix in the %d-monomial Newton basis (solver: %v, margin %.3g), nor one of p less a margin", res.Sizes.Basis, res.SolverStatus, res.Sizes.Margin)
		return f, m, prob, nil, why
	}
	pure := make([]bool, nstates)
	for _, e := range res.Basis {
		nz, at := 0, -1
		for i, k := range e {
			if k != 0 {
				nz, at = nz+1, i
			}
		}
		if nz == 1 {
			pure[res.Vars[at]] = true
		}
	}
	for i, ok := range pure {
		if !ok {
			return f, m, prob, nil, fmt.Sprintf("the basis has no pure power of %s, so a Gram certificate cannot show it positive definite", r.Name(i))
		}
	}
	f.Basis = basis
	f.Gram = poly.NewMatrix(r, n)
	f.LDL = LDL{L: poly.NewMatrix(r, n), D: make([]poly.RatFunc, n), Zero: make([]bool, n)}
	gram, l, d := [][]*big.Rat(nil), [][]*big.Rat(nil), []*big.Rat(nil)
	if c := res.Certificate; c != nil {
		gram, l, d = c.Gram, c.Factor.L, c.Factor.D
		m.Bits, m.MinPivot = c.Bits, c.Min.RatString()
	} else {
		c := res.Margin
		gram, l, d = c.Gram, c.L, c.D
		m.Name, m.Bits, m.Epsilon, m.Iterations = MethodMargin, c.Bits, c.Epsilon.RatString(), res.Sizes.MarginIterations
		f.Margin = poly.Zero(r)
		for _, a := range c.Pure {
			f.Margin.Add(f.Margin, new(poly.Poly).Scale(new(poly.Poly).Mul(basis[a], basis[a]), c.Epsilon))
		}
	}
	for i := range n {
		for j := range n {
			f.Gram[i][j] = poly.RatConst(r, gram[i][j])
			f.LDL.L[i][j] = poly.RatConst(r, l[i][j])
		}
		f.LDL.D[i], f.LDL.Zero[i] = poly.RatConst(r, d[i]), d[i].Sign() == 0
	}
	f.Minors = f.LDL.Minors()
	return f, m, prob, nil, ""
}

// notSOSClaim states an exact moment separation in the basis z.
func notSOSClaim(z []*poly.Poly, ns *sos.Separation) *claims.NotSOS {
	r := z[0].Ring()
	n := len(z)
	mom, l, d := poly.NewMatrix(r, n), poly.NewMatrix(r, n), make([]string, n)
	for i := range n {
		l[i][i] = poly.RatConst(r, big.NewRat(1, 1))
		d[i] = "0"
		for j := range n {
			mom[i][j] = poly.RatConst(r, ns.Moment[i][j])
		}
	}
	if len(ns.Factor.D) == n { // else M = 0: L = I, D = 0
		for i := range n {
			d[i] = ns.Factor.D[i].RatString()
			for j := range n {
				l[i][j] = poly.RatConst(r, ns.Factor.L[i][j])
			}
		}
	}
	c := &claims.NotSOS{Moments: ns.Functional.String(), Moment: mom.Strings(), L: l.Strings(), D: d, Value: ns.Value.RatString()}
	for _, b := range z {
		c.Basis = append(c.Basis, b.String())
	}
	return c
}

// refutePoints looks for a state point, on a small grid of rationals
// around the equilibrium, where V < 0 or V̇ > 0 strictly: for models
// without free parameters, when no Gram certificate was found.
func (res *Result) refutePoints() bool {
	m := res.Model
	if len(m.FreeParams()) > 0 || res.Verdict != checker.VerdictUndecided || res.Refutation != nil {
		return false
	}
	n := len(m.States)
	at := make([]*big.Rat, n)
	zero := make([]*big.Rat, m.Ring.NumVars())
	for i := range zero {
		zero[i] = new(big.Rat)
	}
	for i := range at {
		v, err := m.At[i].Eval(zero)
		if err != nil {
			return false
		}
		at[i] = v
	}
	vals := []*big.Rat{big.NewRat(1, 1), big.NewRat(-1, 1), big.NewRat(1, 2), big.NewRat(-1, 2), big.NewRat(2, 1), big.NewRat(-2, 1), big.NewRat(1, 4), big.NewRat(-1, 4)}
	x := make([]*big.Rat, m.Ring.NumVars())
	var found *big.Rat
	// Points with at most three non-zero coordinates, in increasing support.
	var rec func(i, left int) bool
	rec = func(i, left int) bool {
		if i == n {
			nonzero := false
			for j := range n {
				nonzero = nonzero || x[j].Cmp(at[j]) != 0
			}
			if !nonzero {
				return false
			}
			v, err1 := res.V.Eval(x)
			d, err2 := res.Vdot.Eval(x)
			if err1 == nil && err2 == nil && (v.Sign() < 0 || d.Sign() > 0) && failsNear(m, res, x, v.Sign() < 0, d.Sign() > 0) {
				found = d
				return true
			}
			return false
		}
		x[i] = at[i]
		if rec(i+1, left) {
			return true
		}
		if left == 0 {
			return false
		}
		for _, v := range vals {
			x[i] = new(big.Rat).Add(at[i], v)
			if rec(i+1, left-1) {
				return true
			}
		}
		return false
	}
	for i := n; i < len(x); i++ {
		x[i] = new(big.Rat)
	}
	if !rec(0, min(n, 3)) || found == nil {
		return false
	}
	res.Refutation = minimalRefutation(m, res, map[string]string{}, x)
	res.Verdict = checker.VerdictFails
	res.Claim = checker.KindNone
	res.Reason = "V or V̇ has the wrong sign at the exact point below"
	return true
}
