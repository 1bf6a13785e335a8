package sdp_test

import (
	"context"
	"math"
	"testing"

	"github.com/lyacert/lyacert/certify/sdp"
)

// TestPositiveMargin: X = [[1, c], [c, 1]] fixed by X₁₁ = X₂₂ = 1 and
// 2X₁₂ = 2c has the eigenvalues 1 ± c (common practice), so the largest
// margin is 1 − |c|. Both forms find it when it is positive; when it is
// negative the free form reports it and the positive form does not reach
// optimality (no solution has t ≥ 0).
func TestPositiveMargin(t *testing.T) {
	for _, c := range []float64{0, 0.5, -0.75, 2} {
		p := &sdp.Problem{Blocks: []int{2},
			A: []sdp.Matrix{{{Block: 0, I: 0, J: 0, V: 1}}, {{Block: 0, I: 1, J: 1, V: 1}}, {{Block: 0, I: 0, J: 1, V: 1}}},
			B: []float64{1, 1, 2 * c}}
		want := 1 - math.Abs(c)
		free, err := sdp.SolveMargin(context.Background(), p, 10, nil)
		if err != nil {
			t.Fatal(err)
		}
		pos, err := sdp.SolvePositiveMargin(context.Background(), p, 10, nil)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(free.T-want) > 1e-6 || free.Inner.Status != sdp.Optimal {
			t.Errorf("c = %g: free margin %g (%v), want %g", c, free.T, free.Inner.Status, want)
		}
		switch {
		case want > 0 && (math.Abs(pos.T-want) > 1e-6 || pos.Inner.Status != sdp.Optimal):
			t.Errorf("c = %g: positive margin %g (%v), want %g", c, pos.T, pos.Inner.Status, want)
		case want < 0 && pos.Inner.Status == sdp.Optimal:
			t.Errorf("c = %g: positive margin optimal at %g, but no t ≥ 0 is feasible", c, pos.T)
		}
		if want > 0 && math.Abs(pos.X[0].At(0, 1)-c) > 1e-6 {
			t.Errorf("c = %g: X₁₂ = %g", c, pos.X[0].At(0, 1))
		}
	}
}
