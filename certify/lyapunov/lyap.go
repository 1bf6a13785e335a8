package lyapunov

import (
	"fmt"
	"math"
	"math/cmplx"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/mat"
)

// Continuous solves the continuous-time Lyapunov equation
//
//	AᵀP + PA = −Q
//
// for the symmetric n×n matrix P: by the matrix sign function when A is
// Hurwitz, else by the Bartels–Stewart method on the real Schur form of A
// (see the package documentation). Q must be n×n; only its
// symmetric part (Q+Qᵀ)/2 is used, so for a non-symmetric Q the result is the
// symmetric part of the (then non-symmetric) solution. The result is
// symmetrized as (P+Pᵀ)/2.
//
// Continuous returns an error wrapping ErrSingular when two eigenvalues of A
// (not necessarily distinct) have λi+λj ≈ 0 (see SingularTol), which includes
// A singular and A with a pair of eigenvalues on the imaginary axis; an error
// when A or Q has a NaN or infinite entry or the Schur form does not converge.
// It panics when A is not square, Q does not match A, or either is nil or
// empty.
//
// P is a floating-point proposal: nothing here proves that it is positive
// definite or that it solves the equation exactly.
func Continuous(a, q *mat.Dense) (*mat.SymDense, error) {
	n, err := checkInputs("Continuous", a, q)
	if err != nil {
		return nil, err
	}
	if p, ok := continuousSign(a, q); ok {
		return p, nil
	}
	s, err := newRealSchur(a)
	if err != nil {
		return nil, err
	}
	tol := SingularTol * 2 * mat.Norm(a, 2)
	for i := 0; i < n; i++ {
		for j := i; j < n; j++ {
			if d := cmplx.Abs(s.eigen(i) + s.eigen(j)); d <= tol {
				return nil, fmt.Errorf("%w: Continuous: A has eigenvalues λ%d = %.6g and λ%d = %.6g with |λi+λj| = %.3g ≤ %.3g = SingularTol·2‖A‖_F, so AᵀP+PA = −Q is singular or too ill-conditioned to solve",
					ErrSingular, i, s.eigen(i), j, s.eigen(j), d, tol)
			}
		}
	}
	y, err := solveContinuousSchur(s, s.transformRHS(q))
	if err != nil {
		return nil, err
	}
	return s.backTransform(y), nil
}

// solveContinuousSchur solves TᵀY + YT = −C for symmetric Y, block row by
// block row, computing only the blocks on and above the diagonal and mirroring
// them below. For block row k (rows r:r+nk) the right-hand side of every block
// (k, l), l ≥ k, is first reduced by the terms that involve earlier block rows,
//
//	W = −C[k, r:] − T[:r, k]ᵀ·Y[:r, r:] − Y[k, :r]·T[:r, r:],
//
// (two matrix products; Y[k, :r] = Y[:r, k]ᵀ is already known by symmetry),
// then the blocks are solved left to right with Dlasy2,
//
//	T_kkᵀ·Y_kl + Y_kl·T_ll = W_kl,
//
// each solved block Y_kl being subtracted from the blocks to its right as
// W[k, l+1:] −= Y_kl·T[l, l+1:].
func solveContinuousSchur(s *realSchur, c []float64) ([]float64, error) {
	n, t := s.n, s.t
	y := make([]float64, n*n)
	w := make([]float64, 2*n) // at most two rows of right-hand sides, stride n
	var x [4]float64
	for bk := 0; bk+1 < len(s.starts); bk++ {
		r, nk := s.starts[bk], s.starts[bk+1]-s.starts[bk]
		m := n - r // columns r:n
		W := gen(w, nk, m, n)
		for i := 0; i < nk; i++ {
			for j := 0; j < m; j++ {
				w[i*n+j] = -c[(r+i)*n+r+j]
			}
		}
		if r > 0 {
			gemmSub(blas.Trans, blas.NoTrans, -1, sub(t, n, 0, r, r, nk), sub(y, n, 0, r, r, m), W)
			gemmSub(blas.NoTrans, blas.NoTrans, -1, sub(y, n, r, 0, nk, r), sub(t, n, 0, r, r, m), W)
		}
		for bl := bk; bl+1 < len(s.starts); bl++ {
			cl, nl := s.starts[bl], s.starts[bl+1]-s.starts[bl]
			off := cl - r
			scale, _, ok := impl.Dlasy2(true, false, 1, nk, nl,
				t[r*n+r:], n, t[cl*n+cl:], n, w[off:], n, x[:], 2)
			if !ok {
				return nil, fmt.Errorf("%w: Continuous: diagonal blocks %d and %d of the Schur form give a near-singular 1×1/2×2 Sylvester system (λi+λj ≈ 0)", ErrSingular, bk, bl)
			}
			if scale != 1 {
				return nil, fmt.Errorf("%w: Continuous: the solution would overflow (Dlasy2 scale %g)", ErrSingular, scale)
			}
			if bl == bk && nk == 2 { // diagonal block: symmetric in exact arithmetic
				v := 0.5 * (x[1] + x[2])
				x[1], x[2] = v, v
			}
			for i := 0; i < nk; i++ {
				for j := 0; j < nl; j++ {
					y[(r+i)*n+cl+j] = x[i*2+j]
					y[(cl+j)*n+r+i] = x[i*2+j]
				}
			}
			if rest := n - cl - nl; rest > 0 {
				gemmSub(blas.NoTrans, blas.NoTrans, -1, gen(x[:], nk, nl, 2),
					sub(t, n, cl, cl+nl, nl, rest), sub(w, n, 0, off+nl, nk, rest))
			}
		}
	}
	return y, nil
}

