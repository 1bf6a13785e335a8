// Package sos finds exact sum-of-squares certificates for polynomials with
// rational coefficients, and exact proofs that there is none in a given
// monomial basis. It is engine code: it uses floating point (certify/sdp)
// to propose, checks its results with exact LDLᵀ, and leaves the final
// word to an independent exact checker.
//
// # Gram matrices
//
// A polynomial p of degree 2d is a sum of squares iff p = zᵀGz for a
// vector z of monomials and a symmetric G ⪰ 0 (Choi, Lam & Reznick 1995);
// G = LDLᵀ then gives p = Σₖ Dₖ(Lᵀz)ₖ². Comparing coefficients, the Gram
// matrices of p form an affine family: for every monomial x^γ,
//
//	Σ_{(a,b): z_a z_b = x^γ} G_ab = p_γ     (ordered pairs),
//
// that is G ∈ G₀ + span{Nⱼ} (Parrilo 2000). Finding G ⪰ 0 in it is a
// semidefinite feasibility problem.
//
// # The basis
//
// Only monomials x^α with 2α in the Newton polytope N(p) (the convex hull
// of the exponents of p) can occur (Reznick 1978). NewGram starts from the
// exponents α whose doubles lie in the bounding box and degree range of
// N(p), then prunes by diagonal consistency: if p_{2α} = 0 and no two
// distinct basis elements multiply to x^{2α}, the equation for x^{2α} reads
// G_αα = 0, so for G ⪰ 0 the whole row vanishes and α can go. At the fixed
// point every vertex of the basis' convex hull has p_{2α} ≠ 0 (a vertex is
// not the midpoint of two other points), so the basis lies in ½N(p) and
// contains every monomial any Gram matrix of p ⪰ 0 can use.
//
// # Certificates
//
// Find solves max t subject to G − tI ⪰ 0 in the family (sdp.SolveMargin).
// With t > 0 it rounds G to multiples of 2^−k and projects exactly onto the
// family (Peyrl & Parrilo 2008). The classes of positions {(a, b) :
// z_a z_b = x^γ} partition the entries and each equation sums one class with
// unit weights, so the orthogonal projection adds (p_γ − Σ_class G)/|class|
// to every entry of class γ. The result satisfies p = zᵀGz exactly; exact
// LDLᵀ with positive pivots proves G ≻ 0. Rounding moves G by about n·2^−k,
// so k is chosen with n·2^−k well below t and raised a few times on
// failure. With Options.Margin the target is p − ε·Σᵢ xᵢ^{2d} with ε the
// largest power of two at most t/2: G − ε·Σ E_{xᵢ^d} ⪰ G − εI ≻ 0.
//
// # Singular Gram matrices
//
// Every Gram matrix of a positive definite p may be singular (a block
// forced by classes of one pair, as for x⁴ + y⁴ + (x²y − xy²)²). Then
// Find tries the margin form: max ε subject to p − ε·Σ_{a pure} z_a² =
// zᵀGz, G ⪰ 0, over the pure powers z_a of the basis; it takes ε a power
// of two at most ε*/2, moves the rest back onto G's pure diagonal, rounds
// (coarse precisions first, so that the entries of G's kernel round to
// exact zeros), projects onto the family of p − ε·Σ z_a², and proves G ⪰ 0
// by exact LDLᵀ with zero pivots on zero columns (MarginCertificate).
//
// # Refutations
//
// When t < 0 the dual multipliers y of the margin problem are a linear
// functional L(x^γ) = y_γ with moment matrix M_ab = L(z_a z_b) ⪰ 0 and
// L(p) = t < 0. If p = zᵀGz with G ⪰ 0, then L(p) = ⟨M, G⟩ ≥ 0, so p is not
// a sum of squares (a dual, or moment, certificate). Find rounds L to
// rationals and adds θ times the moments of the uniform measure on
// [−1, 1]ⁿ, whose moment matrix is positive definite, with θ a small power
// of two that keeps L(p) < 0; exact LDLᵀ then proves M ≻ 0. Motzkin's
// polynomial x⁴y² + x²y⁴ − 3x²y² + 1 (Motzkin 1967) is refuted this way. A
// term of p that no product z_a z_b reaches needs no functional: no Gram
// matrix in the basis can produce it (Result.Outside says which).
package sos
