package claims

// OrbitalDerivative restates the candidate V and its derivative along the
// flow, V̇ = Σ ∂V/∂xᵢ·fᵢ, or for a map ΔV = V(f(x)) − V(x).
type OrbitalDerivative struct {
	V    string `json:"V"`
	Vdot string `json:"vdot"`
}

// LDLForm is a Gram matrix G with G = L·diag(D)·Lᵀ, L unit lower triangular,
// and the leading principal minors of G on its non-zero pivots. Of is "V" or
// "-Vdot". A zero pivot is allowed only with a zero column of L below it
// (the semidefinite case).
type LDLForm struct {
	Of     string     `json:"of"`
	Gram   [][]string `json:"gram"`
	L      [][]string `json:"l"`
	D      []string   `json:"d"`
	Minors []string   `json:"minors"`
}

// QuadraticPart is the LDLᵀ of the Gram matrix of the quadratic part of V or
// −V̇ at the equilibrium, in the states.
type QuadraticPart struct{ LDLForm }

// MonomialGram is the LDLᵀ of a Gram matrix of the whole function, all
// degrees: V or −V̇ = zᵀGz for the monomials z of Basis (each with
// coefficient 1, a pure power of every state among them).
type MonomialGram struct {
	Basis []string `json:"basis"`
	LDLForm
}

// MinorCondition is what one leading principal minor requires: Minor > 0,
// with Minor's numerator times its denominator factored as
// Constant · Π Factorᵢ^Powerᵢ. Factors whose sign the assumptions fix are
// discharged; Condition is the product of the rest (with the constant's sign
// and the discharged signs folded in), which must be > 0.
type MinorCondition struct {
	Form      string   `json:"form"`
	Index     int      `json:"index"`
	Minor     string   `json:"minor"`
	Constant  string   `json:"constant"`
	Factors   []Factor `json:"factors"`
	Condition string   `json:"condition"`
}

// Factor is one factor of a minor, with its sign status.
type Factor struct {
	Poly   string `json:"poly"`
	Power  int    `json:"power"`
	Status string `json:"status"`
}

// Factor statuses.
const (
	StatusPositive  = "positive-by-assumption"
	StatusNegative  = "negative-by-assumption"
	StatusCondition = "condition"
)

// NullSpace spans the set where the semidefinite quadratic form of −V̇
// vanishes: one vector per zero pivot.
type NullSpace struct {
	Of      string     `json:"of"`
	Vectors [][]string `json:"vectors"`
}

// WitnessPoints are points of parameter space where the conditions hold or
// fail (several free parameters).
type WitnessPoints struct {
	Points []Witness `json:"points"`
}

// Witness gives exactly the parameters the conditions involve, the
// conditions' values there in order, and whether all are > 0.
type Witness struct {
	Params map[string]string `json:"params"`
	Values []string          `json:"values"`
	Holds  bool              `json:"holds"`
}

// Refutation is a point where the candidate fails: V ≤ 0 or V̇ > 0 at a state
// other than the equilibrium. Params fixes only the parameters on which V or
// V̇ at Point depends; V and Vdot are the exact values there, as functions
// of the remaining parameters, whose sign must hold on their whole range.
type Refutation struct {
	Params map[string]string `json:"params"`
	Point  map[string]string `json:"point"`
	V      string            `json:"V"`
	Vdot   string            `json:"vdot"`
}

func (*OrbitalDerivative) Rule() string { return "orbital-derivative" }
func (*QuadraticPart) Rule() string     { return "quadratic-part-ldl" }
func (*MonomialGram) Rule() string      { return "monomial-gram-ldl" }
func (*MinorCondition) Rule() string    { return "minor-condition" }
func (*NullSpace) Rule() string         { return "semidefinite-kernel" }
func (*WitnessPoints) Rule() string     { return "witness-points" }
func (*Refutation) Rule() string        { return "refutation" }