// Discrete solves the discrete-time Lyapunov (Stein) equation
//
//	AᵀPA − P = −Q
//
// for the symmetric n×n matrix P by the Schur method of Kitagawa (1977) and
// Barraud (1977) (see the package documentation). As in Continuous only the
// symmetric part of Q is used and the result is symmetrized.
//
// Discrete returns an error wrapping ErrSingular when two eigenvalues of A
// (not necessarily distinct) have λiλj ≈ 1 (see SingularTol), which includes
// any eigenvalue ±1 and any pair on the unit circle conjugate to each other; an
// error for non-finite input or a failed Schur form. It panics when A is not
// square, Q does not match A, or either is nil or empty.
func Discrete(a, q *mat.Dense) (*mat.SymDense, error) {
	n, err := checkInputs("Discrete", a, q)
	if err != nil {
		return nil, err
	}
	s, err := newRealSchur(a)
	if err != nil {
		return nil, err
	}
	an := mat.Norm(a, 2)
	tol := SingularTol * (1 + an*an)
	for i := 0; i < n; i++ {
		for j := i; j < n; j++ {
			if d := cmplx.Abs(s.eigen(i)*s.eigen(j) - 1); d <= tol {
				return nil, fmt.Errorf("%w: Discrete: A has eigenvalues λ%d = %.6g and λ%d = %.6g with |λiλj−1| = %.3g ≤ %.3g = SingularTol·(1+‖A‖²_F), so AᵀPA − P = −Q is singular or too ill-conditioned to solve",
					ErrSingular, i, s.eigen(i), j, s.eigen(j), d, tol)
			}
		}
	}
	y, err := solveDiscreteSchur(s, s.transformRHS(q))
	if err != nil {
		return nil, err
	}
	return s.backTransform(y), nil
}

// solveDiscreteSchur solves TᵀYT − Y = −C for symmetric Y. With
// U = TᵀY (block lower-triangular in its first factor, so
// U_kj = Σ_{i≤k} T_ikᵀ·Y_ij), block (k, l) of the equation reads
//
//	Σ_{j≤l} U_kj·T_jl − Y_kl = −C_kl.
//
// For block row k (rows r:r+nk) let G = T[:r, k]ᵀ·Y[:r, :] (the i < k part
// of U's block row; all rows above r are known). Then U_kj = G_kj + T_kkᵀ·Y_kj,
// and Y_kl solves the 1×1 … 2×2 Stein system
//
//	T_kkᵀ·Y_kl·T_ll − Y_kl = −C_kl − Σ_{j<l} U_kj·T_jl − G_kl·T_ll.
//
// The sum over j < k is one matrix product; the sum over k ≤ j < l is
// accumulated left to right as the blocks of row k are solved.
func solveDiscreteSchur(s *realSchur, c []float64) ([]float64, error) {
	n, t := s.n, s.t
	y := make([]float64, n*n)
	g := make([]float64, 2*n) // G, nk×n, stride n
	u := make([]float64, 2*n) // U's block row, nk×n, stride n (columns < r, then one block)
	w := make([]float64, 2*n) // right-hand sides, nk×(n−r), stride n
	var x, b, ub [4]float64
	for bk := 0; bk+1 < len(s.starts); bk++ {
		r, nk := s.starts[bk], s.starts[bk+1]-s.starts[bk]
		m := n - r
		for i := range g[:nk*n] {
			g[i] = 0
		}
		if r > 0 {
			gemmSub(blas.Trans, blas.NoTrans, 1, sub(t, n, 0, r, r, nk), sub(y, n, 0, 0, r, n), gen(g, nk, n, n))
			// U[:, :r] = G[:, :r] + T_kkᵀ·Y[k, :r]
			for i := 0; i < nk; i++ {
				copy(u[i*n:i*n+r], g[i*n:i*n+r])
			}
			gemmSub(blas.Trans, blas.NoTrans, 1, sub(t, n, r, r, nk, nk), sub(y, n, r, 0, nk, r), sub(u, n, 0, 0, nk, r))
		}
		for i := 0; i < nk; i++ {
			for j := 0; j < m; j++ {
				w[i*n+j] = -c[(r+i)*n+r+j]
			}
		}
		if r > 0 {
			gemmSub(blas.NoTrans, blas.NoTrans, -1, sub(u, n, 0, 0, nk, r), sub(t, n, 0, r, r, m), gen(w, nk, m, n))
		}
		for bl := bk; bl+1 < len(s.starts); bl++ {
			cl, nl := s.starts[bl], s.starts[bl+1]-s.starts[bl]
			off := cl - r
			// b = W_kl − G_kl·T_ll
			for i := 0; i < nk; i++ {
				for j := 0; j < nl; j++ {
					v := w[i*n+off+j]
					for p := 0; p < nl; p++ {
						v -= g[i*n+cl+p] * t[(cl+p)*n+cl+j]
					}
					b[i*2+j] = v
				}
			}
			if !solveSmallStein(nk, nl, t[r*n+r:], t[cl*n+cl:], n, b[:], x[:]) {
				return nil, fmt.Errorf("%w: Discrete: diagonal blocks %d and %d of the Schur form give a near-singular 1×1/2×2 Stein system (λiλj ≈ 1)", ErrSingular, bk, bl)
			}
			if bl == bk && nk == 2 {
				v := 0.5 * (x[1] + x[2])
				x[1], x[2] = v, v
			}
			for i := 0; i < nk; i++ {
				for j := 0; j < nl; j++ {
					y[(r+i)*n+cl+j] = x[i*2+j]
					y[(cl+j)*n+r+i] = x[i*2+j]
				}
			}
			rest := n - cl - nl
			if rest == 0 {
				continue
			}
			// U_kl = G_kl + T_kkᵀ·Y_kl, then W[:, l+1:] −= U_kl·T[l, l+1:].
			for i := 0; i < nk; i++ {
				for j := 0; j < nl; j++ {
					v := g[i*n+cl+j]
					for p := 0; p < nk; p++ {
						v += t[(r+p)*n+r+i] * x[p*2+j]
					}
					ub[i*2+j] = v
				}
			}
			gemmSub(blas.NoTrans, blas.NoTrans, -1, gen(ub[:], nk, nl, 2),
				sub(t, n, cl, cl+nl, nl, rest), sub(w, n, 0, off+nl, nk, rest))
		}
	}
	return y, nil
}

