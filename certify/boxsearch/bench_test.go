package boxsearch

import (
	"context"
	"testing"

	"github.com/lyacert/lyacert/model"
)

// benchModels are constructed (invented) models with 2 and 3 states and
// one and two parameters in boxes, each with a certificate of the degree
// given.
var benchModels = []struct {
	name, src string
	degree    int
}{
	// corner (see search_test.go): proven by box multipliers.
	{"states=2/params=1", corner, 2},
	// A coupling p and a cubic damping c (boxquartic.lya's dynamics, and
	// a cubic damping of y).
	{"states=2/params=2", "state x, y\nparameter p in [0, 2]\nparameter c in [1, 3]\nx' = -x - c*x^3 + p*y\ny' = -x - y - y^3\n", 2},
	// Lorenz with r ∈ [0, 1/2] (Strogatz §9.2), then σ ∈ [8, 12] too.
	{"states=3/params=1", "state x, y, z\nparameter r in [0, 1/2]\nx' = 10*(y - x)\ny' = r*x - y - x*z\nz' = x*y - 8/3*z\n", 2},
	{"states=3/params=2", "state x, y, z\nparameter r in [0, 1/2]\nparameter s in [8, 12]\nx' = s*(y - x)\ny' = r*x - y - x*z\nz' = x*y - 8/3*z\n", 2},
	// Chains in the manner of corner (invented): the V found has cross
	// terms, so −V̇'s quartic part needs the multipliers.
	{"states=2/params=2/chain", "state x, y\nparameter p in [0, 4]\nparameter c in [1, 2]\nx' = -x + p*y - x^3\ny' = -y - c*y^3\n", 2},
	{"states=3/params=1/chain", "state x, y, z\nparameter p in [0, 3]\nx' = -x + p*y - x^3\ny' = -y + p*z - y^3\nz' = -z - z^3\n", 2},
	{"states=3/params=2/chain", "state x, y, z\nparameter p in [0, 3]\nparameter q in [0, 2]\nx' = -x + p*y - x^3\ny' = -y + q*z - y^3\nz' = -z - z^3\n", 2},
	// Duffing with k, c ∈ [1, 2] (search_test.go): degree 4.
	{"states=2/params=2/duffing4", "state x, y\nparameter k in [1, 2]\nparameter c in [1, 2]\nx' = y\ny' = -k*x - c*y - x^3\n", 4},
}

// BenchmarkSearchBox: find --degree 2D --box-sos end to end (the search's
// SDP, rounding, the direct method, boxsos's certificate and the kernel);
// the metrics split the search's SDP from the exact part.
func BenchmarkSearchBox(b *testing.B) {
	for _, bm := range benchModels {
		m, err := model.Parse("bench.lya", []byte(bm.src))
		if err != nil {
			b.Fatal(err)
		}
		b.Run(bm.name, func(b *testing.B) {
			var solve, round float64
			var last *Result
			for b.Loop() {
				res, err := Search(context.Background(), m, Options{Degree: bm.degree, Source: "bench.lya"})
				if err != nil || res.Doc == nil {
					b.Fatalf("not proven: %v", err)
				}
				solve += res.Sizes.Solve.Seconds()
				round += res.Sizes.Round.Seconds()
				last = res
			}
			b.ReportMetric(solve/float64(b.N)*1e3, "sdp-ms/op")
			b.ReportMetric(round/float64(b.N)*1e3, "exact-ms/op")
			b.ReportMetric(float64(last.Sizes.Constraints), "equations")
			b.ReportMetric(float64(last.Sizes.Iterations), "iterations")
			b.Logf("%s: V = %s method %s; multipliers %v, blocks %v", bm.name, last.V, last.Method, last.Sizes.Multipliers, last.Sizes.Blocks)
		})
	}
}
