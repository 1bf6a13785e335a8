package checker

import (
	"errors"
	"fmt"
	"maps"
	"math/big"
	"slices"

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
	q, ok := parseRat(s)
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

// walkPaving calls node for every box of the tree in depth-first order and
// checks the tree's shape: known codes, a split only above the resolution
// level, an undecided box only at it, and nothing after the tree.
func walkPaving(tree string, n, level int, node func(code byte, g poly.DyadicBox) error) error {
	pos := 0
	var rec func(g poly.DyadicBox) error
	rec = func(g poly.DyadicBox) error {
		if pos >= len(tree) {
			return errors.New("the tree ends early")
		}
		code := tree[pos]
		pos++
		switch code {
		case PaveSplit:
			if g.MinLevel() >= level {
				return fmt.Errorf("box %d is split but is at the resolution", pos)
			}
		case PaveUndecided:
			if g.MinLevel() < level {
				return fmt.Errorf("box %d is undecided but wider than the resolution", pos)
			}
		case PaveInside, PaveOutside:
		default:
			return fmt.Errorf("box %d has the unknown code %q", pos, code)
		}
		if err := node(code, g); err != nil {
			return err
		}
		if code != PaveSplit {
			return nil
		}
		lo, hi := g.Halves(poly.SplitDim(g.K))
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

// sides reads the box of a paving: bounded, canonical rational ends, lo < hi.
func (p *Paving) sides() ([]poly.Interval, poly.OpenFaces, error) {
	var open poly.OpenFaces
	if len(p.Box) != len(p.Params) || len(p.Params) == 0 || len(p.Params) > poly.MaxCenteredDims {
		return nil, open, fmt.Errorf("the box has %d sides for %d parameters", len(p.Box), len(p.Params))
	}
	out := make([]poly.Interval, len(p.Box))
	for i, s := range p.Box {
		lo, ok1 := parseRat(s.Lo)
		hi, ok2 := parseRat(s.Hi)
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

// paving: set inversion (Moore 1966; Jaulin & Walter 1993). The box lies in
// the allowed ranges and the conditions involve paved parameters only; every
// box of the tree has its class by the exact centred form of each condition
// (Ratschek & Rokne 1984); with conditions of one parameter each, the
// product of one-parameter regions (Sturm) gives the region in closed form.
// The conditions hold everywhere when the box covers the allowed ranges and
// the product holds throughout (every box inside, without one); they fail
// everywhere when it covers them and the product is empty (every box
// outside); else they hold on part of the box when some box or piece holds
// and some fails.
func (c *run) paving(cl Claim) bool {
	pv := cl.(*Paving)
	used, ok := c.conditionsUsed("paving")
	if !ok {
		return false
	}
	sides, open, err := pv.sides()
	if !c.add("paving", err == nil, "the paved box is well formed%s", errSuffix(err)) {
		return false
	}
	level, ok := ResolutionLevel(pv.Resolution)
	if !c.add("paving", ok, "the resolution %q is 2^-L with 0 ≤ L ≤ %d", pv.Resolution, MaxPavingLevel) {
		return false
	}
	vars := make([]int, len(pv.Params))
	covered := map[int]bool{}
	for i, name := range pv.Params {
		p, ok := c.m.Param(name)
		v, isVar := c.r.Index(name)
		if !c.add("paving", ok && isVar && p.Fixed == nil && !slices.Contains(vars[:i], v),
			"%s is a free parameter, paved once", name) {
			return false
		}
		vars[i] = v
		if !c.add("paving", sides[i].WithinOpenWhere(p.Range), "the side %s of %s lies in its range %s, open only where the range is", sides[i], name, p.Range) {
			return false
		}
		covered[v] = sides[i].SameBounded(p.Range)
	}
	for _, v := range slices.Sorted(maps.Keys(used)) { // sorted: the same record every time
		if !c.add("paving", slices.Contains(vars, v), "the conditions involve paved parameters only (%s)", c.r.Name(v)) {
			return false
		}
	}
	count, ok := c.pavingTree(pv.Tree, vars, sides, open, level)
	if !ok {
		return false
	}
	// The product form.
	separable := true
	for _, q := range c.conds {
		separable = separable && len(q.Num.VarsUsed()) <= 1
	}
	if !c.add("product", separable == (len(pv.Product) > 0), "a product form is given exactly when every condition involves at most one parameter") {
		return false
	}
	productAll, productEmpty, productFails := true, false, false
	if separable {
		if !c.add("product", len(pv.Product) == len(vars), "one factor per paved parameter") {
			return false
		}
		for k, v := range vars {
			f := &pv.Product[k]
			if !c.add("product", f.Param == pv.Params[k], "factor %d is a one-parameter region of %s", k+1, pv.Params[k]) {
				return false
			}
			var conds []poly.Univariate
			for _, q := range c.conds {
				if u, ok := q.Num.Univariate(v); ok {
					conds = append(conds, u)
				}
			}
			holds, fails, _, ok := c.regionPieces(f, v, conds, sides[k])
			if !ok {
				return false
			}
			productAll = productAll && !fails
			productEmpty = productEmpty || !holds
			productFails = productFails || fails
		}
	}
	cover := true
	for v := range used {
		cover = cover && covered[v]
	}
	c.seen["paving"] = true
	c.region = &regionFacts{
		used:  used,
		holds: count[PaveInside] > 0 || (separable && !productEmpty),
		fails: count[PaveOutside] > 0 || (separable && productFails),
		all:   cover && (separable && productAll || !separable && count[PaveOutside] == 0 && count[PaveUndecided] == 0),
		none:  cover && (separable && productEmpty || !separable && count[PaveInside] == 0 && count[PaveUndecided] == 0),
	}
	return true
}

// pavingTree checks the class of every box of the tree exactly, walking the
// tree with the centred forms of the conditions (poly.FormWalk).
func (c *run) pavingTree(tree string, vars []int, sides []poly.Interval, open poly.OpenFaces, level int) (map[byte]int, bool) {
	count := map[byte]int{}
	ps := make([]*poly.Poly, len(c.conds))
	for j, q := range c.conds {
		ps[j] = q.Num
	}
	walk, err := poly.NewFormWalk(ps, vars, sides)
	if !c.add("paving", err == nil, "the conditions have centred forms on the box%s", errSuffix(err)) {
		return nil, false
	}
	var bad error
	err = walkPaving(tree, len(vars), level, func(code byte, g poly.DyadicBox) error {
		fs := walk.At(g)
		if code == PaveSplit {
			return nil // a split box claims nothing; walkPaving checked its width
		}
		if count[code]++; count[code]%4096 == 0 && c.ctx.Err() != nil {
			return c.ctx.Err()
		}
		faces := g.OpenFacesOn(open)
		positive, nonPositive := true, false
		for _, f := range fs {
			positive = positive && f.PositiveOn(faces)
			nonPositive = nonPositive || f.NonPositive()
		}
		switch {
		case code == PaveInside && !positive:
			bad = fmt.Errorf("an inside box at depth %d is not proven inside", g.Depth())
		case code == PaveOutside && !nonPositive:
			bad = fmt.Errorf("an outside box at depth %d is not proven outside", g.Depth())
		case code == PaveUndecided && (positive || nonPositive):
			bad = fmt.Errorf("an undecided box at depth %d is decided by the exact test", g.Depth())
		}
		return bad
	})
	return count, c.add("paving", err == nil, "every box of the tree has its class by the exact test%s", errSuffix(err))
}

// Walk calls leaf for every leaf of the tree in depth-first order, with its
// class and its place on the dyadic grid of the box; it returns an error if
// the box, the resolution or the tree is malformed (the classes are taken as
// written: Verify checks them).
func (p *Paving) Walk(leaf func(code byte, g poly.DyadicBox)) error {
	sides, _, err := p.sides()
	if err != nil {
		return err
	}
	level, ok := ResolutionLevel(p.Resolution)
	if !ok {
		return fmt.Errorf("resolution %q is not 2^-L with 0 ≤ L ≤ %d", p.Resolution, MaxPavingLevel)
	}
	return walkPaving(p.Tree, len(sides), level, func(code byte, g poly.DyadicBox) error {
		if code != PaveSplit {
			leaf(code, g)
		}
		return nil
	})
}

// Sides returns the paved box, one interval per parameter.
func (p *Paving) Sides() ([]poly.Interval, error) {
	s, _, err := p.sides()
	return s, err
}
