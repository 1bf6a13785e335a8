package sdp

import (
	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack/lapack64"
	"gonum.org/v1/gonum/mat"
)

// cholesky is the factor U of a symmetric positive definite matrix,
// A = UᵀU, for the solver's m×m systems (the Schur complement and the
// constraints' Gram matrix). It is mat.Cholesky's factorization and solve
// (LAPACK's Potrf and Potrs on a copy of the upper triangle, so the same
// numbers) without the norm and condition estimate that mat.Cholesky adds
// to every factorization, several triangular solves as long as a solve:
// the solver reads no condition number. Its storage is kept for the next
// factorization of the same size.
type cholesky struct {
	data []float64
	u    blas64.Triangular
}

// factorize factors a and reports whether it is positive definite; a is
// not modified.
func (c *cholesky) factorize(a *mat.SymDense) bool {
	raw := a.RawSymmetric()
	n := raw.N
	if len(c.data) != n*n {
		c.data = make([]float64, n*n)
	}
	for i := range n {
		if raw.Uplo == blas.Upper {
			copy(c.data[i*n+i:i*n+n], raw.Data[i*raw.Stride+i:i*raw.Stride+n])
			continue
		}
		for j := i; j < n; j++ {
			c.data[i*n+j] = raw.Data[j*raw.Stride+i]
		}
	}
	t, ok := lapack64.Potrf(blas64.Symmetric{N: n, Stride: n, Data: c.data, Uplo: blas.Upper})
	c.u = t
	return ok
}

// solveVec returns x with A·x = b.
func (c *cholesky) solveVec(b []float64) []float64 {
	x := append([]float64(nil), b...)
	lapack64.Potrs(c.u, blas64.General{Rows: len(x), Cols: 1, Stride: 1, Data: x})
	return x
}
