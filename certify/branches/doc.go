// Package branches computes the equilibria of a polynomial model and their
// linear stability as exact functions of its free parameters p: branches
// of equilibria in closed form, the Jacobian and characteristic polynomial
// along each, the partition of one parameter's range by type and stability,
// the bifurcation values, and a symbolic quadratic certificate P(p). It is
// part of the untrusted engine; its results are proposals that the kernel
// re-checks, but every decision made here is exact (math/big, no floats).
//
// # Branches
//
// The equilibria solve g(x, p) = 0 with g = f (continuous time) or
// g = f − x (maps), numerators taken (denominators of f are in p and must
// not vanish). The system is brought to triangular form over Q(p) by three
// moves, applied recursively:
//
//   - a product x_j^k·h splits into the cases x_j = 0 and h = 0;
//   - a state x_j that occurs in an equation to degree one with a
//     coefficient c(p) free of states is eliminated, x_j = −(rest)/c, under
//     the condition c(p) ≠ 0 (Gaussian elimination over Q(p), the linear
//     case of a lexicographic Gröbner basis, Buchberger 1965);
//   - when every equation left involves one state x_k only, the one of least
//     degree is solved: degree one gives a rational function, degree two
//     x_k = −h₁/(2h₂) ± √(h₁² − 4h₂h₀)/(2h₂); rational roots of a polynomial
//     with constant coefficients are taken out by the rational root
//     theorem. A discriminant that is a perfect square in Q[p] (found term
//     by term and checked) gives two rational branches; otherwise the
//     branches are u ± v·√w. Roots of the chosen equation that do not solve
//     the others identically are dropped with a note.
//
// The eliminated states are then recovered by back-substitution in
// Q(p)(√w) (Surd), and every branch is checked by substituting it into g:
// the result must be exactly zero. A branch exists where w(p) ≥ 0 and the
// recorded conditions c(p) ≠ 0 hold. When all equations vanish before every
// state is solved, the branch is a non-isolated set of equilibria (a curve or
// more) parametrised by the free states; it is reported as such. When none
// of the moves applies, or a limit of Options is exceeded, Analyze returns
// ClosedForm = false with the reason: the caller samples instead.
//
// Where a recorded condition c(p) ≠ 0 can fail inside the parameters'
// ranges the formulas say nothing, and equilibria that exist only where
// c = 0 are not among the branches. Such places are listed (Degeneracy):
// for c in one parameter its real roots in the range are isolated, and at
// a rational root the equilibria are computed with the parameter fixed
// there and matched with the branches' values there; for an irrational
// root, or a c in several parameters that the exact centred form on the
// ranges' box does not keep from zero, a note says so.
//
// # Linearisation
//
// Along an isolated branch the Jacobian J(p) has entries in Q(p)(√w). Its
// characteristic polynomial det(λI − J) = λⁿ + c_{n−1}λ^{n−1} + … + c₀ comes
// from the Faddeev–LeVerrier recursion. For two states the trace τ, the
// determinant Δ and τ² − 4Δ are reported. For continuous time the Hurwitz
// determinants H₁ … Hₙ of the characteristic polynomial decide stability:
// every eigenvalue has negative real part iff all Hₖ > 0 (Routh 1877;
// Hurwitz 1895), and when no Hₖ vanishes the number of eigenvalues in the
// right half-plane is the number of sign changes in Routh's first column
// 1, H₁, H₂/H₁, …, Hₙ/Hₙ₋₁. For maps the bilinear map λ = (1 + s)/(1 − s)
// carries the unit disc to the left half-plane: with q(s) =
// (1 − s)ⁿ·p((1 + s)/(1 − s)), every eigenvalue lies inside the unit circle
// iff q's leading coefficient (−1)ⁿp(−1) and q's Hurwitz determinants are
// positive; for n = 2 these are Jury's conditions (Jury 1964) 1 − τ + Δ > 0,
// 1 − Δ > 0, 1 + τ + Δ > 0.
//
// # One free parameter
//
// With one free parameter t every quantity above is a + b√w with a, b, w
// in Q(t). Its sign is the sign of a where a and b agree, and otherwise the
// sign of a times that of a² − b²w; so the signs can change only at the
// real roots of the numerators and denominators of a, b, w and a² − b²w.
// These roots are isolated by Sturm sequences (poly.Univariate), sorted
// exactly, and cut the range into points and open intervals (poly.Span);
// on each interval the signs are those at a rational sample, at each point
// they are decided at the algebraic number itself (a gcd with its
// polynomial tells a zero). Each piece is labelled per branch: saddle when
// 0 < #unstable < n; node or focus for n = 2 by the sign of τ² − 4Δ and for
// n = 3 by the sign of the cubic's discriminant; centre candidate where
// Hₙ₋₁ = 0 with c₀ > 0 and H₁ … Hₙ₋₂ > 0 (a pair of imaginary eigenvalues;
// Liu 1994); stable or unstable by the Routh count.
//
// Bifurcation values are the points where a branch has det J = 0
// (continuous time) or the eigenvalue 1 (maps): a pitchfork when a pair
// u ± v√w is born there (w = 0) from another branch that passes through the
// same point, a saddle-node when the pair meets no other branch, a
// transcritical bifurcation when two other branches cross there, else a
// zero-eigenvalue value of unknown type; Hopf (Neimark–Sacker for maps) at
// the centre candidates; period-doubling where a map has the eigenvalue −1,
// p(−1) = 0. Values are exact rationals or algebraic numbers with their
// polynomial and isolating interval.
//
// # Several free parameters
//
// With two or more free parameters, each with a bounded range or a box,
// the box is bisected as in set inversion (Moore 1966; Jaulin & Walter
// 1993): a box is halved along its widest side (relative to the box) while
// some branch's label on it is undecided and a side is wider than the
// resolution. A label is the one of the one-parameter case, computed by the
// same rules, but every sign it uses must hold on the whole box: a
// polynomial's sign is decided by the exact enclosure of its centred form
// (poly.CenteredForm, halved exactly along the tree, open ends of the
// ranges excluded), a rational function's by its numerator and every
// denominator factor. For a + b√w on a box where w ≥ 0: when the norm
// a² − b²w has one sign there, a + b√w does not vanish on the box and has
// the sign of a (norm > 0) or of b (norm < 0), which is constant on the
// connected box and read at its centre; otherwise a and b must share one
// sign. When some Hurwitz determinant's sign is undecided but c₀ (p(±1)
// for maps) and Hₙ₋₁ have one sign on the box, no eigenvalue meets the
// imaginary axis (unit circle) there — by Orlando's formula Hₙ₋₁ is ± the
// product of the pairwise sums of the roots — so the number of unstable
// eigenvalues is constant on the connected box and is read at its centre.
// A label that needs an undecided sign is "undecided" on that box.
// Two halves with equal labels are merged back into their parent. The
// bisection stops at MaxBoxes boxes (Map.Truncated) and honours the
// context's deadline.
//
// # Quadratic certificate
//
// P(p) solves AᵀP + PA = −I (AᵀPA − P = −I for maps) with A = J(p): a
// linear system in the n(n+1)/2 entries of P, solved over Q(p)(√w) by
// fraction-free elimination (Bareiss 1968) and back-substitution. Where the
// system's determinant is non-zero, P is positive definite iff its leading
// minors are positive (Sylvester), and by Lyapunov's theorem that happens
// exactly where the branch is linearly stable. For one free parameter
// Quadratic.Region is that set as spans; the caller turns it into a region
// the kernel checks.
//
// A branch with a square root √w has no such region the kernel can read
// (its Jacobian lies in Q(p)(√w)). When w is of degree one in a parameter,
// w = c·p + d, the substitution p = (u² − d)/c with a new parameter u > 0
// makes √w = u, so the branch is rational in u (Reparametrize): the model
// in u is an ordinary model, and its region in u maps back to p through the
// relation, monotone on u > 0 when c is a constant. An algebraic end u*,
// the root of q(u), maps to the root of E(s)² − s·O(s)² with
// q(u) = E(u²) + u·O(u²) and s = c·p + d, isolated by refining u*'s
// interval (MapBack).
package branches
