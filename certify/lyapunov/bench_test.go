package lyapunov

import (
	"fmt"
	"math/rand/v2"
	"testing"
)

// The matrices are the test's random stable ones (randStable: α(A) = −1;
// randSchurStable: ρ(A) = 0.9) with Q = MMᵀ + I, fixed seed;
// bench/lyap_reference.py times SciPy on the same kind of input.

func BenchmarkContinuous(b *testing.B) {
	for _, n := range []int{10, 20, 50, 100, 200, 400} {
		rng := rand.New(rand.NewPCG(uint64(n), 1))
		a := randStable(n, rng)
		q := randSPD(n, rng)
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			for b.Loop() {
				if _, err := Continuous(a, q); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkDiscrete(b *testing.B) {
	for _, n := range []int{10, 20, 50, 100, 200, 400} {
		rng := rand.New(rand.NewPCG(uint64(n), 2))
		a := randSchurStable(n, rng)
		q := randSPD(n, rng)
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			for b.Loop() {
				if _, err := Discrete(a, q); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
