package sossearch

import (
	"context"
	"fmt"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
)

// ring returns a constructed n-state model: a ring of oscillators with
// skew-symmetric coupling (a centre linearization: V = Σxᵢ² is conserved
// by the linear part) and cubic damping, V̇ = −2Σxᵢ⁴ for V = Σxᵢ².
func ring(n int) string {
	var b strings.Builder
	names := make([]string, n)
	for i := range names {
		names[i] = fmt.Sprintf("x%d", i+1)
	}
	fmt.Fprintf(&b, "state %s\n", strings.Join(names, ", "))
	for i, x := range names {
		next, prev := names[(i+1)%n], names[(i+n-1)%n]
		if n == 2 && i == 1 {
			fmt.Fprintf(&b, "%s' = -%s - %s^3\n", x, prev, x)
			continue
		}
		if n == 2 {
			fmt.Fprintf(&b, "%s' = %s - %s^3\n", x, next, x)
			continue
		}
		fmt.Fprintf(&b, "%s' = %s - %s - %s^3\n", x, next, prev, x)
	}
	return b.String()
}

// BenchmarkSearchDegree4: find --degree 4 on 2- to 6-state models; the
// metrics split the SDP from the rounding and exact checks.
func BenchmarkSearchDegree4(b *testing.B) {
	for n := 2; n <= 6; n++ {
		m, err := model.Parse("ring.lya", []byte(ring(n)))
		if err != nil {
			b.Fatal(err)
		}
		b.Run(fmt.Sprintf("states=%d", n), func(b *testing.B) {
			var solve, round float64
			var last *Result
			for b.Loop() {
				res, err := Search(context.Background(), m, Options{Degree: 4, Source: "ring.lya"})
				if err != nil || res.Check == nil || res.Check.Verdict != checker.VerdictHolds {
					b.Fatalf("not proven: %v %+v", err, res)
				}
				solve += res.Sizes.Solve.Seconds()
				round += res.Sizes.Round.Seconds()
				last = res
			}
			b.ReportMetric(solve/float64(b.N)*1e3, "sdp-ms/op")
			b.ReportMetric(round/float64(b.N)*1e3, "exact-ms/op")
			b.ReportMetric(float64(last.Sizes.BasisV), "basisV")
			b.ReportMetric(float64(last.Sizes.BasisVdot), "basisVdot")
			b.ReportMetric(float64(last.Sizes.Constraints), "equations")
			b.ReportMetric(float64(last.Sizes.Iterations), "iterations")
		})
	}
}
