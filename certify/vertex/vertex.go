package vertex

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/big"

	"gonum.org/v1/gonum/mat"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/certify"
	"github.com/lyacert/lyacert/certify/sdp"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// MaxParams is the largest number of free parameters Find accepts: the box
// has 2^MaxParams vertices, as many as the kernel enumerates.
const MaxParams = 12

// ErrInput reports a model the vertex test does not apply to; the error
// says where (file:line:col) and why.
var ErrInput = errors.New("the vertex test does not apply")

// inputError is an ErrInput with its position and reason.
type inputError struct{ msg string }

func (e *inputError) Error() string        { return e.msg }
func (e *inputError) Is(target error) bool { return target == ErrInput }

// Options tune Find.
type Options struct {
	Source string // written into the certificate
	Issued string // the certificate's date; empty: now
}

// Vertex is one corner of the parameter box.
type Vertex struct {
	Params []*big.Rat   // the free parameters' values, in declaration order
	A      [][]*big.Rat // the Jacobian at the equilibrium, exact
	// MaxRe is the largest real part of A's eigenvalues (float): A is
	// Hurwitz, as every vertex must be, when it is negative.
	MaxRe float64
	// Margin is the smallest eigenvalue of −(AᵀP + PA) for the rounded P
	// (float, for display); NaN when no P was found.
	Margin float64
}

// Result is what Find found.
type Result struct {
	Model    *model.Model
	Params   []string // the free parameters, in declaration order
	At       []*big.Rat
	Vertices []Vertex
	Global   bool // f has degree ≤ 1 in the states: the claim is global
	// T is the margin of the semidefinite program (P ⪰ tI and every
	// −(AᵀP + PA) ⪰ tI with trace P = 1), float; Status its solver status.
	T      float64
	Status string
	// P is the exact certificate, nil when none was found; Denominator its
	// common denominator and PMargin the smallest eigenvalue of P (float).
	P           [][]*big.Rat
	Denominator *big.Int
	PMargin     float64
	// Reason says why no P was found (numerical evidence, not a proof).
	Reason string
	// Doc is the sealed certificate, verified by the kernel (Outcome).
	Doc     *claims.Document
	Outcome checker.Outcome
}

// Verdict and Kind are what the certificate proves: holds with the kind of
// stability, or undecided (no P found).
func (r *Result) Verdict() (verdict, kind string) {
	if r.P == nil {
		return checker.VerdictUndecided, checker.KindNone
	}
	if r.Global {
		return checker.VerdictHolds, checker.KindGlobal
	}
	return checker.VerdictHolds, checker.KindLocal
}

// Find looks for one P ≻ 0 with A(v)ᵀP + P·A(v) ≺ 0 at every vertex v of the
// box of m's free parameters (see the package documentation). An error
// wrapping ErrInput means the test does not apply to m; a Result without P
// means none was found.
func Find(ctx context.Context, m *model.Model, opts Options) (*Result, error) {
	res, jac, err := prepare(m)
	if err != nil {
		return nil, err
	}
	if err := res.vertices(jac); err != nil {
		return nil, err
	}
	for i, v := range res.Vertices {
		if !(v.MaxRe < 0) {
			res.Status = "not attempted"
			res.Reason = fmt.Sprintf("vertex %d (%s) is not Hurwitz: A has an eigenvalue with real part %.4g ≥ 0 (float), so no P serves it", i+1, res.VertexText(i), v.MaxRe)
			return res, nil
		}
	}
	pf, err := res.solve(ctx)
	if err != nil {
		return nil, err
	}
	if pf == nil {
		return res, nil
	}
	if !res.round(pf) {
		res.Reason = fmt.Sprintf("the float P (margin %.3g) did not survive rounding to a common denominator up to 10^14", res.T)
		return res, nil
	}
	if err := res.certificate(ctx, opts); err != nil {
		return nil, err
	}
	return res, nil
}

