package sos_test

import (
	"context"
	"fmt"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/certify/sdp"
	"github.com/lyacert/lyacert/certify/sos"
	"github.com/lyacert/lyacert/poly"
)

// randomForm4 returns Σ qₖ² for N+2 random integer quadratic forms qₖ in n
// variables (N = n(n+1)/2, the basis size), a degree-4 form with a
// positive definite Gram matrix (generically).
func randomForm4(tb testing.TB, n int, seed uint64) *poly.Poly {
	rng := rand.New(rand.NewPCG(seed, uint64(n)))
	vars := make([]string, n)
	for i := range vars {
		vars[i] = fmt.Sprintf("x%d", i)
	}
	var parts []string
	for k := 0; k < n*(n+1)/2+2; k++ {
		var q []string
		for i := 0; i < n; i++ {
			for j := i; j < n; j++ {
				if c := rng.IntN(7) - 3; c != 0 {
					q = append(q, fmt.Sprintf("(%d)*%s*%s", c, vars[i], vars[j]))
				}
			}
		}
		if len(q) > 0 {
			parts = append(parts, "("+strings.Join(q, "+")+")^2")
		}
	}
	r := poly.NewRing(vars, nil)
	f, err := poly.Parse(r, strings.Join(parts, "+"))
	if err != nil {
		tb.Fatal(err)
	}
	return f.Num
}

// BenchmarkFind: solve plus exact certificate for degree-4 forms in 3..8
// variables (basis 6..36).
func BenchmarkFind(b *testing.B) {
	for n := 3; n <= 8; n++ {
		p := randomForm4(b, n, 1)
		b.Run(fmt.Sprintf("vars=%d", n), func(b *testing.B) {
			for b.Loop() {
				res, err := sos.Find(context.Background(), p, nil)
				if err != nil || res.Certificate == nil {
					b.Fatalf("no certificate: %v", err)
				}
			}
		})
	}
}

// BenchmarkFindSDP: the margin SDP alone for the forms of BenchmarkFind;
// BenchmarkFind minus this is the rounding, projection and exact LDLᵀ.
func BenchmarkFindSDP(b *testing.B) {
	for n := 3; n <= 8; n++ {
		p := randomForm4(b, n, 1)
		g, _, err := sos.NewGram(p, 0)
		if err != nil {
			b.Fatal(err)
		}
		prob := g.Problem()
		b.Run(fmt.Sprintf("vars=%d/basis=%d", n, len(g.Basis)), func(b *testing.B) {
			for b.Loop() {
				mr, err := sdp.SolveMargin(context.Background(), prob, 10, nil)
				if err != nil || mr.T <= 0 {
					b.Fatalf("margin %v: %v", mr, err)
				}
			}
		})
	}
}
