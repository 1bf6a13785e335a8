package sdp

import (
	"context"
	"errors"
	"fmt"
	"math"
	"runtime"
	"sync"

	"gonum.org/v1/gonum/mat"
)

// stagnation is the number of iterations without halving the worst
// relative residual after which Solve stops as Stalled, once that residual
// is below the square root of the tolerance (common practice: a solution
// that close serves as a proposal to be rounded and checked exactly).
const stagnation = 25

// Status says how Solve ended.
type Status int

const (
	// Optimal: the relative primal and dual infeasibilities and the
	// relative duality gap are all below the tolerance.
	Optimal Status = iota
	// PrimalInfeasible: the iterates approach a ray y with bᵀy < 0 and
	// Σ yᵢAᵢ ⪰ 0 (Farkas' lemma for semidefinite programs). This is
	// numerical evidence, not a proof: only an exact check of a rounded
	// certificate proves infeasibility.
	PrimalInfeasible
	// DualInfeasible: the iterates approach a ray X ⪰ 0 with A(X) = 0 and
	// ⟨C, X⟩ > 0. Numerical evidence, not a proof.
	DualInfeasible
	// Stalled: no progress could be made (a step length or the Schur
	// complement broke down, or the residuals stopped decreasing below the
	// square root of the tolerance) before the tolerances were met. The
	// last iterate and its residuals are returned.
	Stalled
	// IterationLimit: Options.MaxIter iterations were done.
	IterationLimit
)

var statusNames = [...]string{"optimal", "primal infeasible", "dual infeasible", "stalled", "iteration limit"}

func (s Status) String() string {
	if s < 0 || int(s) >= len(statusNames) {
		return fmt.Sprintf("Status(%d)", int(s))
	}
	return statusNames[s]
}

// Options control Solve. The zero value asks for the defaults.
type Options struct {
	Tol     float64 // relative tolerance on infeasibilities and gap; default 1e-8
	MaxIter int     // default 100
	Workers int     // goroutines assembling the Schur complement; default GOMAXPROCS
}

// Result is the last iterate of Solve and how good it is.
type Result struct {
	Status     Status
	X, Z       []Block   // primal and dual matrices, block by block
	Y          []float64 // dual multipliers
	PrimalObj  float64   // ⟨C, X⟩
	DualObj    float64   // bᵀy
	PrimalInf  float64   // ‖b − A(X)‖₂ / (1 + ‖b‖₂)
	DualInf    float64   // ‖Σ yᵢAᵢ − C − Z‖_F / (1 + ‖C‖_F)
	Gap        float64   // |⟨C,X⟩ − bᵀy| / (1 + |⟨C,X⟩| + |bᵀy|)
	Iterations int
}

// Solve runs the primal–dual interior-point method on p (see the package
// documentation) and returns the last iterate. An error is returned for an
// ill-formed or too large problem and when ctx is cancelled; a numerical
// failure is a Status, not an error.
func Solve(ctx context.Context, p *Problem, opts *Options) (*Result, error) {
	if err := p.Validate(); err != nil {
		return nil, err
	}
	o := Options{Tol: 1e-8, MaxIter: 100, Workers: runtime.GOMAXPROCS(0)}
	if opts != nil {
		if opts.Tol > 0 {
			o.Tol = opts.Tol
		}
		if opts.MaxIter > 0 {
			o.MaxIter = opts.MaxIter
		}
		if opts.Workers > 0 {
			o.Workers = opts.Workers
		}
	}
	s := newSolver(p, o)
	return s.run(ctx)
}

// conEntry is an entry of a constraint matrix with both triangles listed.
type conEntry struct {
	k, l int
	a    float64
}

type blockData struct {
	n    int
	diag bool
	cons []int        // constraints with entries in this block, ascending
	ents [][]conEntry // their entries (both triangles)
	rows [][]int      // their distinct rows
	c    []float64    // C, dense (n×n or n)
}

type solver struct {
	gram   *cholesky // of [⟨Aᵢ, Aⱼ⟩], nil when singular
	p      *Problem
	o      Options
	m      int
	blocks []blockData
	ntot   int
	normB  float64
	normC  float64
	// schurData is the m×m storage of the Schur complement, reused from
	// one iteration to the next (8 MB at m = 1,000).
	schurData []float64
}

