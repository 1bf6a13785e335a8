package basin

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/big"
	"math/rand/v2"

	"github.com/lyacert/lyacert/certify/lyapunov"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"

	"gonum.org/v1/gonum/mat"
)

// ImproveOptions bound the search over quadratic candidates; zero fields
// take the defaults.
type ImproveOptions struct {
	// Candidates is how many right-hand sides Q are tried besides Q = I
	// (default 32).
	Candidates int
	// CoarseGap is the gap at which every candidate is certified
	// (default 0.05); the best is refined at Options.Gap.
	CoarseGap float64
	// Seed seeds the random Q (default 1), so that a search repeats.
	Seed uint64
	// Steps bounds the coordinate search that follows the sweep
	// (default 24 candidates; negative for none).
	Steps int
}

// Improvement is the outcome of a search for a quadratic V whose certified
// sublevel set holds a larger ball around the equilibrium.
type Improvement struct {
	// Result is the best certified estimate, at the requested gap: the
	// baseline itself when no candidate beat it.
	Result *Result
	// Base is the baseline: the model's V when it is a quadratic form in
	// the states measured from the equilibrium, otherwise V from Q = I.
	Base     *Result
	BaseName string // "the given V" or "Q = I"
	// Radius and BaseRadius are the radii sqrt(c_lo/λ_max(P)) of the
	// largest balls about the equilibrium inside the certified sets of
	// Result and Base (λ_max in float64, rounded down by a relative 1e-9).
	Radius, BaseRadius float64
	// P is the Gram matrix of Result's V (in the states measured from the
	// equilibrium); Q the right-hand side it came from, nil for the
	// baseline.
	P     [][]*big.Rat
	Q     [][]float64
	Tried int // candidates certified at the coarse gap
	// Failed counts candidates that gave no certified level (P not
	// positive definite after rounding, or no box settled).
	Failed int
}

// Improve searches for a quadratic V = yᵀPy (y = x − x*) with a larger
// certified ball about the equilibrium than the model's own V. It needs the
// linearization A at the equilibrium to be Hurwitz: for each positive
// definite Q of a set of structured and random ones, AᵀP + PA = −Q is
// solved in float64 (certify/lyapunov), P is scaled to λ_max(P) = 1 and
// rounded to thousandths, and Find certifies a level c at o.CoarseGap; the
// score is c/λ_max(P), the squared radius of the largest ball inside
// {V ≤ c} (λ_max(P)·|y|² ≥ yᵀPy, Rayleigh). The best candidate is then
// certified at o.Gap and kept if its radius exceeds the baseline's.
func Improve(ctx context.Context, m *model.Model, source string, o Options, so ImproveOptions) (*Improvement, error) {
	if so.Candidates <= 0 {
		so.Candidates = 32
	}
	if !(so.CoarseGap > 0) {
		so.CoarseGap = 0.05
	}
	if so.Seed == 0 {
		so.Seed = 1
	}
	if so.Steps == 0 {
		so.Steps = 24
	}
	pos := poly.Pos{File: m.File, Line: 1, Col: 1}
	if m.Discrete {
		return nil, &poly.Error{Pos: pos, Msg: "basin: the model is a map; sublevel basins are for continuous time (x' = ...)"}
	}
	if len(m.FreeParams()) > 0 {
		return nil, &poly.Error{Pos: pos, Msg: fmt.Sprintf("basin: fix every parameter with --set (free: %s)", paramNames(m.FreeParams()))}
	}
	n := len(m.States)
	at := make([]*big.Rat, n)
	for i := range n {
		a, err := m.At[i].EvalVars(nil)
		if err != nil || !a.IsPoly() || !a.Num.IsConst() {
			return nil, errors.New("basin: the equilibrium is not a rational point")
		}
		at[i] = a.Num.ConstTerm()
	}
	a, err := linearization(m, at)
	if err != nil {
		return nil, err
	}
	if !lyapunov.IsHurwitz(a) {
		return nil, &poly.Error{Pos: pos, Msg: fmt.Sprintf("basin --improve: the linearization at the equilibrium is not Hurwitz (spectral abscissa %.3g); no quadratic V from AᵀP + PA = −Q", lyapunov.SpectralAbscissa(a))}
	}
	imp := &Improvement{}
	// The baseline, at the requested gap.
	base := m
	imp.BaseName = "the given V"
	if g := quadraticGram(m, at); g == nil {
		p, err := lyapunovP(a, identity(n))
		if err != nil {
			return nil, err
		}
		base = withV(m, at, p, "Q = I")
		imp.BaseName = "Q = I"
	}
	imp.Base, err = Find(ctx, base, source, o)
	if err != nil {
		return nil, fmt.Errorf("basin --improve: the baseline (%s): %w", imp.BaseName, err)
	}
	bg := quadraticGram(base, at)
	imp.BaseRadius = ballRadius(imp.Base.Level, bg)
	imp.Result, imp.Radius, imp.P = imp.Base, imp.BaseRadius, bg
	// The candidates, at the coarse gap.
	coarse := o
	coarse.Gap = so.CoarseGap
	var best [][]float64
	var bestP [][]*big.Rat
	bestScore := 0.0
	// try certifies the candidate from q at the coarse gap and keeps it
	// when its ball is the largest so far.
	try := func(q *mat.Dense) (bool, error) {
		if err := ctx.Err(); err != nil {
			return false, err
		}
		p, err := lyapunovP(a, q)
		if err != nil {
			imp.Failed++
			return false, nil
		}
		r, err := Find(ctx, withV(m, at, p, ""), source, coarse)
		if err != nil {
			if ctx.Err() != nil {
				return false, ctx.Err()
			}
			imp.Failed++
			return false, nil
		}
		imp.Tried++
		if s := ballRadius(r.Level, p); s > bestScore {
			best, bestP, bestScore = denseRows(q), p, s
			return true, nil
		}
		return false, nil
	}
	for _, q := range candidateQs(n, so.Candidates, so.Seed) {
		if _, err := try(q); err != nil {
			return nil, err
		}
	}
	// Coordinate search on the Cholesky factor L of the best Q = LLᵀ, which
	// keeps every Q positive definite: each entry of L moved by ±h times
	// the largest |L_ij|, h halved after a sweep without gain.
	if best != nil && so.Steps > 0 {
		var ch mat.Cholesky
		if ch.Factorize(mat.NewSymDense(n, flat(best))) {
			var l mat.TriDense
			ch.LTo(&l)
			h, steps := 0.25, 0
			scale := mat.Norm(&l, math.Inf(1))
			for steps < so.Steps && h > 1e-3 {
				gained := false
				for i := range n {
					for j := 0; j <= i && steps < so.Steps; j++ {
						for _, sg := range []float64{1, -1} {
							old := l.At(i, j)
							l.SetTri(i, j, old+sg*h*scale)
							q := mat.NewDense(n, n, nil)
							q.Mul(&l, l.T())
							steps++
							ok, err := try(q)
							if err != nil {
								return nil, err
							}
							if ok {
								gained = true
								break
							}
							l.SetTri(i, j, old)
						}
					}
				}
				if !gained {
					h /= 2
				}
			}
		}
	}
	if best == nil {
		return imp, nil
	}
	// The best candidate, refined.
	r, err := Find(ctx, withV(m, at, bestP, qText(best)), source, o)
	if err != nil {
		return nil, fmt.Errorf("basin --improve: refining the best candidate: %w", err)
	}
	if rad := ballRadius(r.Level, bestP); rad > imp.BaseRadius {
		imp.Result, imp.Radius, imp.P, imp.Q = r, rad, bestP, best
	}
	return imp, nil
}

