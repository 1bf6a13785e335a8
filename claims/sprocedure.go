package claims

// SublevelSProcedure claims that, for every value of the free parameters in
// their ranges, the whole sublevel set {V ≤ Level} lies in the region of
// attraction of the equilibrium, by an exact identity in y = x − x*
//
//	−V̇ − Margin − s·(Level − V) = σ,
//
// with s = Multiplier and σ = Remainder sums of squares zᵀGz, z monomials
// in the states of degree ≥ 1, G = L·D·Lᵀ rational with D ≥ 0, and Margin
// = Σ εᵢ·yᵢ^(2kᵢ) with every εᵢ > 0 and every state present. V itself must
// be proven positive definite and radially unbounded by its form.
type SublevelSProcedure struct {
	Level      string    `json:"level"`
	Margin     string    `json:"margin"`
	Multiplier SquareSum `json:"multiplier"`
	Remainder  SquareSum `json:"remainder"`
}

// SquareSum is zᵀGz with G = L·diag(D)·Lᵀ: a sum of squares Σₖ Dₖ·((Lᵀz)ₖ)².
type SquareSum struct {
	Basis []string   `json:"basis"`
	Gram  [][]string `json:"gram"`
	L     [][]string `json:"l"`
	D     []string   `json:"d"`
}

func (*SublevelSProcedure) Rule() string { return "sublevel-sprocedure" }