// prepare checks that the test applies and returns the Jacobian at x* as
// polynomials in the parameters.
func prepare(m *model.Model) (*Result, [][]*poly.Poly, error) {
	bad := func(pos poly.Pos, format string, args ...any) error {
		return &inputError{pos.String() + ": " + fmt.Sprintf(format, args...)}
	}
	file := poly.Pos{File: m.File, Line: 1, Col: 1}
	switch {
	case m.Discrete:
		return nil, nil, bad(m.FPos[0], "the model is a map; the vertex test is for continuous time only (P − AᵀPA is not affine in A, so the vertices prove nothing of the box)")
	case m.V != nil:
		return nil, nil, bad(m.VPos, "the vertex test finds its own quadratic V; remove the candidate")
	}
	free := m.FreeParams()
	if len(free) == 0 || len(free) > MaxParams {
		return nil, nil, bad(file, "the vertex test needs 1 to %d free parameters, the model has %d", MaxParams, len(free))
	}
	res := &Result{Model: m}
	for _, p := range free {
		lo, hi := p.Range.Lo, p.Range.Hi
		if lo.Inf != 0 || hi.Inf != 0 || lo.Open || hi.Open {
			return nil, nil, bad(p.Pos, "parameter %s has range %q; the vertex test needs a closed bounded interval such as `in [1, 4]`", p.Name, model.RangeText(p))
		}
		res.Params = append(res.Params, p.Name)
	}
	for i, a := range m.At {
		if !a.IsPoly() || !a.Num.IsConst() {
			return nil, nil, bad(m.AtPos, "the equilibrium's %s = %s depends on the parameters; the vertex test needs an equilibrium free of them", m.States[i], a)
		}
	}
	if err := m.CheckEquilibrium(); err != nil {
		return nil, nil, &inputError{err.Error()}
	}
	at, err := m.AtPoint()
	if err != nil {
		return nil, nil, &inputError{fmt.Sprintf("%s: %v", m.AtPos, err)}
	}
	res.At = at
	n := len(m.States)
	jac, global, nonPoly := m.JacobianAt(at)
	if nonPoly >= 0 {
		return nil, nil, bad(m.FPos[nonPoly], "%s' has a denominator; the vertex test needs polynomials", m.States[nonPoly])
	}
	res.Global = global
	for i := range n {
		for k := range n {
			if jac[i][k].Degree() > 1 {
				return nil, nil, bad(m.FPos[i], "∂%s'/∂%s = %s at the equilibrium is not affine in the parameters (a power or product of them); the vertex test needs an affine linearization", m.States[i], m.States[k], jac[i][k])
			}
		}
	}
	return res, jac, nil
}

// vertices evaluates the Jacobian at every vertex of the box.
func (r *Result) vertices(jac [][]*poly.Poly) error {
	m := r.Model
	n := len(m.States)
	free := m.FreeParams()
	for v := range 1 << len(free) {
		vx := Vertex{Margin: math.NaN()}
		x := m.Vertex(r.At, v)
		for _, p := range free {
			k, _ := m.Ring.Index(p.Name)
			vx.Params = append(vx.Params, x[k])
		}
		a := mat.NewDense(n, n, nil)
		vx.A = make([][]*big.Rat, n)
		for i := range n {
			for k := range n {
				e := jac[i][k].Eval(x)
				vx.A[i] = append(vx.A[i], e)
				f, _ := e.Float64()
				a.Set(i, k, f)
			}
		}
		var eig mat.Eigen
		if !eig.Factorize(a, mat.EigenNone) {
			return fmt.Errorf("vertex %d: the eigenvalue computation failed", v+1)
		}
		vx.MaxRe = math.Inf(-1)
		for _, l := range eig.Values(nil) {
			vx.MaxRe = max(vx.MaxRe, real(l))
		}
		r.Vertices = append(r.Vertices, vx)
	}
	return nil
}

// VertexText names vertex i by its parameter values.
func (r *Result) VertexText(i int) string {
	s := ""
	for j, name := range r.Params {
		if j > 0 {
			s += ", "
		}
		s += name + " = " + poly.RatString(r.Vertices[i].Params[j])
	}
	return s
}

