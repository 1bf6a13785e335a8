// Package basin estimates the region of attraction of an equilibrium by
// sublevel sets of a candidate V in continuous time: a level c_lo certified
// by the kernel's sublevel-basin rule, and a level c_hi above which no
// sublevel set of V around the equilibrium can be certified, witnessed by an
// exact rational point x ≠ x* with V̇(x) ≥ 0 and V(x) = c_hi.
//
// Free parameters must have closed bounded ranges, and the equilibrium must
// not depend on them: c_lo then holds for every parameter value p in the
// box. The bisection runs over states and parameters together, each box
// halved along the coordinate whose terms make the largest share of the
// widths of the enclosures of V and −V̇ (poly.CenteredForm.Spread; the
// tree names it, claims.WalkDirected), so that a parameter on which
// neither depends, or a state near which they are flat, is not halved in
// vain; without parameters every side is halved in turn. For each
// fixed p the boxes whose parameter sides hold p pave the state box, so the
// argument below applies slice by slice. c_hi is the least of the values
// found at a grid of parameter values, and its point comes with the p at
// which V̇ ≥ 0 holds there.
//
// The lower level comes from interval branch and bound on a box of the
// states around the equilibrium. Every box of a bisection tree carries the
// centred forms (poly.CenteredForm) of V and −V̇. A box is settled when −V̇
// is proven positive on it, or, near the equilibrium, when −V̇ =
// yᵀ(G + M(y))y (y = x − x*, G the Gram matrix of the quadratic part, M the
// higher terms) is proven definite on it (poly.PositiveNearZero). Every other
// box, and every box along the boundary, bounds the level from above by the
// lower end ℓ of V's enclosure on it: a level c < ℓ makes it a box with
// V > c. The box with the smallest ℓ is halved next, so the certified level
// min ℓ rises until it is within the asked gap of c_hi, the resolution is
// reached or the budget is spent. The level written is a short decimal just
// below min ℓ; the tree is then classified against it (I: V̇ < 0, O: V > c)
// and the kernel re-checks every box exactly. Float64 proposes nothing
// here: the engine decides with the same exact forms as the kernel.
//
// # The S-procedure
//
// With every parameter fixed and V proven positive definite and radially
// unbounded by the direct method (a quadratic V, or a Gram form of the
// whole V), the lower level may instead come from one exact identity in
// y = x − x* (Khalil, Nonlinear Systems, §8.2, for the argument):
//
//	−V̇ − ε·Σᵢ yᵢ² − s·(c − V) = σ,   s, σ sums of squares,
//
// so that on {V ≤ c}, where c − V ≥ 0, −V̇ ≥ ε·|y|² > 0 but at x*. The
// set is compact (V radially unbounded) and positively invariant, so all
// of it is attracted (kernel rule sublevel-sprocedure). s = z₁ᵀG₁z₁ has
// degree 2d₁ with 2d₁ + deg V ≥ deg(−V̇), d₁ ≥ 1 (then d₁ + 1 while the gap
// stays open), σ = z₀ᵀG₀z₀ the degree of the other terms; z holds every monomial of degree 1 to d (s and σ
// vanish at y = 0, as the identity forces). For a fixed c the identity is
// linear in G₀, G₁ and ε: a semidefinite program maximising ε
// (certify/sdp). The largest c with ε clearly positive is found by
// bisection below c_hi; at a short decimal just below it, ε is fixed at a
// power of two at most half the optimum, a point deep inside the cones is
// found (sdp.SolvePositiveMargin), G₁ is rounded to multiples of 2^−k,
// and G₀ is the orthogonal projection of its rounding onto the Gram
// matrices of the exact residual −V̇ − ε·Σyᵢ² − s·(c − V) (Peyrl & Parrilo
// 2008, sos.Gram.Project). Exact LDLᵀ with D ≥ 0 proves both; basis
// elements whose rows vanish are dropped. Options.Method chooses the
// branch and bound, the S-procedure, or both (the larger level; the
// branch and bound only when the S-procedure left a gap).
//
// The upper level is found in float64: along rays from the equilibrium in
// many directions the first points where V̇ ≥ 0 are located by bisection, the
// direction of least V is refined by a pattern search, and the point is
// rounded to the shortest decimals at which V̇ ≥ 0 holds exactly; V there,
// computed exactly, is c_hi. A sublevel set {V ≤ c} whose component around
// the equilibrium holds that point, as it does for c ≥ c_hi when the set is
// star-shaped about x*, has a point with V̇ ≥ 0 other than x* and cannot be
// shown to lie in the region of attraction by V.
package basin
