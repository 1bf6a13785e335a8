// Package sossearch finds a Lyapunov function V of a given even degree 2d
// for a model whose parameters are all fixed, by a semidefinite program,
// and then proves it through the direct method (certify/direct), whose
// certificate the kernel re-checks. Floating point only proposes V.
//
// # The program
//
// In coordinates y centred at the equilibrium, V = z₁ᵀG₁z₁ with z₁ the
// monomials of degree 1 to d, so V has no constant or linear part. V̇ is
// linear in V (the orbital derivative for flows, V(f(x)) − V(x) for maps),
// so with Sₑ the derivative of the monomial yᵉ,
//
//	−V̇ = −Σ_{a,b} (G₁)_ab·S_{z_a z_b} = z₂ᵀG₂z₂
//
// is, coefficient by coefficient, a set of linear equations in the entries
// of G₁ and G₂, where z₂ holds monomials of degree ℓ to d₂ (2d₂ ≥ deg V̇)
// kept by the Newton-polytope and diagonal-consistency pruning of
// certify/sos applied to the union of the supports of the Sₑ. A term of V̇
// that no product of z₂ reaches is an equation on G₁ alone. With the
// normalisation tr G₁ = n₁ the program maximises the margin t with
// G₁ − tI ⪰ 0 and G₂ − tI ⪰ 0 (sdp.SolveMargin). A margin t > 0 gives
// V ≥ t·Σyᵢ² and −V̇ ≥ t·Σyᵢ^{2ℓ}: the ε-margins ε·Σxᵢ^{2k} of the
// sum-of-squares literature (Parrilo 2000; Papachristodoulou & Prajna
// 2002) with ε = t and k = ℓ. When the linearization is a centre no
// quadratic part of −V̇ is positive definite, so ℓ = 1 fails and ℓ = 2
// (higher-order margins) is tried next.
//
// # From the proposal to a proof
//
// V's coefficients are rounded to multiples of 2^−k relative to the
// largest one, for growing k; each rounded V is checked by direct.Check,
// which finds Gram matrices of V and −V̇ itself (canonical, or by SOS with
// exact rounding and projection) and has the kernel re-check everything.
package sossearch
