package certificates

import (
	"cmp"
	"math/big"
	"slices"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

// PavingSummary is what follows from a paving's tree: the volume of its box,
// the number of leaves of each class, their exact shares of the box, and the
// inside leaves merged into larger boxes where adjacent ones form a box.
type PavingSummary struct {
	Volume            string      `json:"volume"`
	Inside            int         `json:"inside"`
	Outside           int         `json:"outside"`
	Undecided         int         `json:"undecided"`
	InsideFraction    string      `json:"inside_fraction"`
	OutsideFraction   string      `json:"outside_fraction"`
	UndecidedFraction string      `json:"undecided_fraction"`
	InsideBoxes       []PavingBox `json:"inside_boxes"`
}

// PavingBox is a closed box of parameter values, one coordinate per paved
// parameter: the part of it inside the paving's box.
type PavingBox struct {
	Lo []string `json:"lo"`
	Hi []string `json:"hi"`
}

// Summarize computes the summary of a paving from its tree. It returns an
// error if the box, the resolution or the tree is malformed (the classes are
// taken as written; checker.Verify checks them).
func Summarize(p *claims.Paving) (PavingSummary, error) {
	var s PavingSummary
	sides, _, err := p.Sides()
	if err != nil {
		return s, err
	}
	leaves, err := Leaves(p)
	if err != nil {
		return s, err
	}
	share := map[byte]*big.Rat{claims.PaveInside: new(big.Rat), claims.PaveOutside: new(big.Rat), claims.PaveUndecided: new(big.Rat)}
	count := map[byte]int{}
	var inside []PavingLeaf
	for _, lf := range leaves {
		d := 0
		for _, k := range lf.K {
			d += k
		}
		share[lf.Class].Add(share[lf.Class], new(big.Rat).SetFrac(big.NewInt(1), new(big.Int).Lsh(big.NewInt(1), uint(d))))
		count[lf.Class]++
		if lf.Class == claims.PaveInside {
			inside = append(inside, lf)
		}
	}
	vol := big.NewRat(1, 1)
	for _, side := range sides {
		w, _ := side.Width()
		vol.Mul(vol, w)
	}
	s.Volume = vol.RatString()
	s.Inside, s.Outside, s.Undecided = count[claims.PaveInside], count[claims.PaveOutside], count[claims.PaveUndecided]
	s.InsideFraction = share[claims.PaveInside].RatString()
	s.OutsideFraction = share[claims.PaveOutside].RatString()
	s.UndecidedFraction = share[claims.PaveUndecided].RatString()
	s.InsideBoxes = []PavingBox{}
	scale, merged := mergePaving(inside, len(sides))
	for _, b := range merged {
		var pb PavingBox
		for i, side := range sides {
			pb.Lo = append(pb.Lo, poly.Corner(side, b[0][i], scale[i]).RatString())
			pb.Hi = append(pb.Hi, poly.Corner(side, b[1][i], scale[i]).RatString())
		}
		s.InsideBoxes = append(s.InsideBoxes, pb)
	}
	return s, nil
}

// mergePaving merges grid boxes (disjoint but for their faces) into larger
// boxes, deterministically. All boxes are brought to a common grid,
// 2^scale[i] cells along side i (scale[i] the finest level of a box along
// it); then, for each side in turn, boxes that agree on every other side and
// meet along this one are joined, and the rounds repeat until none joins.
// The result is sorted by lower corner, then upper corner; each box is
// [lo, hi] in grid cells, as {lo, hi}.
func mergePaving(boxes []PavingLeaf, n int) (scale []int, out [][2][]int64) {
	scale = make([]int, n)
	for _, g := range boxes {
		for i, k := range g.K {
			scale[i] = max(scale[i], k)
		}
	}
	for _, g := range boxes {
		lo, hi := make([]int64, n), make([]int64, n)
		for i := range n {
			lo[i] = g.A[i] << (scale[i] - g.K[i])
			hi[i] = (g.A[i] + 1) << (scale[i] - g.K[i])
		}
		out = append(out, [2][]int64{lo, hi})
	}
	for changed := true; changed; {
		changed = false
		for j := range n {
			slices.SortFunc(out, func(x, y [2][]int64) int {
				for i := range n {
					if i == j {
						continue
					}
					if c := cmp.Or(cmp.Compare(x[0][i], y[0][i]), cmp.Compare(x[1][i], y[1][i])); c != 0 {
						return c
					}
				}
				return cmp.Compare(x[0][j], y[0][j])
			})
			var kept [][2][]int64
			for _, b := range out {
				if m := len(kept); m > 0 && kept[m-1][1][j] == b[0][j] && sameExcept(kept[m-1], b, j) {
					kept[m-1][1][j] = b[1][j]
					changed = true
					continue
				}
				kept = append(kept, b)
			}
			out = kept
		}
	}
	slices.SortFunc(out, func(x, y [2][]int64) int {
		return cmp.Or(slices.Compare(x[0], y[0]), slices.Compare(x[1], y[1]))
	})
	return scale, out
}

func sameExcept(x, y [2][]int64, j int) bool {
	for i := range x[0] {
		if i != j && (x[0][i] != y[0][i] || x[1][i] != y[1][i]) {
			return false
		}
	}
	return true
}

// PavingLeaf is a leaf of a paving's tree as a box of parameter values, with
// its class (claims.PaveInside, PaveOutside or PaveUndecided) and its place
// on the dyadic grid of the paved box.
type PavingLeaf struct {
	Class  byte
	Lo, Hi []*big.Rat
	poly.DyadicBox
}

// Leaves returns the leaves of a paving's tree as boxes of parameter values,
// in depth-first order. It returns an error if the box, the resolution or
// the tree is malformed; the classes are as written (checker.Verify checks
// them).
func Leaves(p *claims.Paving) ([]PavingLeaf, error) {
	sides, _, err := p.Sides()
	if err != nil {
		return nil, err
	}
	var out []PavingLeaf
	err = p.Walk(func(code byte, g poly.DyadicBox) {
		lf := PavingLeaf{Class: code, DyadicBox: g}
		for i, side := range sides {
			lf.Lo = append(lf.Lo, poly.Corner(side, g.A[i], g.K[i]))
			lf.Hi = append(lf.Hi, poly.Corner(side, g.A[i]+1, g.K[i]))
		}
		out = append(out, lf)
	})
	return out, err
}
