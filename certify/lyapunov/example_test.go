package lyapunov_test

import (
	"fmt"

	"gonum.org/v1/gonum/mat"

	"github.com/lyacert/lyacert/certify/lyapunov"
)

// The worked example of Ogata's Modern Control Engineering: for ẋ = Ax with
// A = [0 1; −1 −1] and Q = I, the Lyapunov matrix is P = [3/2 1/2; 1/2 1],
// which is positive definite, so V(x) = xᵀPx proves A Hurwitz (once checked
// exactly).
func ExampleContinuous() {
	a := mat.NewDense(2, 2, []float64{
		0, 1,
		-1, -1,
	})
	q := mat.NewDense(2, 2, []float64{1, 0, 0, 1})
	p, err := lyapunov.Continuous(a, q)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("P = %.6f\n", mat.Formatted(p, mat.Prefix("    ")))
	fmt.Printf("residual < 1e-15: %v\n", lyapunov.ContinuousResidual(a, p, q) < 1e-15)
	fmt.Printf("Hurwitz: %v (spectral abscissa %.3f)\n", lyapunov.IsHurwitz(a), lyapunov.SpectralAbscissa(a))
	// Output:
	// P = ⎡1.500000  0.500000⎤
	//     ⎣0.500000  1.000000⎦
	// residual < 1e-15: true
	// Hurwitz: true (spectral abscissa -0.500)
}

// The discrete Lyapunov (Stein) equation for x⁺ = x/2: p/4 − p = −1.
func ExampleDiscrete() {
	a := mat.NewDense(1, 1, []float64{0.5})
	q := mat.NewDense(1, 1, []float64{1})
	p, err := lyapunov.Discrete(a, q)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("p = %.6f\n", p.At(0, 0))
	// Output:
	// p = 1.333333
}

// A singular equation is an error, not a panic or a meaningless P.
func ExampleContinuous_singular() {
	a := mat.NewDense(2, 2, []float64{1, 0, 0, -1}) // eigenvalues 1 and −1
	_, err := lyapunov.Continuous(a, mat.NewDense(2, 2, []float64{1, 0, 0, 1}))
	fmt.Println(err != nil)
	// Output:
	// true
}
