package claims

import (
	"fmt"
	"math/big"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/poly"
)

// The leaves of a tree with directed splits partition the box: their
// volumes 2^−ΣK add up to 1 and no two overlap (common practice: halving a
// box along any coordinate splits it into two boxes that tile it). Random
// trees over three coordinates, resolution 2^−4.
func TestWalkDirectedPartitions(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 5))
	const n, level = 3, 4
	for range 200 {
		var b strings.Builder
		var grow func(k []int, depth int)
		grow = func(k []int, depth int) {
			var can []int
			for i := range n {
				if k[i] < level {
					can = append(can, i)
				}
			}
			if len(can) == 0 || rng.IntN(3) == 0 || depth > 8 {
				b.WriteByte("IO"[rng.IntN(2)])
				return
			}
			dim := can[rng.IntN(len(can))]
			if dim == poly.SplitDim(k) && rng.IntN(2) == 0 {
				b.WriteByte(PaveSplit)
			} else {
				b.WriteByte(byte(PaveSplitAlong + dim))
			}
			k2 := append([]int(nil), k...)
			k2[dim]++
			grow(k2, depth+1)
			grow(k2, depth+1)
		}
		grow(make([]int, n), 0)
		var leaves []poly.DyadicBox
		err := WalkDirected(b.String(), n, level, func(code byte, g poly.DyadicBox) error {
			if code != PaveSplit {
				leaves = append(leaves, g)
			}
			return nil
		})
		if err != nil {
			t.Fatalf("%s: %v", b.String(), err)
		}
		vol := new(big.Rat)
		for a, g := range leaves {
			vol.Add(vol, new(big.Rat).SetFrac(big.NewInt(1), new(big.Int).Lsh(big.NewInt(1), uint(g.Depth()))))
			for _, h := range leaves[a+1:] {
				if overlap(g, h) {
					t.Fatalf("%s: leaves %v and %v overlap", b.String(), g, h)
				}
			}
		}
		if vol.Cmp(big.NewRat(1, 1)) != 0 {
			t.Fatalf("%s: the leaves' volumes add up to %s", b.String(), vol.RatString())
		}
	}
}

// overlap reports whether two dyadic boxes share interior points: along
// every coordinate one interval holds the other (dyadic intervals are
// nested or disjoint).
func overlap(g, h poly.DyadicBox) bool {
	for i := range g.A {
		a, b := g, h
		if a.K[i] > b.K[i] {
			a, b = b, a
		}
		if b.A[i]>>(b.K[i]-a.K[i]) != a.A[i] {
			return false
		}
	}
	return true
}

// The grammar: a directed split at the resolution along its coordinate, a
// coordinate beyond the box's and trailing data are refused; WalkPaving
// knows no directed splits; S-only trees walk alike in both.
func TestWalkDirectedGrammar(t *testing.T) {
	none := func(byte, poly.DyadicBox) error { return nil }
	for _, c := range []struct {
		tree, want string
		n, level   int
	}{
		{"aaIOO", "split along coordinate 1 at the resolution", 2, 1},
		{"cIO", "unknown code", 2, 3},
		{"bIOI", "data after the end", 2, 3},
		{"bI", "ends early", 2, 3},
	} {
		if err := WalkDirected(c.tree, c.n, c.level, none); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: %v, want an error about %q", c.tree, err, c.want)
		}
	}
	if err := WalkPaving("aIO", 2, 3, none); err == nil || !strings.Contains(err.Error(), "unknown code") {
		t.Errorf("WalkPaving read a directed split: %v", err)
	}
	var p, d []poly.DyadicBox
	WalkPaving("SSIOSIO", 2, 3, func(_ byte, g poly.DyadicBox) error { p = append(p, g); return nil })
	WalkDirected("SSIOSIO", 2, 3, func(_ byte, g poly.DyadicBox) error { d = append(d, g); return nil })
	if len(p) != len(d) || len(p) != 7 {
		t.Fatalf("%d and %d boxes, want 7", len(p), len(d))
	}
	for i := range p {
		if fmt.Sprint(p[i]) != fmt.Sprint(d[i]) {
			t.Errorf("box %d: %v and %v", i, p[i], d[i])
		}
	}
}
