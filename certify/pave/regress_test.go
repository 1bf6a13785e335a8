package pave

import (
	"context"
	"math/big"
	"testing"

	"github.com/lyacert/lyacert/poly"
)

// Box ends beyond float64 (1e400, 1e309) leave the float pass with
// unbounded enclosures: it proposes nothing there and the exact test decides
// alone, without a panic. The unit disc 1 − a² − b² > 0 is far smaller than
// any box at level 5 of a box 10⁴⁰⁰ wide, so no box is inside, and the boxes
// far from it are outside (common practice: a² + b² ≥ 1 off the disc).
func TestPaveRegionBeyondFloatRange(t *testing.T) {
	r := ratRing()
	conds := []*poly.Poly{poly.MustParse(r, "1 - a^2 - b^2").Num}
	huge, _ := new(big.Rat).SetString("1e400")
	big309, _ := new(big.Rat).SetString("1e309")
	box := []Side{
		{1, poly.Closed(new(big.Rat).Neg(huge), big.NewRat(2, 1))},
		{2, poly.Interval{Lo: poly.Bound{Value: big.NewRat(-2, 1)}, Hi: poly.Bound{Value: big309, Open: true}}},
	}
	pv, err := PaveRegion(context.Background(), conds, box, 5, Options{Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	if pv.Inside != 0 || pv.Outside == 0 {
		t.Errorf("inside %d, outside %d; want no inside box and some outside ones", pv.Inside, pv.Outside)
	}
}
