package claims

import (
	"errors"
	"fmt"
	"math/big"

	"github.com/lyacert/lyacert/poly"
)

// Codes of a paving's tree, one letter a box.
const (
	PaveSplit     = 'S' // the box is halved; its lower half, then its upper half follow
	PaveInside    = 'I' // every condition is > 0 on the box
	PaveOutside   = 'O' // some condition is ≤ 0 on the whole box
	PaveUndecided = 'U' // neither is proven, and the box is at the resolution
)

// MaxPavingLevel bounds the resolution of a paving: the finest box side is
// at least 2^-MaxPavingLevel of the side of the paved box.
const MaxPavingLevel = 50

// Paving is a set-inversion paving of a box of parameter values (Moore 1966;
// Jaulin & Walter 1993, SIVIA): the box is bisected recursively, and every
// part is classified by exact enclosures of the conditions (each must be
// > 0) as inside (every condition > 0 on all of it), outside (some condition
// ≤ 0 on all of it) or undecided (at the resolution, neither proven).
//
// The classification is canonical: Box has one side per parameter of
// Params (canonical rational ends in the allowed range, open exactly where
// the range is); Resolution is 2^-L, and a box is halved along
// poly.SplitDim while a side is wider than 2^-L of Box's, lower half first;
// Tree lists the boxes depth first, one code each, so every box follows from
// Box and its position. A split box is wider than the resolution, an
// undecided one at it and decided by neither test; the test of a box is the
// centred form of each condition on it (faces on an open end excluded).
type Paving struct {
	Params     []string   `json:"params"`
	Box        []Interval `json:"box"`
	Resolution string     `json:"resolution"`
	Tree       string     `json:"tree"`
	// Product, when every condition involves at most one parameter, is the
	// region within Box as one one-parameter region per paved parameter,
	// each over its side of Box.
	Product []SturmRegion `json:"product"`
}

func (*Paving) Rule() string { return "paving" }

// ResolutionLevel returns L for a resolution written canonically as 2^-L
// ("1", "1/2", "1/4", ...) with 0 ≤ L ≤ MaxPavingLevel.
func ResolutionLevel(s string) (int, bool) {
	q, ok := poly.ParseRat(s)
	if !ok || q.RatString() != s || q.Num().Cmp(big.NewInt(1)) != 0 {
		return 0, false
	}
	d := q.Denom()
	l := d.BitLen() - 1
	if l > MaxPavingLevel || d.TrailingZeroBits() != uint(l) {
		return 0, false
	}
	return l, true
}

// PaveSplitAlong is the code of a box halved along coordinate k (k < 26,
// at most MaxDirected coordinates): PaveSplitAlong + k, a lower-case letter,
// in the trees WalkDirected reads.
const (
	PaveSplitAlong = 'a'
	MaxDirected    = 26
)

// WalkPaving calls node for every box of the tree in depth-first order and
// checks the tree's shape: known codes, a split only above the resolution
// level, an undecided box only at it, and nothing after the tree.
func WalkPaving(tree string, n, level int, node func(code byte, g poly.DyadicBox) error) error {
	return walkTree(tree, n, level, false, node)
}

// WalkDirected is WalkPaving for trees whose splits may also name their
// coordinate: the code PaveSplitAlong + k halves the box along coordinate
// k, allowed while the box has been halved fewer than level times along
// it; node then sees the code PaveSplit. S still halves along
// poly.SplitDim. Every tree is a partition of the box into dyadic boxes,
// whatever the coordinates chosen.
func WalkDirected(tree string, n, level int, node func(code byte, g poly.DyadicBox) error) error {
	return walkTree(tree, n, level, true, node)
}

func walkTree(tree string, n, level int, directed bool, node func(code byte, g poly.DyadicBox) error) error {
	pos := 0
	var rec func(g poly.DyadicBox) error
	rec = func(g poly.DyadicBox) error {
		if pos >= len(tree) {
			return errors.New("the tree ends early")
		}
		code := tree[pos]
		pos++
		dim := -1
		switch k := int(code) - PaveSplitAlong; {
		case directed && k >= 0 && k < min(n, MaxDirected):
			if g.K[k] >= level {
				return fmt.Errorf("box %d is split along coordinate %d at the resolution", pos, k+1)
			}
			code, dim = PaveSplit, k
		case code == PaveSplit:
			if g.MinLevel() >= level {
				return fmt.Errorf("box %d is split but is at the resolution", pos)
			}
			dim = poly.SplitDim(g.K)
		case code == PaveUndecided:
			if g.MinLevel() < level {
				return fmt.Errorf("box %d is undecided but wider than the resolution", pos)
			}
		case code == PaveInside || code == PaveOutside:
		default:
			return fmt.Errorf("box %d has the unknown code %q", pos, code)
		}
		if err := node(code, g); err != nil {
			return err
		}
		if code != PaveSplit {
			return nil
		}
		lo, hi := g.Halves(dim)
		if err := rec(lo); err != nil {
			return err
		}
		return rec(hi)
	}
	if err := rec(poly.DyadicBox{A: make([]int64, n), K: make([]int, n)}); err != nil {
		return err
	}
	if pos != len(tree) {
		return errors.New("data after the end of the tree")
	}
	return nil
}

// Sides reads the box of a paving, one interval per parameter (bounded,
// canonical rational ends, lo < hi), and its faces on open ends.
func (p *Paving) Sides() ([]poly.Interval, poly.OpenFaces, error) {
	var open poly.OpenFaces
	if len(p.Box) != len(p.Params) || len(p.Params) == 0 || len(p.Params) > poly.MaxCenteredDims {
		return nil, open, fmt.Errorf("the box has %d sides for %d parameters", len(p.Box), len(p.Params))
	}
	out := make([]poly.Interval, len(p.Box))
	for i, s := range p.Box {
		lo, ok1 := poly.ParseRat(s.Lo)
		hi, ok2 := poly.ParseRat(s.Hi)
		if !ok1 || !ok2 || lo.RatString() != s.Lo || hi.RatString() != s.Hi || s.LoPoly != "" || s.HiPoly != "" ||
			s.LoIsolating != nil || s.HiIsolating != nil || lo.Cmp(hi) >= 0 {
			return nil, open, fmt.Errorf("side %d of the box is not a bounded interval with canonical rational ends", i+1)
		}
		out[i] = poly.Interval{Lo: poly.Bound{Value: lo, Open: !s.LoClosed}, Hi: poly.Bound{Value: hi, Open: !s.HiClosed}}
		if !s.LoClosed {
			open.Lo |= 1 << i
		}
		if !s.HiClosed {
			open.Hi |= 1 << i
		}
	}
	return out, open, nil
}

// Walk calls leaf for every leaf of the tree in depth-first order, with its
// class and its place on the dyadic grid of the box; it returns an error if
// the box, the resolution or the tree is malformed (the classes are taken as
// written: Verify checks them).
func (p *Paving) Walk(leaf func(code byte, g poly.DyadicBox)) error {
	sides, _, err := p.Sides()
	if err != nil {
		return err
	}
	level, ok := ResolutionLevel(p.Resolution)
	if !ok {
		return fmt.Errorf("resolution %q is not 2^-L with 0 ≤ L ≤ %d", p.Resolution, MaxPavingLevel)
	}
	return WalkPaving(p.Tree, len(sides), level, func(code byte, g poly.DyadicBox) error {
		if code != PaveSplit {
			leaf(code, g)
		}
		return nil
	})
}
