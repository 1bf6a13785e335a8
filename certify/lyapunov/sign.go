package lyapunov

import (
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack/lapack64"
	"gonum.org/v1/gonum/mat"
)

// transposeFrom is the order from which continuousSign copies Aₖ⁻ᵀ out
// rather than multiply by a transposed operand.
const transposeFrom = 48

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
	invT := mat.NewDense(n, n, nil)
	stepCol, sizeCol := make([]float64, n), make([]float64, n)
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
		// F ← (c·F + Aₖ⁻ᵀ·F·Aₖ⁻¹/c)/2; from order transposeFrom on with
		// Aₖ⁻ᵀ copied out: gonum's products of untransposed operands are
		// then several times faster.
		left, tr := raw, blas.Trans
		if n >= transposeFrom {
			invT.CloneFrom(inv.T())
			left, tr = invT.RawMatrix(), blas.NoTrans
		}
		blas64.Gemm(tr, blas.NoTrans, 1, left, f.RawMatrix(), 0, t.RawMatrix())
		blas64.Gemm(blas.NoTrans, blas.NoTrans, 0.5/c, t.RawMatrix(), raw, 0.5*c, f.RawMatrix())
		// Aₖ₊₁ = (c·Aₖ + Aₖ⁻¹/c)/2, and the 1-norms of the step and of
		// Aₖ₊₁ (largest column sums), in one pass.
		a0, a1, x := ak.RawMatrix(), next.RawMatrix(), raw
		clear(stepCol)
		clear(sizeCol)
		for i := range n {
			ri, rn, rx := a0.Data[i*a0.Stride:i*a0.Stride+n], a1.Data[i*a1.Stride:i*a1.Stride+n], x.Data[i*x.Stride:i*x.Stride+n]
			for j := range n {
				v := 0.5*c*ri[j] + 0.5/c*rx[j]
				stepCol[j] += math.Abs(v - ri[j])
				sizeCol[j] += math.Abs(v)
				rn[j] = v
			}
		}
		step, size := 0.0, 0.0
		for j := range n {
			step, size = max(step, stepCol[j]), max(size, sizeCol[j])
		}
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