// solveSmallStein solves the n1×n2 Stein system TLᵀ·X·TR − X = B (n1, n2 ∈
// {1, 2}; TL and TR row-major with stride ld; B and X row-major with stride 2)
// as the m×m linear system (TRᵀ⊗TLᵀ − I)·vec X = vec B, m = n1·n2 ≤ 4, by
// Gaussian elimination with complete pivoting. The coefficient of X[s][t] in
// equation (p, q) is TL[s][p]·TR[t][q] − δ_sp·δ_tq. It reports false, like
// LAPACK's Dlasy2, when a pivot falls below max(eps·max|M|, smallest normal/eps)
// so that the system is singular to working precision.
func solveSmallStein(n1, n2 int, tl, tr []float64, ld int, b, x []float64) bool {
	m := n1 * n2
	var M [4][4]float64
	var rhs [4]float64
	big := 0.0
	for p := 0; p < n1; p++ {
		for q := 0; q < n2; q++ {
			e := p*n2 + q
			rhs[e] = b[p*2+q]
			for s := 0; s < n1; s++ {
				for t := 0; t < n2; t++ {
					v := tl[s*ld+p] * tr[t*ld+q]
					if s == p && t == q {
						v--
					}
					M[e][s*n2+t] = v
					big = math.Max(big, math.Abs(v))
				}
			}
		}
	}
	const eps = 0x1p-53
	smin := math.Max(eps*big, 0x1p-1022/eps)
	var perm [4]int // column permutation: unknown index at position j
	for j := range perm {
		perm[j] = j
	}
	for k := 0; k < m; k++ {
		// complete pivoting
		pi, pj, pv := k, k, 0.0
		for i := k; i < m; i++ {
			for j := k; j < m; j++ {
				if a := math.Abs(M[i][j]); a > pv {
					pi, pj, pv = i, j, a
				}
			}
		}
		if pv <= smin {
			return false
		}
		M[k], M[pi] = M[pi], M[k]
		rhs[k], rhs[pi] = rhs[pi], rhs[k]
		for i := 0; i < m; i++ {
			M[i][k], M[i][pj] = M[i][pj], M[i][k]
		}
		perm[k], perm[pj] = perm[pj], perm[k]
		for i := k + 1; i < m; i++ {
			f := M[i][k] / M[k][k]
			for j := k + 1; j < m; j++ {
				M[i][j] -= f * M[k][j]
			}
			rhs[i] -= f * rhs[k]
		}
	}
	var sol [4]float64
	for k := m - 1; k >= 0; k-- {
		v := rhs[k]
		for j := k + 1; j < m; j++ {
			v -= M[k][j] * sol[j]
		}
		sol[k] = v / M[k][k]
	}
	for k := 0; k < m; k++ {
		e := perm[k]
		p, q := e/n2, e%n2
		x[p*2+q] = sol[k]
	}
	for _, v := range sol[:m] {
		if math.IsInf(v, 0) || math.IsNaN(v) {
			return false
		}
	}
	return true
}
