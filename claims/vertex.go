package claims

// VertexLyapunov certifies the model's equilibrium x* for every value of its
// free parameters p in their box at once, with one quadratic V (quadratic
// stability). The model is in continuous time, x* (its "at" point, or the
// origin) is free of p and an equilibrium for every p, and every entry of
// the Jacobian A(p) = ∂f/∂x(x*, p) is affine in p. The rule requires P ≻ 0
// and M(v) = −(A(v)ᵀP + P·A(v)) ≻ 0 at every vertex v of the box. M is
// affine in A and A in p, so M(p) is a convex combination of the M(v) (the
// box is the convex hull of its vertices) and M(p) ≻ 0 on the whole box:
// Lyapunov's indirect method then gives local asymptotic stability for every
// p, with V = (x − x*)ᵀP(x − x*); when f has degree ≤ 1 in the states,
// f = A(p)(x − x*) exactly and stability is global (the direct method).
// Maps are refused: P − AᵀPA is not affine in A, and its vertices prove
// nothing of the box.
// Decay restates M(v) at each vertex, vertex v having parameter j at its
// upper end exactly when bit j of v is set.
type VertexLyapunov struct {
	P     [][]string   `json:"p"`     // symmetric, one P for the whole box
	Decay [][][]string `json:"decay"` // M(v) per vertex, recomputed
}

func (*VertexLyapunov) Rule() string { return "vertex-lyapunov" }
