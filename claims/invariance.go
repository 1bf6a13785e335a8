package claims

// Invariance shows that the largest invariant set in {V̇ = 0} is the
// equilibrium. Lie lists generators: the square bases qₖ of −V̇'s
// semidefinite form, its quadratic part or a Gram form of the whole in a
// monomial basis (−V̇ = Σ dₖ·qₖ², Square k counted from 1) and their
// derivatives along the flow of order Order. States gives, for every state
// s, a polynomial g in s alone whose only real root is the equilibrium's
// coordinate, with cofactors: g = Σ Cofactors[j]·Lie[j].
type Invariance struct {
	Lie    []LieTerm `json:"lie"`
	States []Vanish  `json:"states"`
}

// LieTerm is the derivative of order Order along the flow of square base Square.
type LieTerm struct {
	Square int `json:"square"`
	Order  int `json:"order"`
}

// Vanish is g(s) = Σ cofactorⱼ·generatorⱼ for one state s.
type Vanish struct {
	State     string   `json:"state"`
	Poly      string   `json:"poly"`
	Cofactors []string `json:"cofactors"`
}

func (*Invariance) Rule() string { return "invariance" }
