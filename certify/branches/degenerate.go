package branches

import (
	"context"
	"fmt"
	"math/big"
	"slices"

	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// Degeneracy is a place in the parameters' ranges where a condition
// c(p) ≠ 0 that the elimination divided by fails. The branches' formulas
// say nothing there: a branch may still pass through it, and equilibria
// that exist only there (where c = 0) are not among the branches.
type Degeneracy struct {
	// Cond is c; Param names its one free parameter (else "") and Value
	// is a root of c in that parameter's range (nil when c involves
	// several parameters).
	Cond  *poly.Poly
	Param string
	Value *poly.URoot
	// Equation: c was met as an equation in the parameters alone (the
	// equilibria of that case exist only where c = 0); otherwise the
	// elimination divided by c.
	Equation bool
	// Checked: the equilibria at Value were computed by the same
	// analysis with the parameter fixed there (a rational root only).
	// Found are they, in the ring of that analysis (Ring); OnBranch[i]
	// is the branch of Analysis.Branches whose formula takes that value
	// there, or −1 when none does: an equilibrium that exists only where
	// c = 0, as far as the formulas tell.
	Checked  bool
	Ring     *poly.Ring
	Found    []*Branch
	OnBranch []int
	// Note says why nothing was computed (an irrational root, several
	// parameters, no closed form there).
	Note string
}

// OffBranches reports an equilibrium found at the value that is on no
// branch.
func (d *Degeneracy) OffBranches() bool { return slices.Contains(d.OnBranch, -1) }

// degeneracies finds, for every condition of the branches, where it fails
// in the parameters' ranges, and analyses the model there.
func degeneracies(ctx context.Context, m *model.Model, an *Analysis, opts Options) error {
	var conds []*poly.Poly
	seen := map[string]bool{}
	equation := map[*poly.Poly]bool{}
	for _, b := range an.Branches {
		for _, c := range b.Nonzero {
			if k := c.String(); !seen[k] && !c.IsConst() {
				seen[k] = true
				conds = append(conds, c)
			}
		}
	}
	for _, c := range an.further {
		if k := c.String(); !seen[k] {
			seen[k] = true
			conds = append(conds, c)
			equation[c] = true
		}
	}
	free := m.FreeParams()
	for _, c := range conds {
		if err := ctx.Err(); err != nil {
			return err
		}
		var used []model.Param
		for _, p := range free {
			if i, _ := m.Ring.Index(p.Name); c.UsesVar(i) {
				used = append(used, p)
			}
		}
		if len(used) != 1 {
			if len(used) > 1 && !mayVanish(m, c, used) {
				continue
			}
			an.Degenerate = append(an.Degenerate, Degeneracy{Cond: c, Equation: equation[c], Note: "it may vanish within the parameters' ranges; fix the parameters at such a point with --set to see the equilibria there"})
			continue
		}
		p := used[0]
		pi, _ := m.Ring.Index(p.Name)
		u, ok := c.Univariate(pi)
		if !ok {
			continue
		}
		for _, r := range u.IsolateRoots() {
			if !inRange(r, p.Range) {
				continue
			}
			d := Degeneracy{Cond: c, Param: p.Name, Value: &r, Equation: equation[c]}
			if r.Exact == nil {
				d.Note = "an irrational value: fix the parameter near it with --set to see the equilibria there"
			} else if err := d.analyse(ctx, m, an, p.Name, r.Exact, opts); err != nil {
				return err
			}
			an.Degenerate = append(an.Degenerate, d)
		}
	}
	return nil
}

// mayVanish reports that c may vanish on the box of the parameters' ranges:
// false only when every range is bounded and c's exact centred form on the
// box has one sign.
func mayVanish(m *model.Model, c *poly.Poly, used []model.Param) bool {
	var vars []int
	var sides []poly.Interval
	for _, p := range used {
		if p.Range.Lo.Inf != 0 || p.Range.Hi.Inf != 0 {
			return true
		}
		i, _ := m.Ring.Index(p.Name)
		vars, sides = append(vars, i), append(sides, p.Range)
	}
	f, err := poly.NewCenteredForm(c, vars, sides)
	if err != nil {
		return true
	}
	iv := f.Enclose(poly.OpenFaces{})
	return !(iv.Lo.Value.Sign() > 0 || iv.Hi.Value.Sign() < 0)
}

// analyse fixes the parameter at v, computes the equilibria there and
// matches each with the branches' values at v.
func (d *Degeneracy) analyse(ctx context.Context, m *model.Model, an *Analysis, name string, v *big.Rat, opts Options) error {
	fixed, err := model.FixParams(m, []model.Setting{{Name: name, Value: v}})
	if err != nil {
		d.Note = fmt.Sprintf("the model is not defined there (%v)", err)
		return nil
	}
	sub := opts
	sub.noClassify, sub.noDegenerate = true, true
	at, err := Analyze(ctx, fixed, sub)
	if err != nil {
		if ctx.Err() != nil {
			return err
		}
		d.Note = fmt.Sprintf("the analysis there failed: %v", err)
		return nil
	}
	if !at.ClosedForm {
		d.Note = "no closed form there: fix the parameter there with --set to find the equilibria"
		return nil
	}
	d.Checked, d.Ring, d.Found = true, fixed.Ring, at.Branches
	pi, _ := m.Ring.Index(name)
	relabel := make([]int, m.Ring.NumVars())
	for i := range relabel {
		relabel[i] = -1
		if j, ok := fixed.Ring.Index(m.Ring.Name(i)); ok {
			relabel[i] = j
		}
	}
	move := func(f poly.RatFunc) (poly.RatFunc, bool) {
		g, err := f.EvalVars(map[int]*big.Rat{pi: v})
		if err != nil {
			return poly.RatFunc{}, false
		}
		out := poly.FromPoly(g.Num.Relabel(fixed.Ring, relabel))
		for _, df := range g.Den {
			out.Den = append(out.Den, poly.DenFactor{P: df.P.Relabel(fixed.Ring, relabel), Mult: df.Mult})
		}
		return out, true
	}
	// Each branch's coordinates at v, where its formula is defined there.
	at0 := make([][]Surd, len(an.Branches))
	for k, b := range an.Branches {
		var w *poly.RatFunc
		if b.W != nil {
			wv, ok := move(*b.W)
			if !ok {
				continue
			}
			w = &wv
		}
		var xs []Surd
		for _, c := range b.Coords {
			a, ok1 := move(c.A)
			bb, ok2 := move(c.B)
			if !ok1 || !ok2 {
				xs = nil
				break
			}
			xs = append(xs, Surd{A: a, B: bb, W: w})
		}
		if len(xs) == len(b.Coords) && len(b.Free) == 0 {
			at0[k] = xs
		}
	}
	for _, f := range at.Branches {
		on := -1
		for k, xs := range at0 {
			if xs != nil && f.Isolated() && sameValue(xs, f.Coords) {
				on = k
				break
			}
		}
		d.OnBranch = append(d.OnBranch, on)
	}
	return nil
}

// sameValue compares two points whose coordinates are surds: exactly when
// every coordinate is a constant (a = a′ and b²w = b′²w′ with b, b′ of one
// sign), structurally otherwise.
func sameValue(xs, ys []Surd) bool {
	for i := range xs {
		if !sameSurd(xs[i], ys[i]) {
			return false
		}
	}
	return true
}

func sameSurd(x, y Surd) bool {
	if !x.A.Equal(y.A) {
		return false
	}
	xb, yb := x.B, y.B
	if x.W == nil || xb.IsZero() {
		xb = zeroRF(x.Ring())
	}
	if y.W == nil || yb.IsZero() {
		yb = zeroRF(y.Ring())
	}
	if xb.IsZero() || yb.IsZero() {
		// b√w = 0 on one side: equal iff the other's b·√w is zero too.
		return surdPartZero(xb, x.W) && surdPartZero(yb, y.W)
	}
	if x.W.Equal(*y.W) {
		return xb.Equal(yb)
	}
	// Constant values: b²w = b′²w′ with one sign.
	x2 := xb.Mul(xb).Mul(*x.W)
	y2 := yb.Mul(yb).Mul(*y.W)
	if !x2.Equal(y2) {
		return false
	}
	if xb.IsPoly() && yb.IsPoly() && xb.Num.IsConst() && yb.Num.IsConst() {
		return xb.Num.ConstTerm().Sign() == yb.Num.ConstTerm().Sign()
	}
	return false
}

func surdPartZero(b poly.RatFunc, w *poly.RatFunc) bool {
	return b.IsZero() || (w != nil && w.IsZero())
}
