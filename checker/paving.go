package checker

import (
	"fmt"
	"maps"
	"slices"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

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
func (c *run) paving(cl claims.Claim) bool {
	pv := cl.(*claims.Paving)
	used, ok := c.conditionsUsed("paving")
	if !ok {
		return false
	}
	sides, open, err := pv.Sides()
	if !c.add("paving", err == nil, "the paved box is well formed%s", errSuffix(err)) {
		return false
	}
	level, ok := claims.ResolutionLevel(pv.Resolution)
	if !c.add("paving", ok, "the resolution %q is 2^-L with 0 ≤ L ≤ %d", pv.Resolution, claims.MaxPavingLevel) {
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
		holds: count[claims.PaveInside] > 0 || (separable && !productEmpty),
		fails: count[claims.PaveOutside] > 0 || (separable && productFails),
		all:   cover && (separable && productAll || !separable && count[claims.PaveOutside] == 0 && count[claims.PaveUndecided] == 0),
		none:  cover && (separable && productEmpty || !separable && count[claims.PaveInside] == 0 && count[claims.PaveUndecided] == 0),
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
	err = claims.WalkPaving(tree, len(vars), level, func(code byte, g poly.DyadicBox) error {
		fs := walk.At(g)
		if code == claims.PaveSplit {
			return nil // a split box claims nothing; claims.WalkPaving checked its width
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
		case code == claims.PaveInside && !positive:
			bad = fmt.Errorf("an inside box at depth %d is not proven inside", g.Depth())
		case code == claims.PaveOutside && !nonPositive:
			bad = fmt.Errorf("an outside box at depth %d is not proven outside", g.Depth())
		case code == claims.PaveUndecided && (positive || nonPositive):
			bad = fmt.Errorf("an undecided box at depth %d is decided by the exact test", g.Depth())
		}
		return bad
	})
	return count, c.add("paving", err == nil, "every box of the tree has its class by the exact test%s", errSuffix(err))
}
