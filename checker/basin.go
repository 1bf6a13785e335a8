package checker

import (
	"errors"
	"fmt"
	"math/big"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

// sublevelBasin: a compact positively invariant set on which V̇ < 0 except at
// the equilibrium lies in the equilibrium's region of attraction (Lyapunov's
// direct method with LaSalle's invariance principle; Khalil, Nonlinear
// Systems, §8.2). Let K be the component of {V ≤ c} that holds x*. The
// equilibrium lies inside the box and V(x*) < c, while V > c on every
// box along the boundary, so the connected K never meets the boundary: K is
// closed and inside the box, hence compact. Every point of K lies in a box
// that is not an O box, so V̇ < 0 on K but at x*. A solution that starts in K
// cannot leave it: V does not grow on it, and a continuous path that stays in
// {V ≤ c} stays in one component. Solutions in K therefore exist for all
// time and tend to the largest invariant set in {V̇ = 0} ∩ K, which is {x*}.
// With free parameters the argument runs for each value p in their box Q on
// its own: the leaves whose parameter sides hold p cover the state box, so
// the claims of those leaves are the claims above for V(·, p), with the
// equilibrium and the level the same for every p. An I box is proven by the
// centred form of −V̇ > 0 on it, or by −V̇ = yᵀ(G(p) + M(y, p))y
// (y = x − x*) with every matrix of Enclose(G) + Enclose(M) on the box
// positive definite (poly.PositiveNearZero).
func (c *run) sublevelBasin(cl claims.Claim) bool {
	b := cl.(*claims.SublevelBasin)
	n := len(c.m.States)
	const what = "sublevel-basin"
	if !c.once(what) || !c.add(what, c.derived && !c.m.Discrete && c.v.IsPoly() && c.vdot.IsPoly() && c.basin == "",
		"follows V̇ in continuous time, V and V̇ polynomials, one basin claim") {
		return false
	}
	level, ok := poly.ParseRat(b.Level)
	if !c.add(what, ok && level.RatString() == b.Level && level.Sign() > 0, "the level %q is a canonical rational > 0", b.Level) {
		return false
	}
	res, ok := claims.ResolutionLevel(b.Resolution)
	if !c.add(what, ok, "the resolution %q is 2^-L with 0 ≤ L ≤ %d", b.Resolution, claims.MaxPavingLevel) {
		return false
	}
	sides, at, err := c.basinBox(b)
	if !c.add(what, err == nil, "the box is well formed and holds the equilibrium inside%s", errSuffix(err)) {
		return false
	}
	vars := make([]int, len(sides))
	for i := range vars {
		vars[i] = i
	}
	vc := new(poly.Poly).Sub(c.v.Num, poly.Const(c.r, level))
	walk, err := poly.NewFormWalk([]*poly.Poly{vc, new(poly.Poly).Neg(c.vdot.Num)}, vars, sides)
	if !c.add(what, err == nil, "V − level and −V̇ have centred forms on the box%s", errSuffix(err)) {
		return false
	}
	near := c.m.Shift(c.vdot).Neg().Num // −V̇ at x* + y, in y
	count := 0
	err = claims.WalkDirected(b.Tree, len(sides), res, func(code byte, g poly.DyadicBox) error {
		fs := walk.At(g)
		if count++; count%4096 == 0 && c.ctx.Err() != nil {
			return c.ctx.Err()
		}
		switch code {
		case claims.PaveSplit:
			return nil
		case claims.PaveOutside:
			if !fs[0].PositiveOn(poly.OpenFaces{}) {
				return fmt.Errorf("an O box at depth %d is not proven to have V > level", g.Depth())
			}
			return nil
		case claims.PaveInside:
		default:
			return fmt.Errorf("box %d has the code %q, not S, I or O", count, code)
		}
		if g.OnEdgeFirst(n) {
			return fmt.Errorf("an I box at depth %d touches the boundary", g.Depth())
		}
		if fs[1].PositiveOn(poly.OpenFaces{}) {
			return nil
		}
		y := g.Sides(sides)
		for i := range at {
			y[i] = y[i].Sub(poly.Point(at[i]))
		}
		if !near.PositiveNearZero(y) {
			return fmt.Errorf("an I box at depth %d is not proven to have V̇ < 0 but at the equilibrium", g.Depth())
		}
		return nil
	})
	if !c.add(what, err == nil, "every box of the tree has its class by the exact test%s", errSuffix(err)) {
		return false
	}
	c.basin = b.Level
	return true
}

// basinBox reads the box of a basin claim, followed by the free
// parameters' ranges, and the equilibrium, which must be a rational point
// inside it, the same for every parameter value, where V is below the level.
func (c *run) basinBox(b *claims.SublevelBasin) ([]poly.Interval, []*big.Rat, error) {
	n := len(c.m.States)
	sides, err := b.Sides(n)
	if err != nil {
		return nil, nil, err
	}
	at, err := c.m.ConstantAt()
	if err != nil {
		return nil, nil, err
	}
	pt := make([]poly.Interval, n)
	for i := range n {
		pt[i] = poly.Point(at[i])
		if sides[i].Lo.Value.Cmp(at[i]) >= 0 || at[i].Cmp(sides[i].Hi.Value) >= 0 {
			return nil, nil, fmt.Errorf("the equilibrium is not inside side %d", i+1)
		}
	}
	for i, s := range c.m.Box()[n:] {
		if !s.Compact() {
			return nil, nil, fmt.Errorf("the range of parameter %s is not closed and bounded", c.r.Name(n+i))
		}
		sides = append(sides, s)
	}
	if level, _ := poly.ParseRat(b.Level); c.v.Num.Enclose(append(pt, sides[n:]...)).Hi.Value.Cmp(level) >= 0 {
		return nil, nil, errors.New("V at the equilibrium is not below the level")
	}
	return sides, at, nil
}
