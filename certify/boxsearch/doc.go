// Package boxsearch finds one Lyapunov function V of a given even degree
// 2d for every parameter value in a box: the model's free parameters, each
// in a closed bounded range [loᵢ, hiᵢ], at an equilibrium that does not
// depend on them. V's coefficients are constants (not functions of the
// parameters), so V's own positivity is a question without parameters.
//
// # The program
//
// In coordinates y centred at the equilibrium, V = z₁ᵀG₁z₁ with z₁ the
// monomials of the states of degree 1 to d. With S_e(y, p) the derivative
// of the monomial yᵉ along the flow (V(f) − V for maps), V̇ = Σ_{a,b}
// (G₁)_ab·S_{z_a z_b} is linear in G₁. The box certificate of
// certify/boxsos,
//
//	−V̇(y, p) − t·Σⱼ yⱼ^(2kⱼ) = σ₀(y, p) + Σᵢ σᵢ(y, p)·(pᵢ − loᵢ)(hiᵢ − pᵢ),
//
// with σₖ = wₖᵀGₖwₖ, is then, coefficient by coefficient over the
// monomials of (y, p), a set of linear equations in the entries of G₁ and
// of every Gₖ: one semidefinite program for V and the multipliers
// together (Parrilo 2000 for sums of squares as SDPs; Putinar 1993 for
// the form of the certificate, the S-procedure on the box). The bases wₖ
// and the margin's powers yⱼ^(2kⱼ) are certify/boxsos's, computed for a
// −V̇ with every term that some S_e has (boxsos.Multipliers).
//
// Writing G₁ = G₁′ + t·I with G₁′ ⪰ 0, the program maximises t ≤ 1 under
// tr G₁ = n₁ (a normalisation: V and −V̇ scale together). A solution with
// t > 0 has V ≥ t·Σyᵢ² (V − t·Σyᵢ² = z₁ᵀG₁′z₁ is a sum of squares) and
// −V̇ ≥ t·Σⱼ yⱼ^(2kⱼ) on the box: the ε-margins of the sum-of-squares
// literature (Papachristodoulou & Prajna 2002), with ε = t for both, so
// the same t leaves room to round V.
//
// When the linearization is a centre for some parameter value, no V has
// −V̇ with a definite quadratic part and the program has t = 0. A second
// program then drops the state monomials of degree 1 from the
// multipliers' bases and takes the margin t·Σⱼ yⱼ⁴ (the higher-order
// margins of certify/sossearch); V keeps V − t·Σyᵢ² a sum of squares.
//
// # From the proposal to a proof
//
// Only V is kept. Its coefficients are rounded to multiples of 2^−k
// relative to the largest, for growing k. For each rounded V:
//
//  1. certify/direct checks the model with that V, which proves V's form
//     exactly (V has no parameters, so its minors are numbers); when the
//     direct method alone already proves V̇ < 0 on the whole box, its
//     certificate is the proof;
//  2. otherwise certify/boxsos looks for the box certificate of the
//     rounded V's −V̇ (its own SDP, then exact rationals, projection and
//     LDLᵀ), and boxsos.Certify joins it to the direct method's claims
//     about V.
//
// When the direct method proves only V's quadratic part (V of degree ≥ 4
// with −V̇ depending on the parameters, where its search for Gram matrices
// of whole functions does not apply), a Gram matrix of the whole V is
// taken from the direct method on the model with the parameters fixed at
// their ranges' lower ends: V has constant coefficients, so that claim
// and its minors are claims about V alone, and the certificate's claim is
// then global rather than local.
//
// The kernel (checker.Verify) re-checks the whole document, and the
// engine keeps it only when the kernel derives the verdict and kind it
// expects (certify.Agrees). Floating point only ever proposes V and the
// Gram matrices; a failed search is numerical evidence, not a proof that
// no V of that degree exists.
package boxsearch