func newSolver(p *Problem, o Options) *solver {
	s := &solver{p: p, o: o, m: len(p.B)}
	s.blocks = make([]blockData, len(p.Blocks))
	for k, n := range p.Blocks {
		bd := &s.blocks[k]
		bd.n, bd.diag = abs(n), n < 0
		s.ntot += bd.n
		if bd.diag {
			bd.c = make([]float64, bd.n)
		} else {
			bd.c = make([]float64, bd.n*bd.n)
		}
	}
	for _, e := range p.C {
		bd := &s.blocks[e.Block]
		if bd.diag {
			bd.c[e.I] += e.V
			continue
		}
		bd.c[e.I*bd.n+e.J] += e.V
		if e.I != e.J {
			bd.c[e.J*bd.n+e.I] += e.V
		}
	}
	for i, a := range p.A {
		per := map[int][]conEntry{}
		for _, e := range a {
			if e.V == 0 {
				continue
			}
			per[e.Block] = append(per[e.Block], conEntry{e.I, e.J, e.V})
			if e.I != e.J {
				per[e.Block] = append(per[e.Block], conEntry{e.J, e.I, e.V})
			}
		}
		for k := range s.blocks {
			es, ok := per[k]
			if !ok {
				continue
			}
			bd := &s.blocks[k]
			bd.cons = append(bd.cons, i)
			bd.ents = append(bd.ents, es)
			seen := map[int]bool{}
			var rows []int
			for _, e := range es {
				if !seen[e.k] {
					seen[e.k] = true
					rows = append(rows, e.k)
				}
			}
			bd.rows = append(bd.rows, rows)
		}
	}
	for _, b := range p.B {
		s.normB += b * b
	}
	s.normB = math.Sqrt(s.normB)
	for _, bd := range s.blocks {
		for _, v := range bd.c {
			s.normC += v * v
		}
	}
	s.normC = math.Sqrt(s.normC)
	// The Gram matrix of the constraints, for refine.
	if s.m > 0 {
		g := mat.NewSymDense(s.m, nil)
		for k, bd := range s.blocks {
			_ = k
			for ci, i := range bd.cons {
				for cj := ci; cj < len(bd.cons); cj++ {
					j := bd.cons[cj]
					var t float64
					for _, ei := range bd.ents[ci] {
						for _, ej := range bd.ents[cj] {
							if ei.k == ej.k && ei.l == ej.l {
								t += ei.a * ej.a
							}
						}
					}
					g.SetSym(i, j, g.At(i, j)+t)
				}
			}
		}
		var c cholesky
		if c.factorize(g) {
			s.gram = &c
		}
	}
	return s
}

// refine corrects a primal direction so that A(dX) = Rp holds to working
// precision: dX += A*(AA*)⁻¹(Rp − A(dX)), the least-norm correction. Near
// the optimum the Schur complement is ill-conditioned and the HKM formula
// for dX loses the primal equations; this keeps the iterates feasible.
func (s *solver) refine(dx bmat, rp []float64) {
	if s.gram == nil {
		return
	}
	adx := s.aop(dx)
	r := make([]float64, s.m)
	for i := range adx {
		r[i] = rp[i] - adx[i]
	}
	axpy(dx, 1, s.atop(s.gram.solveVec(r)))
}

// bmat is a block-diagonal matrix: dense n×n data or n diagonal entries.
type bmat [][]float64

func (s *solver) newB() bmat {
	x := make(bmat, len(s.blocks))
	for k, bd := range s.blocks {
		if bd.diag {
			x[k] = make([]float64, bd.n)
		} else {
			x[k] = make([]float64, bd.n*bd.n)
		}
	}
	return x
}

func (s *solver) identity(v float64) bmat {
	x := s.newB()
	for k, bd := range s.blocks {
		for i := 0; i < bd.n; i++ {
			if bd.diag {
				x[k][i] = v
			} else {
				x[k][i*bd.n+i] = v
			}
		}
	}
	return x
}

// inner returns ⟨x, y⟩ = tr(xy) for symmetric x, y.
func inner(x, y bmat) float64 {
	var t float64
	for k := range x {
		for i, v := range x[k] {
			t += v * y[k][i]
		}
	}
	return t
}

