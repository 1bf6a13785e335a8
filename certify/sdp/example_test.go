package sdp_test

import (
	"context"
	"fmt"

	"github.com/lyacert/lyacert/certify/sdp"
)

// The largest eigenvalue of [[2, 1], [1, 2]] is 3: max ⟨C, X⟩ subject to
// tr X = 1, X ⪰ 0.
func ExampleSolve() {
	p := &sdp.Problem{
		Blocks: []int{2},
		C:      sdp.Matrix{{Block: 0, I: 0, J: 0, V: 2}, {Block: 0, I: 0, J: 1, V: 1}, {Block: 0, I: 1, J: 1, V: 2}},
		A:      []sdp.Matrix{{{Block: 0, I: 0, J: 0, V: 1}, {Block: 0, I: 1, J: 1, V: 1}}},
		B:      []float64{1},
	}
	r, err := sdp.Solve(context.Background(), p, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%v %.6f\n", r.Status, r.PrimalObj)
	// Output: optimal 3.000000
}