// linearization returns the Jacobian of the right-hand side at the
// equilibrium in float64.
func linearization(m *model.Model, at []*big.Rat) (*mat.Dense, error) {
	n := len(m.States)
	fs := make([]*poly.Poly, n)
	for i, f := range m.F {
		if !f.IsPoly() {
			return nil, &poly.Error{Pos: m.FPos[i], Msg: "basin: the right-hand sides must be polynomials"}
		}
		fs[i] = f.Num
	}
	j := poly.Jacobian(fs)
	a := mat.NewDense(n, n, nil)
	for i := range n {
		for k := range n {
			v, _ := j[i][k].Eval(at).Float64()
			a.Set(i, k, v)
		}
	}
	return a, nil
}

func identity(n int) *mat.Dense {
	q := mat.NewDense(n, n, nil)
	for i := range n {
		q.Set(i, i, 1)
	}
	return q
}

// candidateQs returns k positive definite right-hand sides: the diagonal
// ones with entries in {1/4, 1, 4} (up to 9 of them), I + uuᵀ·s for unit
// vectors u along the axes and diagonals, then random LLᵀ + I/10 with
// standard normal L.
func candidateQs(n, k int, seed uint64) []*mat.Dense {
	var out []*mat.Dense
	add := func(q *mat.Dense) bool {
		if len(out) < k {
			out = append(out, q)
		}
		return len(out) < k
	}
	// Diagonal: entry i is 4^(d_i) with d_i ∈ {−1, 0, 1}, the first
	// 3^min(n,2) patterns on the first two states, skipping I.
	for code := 1; code < 9; code++ {
		q := identity(n)
		q.Set(0, 0, math.Pow(4, float64(code%3-1)))
		if n > 1 {
			q.Set(1, 1, math.Pow(4, float64(code/3-1)))
		} else if code >= 3 {
			break
		}
		if q.At(0, 0) == 1 && (n == 1 || q.At(1, 1) == 1) {
			continue
		}
		if !add(q) {
			return out
		}
	}
	// Diagonal plus rank one along e_i ± e_j.
	for i := range n {
		for j := i + 1; j < n; j++ {
			for _, sg := range []float64{1, -1} {
				q := identity(n)
				q.Set(i, i, q.At(i, i)+2)
				q.Set(j, j, q.At(j, j)+2)
				q.Set(i, j, 2*sg)
				q.Set(j, i, 2*sg)
				if !add(q) {
					return out
				}
			}
		}
	}
	rng := rand.New(rand.NewPCG(seed, 0x9e3779b97f4a7c15))
	for len(out) < k {
		l := mat.NewDense(n, n, nil)
		for i := range n {
			for j := range n {
				l.Set(i, j, rng.NormFloat64())
			}
		}
		q := mat.NewDense(n, n, nil)
		q.Mul(l, l.T())
		for i := range n {
			q.Set(i, i, q.At(i, i)+0.1)
		}
		out = append(out, q)
	}
	return out
}