// aop returns (tr(Aᵢ W))ᵢ; W need not be symmetric.
func (s *solver) aop(w bmat) []float64 {
	r := make([]float64, s.m)
	for k, bd := range s.blocks {
		for ci, i := range bd.cons {
			var t float64
			for _, e := range bd.ents[ci] {
				if bd.diag {
					t += e.a * w[k][e.k]
				} else {
					t += e.a * w[k][e.l*bd.n+e.k]
				}
			}
			r[i] += t
		}
	}
	return r
}

// atop returns Σ yᵢAᵢ.
func (s *solver) atop(y []float64) bmat {
	z := s.newB()
	for k, bd := range s.blocks {
		for ci, i := range bd.cons {
			yi := y[i]
			if yi == 0 {
				continue
			}
			for _, e := range bd.ents[ci] {
				if bd.diag {
					z[k][e.k] += yi * e.a
				} else {
					z[k][e.k*bd.n+e.l] += yi * e.a
				}
			}
		}
	}
	return z
}

// factor holds the Cholesky factorizations of the dense blocks of a
// positive definite block matrix, and its inverse.
type factor struct {
	chol []*mat.Cholesky
	inv  bmat
}

func (s *solver) factorize(x bmat) (*factor, bool) {
	f := &factor{chol: make([]*mat.Cholesky, len(x)), inv: s.newB()}
	for k, bd := range s.blocks {
		if bd.diag {
			for i, v := range x[k] {
				if !(v > 0) {
					return nil, false
				}
				f.inv[k][i] = 1 / v
			}
			continue
		}
		var c mat.Cholesky
		if !c.Factorize(mat.NewSymDense(bd.n, x[k])) {
			return nil, false
		}
		var inv mat.SymDense
		if err := c.InverseTo(&inv); err != nil {
			return nil, false
		}
		f.chol[k] = &c
		for i := 0; i < bd.n; i++ {
			for j := 0; j < bd.n; j++ {
				f.inv[k][i*bd.n+j] = inv.At(i, j)
			}
		}
	}
	return f, true
}

// maxStep returns the largest α ≤ 1/0 with x + α·dx ⪰ 0 given the factor of
// x ≻ 0 (math.Inf(1) when every α works).
func (s *solver) maxStep(f *factor, x, dx bmat) float64 {
	alpha := math.Inf(1)
	for k, bd := range s.blocks {
		if bd.diag {
			for i, d := range dx[k] {
				if d < 0 {
					alpha = math.Min(alpha, -x[k][i]/d)
				}
			}
			continue
		}
		// λmin(L⁻¹ dX L⁻ᵀ) with X = LLᵀ.
		var l mat.TriDense
		f.chol[k].LTo(&l)
		var li mat.TriDense
		if err := li.InverseTri(&l); err != nil {
			return 0
		}
		d := mat.NewDense(bd.n, bd.n, dx[k])
		var t, u mat.Dense
		t.Mul(&li, d)
		u.Mul(&t, li.T())
		sym := mat.NewSymDense(bd.n, nil)
		for i := 0; i < bd.n; i++ {
			for j := i; j < bd.n; j++ {
				sym.SetSym(i, j, (u.At(i, j)+u.At(j, i))/2)
			}
		}
		var es mat.EigenSym
		if !es.Factorize(sym, false) {
			return 0
		}
		if lm := es.Values(nil)[0]; lm < 0 {
			alpha = math.Min(alpha, -1/lm)
		}
	}
	return alpha
}

