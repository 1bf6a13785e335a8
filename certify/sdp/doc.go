// Package sdp solves semidefinite programs in floating point with a
// primal–dual interior-point method. In lyacert floating point proposes and
// exact arithmetic decides: a solution from this package is a candidate to
// be rounded and checked exactly elsewhere, and a status such as
// PrimalInfeasible is numerical evidence, never a proof.
//
// # The problem
//
// For block-diagonal symmetric matrices C, A₁, …, Aₘ and b ∈ ℝᵐ,
//
//	(P)  maximise ⟨C, X⟩  subject to ⟨Aᵢ, X⟩ = bᵢ,  X ⪰ 0,
//	(D)  minimise bᵀy     subject to Z = Σᵢ yᵢAᵢ − C ⪰ 0,
//
// where ⟨A, B⟩ = tr(AB). Each block is either a dense symmetric block
// (X_k ⪰ 0) or a diagonal block (a vector x_k ≥ 0, a linear program). Weak
// duality ⟨C, X⟩ ≤ bᵀy holds for feasible pairs, with ⟨X, Z⟩ = bᵀy − ⟨C, X⟩.
//
// # The method
//
// From a starting point X = ξI, Z = ηI, y = 0 scaled to the data (as in
// SDPT3, Toh, Todd & Tütüncü 1999), each iteration solves the Newton
// equations of the perturbed optimality conditions
//
//	A(X) = b,  Σ yᵢAᵢ − Z = C,  XZ = σμI,   μ = ⟨X, Z⟩/n,
//
// linearised with the HKM direction (Helmberg, Rendl, Vanderbei &
// Wolkowicz 1996; Kojima, Shindoh & Hara 1997; Monteiro 1997):
// dZ = Σ dyᵢAᵢ + R_d, dX = σμZ⁻¹ − X − sym(X dZ Z⁻¹), where dy solves the
// Schur complement system M dy = σμA(Z⁻¹) − b − A(X R_d Z⁻¹) with
//
//	M_ij = tr(Aᵢ X Aⱼ Z⁻¹),
//
// symmetric positive definite, factored by dense Cholesky (gonum). M is
// assembled from the entries of the constraint matrices only: with
// T = Aᵢ Z⁻¹ restricted to the rows where Aᵢ has entries,
// M_ij = Σ_{(p,q) ∈ Aⱼ} (Aⱼ)_pq Σ_r X_qr T_rp, so that a constraint with
// few entries costs in proportion to them (sums of squares give such
// constraints).
//
// Mehrotra's predictor–corrector (Mehrotra 1992): a predictor with σ = 0
// gives step lengths α_p, α_d and μ_aff = ⟨X + α_p dX, Z + α_d dZ⟩/n; then
// σ = (μ_aff/μ)³ and the corrector adds the second-order term dX_p·dZ_p·Z⁻¹
// to the complementarity equation, with the same factorization of M. The
// steps are 0.95 of the largest keeping X and Z positive definite
// (λ_min(L⁻¹ dX L⁻ᵀ) with X = LLᵀ), reduced further when the new iterate
// does not factor. The primal direction is corrected by the least-norm
// solution of A(δ) = R_p − A(dX), which keeps the primal equations
// accurate when M is ill-conditioned near the optimum.
//
// # Stopping
//
// Optimal when the relative primal infeasibility ‖b − A(X)‖/(1 + ‖b‖), the
// relative dual infeasibility ‖Σ yᵢAᵢ − C − Z‖_F/(1 + ‖C‖_F) and the
// relative gap |⟨C,X⟩ − bᵀy|/(1 + |⟨C,X⟩| + |bᵀy|) are below the
// tolerance. PrimalInfeasible when y/(−bᵀy) is nearly a Farkas ray
// (Σ yᵢAᵢ ⪰ 0 with bᵀy = −1); DualInfeasible when X/⟨C, X⟩ nearly is one
// (A(X) = 0, X ⪰ 0, ⟨C, X⟩ = 1). Both are evidence, not proof.
//
// # Margin
//
// SolveMargin maximises t subject to A(X) = b and X − tI ⪰ 0, so that
// the solution has a margin for rounding to rationals: every symmetric
// perturbation of spectral norm below t keeps it positive definite.
//
// # Files
//
// ReadSDPA and WriteSDPA read and write the SDPA sparse format, an open
// format that many solvers read; the reader checks every size before it
// allocates.
package sdp
