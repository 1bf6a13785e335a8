package poly

import (
	"fmt"
	"math/big"
	"math/rand/v2"
	"testing"
)

// chebyshevU returns the Chebyshev polynomial of the second kind Uₙ
// (U₀ = 1, U₁ = 2t, Uₙ₊₁ = 2t·Uₙ − Uₙ₋₁; common practice). Its roots are
// cos(jπ/(n+1)), j = 1…n, all simple.
func chebyshevU(n int) Univariate {
	a, b := UnivariateFromInts(1), UnivariateFromInts(0, 2)
	if n == 0 {
		return a
	}
	for range n - 1 {
		a, b = b, UnivariateFromInts(0, 2).Mul(b).Sub(a)
	}
	return b
}

// TestSquareFreeRationalRootsChebyshev: by Niven's theorem (Niven 1956,
// Irrational Numbers, Cor. 3.12) the only rational values of cos(rπ), r
// rational, are 0, ±1/2 and ±1, so the rational roots of Uₙ are 0 (n odd)
// and ±1/2 (3 | n + 1); Uₙ is square-free.
func TestSquareFreeRationalRootsChebyshev(t *testing.T) {
	for n := 1; n <= 60; n++ {
		var want []*big.Rat
		if (n+1)%3 == 0 {
			want = append(want, big.NewRat(-1, 2))
		}
		if n%2 == 1 {
			want = append(want, new(big.Rat))
		}
		if (n+1)%3 == 0 {
			want = append(want, big.NewRat(1, 2))
		}
		got, ok := chebyshevU(n).SquareFreeRationalRoots()
		if !ok || !utRatsEqual(got, want) {
			t.Errorf("U_%d: got %s (square-free shown: %v), want %s", n, utRatsString(got), ok, utRatsString(want))
		}
		// Scaled to rational coefficients: the same roots.
		if got := chebyshevU(n).Scale(big.NewRat(-3, 7)).RationalRoots(); !utRatsEqual(got, want) {
			t.Errorf("U_%d·(−3/7): RationalRoots %s, want %s", n, utRatsString(got), utRatsString(want))
		}
	}
}

// TestSquareFreeRationalRootsPlanted: polynomials built from their roots
// (the rational root theorem, common practice, says which rationals can be
// roots; the roots here are planted, so the answer is known by
// construction), times factors without rational roots.
func TestSquareFreeRationalRootsPlanted(t *testing.T) {
	noRoots := []Univariate{
		UnivariateFromInts(1),
		UnivariateFromInts(-2, 0, 1),       // ±√2
		UnivariateFromInts(1, 0, 1),        // ±i
		UnivariateFromInts(-1, -1, 1),      // golden ratio
		UnivariateFromInts(-2, 0, 0, 1),    // ∛2
		UnivariateFromInts(3, 0, -5, 0, 1), // (5 ± √13)/2 under a square root
	}
	rng := rand.New(rand.NewPCG(1983, 7))
	for trial := range 300 {
		var roots []string
		seen := map[string]bool{}
		for range rng.IntN(7) {
			r := big.NewRat(rng.Int64N(2001)-1000, rng.Int64N(60)+1)
			if !seen[r.RatString()] {
				seen[r.RatString()] = true
				roots = append(roots, r.RatString())
			}
		}
		p := utFromRoots(roots...).Mul(noRoots[rng.IntN(len(noRoots))])
		if p.Degree() < 1 {
			continue
		}
		p = p.Scale(big.NewRat(rng.Int64N(19)-9|1, rng.Int64N(7)+1))
		want := utRats(roots...)
		sortRats(want)
		got, ok := p.SquareFreeRationalRoots()
		if !ok || !utRatsEqual(got, want) {
			t.Fatalf("trial %d: %s: got %s (%v), want %s", trial, p.String("t"), utRatsString(got), ok, utRatsString(want))
		}
		if len(roots) > 0 {
			// A square: no claim of square-freeness, and RationalRoots still
			// finds every root (by isolation).
			sq := p.Mul(utLin(want[0]))
			if _, ok := sq.SquareFreeRationalRoots(); ok {
				t.Fatalf("trial %d: %s shown square-free", trial, sq.String("t"))
			}
			if got := sq.RationalRoots(); !utRatsEqual(got, want) {
				t.Fatalf("trial %d: RationalRoots of the square %s, want %s", trial, utRatsString(got), utRatsString(want))
			}
		}
	}
}

// TestSquareFreeRationalRootsBadPrimes: a leading coefficient divisible by
// the first primes tried, and roots that collide modulo them, are handled
// by moving to another prime (by construction).
func TestSquareFreeRationalRootsBadPrimes(t *testing.T) {
	lead := big.NewInt(1)
	for _, q := range rootPrimes[:5] {
		lead.Mul(lead, new(big.Int).SetUint64(q))
	}
	// Roots 0, 101·103 and 1/lead: 0 and 10403 collide mod 101 and 103.
	p := utFromRoots("0", "10403").Mul(NewUnivariate(big.NewRat(-1, 1), new(big.Rat).SetInt(lead)))
	got, ok := p.SquareFreeRationalRoots()
	want := []*big.Rat{new(big.Rat), new(big.Rat).SetFrac(big.NewInt(1), lead), big.NewRat(10403, 1)}
	if !ok || !utRatsEqual(got, want) {
		t.Errorf("got %s (%v), want %s", utRatsString(got), ok, utRatsString(want))
	}
}

func sortRats(rs []*big.Rat) {
	for i := 1; i < len(rs); i++ {
		for j := i; j > 0 && rs[j].Cmp(rs[j-1]) < 0; j-- {
			rs[j], rs[j-1] = rs[j-1], rs[j]
		}
	}
}

func BenchmarkRationalRootsChebyshev(b *testing.B) {
	for _, n := range []int{20, 40, 80} {
		p := chebyshevU(n)
		b.Run(fmt.Sprintf("n=%d/lifting", n), func(b *testing.B) {
			for b.Loop() {
				p.SquareFreeRationalRoots()
			}
		})
		b.Run(fmt.Sprintf("n=%d/isolation", n), func(b *testing.B) {
			for b.Loop() {
				p.isolatedRationalRoots()
			}
		})
	}
}
