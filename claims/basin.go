package claims

import (
	"fmt"

	"github.com/lyacert/lyacert/poly"
)

// SublevelBasin claims that, for every value p of the free parameters in
// their ranges, every state of the connected component of {V(·, p) ≤ Level}
// around the equilibrium tends to the equilibrium. The box of the states
// (sides [Lo[i], Hi[i]], canonical rationals) times the box of the free
// parameters (their ranges, which must be closed and bounded) is bisected
// like a Paving's (Resolution, Tree; codes S, I, O, no U), and a split may
// name its coordinate k by the letter PaveSplitAlong + k (WalkDirected):
// on an O box V > Level throughout, on an I box V̇ < 0 except at the
// equilibrium; every box that touches a face of the state box is an O box.
type SublevelBasin struct {
	Level      string   `json:"level"`
	Lo         []string `json:"lo"`
	Hi         []string `json:"hi"`
	Resolution string   `json:"resolution"`
	Tree       string   `json:"tree"`
}

func (*SublevelBasin) Rule() string { return "sublevel-basin" }

// Sides reads the box of the n states: canonical rational ends, lo < hi.
func (b *SublevelBasin) Sides(n int) ([]poly.Interval, error) {
	if len(b.Lo) != n || len(b.Hi) != n {
		return nil, fmt.Errorf("%d and %d sides for %d states", len(b.Lo), len(b.Hi), n)
	}
	sides := make([]poly.Interval, n)
	for i := range n {
		lo, ok1 := CanonicalRat(b.Lo[i])
		hi, ok2 := CanonicalRat(b.Hi[i])
		if !ok1 || !ok2 || lo.Cmp(hi) >= 0 {
			return nil, fmt.Errorf("side %d is not two canonical rationals, lo < hi", i+1)
		}
		sides[i] = poly.Closed(lo, hi)
	}
	return sides, nil
}
