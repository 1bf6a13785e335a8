package branches

import (
	"context"
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
