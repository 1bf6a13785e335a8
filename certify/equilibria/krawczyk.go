package equilibria

import (
	"math"
	"math/big"

	"gonum.org/v1/gonum/mat"

	"github.com/lyacert/lyacert/certify"
	"github.com/lyacert/lyacert/poly"
)

// krawczykRadii are the relative half-widths tried for the box around a
// Newton point, the first that passes wins: wide enough to contain the
// equilibrium despite float error, narrow enough for the linear terms of
// the Krawczyk operator to contract.
var krawczykRadii = []float64{1e-10, 1e-7, 1e-5, 1e-12}

// encloseZero proposes a box around the float point c and proves with the
// Krawczyk test, in exact rational interval arithmetic, that it contains
// exactly one zero of g. Floats propose the centre, the radius and the
// preconditioner Y ≈ J(c)⁻¹ (rounded to short rationals); the inclusion
// K(X) ⊂ int X decides (poly.KrawczykImage).
func encloseZero(g []*poly.Poly, jac [][]*poly.Poly, fj [][]certify.FloatPoly, c []float64) (box []poly.Interval, y [][]*big.Rat, k []poly.Interval, ok bool) {
	n := len(g)
	var inv mat.Dense
	if err := inv.Inverse(evalJacobian(fj, c)); err != nil {
		return nil, nil, nil, false
	}
	ymax := mat.Norm(&inv, math.Inf(1))
	y = make([][]*big.Rat, n)
	for i := range y {
		y[i] = make([]*big.Rat, n)
		for j := range y[i] {
			y[i][j] = rationalize(inv.At(i, j), 1e-9*ymax)
		}
	}
	for _, rel := range krawczykRadii {
		box = make([]poly.Interval, n)
		for i, x := range c {
			// A dyadic centre on the grid of the radius/2¹⁶, so that the ends
			// share one power-of-two denominator and stay short.
			r := powerOfTwoAtLeast(rel * (1 + math.Abs(x)))
			mid := dyadicRound(x, new(big.Rat).Quo(r, big.NewRat(1<<16, 1)))
			box[i] = poly.Closed(new(big.Rat).Sub(mid, r), new(big.Rat).Add(mid, r))
		}
		k = poly.KrawczykImage(g, box, y)
		inside := true
		for i := range k {
			if k[i].Lo.Value.Cmp(box[i].Lo.Value) <= 0 || k[i].Hi.Value.Cmp(box[i].Hi.Value) >= 0 {
				inside = false
				break
			}
		}
		if inside {
			return box, y, k, true
		}
	}
	return nil, nil, nil, false
}

// dyadicRound returns the multiple of the power of two h nearest to x.
func dyadicRound(x float64, h *big.Rat) *big.Rat {
	q := new(big.Rat).SetFloat64(x)
	q.Quo(q, h)
	k := new(big.Int).Quo(q.Num(), q.Denom()) // truncated
	if f, _ := new(big.Rat).Sub(q, new(big.Rat).SetInt(k)).Float64(); f >= 0.5 {
		k.Add(k, big.NewInt(1))
	} else if f <= -0.5 {
		k.Sub(k, big.NewInt(1))
	}
	return new(big.Rat).Mul(new(big.Rat).SetInt(k), h)
}

// powerOfTwoAtLeast returns the smallest power of two ≥ x > 0, exactly.
func powerOfTwoAtLeast(x float64) *big.Rat {
	e := int(math.Ceil(math.Log2(x)))
	one := big.NewInt(1)
	if e >= 0 {
		return new(big.Rat).SetInt(new(big.Int).Lsh(one, uint(e)))
	}
	return new(big.Rat).SetFrac(one, new(big.Int).Lsh(one, uint(-e)))
}
