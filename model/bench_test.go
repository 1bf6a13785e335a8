package model

import (
	"fmt"
	"strings"
	"testing"
)

// chainModel is an n-state chain x1' = -x1, x_i' = -x_i + k*x_{i-1}^2 with
// V = Σ x_i² (an invented benchmark model).
func chainModel(n int) string {
	var b strings.Builder
	names := make([]string, n)
	for i := range names {
		names[i] = fmt.Sprintf("x%d", i+1)
	}
	fmt.Fprintf(&b, "state %s\nparameter k > 0\n", strings.Join(names, ", "))
	for i, s := range names {
		if i == 0 {
			fmt.Fprintf(&b, "%s' = -%s\n", s, s)
			continue
		}
		fmt.Fprintf(&b, "%s' = -%s + k*%s^2\n", s, s, names[i-1])
	}
	sq := make([]string, n)
	for i, s := range names {
		sq[i] = s + "^2"
	}
	fmt.Fprintf(&b, "V = %s\n", strings.Join(sq, " + "))
	return b.String()
}

func BenchmarkOrbitalDerivative(b *testing.B) {
	for _, n := range []int{5, 10, 20, 40} {
		m, err := Parse("chain.lya", []byte(chainModel(n)))
		if err != nil {
			b.Fatal(err)
		}
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			for b.Loop() {
				m.Derivative(*m.V)
			}
		})
	}
}
