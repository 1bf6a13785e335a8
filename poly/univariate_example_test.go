package poly_test

import (
	"fmt"
	"math/big"

	"github.com/lyacert/lyacert/poly"
)

func ExampleUnivariate_IsolateRoots() {
	// (2t - 1)(t^2 - 2)(t^2 + 1)
	p := poly.UnivariateFromInts(-1, 2).
		Mul(poly.UnivariateFromInts(-2, 0, 1)).
		Mul(poly.UnivariateFromInts(1, 0, 1))
	fmt.Println(p.String("t"))
	// Irrational roots carry the square-free part of p without its rational
	// roots, here (t^2 - 2)(t^2 + 1).
	for _, r := range p.IsolateRoots() {
		if r.Exact != nil {
			fmt.Println("exact", r.Exact.RatString())
			continue
		}
		fmt.Printf("root of %s in (%s, %s) ~ %s\n", r.Poly.String("t"), r.Lo.RatString(), r.Hi.RatString(), r.Decimal(12))
	}
	// Output:
	// 2*t^5 - t^4 - 2*t^3 + t^2 - 4*t + 2
	// root of t^4 - t^2 - 2 in (-3/2, -1) ~ -1.41421356237
	// exact 1/2
	// root of t^4 - t^2 - 2 in (5/4, 3/2) ~ 1.41421356237
}

func ExampleUnivariate_CountRoots() {
	p := poly.UnivariateFromInts(-1, 1).Mul(poly.UnivariateFromInts(-2, 1)) // (t - 1)(t - 2)
	one, two := big.NewRat(1, 1), big.NewRat(2, 1)
	fmt.Println(p.CountRoots(poly.UBoundClosed(one), poly.UBoundClosed(two)))
	fmt.Println(p.CountRoots(poly.UBoundOpen(one), poly.UBoundClosed(two)))
	fmt.Println(p.CountRoots(poly.UBoundOpen(one), poly.UBoundOpen(two)))
	fmt.Println(p.CountRoots(poly.UBoundNegInf(), poly.UBoundPosInf()))
	// Output:
	// 2
	// 1
	// 0
	// 2
}
