// Package boxsos looks for one certificate that a candidate V decreases
// along the flow for every parameter value in a box: an exact identity
//
//	−V̇(x, p) − ε·Σⱼ xⱼ^(2kⱼ) = σ₀(x, p) + Σᵢ σᵢ(x, p)·(pᵢ − loᵢ)(hiᵢ − pᵢ)
//
// with σ₀, σᵢ sums of squares in the states and the parameters, over the
// closed ranges [loᵢ, hiᵢ] of the model's parameters. On the box every
// factor (pᵢ − loᵢ)(hiᵢ − pᵢ) is a product of two numbers ≥ 0 and every
// σ is ≥ 0, so −V̇ is at least the margin, which is > 0 away from the
// equilibrium (the S-procedure; Putinar 1993 for the form of the
// certificate). The kernel rule box-multiplier-sos checks it.
//
// # The search
//
// Each σ is zᵀGz with G ⪰ 0 (Parrilo 2000). The state part of the bases
// is Z_x, the monomials x^α with 2α inside the bounding box and degree
// range of the states' exponents of −V̇, pruned by diagonal consistency as
// in certify/sos: when no term of −V̇ has state part x^(2α) and no two
// other elements of Z_x multiply to it, the coefficient of x^(2α) is
// s₀(p) + Σ sᵢ(p)·gᵢ(p) ≡ 0 with sᵢ sums of squares, which on the box
// forces every s to vanish, so the row of α can go. The parameter part is
// every monomial of degree ≤ d in σ₀ and ≤ d − 1 in σᵢ, with 2d ≥ the
// parameter degree of −V̇ (d ≥ 1), so that σ₀ and σᵢ·gᵢ reach the same
// degrees. One equation per monomial of (x, p) equates coefficients.
//
// The semidefinite program first maximises ε (ε ≤ the smallest margin
// coefficient of −V̇); then, with ε fixed at a power of two at most half
// the optimum, it maximises t with every G − tI ⪰ 0 (sdp.SolvePositiveMargin),
// a point deep inside the cone. The σᵢ are rounded to multiples of 2^−k
// and kept as they are; σ₀ is then the Gram matrix of the exact residual
// r = −V̇ − margin − Σ σᵢgᵢ, and its classes of positions {(a, b) :
// z_a z_b = γ} carry unit weights, so the orthogonal projection adds
// (r_γ − Σ_class G)/|class| to each entry of class γ (Peyrl & Parrilo
// 2008). Exact LDLᵀ with D ≥ 0 then proves every G ⪰ 0.
package boxsos
