// Package vertex looks for one quadratic Lyapunov function that serves a
// whole box of parameter values (quadratic stability), for a model in
// continuous time whose linearization A(p) = ∂f/∂x(x*, p) at a
// parameter-free equilibrium x* is affine in the free parameters p, each in
// a closed bounded interval.
//
// # The mathematics
//
// The map A ↦ AᵀP + PA is linear, and A(p) is affine, so for p = Σ λᵥ·v, a
// convex combination of the box's vertices v (λᵥ ≥ 0, Σ λᵥ = 1),
//
//	A(p)ᵀP + P·A(p) = Σ λᵥ·(A(v)ᵀP + P·A(v)).
//
// If P ≻ 0 and A(v)ᵀP + P·A(v) ≺ 0 at every one of the 2^q vertices, the
// sum is negative definite on the whole box: every A(p) is Hurwitz, the
// equilibrium is locally asymptotically stable for every p (Lyapunov's
// indirect method), and V = (x − x*)ᵀP(x − x*) is one Lyapunov function for
// all of them. When f has degree ≤ 1 in the states the linearization is f
// itself and the stability is global.
//
// For maps the condition P − AᵀPA ≻ 0 is quadratic in A, not linear, and the
// vertices alone prove nothing of the box; the package refuses maps.
//
// Vertex stability is necessary (a Hurwitz A(v) at every vertex) but not
// sufficient: a box may have stable vertices and no common P.
//
// # The search
//
// The linear matrix inequalities become one semidefinite program over the
// block-diagonal X = diag(P, Q₁, …, Q_N), with the equations
// Qᵥ = −(A(v)ᵀP + P·A(v)) entry by entry and trace P = 1, solved by
// certify/sdp with the largest margin t such that X − t·I ⪰ 0
// (SolvePositiveMargin): P ⪰ tI and every Qᵥ ⪰ tI. The float P is rounded
// to integers over a common power of ten, 10², 10³, …, until the exact test
// passes (P ≻ 0 and every −(AᵀP + PA) ≻ 0 by rational LDLᵀ pivots), and the
// certificate is re-checked by the kernel (rule vertex-lyapunov), which
// recomputes A and the vertices from the model.
//
// No P found is numerical evidence only, never a proof that none exists.
package vertex
