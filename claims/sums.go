package claims

// MarginGram is a Gram matrix of the whole function less a margin: V or
// −V̇ minus Margin equals zᵀGz for the monomials z of Basis, with G = L·D·Lᵀ
// and D ≥ 0 (zero pivots allowed, with zero columns), and Margin
// = Σ εᵢ·xᵢ^(2kᵢ) with rational εᵢ > 0 and a term for every state.
type MarginGram struct {
	Basis  []string `json:"basis"`
	Margin string   `json:"margin"`
	LDLForm
}

// NotSOS is a moment functional separating V or −V̇ from the sums of
// squares of polynomials in the span of the monomials Basis: Moments lists
// its values, L(x^γ) = the coefficient of x^γ; Moment is M_ab = L(z_a·z_b)
// = L·diag(D)·Lᵀ with D ≥ 0; Value = L(p) < 0.
type NotSOS struct {
	Of      string     `json:"of"`
	Basis   []string   `json:"basis"`
	Moments string     `json:"moments"`
	Moment  [][]string `json:"moment"`
	L       [][]string `json:"l"`
	D       []string   `json:"d"`
	Value   string     `json:"value"`
}

func (*MarginGram) Rule() string { return "margin-gram-ldl" }
func (*NotSOS) Rule() string     { return "moment-separation" }

// TriangularSquares shows that the square bases of a semidefinite Gram form
// of V or −V̇ (Of) in a monomial basis vanish together only at the
// equilibrium: taken in order, the k-th base with a non-zero pivot solves
// for the state Order[k] given the states before it.
type TriangularSquares struct {
	Of    string   `json:"of"`
	Order []string `json:"order"`
}

func (*TriangularSquares) Rule() string { return "triangular-squares" }
