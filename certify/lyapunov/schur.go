package lyapunov

import (
	"errors"
	"fmt"
	"math"
	"sync"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack"
	"gonum.org/v1/gonum/lapack/gonum"
	"gonum.org/v1/gonum/mat"
)

// impl is gonum's pure-Go LAPACK. The Hessenberg, Schur and small Sylvester
// routines are not wrapped by lapack64, so they are called directly.
var impl gonum.Implementation

// realSchur holds the real Schur decomposition A = Z T Zᵀ of an n×n matrix.
// t and z are dense row-major n×n matrices with stride n. T is upper
// quasi-triangular: its diagonal blocks are 1×1 (real eigenvalues) or 2×2 in
// LAPACK standard form (a complex-conjugate pair), and everything below the
// diagonal blocks is zero.
type realSchur struct {
	n      int
	t, z   []float64
	wr, wi []float64 // eigenvalues, in the order of T's diagonal blocks
	starts []int     // first row of each diagonal block, plus a final n
}

// newRealSchur computes the real Schur form of a by Dgehrd (Hessenberg
// reduction), Dorghr (the orthogonal factor Q) and Dhseqr (QR iteration,
// accumulating its Schur vectors into Q, so that Z = Q·Z_H).
func newRealSchur(a *mat.Dense) (*realSchur, error) {
	n, _ := a.Dims()
	h := make([]float64, n*n)
	copyDense(h, a)

	tau := make([]float64, max(n-1, 0))
	// The LAPACK workspace is scratch only, and Dgehrd's optimal size is
	// large (its blocked code's, thousands of entries even for n = 3), so
	// it is reused across calls. grow gives every call the same length as
	// a fresh buffer would have, so the results do not depend on the reuse.
	pooled := workPool.Get().(*[]float64)
	defer workPool.Put(pooled)
	work := (*pooled)[:1]
	defer func() { *pooled = work[:cap(work)] }()
	impl.Dgehrd(n, 0, n-1, h, n, tau, work, -1)
	work = grow(work, int(work[0]))
	impl.Dgehrd(n, 0, n-1, h, n, tau, work, len(work))

	// Q from the reflectors stored below the subdiagonal of h; then clear them
	// so that h holds exactly the Hessenberg matrix.
	z := make([]float64, n*n)
	copy(z, h)
	impl.Dorghr(n, 0, n-1, z, n, tau, work, -1)
	work = grow(work, int(work[0]))
	impl.Dorghr(n, 0, n-1, z, n, tau, work, len(work))
	for i := 2; i < n; i++ {
		for j := 0; j < i-1; j++ {
			h[i*n+j] = 0
		}
	}

	wr := make([]float64, n)
	wi := make([]float64, n)
	impl.Dhseqr(lapack.EigenvaluesAndSchur, lapack.SchurOrig, n, 0, n-1, h, n, wr, wi, z, n, work, -1)
	work = grow(work, max(int(work[0]), n))
	if unconv := impl.Dhseqr(lapack.EigenvaluesAndSchur, lapack.SchurOrig, n, 0, n-1, h, n, wr, wi, z, n, work, len(work)); unconv > 0 {
		return nil, fmt.Errorf("lyap: QR iteration for the real Schur form of A did not converge (%d eigenvalues unconverged)", unconv)
	}

	// Block structure. Dhseqr returns T in standard form: a nonzero
	// subdiagonal entry marks a 2×2 block, and such blocks never touch.
	// Anything strictly below the block diagonal is zeroed for safety.
	starts := make([]int, 0, n+1)
	for i := 0; i < n; {
		starts = append(starts, i)
		if i+1 < n && h[(i+1)*n+i] != 0 {
			i += 2
		} else {
			if i+1 < n {
				h[(i+1)*n+i] = 0
			}
			i++
		}
	}
	starts = append(starts, n)
	for i := 2; i < n; i++ {
		for j := 0; j < i-1; j++ {
			h[i*n+j] = 0
		}
	}
	return &realSchur{n: n, t: h, z: z, wr: wr, wi: wi, starts: starts}, nil
}

// transformRHS returns C = Zᵀ·Qs·Z as a dense row-major n×n slice, where
// Qs = (Q+Qᵀ)/2 is the symmetric part of q.
func (s *realSchur) transformRHS(q *mat.Dense) []float64 {
	n := s.n
	qs := make([]float64, n*n)
	raw := q.RawMatrix()
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			qs[i*n+j] = 0.5 * (raw.Data[i*raw.Stride+j] + raw.Data[j*raw.Stride+i])
		}
	}
	tmp := make([]float64, n*n)
	c := make([]float64, n*n)
	Z := gen(s.z, n, n, n)
	blas64.Gemm(blas.Trans, blas.NoTrans, 1, Z, gen(qs, n, n, n), 0, gen(tmp, n, n, n))
	blas64.Gemm(blas.NoTrans, blas.NoTrans, 1, gen(tmp, n, n, n), Z, 0, gen(c, n, n, n))
	return c
}