// schur assembles M_ij = Σ_blocks tr(Aᵢ X Aⱼ Z⁻¹), using only the entries of
// the constraint matrices: with T = Aᵢ Z⁻¹ (rows of Aᵢ only),
// (X Aᵢ Z⁻¹)_qp = Σ_r X_q,r T_r,p and M_ij = Σ_{(p,q)∈Aⱼ} (Aⱼ)_pq (X Aᵢ Z⁻¹)_qp.
func (s *solver) schur(x, zinv bmat) *mat.SymDense {
	m := s.m
	if len(s.schurData) != m*m {
		s.schurData = make([]float64, m*m)
	}
	md := s.schurData
	clear(md)
	for k := range s.blocks {
		bd := &s.blocks[k]
		xk, zk := x[k], zinv[k]
		if bd.diag {
			for ci, i := range bd.cons {
				for cj := ci; cj < len(bd.cons); cj++ {
					j := bd.cons[cj]
					var t float64
					// Both lists are short; entries on the same index pair up.
					for _, ei := range bd.ents[ci] {
						for _, ej := range bd.ents[cj] {
							if ei.k == ej.k {
								t += ei.a * ej.a * xk[ei.k] * zk[ei.k]
							}
						}
					}
					md[i*m+j] += t
				}
			}
			continue
		}
		n := bd.n
		// work adds row i = cons[ci] of M for this block. With R = rows(Aᵢ),
		// T = Aᵢ Z⁻¹ is kept transposed (n × R) and the columns R of X are
		// gathered (n × R), so that (X Aᵢ Z⁻¹)_qp is a dot product of two
		// contiguous rows of length |R|.
		work := func(ci int, tbuf []float64, pos []int) {
			i := bd.cons[ci]
			rows := bd.rows[ci]
			nr := len(rows)
			for r, k := range rows {
				pos[k] = r
			}
			tt := tbuf[:nr*n]
			clear(tt)
			for _, e := range bd.ents[ci] {
				r := pos[e.k]
				zl := zk[e.l*n : e.l*n+n]
				for p, v := range zl {
					tt[p*nr+r] += e.a * v
				}
			}
			xg := tbuf[nr*n : 2*nr*n]
			for q := range n {
				xq := xk[q*n : q*n+n]
				g := xg[q*nr : q*nr+nr]
				for r, kk := range rows {
					g[r] = xq[kk]
				}
			}
			for cj := ci; cj < len(bd.cons); cj++ {
				var sum float64
				for _, e := range bd.ents[cj] {
					// e.k = p, e.l = q: need (X Aᵢ Z⁻¹)_{q,p}.
					a := xg[e.l*nr : e.l*nr+nr]
					b := tt[e.k*nr : e.k*nr+nr]
					var w float64
					for r, v := range a {
						w += v * b[r]
					}
					sum += e.a * w
				}
				md[i*m+bd.cons[cj]] += sum
			}
		}
		nc := len(bd.cons)
		workers := s.o.Workers
		if workers > nc {
			workers = nc
		}
		if workers <= 1 || nc*n < 2000 {
			buf, pos := make([]float64, 2*n*n), make([]int, n)
			for ci := 0; ci < nc; ci++ {
				work(ci, buf, pos)
			}
			continue
		}
		var wg sync.WaitGroup
		next := make(chan int)
		for w := 0; w < workers; w++ {
			wg.Add(1)
			go func() {
				defer wg.Done()
				buf, pos := make([]float64, 2*n*n), make([]int, n)
				for ci := range next {
					work(ci, buf, pos)
				}
			}()
		}
		for ci := 0; ci < nc; ci++ {
			next <- ci
		}
		close(next)
		wg.Wait()
	}
	// Only one triangle was filled for each block; constraints are
	// ascending in every block, so it is the upper one, which is what a
	// SymDense reads from its row-major backing slice.
	return mat.NewSymDense(m, md)
}

// mulXDZinv returns X·D·Z⁻¹ block by block (not symmetric).
func (s *solver) mul3(a, b, c bmat) bmat {
	r := s.newB()
	for k, bd := range s.blocks {
		if bd.diag {
			for i := range r[k] {
				r[k][i] = a[k][i] * b[k][i] * c[k][i]
			}
			continue
		}
		n := bd.n
		var t mat.Dense
		t.Mul(mat.NewDense(n, n, a[k]), mat.NewDense(n, n, b[k]))
		u := mat.NewDense(n, n, r[k])
		u.Mul(&t, mat.NewDense(n, n, c[k]))
	}
	return r
}

func (s *solver) symmetrize(x bmat) {
	for k, bd := range s.blocks {
		if bd.diag {
			continue
		}
		n := bd.n
		for i := 0; i < n; i++ {
			for j := i + 1; j < n; j++ {
				v := (x[k][i*n+j] + x[k][j*n+i]) / 2
				x[k][i*n+j], x[k][j*n+i] = v, v
			}
		}
	}
}

func axpy(dst bmat, a float64, x bmat) {
	for k := range dst {
		for i, v := range x[k] {
			dst[k][i] += a * v
		}
	}
}

