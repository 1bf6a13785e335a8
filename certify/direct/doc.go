// Package direct is Lyapunov's direct method for a given candidate V: the
// orbital derivative V̇ = Σ ∂V/∂xᵢ·fᵢ (ΔV = V(f(x)) − V(x) for maps), the
// Gram matrices of the quadratic parts of V and −V̇ at the equilibrium,
// their symbolic LDLᵀ (Lagrange's completing of squares), Sylvester's
// conditions reduced by the parameters' assumptions (factors whose sign an
// exact interval enclosure fixes are discharged), the exact region where
// the conditions hold (one parameter: Sturm sequences; several: set
// inversion by paving, witness points), Gram matrices of the whole V and −V̇
// in monomial bases for global claims, and exact refutations.
//
// A semidefinite, exactly quadratic −V̇ = Σ dₖ·qₖ² is taken further by the
// invariance principle (LaSalle 1960): for each state s a polynomial g(s)
// with the equilibrium as its only real root is sought as a combination of
// the qₖ and their derivatives along the flow, by exact linear algebra over
// the rational functions of the parameters (invariance.go). A region's
// piece that does not hold is refuted when the quadratic part of V or −V̇
// has a negative leading minor there (Jacobi), else undecided; a refuting
// point must lie on a ray along which the lowest-order part of V (or V̇)
// already has the wrong sign, so that it denies a local claim.
//
// Check builds a certificate of claims (orbital-derivative,
// quadratic-part-ldl or monomial-gram-ldl, minor-condition,
// semidefinite-kernel, invariance, a region, refutation) and has the kernel (package checker) re-check it before it
// returns; a claim the kernel does not accept, or a verdict it does not
// derive, is an internal error, never a result.
package direct