// backTransform returns the symmetric matrix P = Z·Y·Zᵀ, symmetrized as
// (P+Pᵀ)/2.
func (s *realSchur) backTransform(y []float64) *mat.SymDense {
	n := s.n
	Z := gen(s.z, n, n, n)
	tmp := make([]float64, n*n)
	p := make([]float64, n*n)
	blas64.Gemm(blas.NoTrans, blas.NoTrans, 1, Z, gen(y, n, n, n), 0, gen(tmp, n, n, n))
	blas64.Gemm(blas.NoTrans, blas.Trans, 1, gen(tmp, n, n, n), Z, 0, gen(p, n, n, n))
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			v := 0.5 * (p[i*n+j] + p[j*n+i])
			p[i*n+j], p[j*n+i] = v, v
		}
	}
	return mat.NewSymDense(n, p)
}

// eigen returns the i-th eigenvalue of A as found by Dhseqr.
func (s *realSchur) eigen(i int) complex128 { return complex(s.wr[i], s.wi[i]) }

// gen views data (row-major, given stride) as an r×c blas64.General.
func gen(data []float64, r, c, stride int) blas64.General {
	return blas64.General{Rows: r, Cols: c, Stride: stride, Data: data}
}

// sub returns the r×c submatrix of the row-major n×n matrix m starting at
// (i, j). It must not be used with r == 0 or c == 0.
func sub(m []float64, n, i, j, r, c int) blas64.General {
	return blas64.General{Rows: r, Cols: c, Stride: n, Data: m[i*n+j : (i+r-1)*n+j+c]}
}

// gemmSub computes C ← alpha·op(A)·op(B) + C on submatrices, skipping empty
// products (gonum's blas rejects zero-sized views of the slices used here).
func gemmSub(tA, tB blas.Transpose, alpha float64, a, b blas64.General, c blas64.General) {
	if c.Rows == 0 || c.Cols == 0 {
		return
	}
	k := a.Cols
	if tA == blas.Trans {
		k = a.Rows
	}
	if k == 0 {
		return
	}
	blas64.Gemm(tA, tB, alpha, a, b, 1, c)
}

// grow returns w when it has at least n entries (at least 1), otherwise a
// slice of n entries, w's storage when its capacity allows.
func grow(w []float64, n int) []float64 {
	if n < 1 {
		n = 1
	}
	if len(w) >= n {
		return w
	}
	if cap(w) >= n {
		return w[:n]
	}
	return make([]float64, n)
}

// workPool holds LAPACK workspaces for reuse (newRealSchur).
var workPool = sync.Pool{New: func() any { return &[]float64{0} }}

// copyDense copies a (any stride) into the dense row-major slice dst.
func copyDense(dst []float64, a *mat.Dense) {
	raw := a.RawMatrix()
	for i := 0; i < raw.Rows; i++ {
		copy(dst[i*raw.Cols:(i+1)*raw.Cols], raw.Data[i*raw.Stride:i*raw.Stride+raw.Cols])
	}
}

// checkInputs panics on mismatched dimensions and returns an error for
// non-finite entries.
func checkInputs(fn string, a, q *mat.Dense) (int, error) {
	if a == nil || q == nil {
		panic(fmt.Sprintf("lyap: %s: nil matrix", fn))
	}
	if a.IsEmpty() || q.IsEmpty() {
		panic(fmt.Sprintf("lyap: %s: empty matrix", fn))
	}
	n, c := a.Dims()
	if n != c {
		panic(fmt.Sprintf("lyap: %s: A is %d×%d, not square", fn, n, c))
	}
	if qr, qc := q.Dims(); qr != n || qc != n {
		panic(fmt.Sprintf("lyap: %s: Q is %d×%d, want %d×%d to match A", fn, qr, qc, n, n))
	}
	for _, m := range []struct {
		name string
		x    *mat.Dense
	}{{"A", a}, {"Q", q}} {
		raw := m.x.RawMatrix()
		for i := 0; i < raw.Rows; i++ {
			for _, v := range raw.Data[i*raw.Stride : i*raw.Stride+raw.Cols] {
				if math.IsNaN(v) || math.IsInf(v, 0) {
					return n, fmt.Errorf("lyap: %s: %s has a non-finite entry (%v)", fn, m.name, v)
				}
			}
		}
	}
	return n, nil
}

// ErrSingular is wrapped by the errors that Continuous and Discrete return
// when the equation is singular or too ill-conditioned to solve reliably.
var ErrSingular = errors.New("lyap: equation singular or ill-conditioned")

// SingularTol is the relative eigenvalue tolerance below which an equation is
// declared singular: Continuous rejects A when some pair of eigenvalues has
// |λi+λj| ≤ SingularTol·2‖A‖_F, Discrete when |λiλj−1| ≤ SingularTol·(1+‖A‖²_F).
// The right-hand sides bound the norm of the Kronecker operators I⊗Aᵀ+Aᵀ⊗I
// and Aᵀ⊗Aᵀ−I, whose eigenvalues are λi+λj and λiλj−1; below this tolerance a
// float solution would carry an error of about eps/SingularTol ≈ 1e-6
// relative to ‖P‖ or worse, which is useless as a certificate proposal.
const SingularTol = 1e-10

// frob returns the Frobenius norm of a row-major matrix.
func frob(x []float64) float64 {
	var scale, ssq float64 = 0, 1
	for _, v := range x {
		if v == 0 {
			continue
		}
		av := math.Abs(v)
		if scale < av {
			ssq = 1 + ssq*(scale/av)*(scale/av)
			scale = av
		} else {
			ssq += (av / scale) * (av / scale)
		}
	}
	return scale * math.Sqrt(ssq)
}
