package equilibria

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// randomLinear is an invented benchmark model: x' = A·x with A = M − s·I,
// M's entries k/(10·⌈√n⌉) for random integers k in [−9, 9] (a fixed seed),
// and s the least integer ≥ α(M) + 1 (α the spectral abscissa, from gonum's
// eigenvalues), so that A is stable with abscissa about −1 (common practice
// for random stable test matrices).
func randomLinear(n int, seed uint64) string {
	rng := rand.New(rand.NewPCG(seed, 0))
	den := 10 * int(math.Ceil(math.Sqrt(float64(n))))
	k := make([][]int, n)
	m := mat.NewDense(n, n, nil)
	for i := range k {
		k[i] = make([]int, n)
		for j := range k[i] {
			k[i][j] = rng.IntN(19) - 9
			m.Set(i, j, float64(k[i][j])/float64(den))
		}
	}
	var eig mat.Eigen
	if !eig.Factorize(m, mat.EigenNone) {
		panic("eigenvalues")
	}
	alpha := math.Inf(-1)
	for _, v := range eig.Values(nil) {
		alpha = math.Max(alpha, real(v))
	}
	s := int(math.Ceil(alpha + 1))
	var b strings.Builder
	names := make([]string, n)
	for i := range names {
		names[i] = fmt.Sprintf("x%d", i+1)
	}
	fmt.Fprintf(&b, "state %s\n", strings.Join(names, ", "))
	for i := range n {
		var terms []string
		for j := range n {
			c := k[i][j]
			if i == j {
				c -= s * den
			}
			if c != 0 {
				terms = append(terms, fmt.Sprintf("%d/%d*%s", c, den, names[j]))
			}
		}
		fmt.Fprintf(&b, "%s' = %s\n", names[i], strings.Join(terms, " + "))
	}
	return b.String()
}

// BenchmarkFindLinear times `find` end to end on random stable linear
// models: the equilibria, the float Lyapunov solve, the rational P, the
// exact certificate and its re-check by the kernel.
func BenchmarkFindLinear(b *testing.B) {
	// 200 states is above the default limit: raise it for every reader, the
	// kernel's included (what --limit states=200 does).
	saved := poly.DefaultLimits()
	lim := saved
	lim.States = 200
	if err := poly.SetDefaultLimits(lim); err != nil {
		b.Fatal(err)
	}
	defer poly.SetDefaultLimits(saved)
	for _, n := range []int{10, 20, 50, 100, 200} {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			m, err := model.Parse("linear.lya", []byte(randomLinear(n, 1)))
			if err != nil {
				b.Fatal(err)
			}
			for b.Loop() {
				res, err := Find(context.Background(), m, FindOptions{Source: "linear.lya"})
				if err != nil {
					b.Fatal(err)
				}
				if c := res.Certs[res.Target]; c == nil || c.Verdict != checker.VerdictHolds || c.Claim != checker.KindGlobal {
					b.Fatalf("not certified: %+v", c)
				}
			}
		})
	}
}

// cubicChain is an invented benchmark model: n states in a chain. One way
// (coupled false): xᵢ' = −xᵢ + xᵢ₊₁³ and xₙ' = −xₙ; the origin is the only
// equilibrium (xₙ = 0, then each xᵢ = xᵢ₊₁³ = 0), the linearization there is
// −I. Coupled: xᵢ' = −xᵢ + xᵢ₊₁/2 − xᵢ³; eliminating the states one by one
// gives a polynomial of degree 3ⁿ, so the search falls back on Newton's
// method, and V = xᵀPx is proven global through sums of squares.
func cubicChain(n int, coupled bool) string {
	var b strings.Builder
	names := make([]string, n)
	for i := range names {
		names[i] = fmt.Sprintf("x%d", i+1)
	}
	fmt.Fprintf(&b, "state %s\n", strings.Join(names, ", "))
	for i := range n {
		switch {
		case coupled && i+1 < n:
			fmt.Fprintf(&b, "%s' = -%s + 1/2*%s - %s^3\n", names[i], names[i], names[i+1], names[i])
		case coupled:
			fmt.Fprintf(&b, "%s' = -%s - %s^3\n", names[i], names[i], names[i])
		case i+1 < n:
			fmt.Fprintf(&b, "%s' = -%s + %s^3\n", names[i], names[i], names[i+1])
		default:
			fmt.Fprintf(&b, "%s' = -%s\n", names[i], names[i])
		}
	}
	return b.String()
}

// BenchmarkFindCubicChain times `find` end to end on the cubic chains: the
// equilibrium (elimination, or Newton's method and the Krawczyk test), the
// Lyapunov matrix of the linearization, and the full check of V along the
// nonlinear model.
func BenchmarkFindCubicChain(b *testing.B) {
	for _, c := range []struct {
		n       int
		coupled bool
	}{{5, false}, {10, false}, {20, false}, {5, true}, {10, true}} {
		name := fmt.Sprintf("oneway/n=%d", c.n)
		if c.coupled {
			name = fmt.Sprintf("coupled/n=%d", c.n)
		}
		b.Run(name, func(b *testing.B) {
			m, err := model.Parse("cubic.lya", []byte(cubicChain(c.n, c.coupled)))
			if err != nil {
				b.Fatal(err)
			}
			for b.Loop() {
				res, err := Find(context.Background(), m, FindOptions{Source: "cubic.lya"})
				if err != nil {
					b.Fatal(err)
				}
				if c := res.Certs[res.Target]; c == nil || c.Verdict != checker.VerdictHolds {
					b.Fatalf("not certified: %+v", c)
				}
			}
		})
	}
}