// solve runs the semidefinite program and returns the float P, or nil with
// the reason in r.Reason.
func (r *Result) solve(ctx context.Context) ([][]float64, error) {
	n := len(r.Model.States)
	prob := &sdp.Problem{Blocks: []int{n}}
	var trace sdp.Matrix
	for i := range n {
		trace = append(trace, sdp.Entry{Block: 0, I: i, J: i, V: 1})
	}
	prob.A, prob.B = append(prob.A, trace), append(prob.B, 1)
	half := func(a, b int) float64 { return map[bool]float64{true: 1, false: 0.5}[a == b] }
	for v, vx := range r.Vertices {
		prob.Blocks = append(prob.Blocks, n)
		a := make([][]float64, n)
		for i := range n {
			for k := range n {
				f, _ := vx.A[i][k].Float64()
				a[i] = append(a[i], f)
			}
		}
		for s := range n {
			for t := s; t < n; t++ {
				// Qᵥ(s,t) + Σₖ A(k,s)·P(k,t) + Σₖ P(s,k)·A(k,t) = 0, with the
				// coefficients gathered on the upper triangle of P.
				coef := map[[2]int]float64{}
				for k := range n {
					coef[[2]int{min(k, t), max(k, t)}] += a[k][s]
					coef[[2]int{min(s, k), max(s, k)}] += a[k][t]
				}
				row := sdp.Matrix{{Block: 1 + v, I: s, J: t, V: half(s, t)}}
				for ij, c := range coef {
					if c != 0 {
						row = append(row, sdp.Entry{Block: 0, I: ij[0], J: ij[1], V: c * half(ij[0], ij[1])})
					}
				}
				prob.A, prob.B = append(prob.A, row), append(prob.B, 0)
			}
		}
	}
	mr, err := sdp.SolvePositiveMargin(ctx, prob, 1, nil)
	if err != nil {
		if ctx.Err() != nil {
			return nil, ctx.Err()
		}
		return nil, fmt.Errorf("the semidefinite program: %w", err)
	}
	r.T, r.Status = mr.T, mr.Inner.Status.String()
	// A margin below 10⁻⁷ (trace P = 1) is the solver's zero: no P to round.
	if mr.Inner.Status != sdp.Optimal && mr.Inner.Status != sdp.Stalled || !(mr.T > 1e-7) {
		r.Reason = fmt.Sprintf("the semidefinite program found no common P (status %s, margin %.3g): numerical evidence that none exists, not a proof", r.Status, mr.T)
		return nil, nil
	}
	p := make([][]float64, n)
	for i := range n {
		for k := range n {
			p[i] = append(p[i], (mr.X[0].At(i, k)+mr.X[0].At(k, i))/2)
		}
	}
	return p, nil
}

// round rounds pf to integers over 10ᵏ, k = 2, 3, …, 14, and keeps the first
// P that passes the exact test.
func (r *Result) round(pf [][]float64) bool {
	n := len(pf)
	d := big.NewInt(10)
	for k := 2; k <= 14; k++ {
		d.Mul(d, big.NewInt(10))
		df, _ := new(big.Float).SetInt(d).Float64()
		p := make([][]*big.Rat, n)
		for i := range n {
			p[i] = make([]*big.Rat, n)
		}
		for i := range n {
			for j := i; j < n; j++ {
				num, _ := new(big.Float).SetFloat64(math.Round(pf[i][j] * df)).Int(nil)
				p[i][j] = new(big.Rat).SetFrac(num, d)
				p[j][i] = p[i][j]
			}
		}
		if Check(p, r.Vertices) {
			r.P, r.Denominator = p, new(big.Int).Set(d)
			r.margins()
			return true
		}
	}
	return false
}

// Check reports, exactly, that P ≻ 0 and −(AᵀP + PA) ≻ 0 at every vertex.
func Check(p [][]*big.Rat, vs []Vertex) bool {
	if k, _ := poly.FirstNonPositivePivot(p); k >= 0 {
		return false
	}
	for _, v := range vs {
		if k, _ := poly.FirstNonPositivePivot(poly.DecayAt(v.A, false, p)); k >= 0 {
			return false
		}
	}
	return true
}

// margins sets the float margins of the exact P, for display.
func (r *Result) margins() {
	r.PMargin = minEigen(r.P)
	for i := range r.Vertices {
		r.Vertices[i].Margin = minEigen(poly.DecayAt(r.Vertices[i].A, false, r.P))
	}
}

func minEigen(a [][]*big.Rat) float64 {
	n := len(a)
	s := mat.NewSymDense(n, nil)
	for i := range n {
		for j := i; j < n; j++ {
			f, _ := a[i][j].Float64()
			s.SetSym(i, j, f)
		}
	}
	var e mat.EigenSym
	if !e.Factorize(s, false) {
		return math.NaN()
	}
	return e.Values(nil)[0]
}

// certificate writes, seals and verifies the certificate.
func (r *Result) certificate(ctx context.Context, opts Options) error {
	m := r.Model
	d := certify.NewDocument(m, opts.Source)
	if opts.Issued != "" {
		d.Issued = opts.Issued
	}
	p := make([][]string, len(r.P))
	for i := range r.P {
		for _, v := range r.P[i] {
			p[i] = append(p[i], poly.RatString(v))
		}
	}
	vl := &claims.VertexLyapunov{P: p}
	for _, v := range r.Vertices {
		var mv [][]string
		for _, row := range poly.DecayAt(v.A, false, r.P) {
			var cells []string
			for _, x := range row {
				cells = append(cells, poly.RatString(x))
			}
			mv = append(mv, cells)
		}
		vl.Decay = append(vl.Decay, mv)
	}
	d.Claims = append(d.Claims, vl)
	if err := certificates.Seal(d); err != nil {
		return err
	}
	r.Doc = d
	r.Outcome = checker.VerifyContext(ctx, d)
	if ctx.Err() != nil {
		return ctx.Err()
	}
	verdict, kind := r.Verdict()
	return certify.Agrees(r.Outcome, verdict, kind)
}
