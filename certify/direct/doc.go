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
// Check builds a certificate of claims (orbital-derivative,
// quadratic-part-ldl or monomial-gram-ldl, minor-condition, a region,
// refutation) and has the kernel (package checker) re-check it before it
// returns; a claim the kernel does not accept, or a verdict it does not
// derive, is an internal error, never a result.
package direct
