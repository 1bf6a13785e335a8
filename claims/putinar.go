package claims

// BoxMultiplier proves −V̇ positive definite for every parameter value in
// the box of the model's ranges at once: −V̇ − Margin = σ₀ + Σᵢ σᵢ·(pᵢ −
// loᵢ)(hiᵢ − pᵢ), with every σ = zᵀGz, z monomials in the states and the
// parameters, G = L·D·Lᵀ rational with D ≥ 0. Terms[0] is σ₀ (Parameter
// ""); each further term names the parameter pᵢ of its multiplier.
type BoxMultiplier struct {
	Margin string       `json:"margin"`
	Terms  []Multiplied `json:"terms"`
}

// Multiplied is one sum of squares of a multiplier identity.
type Multiplied struct {
	Parameter string `json:"parameter"`
	SquareSum
}

func (*BoxMultiplier) Rule() string { return "box-multiplier-sos" }
