package lyapunov

import (
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack/lapack64"
	"gonum.org/v1/gonum/mat"
)

// signIterations bounds the Newton iteration of continuousSign; with
// determinant scaling it needs about 6 to 10 for a well-conditioned A.
const signIterations = 40

// continuousSign solves AᵀP + PA = −Q for a Hurwitz A by Newton's iteration
// for the matrix sign function (Roberts 1980) with determinant scaling
// (Byers 1987). With T = [[I, P], [0, I]], the block matrix
// Z = [[Aᵀ, Q], [0, −A]] is T·diag(Aᵀ, −A)·T⁻¹ exactly when P solves the
// equation, so sign(Z) = [[−I, 2P], [0, I]] for Hurwitz A. The iteration
// Z ← (c·Z + Z⁻¹/c)/2 keeps Z block triangular, Z = [[Aₖᵀ, Fₖ], [0, −Aₖ]]:
//
//	Aₖ₊₁ = (c·Aₖ + Aₖ⁻¹/c)/2,   Fₖ₊₁ = (c·Fₖ + Aₖ⁻ᵀFₖAₖ⁻¹/c)/2,
//
// with c = |det Aₖ|^(−1/n), and Aₖ → −I, Fₖ → 2P. Its work is matrix
// inversion and products (gonum's blocked BLAS), which beat the QR
// iteration of the Schur form at the sizes of interest. ok is false when
// A is singular along the way, or the iteration does not settle at −I
// within signIterations steps (A not Hurwitz, or too close to the
// imaginary axis): the caller then uses the Schur method, which also
// diagnoses such cases.
func continuousSign(a, q *mat.Dense) (*mat.SymDense, bool) {
	n, _ := a.Dims()
	ak := mat.DenseCopyOf(a)
	f := mat.NewDense(n, n, nil)
	f.Add(q, q.T())
	f.Scale(0.5, f)
	inv := mat.NewDense(n, n, nil)
	t := mat.NewDense(n, n, nil)
	next := mat.NewDense(n, n, nil)
	ipiv := make([]int, n)
	work := make([]float64, 64*n)
	for range signIterations {
		inv.Copy(ak)
		raw := inv.RawMatrix()
		if !lapack64.Getrf(raw, ipiv) {
			return nil, false
		}
		logDet := 0.0
		for i := range n {
			logDet += math.Log(math.Abs(raw.Data[i*raw.Stride+i]))
		}
		if !lapack64.Getri(raw, ipiv, work, len(work)) {
			return nil, false
		}
		c := math.Exp(-logDet / float64(n))
		if math.IsNaN(c) || math.IsInf(c, 0) || c == 0 {
			return nil, false
		}
		// F ← (c·F + Aₖ⁻ᵀ·F·Aₖ⁻¹/c)/2
		blas64.Gemm(blas.Trans, blas.NoTrans, 1, raw, f.RawMatrix(), 0, t.RawMatrix())
		blas64.Gemm(blas.NoTrans, blas.NoTrans, 0.5/c, t.RawMatrix(), raw, 0.5*c, f.RawMatrix())
		// Aₖ₊₁ = (c·Aₖ + Aₖ⁻¹/c)/2, and the step's size
		next.Scale(0.5*c, ak)
		t.Scale(0.5/c, inv)
		next.Add(next, t)
		t.Sub(next, ak)
		step, size := mat.Norm(t, 1), mat.Norm(next, 1)
		ak, next = next, ak
		// Quadratic convergence: a relative step below 1e-8 leaves an error
		// of about its square, below the rounding of the entries.
		if step <= 1e-8*size {
			break
		}
	}
	// Settled at −I: A is Hurwitz and F = 2P.
	for i := range n {
		ak.Set(i, i, ak.At(i, i)+1)
	}
	if d := mat.Norm(ak, 1); math.IsNaN(d) || d > 1e-8 {
		return nil, false
	}
	p := mat.NewSymDense(n, nil)
	for i := range n {
		for j := i; j < n; j++ {
			p.SetSym(i, j, (f.At(i, j)+f.At(j, i))/4)
		}
	}
	return p, true
}
