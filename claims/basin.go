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
	return closedBox(b.Lo, b.Hi)
}

// closedBox reads closed sides [lo[i], hi[i]]: canonical rationals, lo < hi.
func closedBox(lo, hi []string) ([]poly.Interval, error) {
	sides := make([]poly.Interval, len(lo))
	for i := range lo {
		l, ok1 := CanonicalRat(lo[i])
		h, ok2 := CanonicalRat(hi[i])
		if !ok1 || !ok2 || l.Cmp(h) >= 0 {
			return nil, fmt.Errorf("side %d is not two canonical rationals, lo < hi", i+1)
		}
		sides[i] = poly.Closed(l, h)
	}
	return sides, nil
}
