package lyapunov

import (
	"fmt"
	"math"
	"math/cmplx"

	"gonum.org/v1/gonum/mat"
)

// ContinuousResidual returns the relative residual of P as a solution of
// AᵀP + PA = −Q,
//
//	‖AᵀP + PA + Q‖_F / (‖A‖_F‖P‖_F + ‖Q‖_F),
//
// or 0 when the denominator is 0 (then the numerator is 0 too). It panics on
// mismatched dimensions.
func ContinuousResidual(a *mat.Dense, p *mat.SymDense, q *mat.Dense) float64 {
	n := residualDims("ContinuousResidual", a, p, q)
	r := mat.NewDense(n, n, nil)
	r.Mul(a.T(), p)
	var pa mat.Dense
	pa.Mul(p, a)
	r.Add(r, &pa)
	r.Add(r, q)
	return ratio(mat.Norm(r, 2), mat.Norm(a, 2)*mat.Norm(p, 2)+mat.Norm(q, 2))
}

// DiscreteResidual returns the relative residual of P as a solution of
// AᵀPA − P = −Q,
//
//	‖AᵀPA − P + Q‖_F / (‖A‖²_F‖P‖_F + ‖P‖_F + ‖Q‖_F),
//
// or 0 when the denominator is 0. It panics on mismatched dimensions.
func DiscreteResidual(a *mat.Dense, p *mat.SymDense, q *mat.Dense) float64 {
	n := residualDims("DiscreteResidual", a, p, q)
	var pa mat.Dense
	pa.Mul(p, a)
	r := mat.NewDense(n, n, nil)
	r.Mul(a.T(), &pa)
	r.Sub(r, p)
	r.Add(r, q)
	an, pn := mat.Norm(a, 2), mat.Norm(p, 2)
	return ratio(mat.Norm(r, 2), an*an*pn+pn+mat.Norm(q, 2))
}

func residualDims(fn string, a *mat.Dense, p *mat.SymDense, q *mat.Dense) int {
	n, c := a.Dims()
	if n != c {
		panic(fmt.Sprintf("lyap: %s: A is %d×%d, not square", fn, n, c))
	}
	if p.SymmetricDim() != n {
		panic(fmt.Sprintf("lyap: %s: P is %d×%d, want %d×%d", fn, p.SymmetricDim(), p.SymmetricDim(), n, n))
	}
	if qr, qc := q.Dims(); qr != n || qc != n {
		panic(fmt.Sprintf("lyap: %s: Q is %d×%d, want %d×%d", fn, qr, qc, n, n))
	}
	return n
}

func ratio(num, den float64) float64 {
	if den == 0 {
		return 0
	}
	return num / den
}

// eigenvalues returns the eigenvalues of a via mat.Eigen, or nil if the
// factorization fails.
func eigenvalues(a *mat.Dense) []complex128 {
	var e mat.Eigen
	if !e.Factorize(a, mat.EigenNone) {
		return nil
	}
	return e.Values(nil)
}

// SpectralAbscissa returns max Re λ(A) over the eigenvalues of the square
// matrix A, computed with mat.Eigen, or NaN if that fails. It is a float
// proposal only: it proves nothing about the sign of the true abscissa.
func SpectralAbscissa(a *mat.Dense) float64 {
	ev := eigenvalues(a)
	if ev == nil {
		return math.NaN()
	}
	m := math.Inf(-1)
	for _, l := range ev {
		m = math.Max(m, real(l))
	}
	return m
}

// IsHurwitz reports whether SpectralAbscissa(a) < 0, i.e. whether A looks
// asymptotically stable as a continuous-time system (ẋ = Ax) in floating
// point. It is false when the eigenvalues could not be computed.
func IsHurwitz(a *mat.Dense) bool { return SpectralAbscissa(a) < 0 }

// SpectralRadius returns max |λ(A)| via mat.Eigen, or NaN if that fails; the
// discrete-time analogue of SpectralAbscissa, and a float proposal only.
func SpectralRadius(a *mat.Dense) float64 {
	ev := eigenvalues(a)
	if ev == nil {
		return math.NaN()
	}
	m := 0.0
	for _, l := range ev {
		m = math.Max(m, cmplx.Abs(l))
	}
	return m
}

// IsSchurStable reports whether SpectralRadius(a) < 1, i.e. whether A looks
// asymptotically stable as a discrete-time system (x⁺ = Ax) in floating point.
func IsSchurStable(a *mat.Dense) bool { return SpectralRadius(a) < 1 }