// lyapunovP solves AᵀP + PA = −Q in float64, scales P to λ_max(P) = 1 and
// rounds it to thousandths, as exact rationals.
func lyapunovP(a, q *mat.Dense) ([][]*big.Rat, error) {
	p, err := lyapunov.Continuous(a, q)
	if err != nil {
		return nil, err
	}
	var eig mat.EigenSym
	if !eig.Factorize(p, false) {
		return nil, errors.New("basin: no eigenvalues of P")
	}
	vals := eig.Values(nil)
	top := vals[len(vals)-1]
	if !(vals[0] > 0) {
		return nil, errors.New("basin: P is not positive definite")
	}
	n, _ := p.Dims()
	out := make([][]*big.Rat, n)
	for i := range n {
		out[i] = make([]*big.Rat, n)
		for j := range n {
			out[i][j] = big.NewRat(int64(math.Round(1000*p.At(i, j)/top)), 1000)
		}
	}
	return out, nil
}

// withV returns a copy of m whose V is yᵀPy with y = x − at, its
// description saying where V came from (q, when not "").
func withV(m *model.Model, at []*big.Rat, p [][]*big.Rat, q string) *model.Model {
	r := m.Ring
	n := len(m.States)
	y := make([]*poly.Poly, n)
	for i := range n {
		y[i] = new(poly.Poly).Sub(poly.Var(r, i), poly.Const(r, at[i]))
	}
	v := poly.ConstInt(r, 0)
	for i := range n {
		for j := range n {
			t := new(poly.Poly).Mul(y[i], y[j])
			v = new(poly.Poly).Add(v, new(poly.Poly).Scale(t, p[i][j]))
		}
	}
	c := *m
	vf := poly.FromPoly(v)
	c.V = &vf
	if q != "" {
		c.Description = append(append(append([]string(nil), m.Description...), ""),
			"V here is not the model file's: it is yᵀPy (y = x − x*) with P from AᵀP + PA = −Q,",
			"A the linearization at the equilibrium and Q = "+q+", scaled and rounded to thousandths;",
			"it was chosen by lyacert basin --improve for the largest certified ball about x*.")
	}
	return &c
}

// quadraticGram returns the Gram matrix of m's V when V is a quadratic form
// in the states measured from at, otherwise nil.
func quadraticGram(m *model.Model, at []*big.Rat) [][]*big.Rat {
	if m.V == nil || !m.V.IsPoly() {
		return nil
	}
	vs := m.Shift(*m.V)
	n := len(m.States)
	if !vs.Sub(vs.Homogeneous(2, m.Ring.StateMask())).IsZero() {
		return nil
	}
	g := poly.GramMatrix(vs, n)
	out := make([][]*big.Rat, n)
	for i := range n {
		out[i] = make([]*big.Rat, n)
		for j := range n {
			if !g[i][j].IsPoly() || !g[i][j].Num.IsConst() {
				return nil
			}
			out[i][j] = g[i][j].Num.ConstTerm()
		}
	}
	return out
}

// ballRadius returns sqrt(c/λ_max(P)), rounded down by a relative 1e-9, or
// 0 when P is nil: the ball of that radius about the equilibrium lies in
// {yᵀPy ≤ c} since yᵀPy ≤ λ_max(P)·|y|² (Rayleigh), and, being connected
// and holding the equilibrium, in the component that the level certifies.
func ballRadius(c *big.Rat, p [][]*big.Rat) float64 {
	if p == nil || c == nil {
		return 0
	}
	n := len(p)
	s := mat.NewSymDense(n, nil)
	for i := range n {
		for j := i; j < n; j++ {
			f, _ := p[i][j].Float64()
			s.SetSym(i, j, f)
		}
	}
	var eig mat.EigenSym
	if !eig.Factorize(s, false) {
		return 0
	}
	vals := eig.Values(nil)
	cf, _ := c.Float64()
	return math.Sqrt(cf/vals[len(vals)-1]) * (1 - 1e-9)
}

func flat(q [][]float64) []float64 {
	var out []float64
	for _, row := range q {
		out = append(out, row...)
	}
	return out
}

func denseRows(q *mat.Dense) [][]float64 {
	n, _ := q.Dims()
	out := make([][]float64, n)
	for i := range n {
		out[i] = append([]float64(nil), q.RawRowView(i)...)
	}
	return out
}

// qText writes Q with four significant digits per entry.
func qText(q [][]float64) string {
	s := "["
	for i, row := range q {
		if i > 0 {
			s += "; "
		}
		for j, x := range row {
			if j > 0 {
				s += ", "
			}
			s += fmt.Sprintf("%.4g", x)
		}
	}
	return s + "]"
}
