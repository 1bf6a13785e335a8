package branches

import (
	"context"
	"math/big"
	"testing"
)

// BenchmarkLorenz is the whole analysis of the classical Lorenz model
// (target < 100 ms).
func BenchmarkLorenz(b *testing.B) {
	m := readModel(b, "lorenz-classic.lya")
	for b.Loop() {
		if _, err := Analyze(context.Background(), m, Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkFourStatesTwoParams is a 4-state chain of our own with two
// symbolic parameters (target < 2 s): branches x = 0 and x = ab − 1,
// 4×4 Jacobians, Hurwitz determinants and the 10-unknown Lyapunov system.
func BenchmarkFourStatesTwoParams(b *testing.B) {
	m := parse(b, "chain4.lya", "state x, y, z, w\nparameter a\nparameter b\nx' = y - a*x\ny' = z - y\nz' = w - b*z + x^2\nw' = x - w\n")
	for b.Loop() {
		an, err := Analyze(context.Background(), m, Options{})
		if err != nil {
			b.Fatal(err)
		}
		if len(an.Branches) != 2 {
			b.Fatalf("%d branches", len(an.Branches))
		}
	}
}

// fourStates is a companion form of a quartic with two gains and a cubic
// term (an invented scenario): the origin and the pair x₁ = ±√k₁, each
// with its Hurwitz determinants H₁ … H₄ in (k₁, k₂).
const fourStates = `# Quartic companion form with two gains and a cubic spring (an invented scenario).
state x1, x2, x3, x4
parameter k1 in [-1, 2]
parameter k2 in [0, 4]
x1' = x2
x2' = x3
x3' = x4
x4' = -k1*x1 + x1^3 - k2*x2 - 3*x3 - 2*x4
`

// BenchmarkMapFourStates: the map over (k₁, k₂) of a four-state model at
// the default resolution (target: under 2 s).
func BenchmarkMapFourStates(b *testing.B) {
	m := parse(b, "four.lya", fourStates)
	for b.Loop() {
		an, err := Analyze(context.Background(), m, Options{})
		if err != nil || an.Map == nil {
			b.Fatal(err, an.Notes)
		}
	}
}

// BenchmarkMapChainFour is the chain above with its map over the box
// a, b ∈ [−2, 2] at the default resolution (target: under 2 s).
func BenchmarkMapChainFour(b *testing.B) {
	m := parse(b, "chain4.lya", "state x, y, z, w\nparameter a\nparameter b\nx' = y - a*x\ny' = z - y\nz' = w - b*z + x^2\nw' = x - w\n")
	opts := Options{Box: map[string][2]*big.Rat{"a": {big.NewRat(-2, 1), big.NewRat(2, 1)}, "b": {big.NewRat(-2, 1), big.NewRat(2, 1)}}}
	for b.Loop() {
		an, err := Analyze(context.Background(), m, opts)
		if err != nil || an.Map == nil {
			b.Fatal(err, an.Notes)
		}
	}
}
