// Package checker is lyacert's trusted kernel: it re-checks a certificate
// from scratch with exact rational arithmetic, knowing nothing of how the
// certificate was found. It imports only poly, model, claims (the
// certificate format) and the standard library, and uses no floating point.
//
// A certificate (claims.Document) is a model text, a restatement of its parameters
// and a list of claims. Each claim names the rule that checks it; Verify
// dispatches on the name, in the order of the table below, and derives the
// verdict (holds, holds-on-region, fails, undecided) and the kind of claim
// (global-asymptotic, local-asymptotic, stable, unstable, none) from the
// claims it verified. Nothing of the verdict is read from the document.
//
//	rule                 theorem applied; what is recomputed
//	orbital-derivative   chain rule: V̇ = Σ ∂V/∂xᵢ·fᵢ (ΔV = V(f(x)) − V(x) for maps),
//	                     recomputed from the model; f vanishes at the equilibrium
//	quadratic-part-ldl   Sylvester's criterion through G = L·D·Lᵀ, checked as an
//	                     identity; minors = products of pivots; D ≥ 0 with zero
//	                     columns gives a semidefinite form
//	monomial-gram-ldl    zᵀGz equals the whole function, z monomials with a pure
//	                     power of every state: G ≻ 0 ⇒ positive definite and
//	                     radially unbounded
//	margin-gram-ldl      zᵀGz equals the whole function less Σ εᵢxᵢ^(2kᵢ), εᵢ > 0, every
//	                     state: G ⪰ 0 (zero pivots allowed) ⇒ positive definite and
//	                     radially unbounded (the margin, not G, makes it definite)
//	box-multiplier-sos   −V̇ − Σ εᵢxᵢ^(2kᵢ) = σ₀ + Σ σᵢ·(pᵢ − loᵢ)(hiᵢ − pᵢ), σ = zᵀGz, G ⪰ 0
//	                     by exact LDLᵀ, z monomials in states and parameters: −V̇
//	                     definite on the closed parameter box (S-procedure)
//	triangular-squares   square bases of a semidefinite Gram form solve for the states in
//	                     turn (c·s + h, h in earlier states): definite, radially unbounded
//	minor-condition      a minor's factorization as an identity; factor signs by
//	                     exact interval enclosure over the parameter box (Moore 1966)
//	semidefinite-kernel  the kernel of a semidefinite −V̇: independent vectors with
//	                     G·k = 0, one per zero pivot
//	invariance           the invariance principle (LaSalle 1960): per state, g(s) =
//	                     Σ cⱼ·(derivatives of −V̇'s square bases) with the equilibrium
//	                     g's only real root (Sturm), so {V̇ = 0} holds no other solution
//	point-check          the model with some parameters fixed, and a whole certificate
//	                     of it verified from scratch by this table (no deeper nesting)
//	algebraic-point      margin Gram forms of V and −V̇ as identities in Q(p), pivots ≥ 0
//	                     at an irrational p = α (signs at α by gcd and Sturm sequences)
//	sturm-region         Sturm's theorem: the pieces of one parameter's range where
//	                     every condition holds, algebraic ends by isolating intervals
//	paving               set inversion (Jaulin & Walter 1993): every box of the tree
//	                     classified by centred forms, exact
//	witness-points       the conditions evaluated exactly at parameter points
//	refutation           V ≤ 0 or V̇ ≥ 0 at an exact point, for every value of the
//	                     parameters left free (interval enclosure)
//	moment-separation    semidefinite duality: a functional L with L(p) < 0 and moment
//	                     matrix L(z_a·z_b) ⪰ 0 ⇒ p is no sum of squares in the span of
//	                     z; reported, it changes no verdict
//	krawczyk-enclosure   Krawczyk's theorem: K(X) inside X ⇒ exactly one equilibrium
//	linearization        Lyapunov's indirect method: M(x*) ≻ 0 with P ≻ 0 (stable;
//	                     global for affine f) or a negative pivot of P (unstable);
//	                     M recomputed, signs by Bareiss pivots over the integers
//	vertex-lyapunov      quadratic stability on a parameter box: A(p) = ∂f/∂x(x*, p)
//	                     affine in p, P ≻ 0 and −(AᵀP + PA) ≻ 0 at every vertex,
//	                     so on the box (convex hull); Lyapunov's indirect method
//	                     for every p (continuous time only)
//	sublevel-basin       region of attraction (Lyapunov, LaSalle): a box of the
//	                     states bisected, V > c on the boxes along its boundary
//	                     and wherever V̇ < 0 is not proven (centred forms, or
//	                     −V̇ = yᵀ(G + M(y))y definite on a box at the equilibrium),
//	                     so {V ≤ c} around the equilibrium is compact, invariant
//	                     and attracted; the level joins the outcome, not the verdict
//	sublevel-sprocedure  S-procedure: −V̇ − Σ εᵢyᵢ^(2kᵢ) − s·(c − V) = σ, s, σ ⪰ 0 by exact
//	                     LDLᵀ, V's form radially unbounded: all of {V ≤ c} attracted
//
// Lyapunov's direct method combines them: V and −V̇ definite as wholes give
// global asymptotic stability, their quadratic parts local asymptotic
// stability, a definite V with an exactly quadratic semidefinite −V̇
// stability, asymptotic stability with the invariance claim; where the
// conditions hold is what the region claims say, each piece holds, fails
// (refuted by a negative leading minor) or is undecided, and a failing test
// turns into "fails" only beside a refutation that reaches the equilibrium.
//
// claims.Read takes a file only byte for byte as File writes it; the digest
// (SHA-256 of the canonical serialization) is checked last, and a present
// ed25519 signature must verify against it.
package checker
