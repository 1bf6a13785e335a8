// Package lyap solves the Lyapunov equations of linear(ized) dynamics in
// floating point:
//
//	continuous time (ẋ = Ax):     AᵀP + PA  = −Q   (Continuous)
//	discrete time   (x⁺ = Ax):    AᵀPA − P  = −Q   (Discrete, the Stein equation)
//
// for a symmetric n×n matrix P, given a dense n×n matrix A and a symmetric Q.
// In lyacert floats propose and exact arithmetic decides: a P from this
// package is only a candidate, to be rounded and checked exactly elsewhere.
// ContinuousResidual and DiscreteResidual measure how well a P solves its
// equation; SpectralAbscissa, IsHurwitz, SpectralRadius and IsSchurStable are
// float stability tests of the same kind.
//
// # Schur form
//
// Both solvers start from the real Schur decomposition
//
//	A = Z T Zᵀ,   ZᵀZ = I,
//
// computed with gonum's LAPACK (gonum.org/v1/gonum/lapack/gonum): Dgehrd
// reduces A to upper Hessenberg form H = QᵀAQ, Dorghr forms Q from the
// Householder reflectors, and Dhseqr runs the QR iteration on H, returning
// the upper quasi-triangular T and Z = Q·Z_H. T is block upper triangular
// with diagonal blocks T_kk of order 1 (a real eigenvalue) or 2 (a complex
// conjugate pair, in LAPACK's standard form). No balancing is done.
//
// Substituting A = ZTZᵀ and writing
//
//	Y = ZᵀPZ,   C = ZᵀQZ,
//
// turns the equations into
//
//	TᵀY + YT  = −C   (continuous)
//	TᵀYT − Y  = −C   (discrete)
//
// and, once Y is known, P = ZYZᵀ, which is then symmetrized as (P+Pᵀ)/2.
// Only the symmetric part (Q+Qᵀ)/2 of Q enters C.
//
// # Continuous: the sign function first
//
// For a Hurwitz A, Continuous first runs Newton's iteration for the matrix
// sign function of Z = [[Aᵀ, Q], [0, −A]] with determinant scaling
// (Roberts 1980; Byers 1987): sign(Z) = [[−I, 2P], [0, I]], and the
// iteration's work is inversions and matrix products, faster than the QR
// iteration of the Schur form in pure Go at these sizes (see sign.go). When
// it does not settle at −I (A not Hurwitz, or nearly so), the Schur method
// below solves the equation and diagnoses singular cases.
//
// # Continuous: Bartels–Stewart
//
// Partition Y and C conformally with the diagonal blocks of T (blocks
// k, l = 1…m of order n_k, n_l ∈ {1, 2}). Since T_ik = 0 for i > k, block
// (k, l) of TᵀY + YT = −C reads
//
//	Σ_{i≤k} T_ikᵀ Y_il + Σ_{j≤l} Y_kj T_jl = −C_kl,
//
// that is,
//
//	T_kkᵀ Y_kl + Y_kl T_ll = −C_kl − Σ_{i<k} T_ikᵀ Y_il − Σ_{j<l} Y_kj T_jl.   (1)
//
// This is the block recurrence of Bartels and Stewart (1972): the right-hand
// side of (1) involves only blocks in earlier block rows, or earlier in the
// same block row, so the blocks can be solved in the order
// (1,1), (1,2), …, (1,m), (2,2), …, (m,m). By symmetry Y_lk = Y_klᵀ, so only
// blocks with l ≥ k are solved and each is mirrored below the diagonal; the
// sum over j < k in (1) then uses the mirrored blocks. For each block row the
// i < k and j < k parts are two matrix products (blas64.Gemm), and the
// k ≤ j < l part is accumulated as the row is swept left to right. Each
// small equation (1), of size 1×1, 1×2, 2×1 or 2×2, is solved with LAPACK's
// Dlasy2 (Gaussian elimination with complete pivoting on the Kronecker form
// of order ≤ 4). Equation (1) is uniquely solvable iff no eigenvalue of T_kk
// and no eigenvalue of T_ll add to zero; over all blocks, iff λi + λj ≠ 0
// for all eigenvalues λi, λj of A.
//
// # Discrete: Kitagawa / Barraud
//
// The Schur method for the Stein equation (Kitagawa 1977; Barraud 1977)
// applies the same partition to TᵀYT − Y = −C. Let U = TᵀY, so that
// U_kj = Σ_{i≤k} T_ikᵀ Y_ij. Block (k, l) reads
//
//	Σ_{j≤l} U_kj T_jl − Y_kl = −C_kl.
//
// Split U_kj = G_kj + T_kkᵀ Y_kj with G_kj = Σ_{i<k} T_ikᵀ Y_ij (known once
// the block rows above k are); then
//
//	T_kkᵀ Y_kl T_ll − Y_kl = −C_kl − Σ_{j<l} U_kj T_jl − G_kl T_ll,            (2)
//
// solved in the same order as (1). Each small equation (2) is the linear
// system (T_llᵀ ⊗ T_kkᵀ − I) vec Y_kl = vec(rhs) of order n_k n_l ≤ 4, solved
// by a direct Gaussian elimination with complete pivoting (solveSmallStein)
// that, like Dlasy2, declares the block singular when a pivot falls below
// eps times the largest coefficient. Uniqueness holds iff λi λj ≠ 1 for all
// eigenvalues of A.
//
// # Cost and errors
//
// Hessenberg reduction and QR iteration take about 25n³ flops, the transformed
// right-hand side and back-transformation 8n³, and the block recurrences
// about 2n³ (continuous) and 2.5n³ (discrete), so the Schur form dominates.
//
// Before solving, both functions check the eigenvalues from Dhseqr: when
// |λi+λj| ≤ SingularTol·2‖A‖_F (continuous) or |λiλj − 1| ≤
// SingularTol·(1+‖A‖²_F) (discrete) for some pair, they return an error
// wrapping ErrSingular that names the eigenvalues. A near-singular small
// block system, an overflow, non-finite input or a failed QR iteration is
// also an error. Only mismatched, nil or empty matrices panic.
//
// References:
//
//   - R. H. Bartels, G. W. Stewart. Algorithm 432: Solution of the matrix
//     equation AX + XB = C. Comm. ACM 15(9) (1972), pp. 820–826.
//   - J. D. Roberts. Linear model reduction and solution of the algebraic
//     Riccati equation by use of the sign function. Int. J. Control 32(4)
//     (1980), pp. 677–687.
//   - R. Byers. Solving the algebraic Riccati equation with the matrix sign
//     function. Linear Algebra Appl. 85 (1987), pp. 267–279.
//   - G. Kitagawa. An algorithm for solving the matrix equation X = FXFᵀ + S.
//     Int. J. Control 25(5) (1977), pp. 745–753.
//   - A. Y. Barraud. A numerical algorithm to solve AᵀXA − X = Q. IEEE Trans.
//     Automat. Control 22(5) (1977), pp. 883–885.
//
// See ExampleContinuous and ExampleDiscrete for runnable examples.
package lyapunov
