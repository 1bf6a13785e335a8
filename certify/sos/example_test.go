package sos_test

import (
	"context"
	"fmt"

	"github.com/lyacert/lyacert/certify/sos"
	"github.com/lyacert/lyacert/poly"
)

// x⁴ − 2x²y² + 2y⁴ = (x² − y²)² + y⁴ gets an exact certificate; Motzkin's
// polynomial gets an exact refutation.
func ExampleFind() {
	r := poly.NewRing([]string{"x", "y"}, nil)
	for _, text := range []string{"x^4 - 2*x^2*y^2 + 2*y^4", "x^4*y^2 + x^2*y^4 - 3*x^2*y^2 + 1"} {
		res, err := sos.Find(context.Background(), poly.MustParse(r, text).Num, nil)
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Printf("basis %d: certificate %v, refutation %v\n", len(res.Basis), res.Certificate != nil, res.NotSOS != nil)
	}
	// Output:
	// basis 3: certificate true, refutation false
	// basis 4: certificate false, refutation true
}