func frob(x bmat) float64 { return math.Sqrt(inner(x, x)) }

func norm2(v []float64) float64 {
	var t float64
	for _, x := range v {
		t += x * x
	}
	return math.Sqrt(t)
}

var errCancelled = errors.New("sdp: solve cancelled")

func (s *solver) run(ctx context.Context) (*Result, error) {
	m := s.m
	// Starting point after Toh, Todd & Tütüncü (SDPT3): multiples of I
	// scaled to the data.
	nrt := math.Sqrt(float64(s.ntot))
	xi, eta := math.Max(10, nrt), math.Max(10, nrt)
	normA := make([]float64, m)
	for i, a := range s.p.A {
		var t float64
		for _, e := range a {
			if e.I == e.J {
				t += e.V * e.V
			} else {
				t += 2 * e.V * e.V
			}
		}
		normA[i] = math.Sqrt(t)
		xi = math.Max(xi, float64(s.ntot)*(1+math.Abs(s.p.B[i]))/(1+normA[i]))
		eta = math.Max(eta, normA[i])
	}
	eta = math.Max(eta, s.normC)
	x, z := s.identity(xi), s.identity(eta)
	y := make([]float64, m)
	res := &Result{}
	fill := func(st Status, it int, rp []float64, rd bmat) *Result {
		res.Status, res.Iterations, res.Y = st, it, y
		res.X, res.Z = s.export(x), s.export(z)
		res.PrimalObj, res.DualObj = s.cdot(x), dot(s.p.B, y)
		res.PrimalInf = norm2(rp) / (1 + s.normB)
		res.DualInf = frob(rd) / (1 + s.normC)
		res.Gap = math.Abs(res.PrimalObj-res.DualObj) / (1 + math.Abs(res.PrimalObj) + math.Abs(res.DualObj))
		return res
	}
	stall := 0
	// Stagnation: the worst of the three relative residuals, best so far
	// and when it last halved. Degenerate problems (an optimal face
	// without a strictly feasible neighbourhood) can creep for many
	// iterations at a small residual without reaching the tolerance.
	worst, halved := math.Inf(1), 0
	// One factorization reused by every iteration (its storage is kept).
	var chol cholesky
	for it := 0; ; it++ {
		if err := ctx.Err(); err != nil {
			return nil, fmt.Errorf("%w: %w", errCancelled, err)
		}
		ax := s.aop(x)
		rp := make([]float64, m)
		for i := range rp {
			rp[i] = s.p.B[i] - ax[i]
		}
		rd := s.atop(y)
		for k, bd := range s.blocks {
			for i := range rd[k] {
				rd[k][i] -= bd.c[i] + z[k][i]
			}
		}
		r := fill(Optimal, it, rp, rd)
		if r.PrimalInf < s.o.Tol && r.DualInf < s.o.Tol && r.Gap < s.o.Tol {
			return r, nil
		}
		// Ray tests (Farkas): y/(−bᵀy) with Σ yᵢAᵢ − Z = C + Rd small relative.
		if sdual := -r.DualObj; sdual > 0 {
			cr := s.atop(y)
			axpy(cr, -1, z)
			if frob(cr)/sdual < s.o.Tol && r.PrimalInf > s.o.Tol {
				r.Status = PrimalInfeasible
				return r, nil
			}
		}
		if sp := r.PrimalObj; sp > 0 && norm2(ax)/sp < s.o.Tol && r.DualInf > s.o.Tol {
			r.Status = DualInfeasible
			return r, nil
		}
		if it >= s.o.MaxIter {
			r.Status = IterationLimit
			return r, nil
		}
		if e := math.Max(r.PrimalInf, math.Max(r.DualInf, r.Gap)); e < worst/2 {
			worst, halved = e, it
		} else if it-halved >= stagnation && worst < math.Sqrt(s.o.Tol) {
			r.Status = Stalled
			return r, nil
		}
		mu := inner(x, z) / float64(s.ntot)
		fx, okx := s.factorize(x)
		fz, okz := s.factorize(z)
		if !okx || !okz {
			r.Status = Stalled
			return r, nil
		}
		zinv := fz.inv
		ms := s.schur(x, zinv)
		if !chol.factorize(ms) {
			// Regularize lightly once: a rank-deficient constraint set.
			var mx float64
			for i := 0; i < m; i++ {
				mx = math.Max(mx, ms.At(i, i))
			}
			for i := 0; i < m; i++ {
				ms.SetSym(i, i, ms.At(i, i)+1e-12*mx+1e-300)
			}
			if !chol.factorize(ms) {
				r.Status = Stalled
				return r, nil
			}
		}
		xrz := s.mul3(x, rd, zinv)
		azinv := s.aop(zinv)
		axrz := s.aop(xrz)
		direction := func(sigma float64, corr bmat) (dx, dz bmat, dy []float64) {
			rhs := make([]float64, m)
			var acorr []float64
			if corr != nil {
				acorr = s.aop(corr)
			}
			for i := 0; i < m; i++ {
				v := sigma*mu*azinv[i] - s.p.B[i] - axrz[i]
				if corr != nil {
					v -= acorr[i]
				}
				rhs[i] = v
			}
			// An ill-conditioned Schur complement is normal near the
			// optimum of a degenerate problem; the solution is used as it is.
			dy = chol.solveVec(rhs)
			dz = s.atop(dy)
			axpy(dz, 1, rd)
			dx = s.mul3(x, dz, zinv)
			for k := range dx {
				for i := range dx[k] {
					dx[k][i] = sigma*mu*zinv[k][i] - x[k][i] - dx[k][i]
				}
			}
			if corr != nil {
				axpy(dx, -1, corr)
			}
			s.symmetrize(dx)
			s.refine(dx, rp)
			return dx, dz, dy
		}
		// Predictor (affine scaling, σ = 0).
		dxp, dzp, _ := direction(0, nil)
		if dxp == nil {
			r.Status = Stalled
			return r, nil
		}
		ap := math.Min(1, s.maxStep(fx, x, dxp))
		ad := math.Min(1, s.maxStep(fz, z, dzp))
		xa, za := cloneB(x), cloneB(z)
		axpy(xa, ap, dxp)
		axpy(za, ad, dzp)
		muAff := inner(xa, za) / float64(s.ntot)
		sigma := math.Pow(math.Max(0, muAff)/mu, 3)
		sigma = math.Min(1, sigma)
		// Corrector (Mehrotra): the second-order term dXp·dZp·Z⁻¹.
		corr := s.mul3(dxp, dzp, zinv)
		dx, dz, dy := direction(sigma, corr)
		if dx == nil {
			r.Status = Stalled
			return r, nil
		}
		ap = math.Min(1, 0.95*s.maxStep(fx, x, dx))
		ad = math.Min(1, 0.95*s.maxStep(fz, z, dz))
		if ap < 1e-10 && ad < 1e-10 {
			stall++
			if stall > 3 {
				r.Status = Stalled
				return r, nil
			}
		} else {
			stall = 0
		}
		// Eigenvalue rounding can overestimate a step: back off until the
		// new iterates factor.
		x = s.stepInto(x, dx, ap)
		z = s.stepInto(z, dz, ad)
		for i := range y {
			y[i] += ad * dy[i]
		}
		res = &Result{}
	}
}

// stepInto returns x + α·dx with α reduced (×0.8, a few times) until the
// result is positive definite; x itself when no step works.
func (s *solver) stepInto(x, dx bmat, alpha float64) bmat {
	for try := 0; try < 30; try++ {
		t := cloneB(x)
		axpy(t, alpha, dx)
		if _, ok := s.factorize(t); ok {
			return t
		}
		alpha *= 0.8
	}
	return x
}

func cloneB(x bmat) bmat {
	y := make(bmat, len(x))
	for k := range x {
		y[k] = append([]float64(nil), x[k]...)
	}
	return y
}

func dot(a, b []float64) float64 {
	var t float64
	for i := range a {
		t += a[i] * b[i]
	}
	return t
}

func (s *solver) cdot(x bmat) float64 {
	var t float64
	for k, bd := range s.blocks {
		for i, v := range bd.c {
			t += v * x[k][i]
		}
	}
	return t
}

func (s *solver) export(x bmat) []Block {
	out := make([]Block, len(x))
	for k, bd := range s.blocks {
		out[k] = Block{N: bd.n, Diag: bd.diag, Data: append([]float64(nil), x[k]...)}
	}
	return out
}
