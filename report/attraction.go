package report

import (
	"fmt"
	"math"
	"math/big"
	"strings"

	"github.com/lyacert/lyacert/certify"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// attractionView is the region-of-attraction section of a certificate with
// a sublevel-basin claim: what the level certifies, how, a caution, and
// for two states a picture drawn from the certificate alone.
type attractionView struct {
	Text    rich
	Method  rich
	Caution string
	Caption rich
	// Note replaces the picture when it is not drawn (more than two states,
	// or a Markdown or LaTeX report written without a file beside it).
	Note   string
	SVG    string // HTML: the drawing inline
	Figure string // Markdown and LaTeX: the drawing's file beside the report
	scene  *basinScene
}

// attractionOf presents the certificate's sublevel-basin or
// sublevel-sprocedure claim, which checker.Verify has accepted (res.Basin
// is its level), or returns nil.
func (b *builder) attractionOf(res checker.Outcome) (*attractionView, error) {
	var cl *claims.SublevelBasin
	var sp *claims.SublevelSProcedure
	for _, c := range b.doc.Claims {
		switch c := c.(type) {
		case *claims.SublevelBasin:
			cl = c
		case *claims.SublevelSProcedure:
			sp = c
		}
	}
	if cl == nil && sp == nil || res.Basin == "" || b.doc.V == "" {
		return nil, nil
	}
	m := b.m
	level, ok := new(big.Rat).SetString(res.Basin)
	if !ok {
		return nil, fmt.Errorf("reading the level %q from the certificate", res.Basin)
	}
	v, err := b.parse(b.doc.V)
	if err != nil {
		return nil, err
	}
	vdot, err := b.parse(b.doc.Vdot)
	if err != nil {
		return nil, err
	}
	cSym := symbol{"c", "<mi>c</mi>"}
	set := symbol{`\{x : V(x) \le c\}`, mrow(mo("{") + "<mi>x</mi>" + mo(":") + "<mi>V</mi>" + mo("(") + "<mi>x</mi>" + mo(")") + mo("≤") + "<mi>c</mi>" + mo("}"))}
	lf, _ := level.Float64()
	a := &attractionView{}
	if sp != nil {
		return b.sprocedureView(a, sp, level, v, vdot, cSym, set)
	}
	a.Text = rich{"The kernel certifies the level ", relation{cSym, symEq, ratNode(level)}, fmt.Sprintf(" (about %.6g): every state in the connected component of the sublevel set ", lf),
		set, " that holds the equilibrium tends to the equilibrium. That component lies in the equilibrium's region of attraction; it is an estimate from inside, and the region itself may be larger."}
	var sides list
	var ends [][]*big.Rat
	for i, s := range m.States {
		lo, ok1 := new(big.Rat).SetString(cl.Lo[i])
		hi, ok2 := new(big.Rat).SetString(cl.Hi[i])
		if !ok1 || !ok2 {
			return nil, fmt.Errorf("reading side %d of the basin's box", i+1)
		}
		ends = append(ends, []*big.Rat{lo, hi})
		sides = append(sides, relation{name{s}, symIn, interval{lo: ratNode(lo), hi: ratNode(hi), loClosed: true, hiClosed: true}})
	}
	for _, p := range m.FreeParams() { // closed and bounded: the kernel accepted the claim
		sides = append(sides, relation{name{p.Name}, symIn, interval{lo: ratNode(p.Range.Lo.Value), hi: ratNode(p.Range.Hi.Value), loClosed: true, hiClosed: true}})
	}
	in, out := strings.Count(cl.Tree, string(claims.PaveInside)), strings.Count(cl.Tree, string(claims.PaveOutside))
	res0, _ := new(big.Rat).SetString(cl.Resolution)
	a.Method = rich{"Method: interval branch and bound. The box ", sides, " was bisected down to a resolution of ", ratNode(res0),
		fmt.Sprintf(" of its sides into %d boxes. On %d of them ", in+out, out), relation{vSym, symGreater, cSym},
		fmt.Sprintf(" was proven, on the other %d ", in), relation{vdotSym, symLess, zeroNode},
		" except at the equilibrium, by exact centred forms (Moore 1966) or, at the equilibrium, by bounding the higher terms of ", neg(vdotSym),
		" around its positive definite quadratic part; every box along the boundary has ", relation{vSym, symGreater, cSym},
		". So the component never reaches the boundary: it is compact and positively invariant, ", vdotSym,
		" is negative on it but at the equilibrium, and LaSalle's invariance principle gives convergence (Khalil, Nonlinear Systems, §8.2)."}
	a.Caution = "This is a property of the model stated above, with its parameters fixed as stated, not of the physical system: modelling error, disturbances, delay and saturation can make the true basin smaller than the certified set."
	if box := freeRanges(b.doc.Document); box != "" {
		a.Text = append(a.Text, " The level holds for "+forEvery+": "+box+"; the set itself changes with the parameters.")
		a.Caution = "This is a property of the model stated above, for every parameter value in its stated ranges, not of the physical system: modelling error, disturbances, delay and saturation can make the true basin smaller than the certified set."
		a.Note = "The set is not drawn: it changes with the parameters."
		return a, nil
	}
	if len(m.States) < 2 {
		a.Note = "The set is not drawn: a picture needs at least two states, the model has one."
		return a, nil
	}
	at, err := equilibriumOf(m.At)
	if err != nil {
		return nil, err
	}
	a.scene = newBasinScene(m.States, v.Num, vdot.Num, m.F, at, level, ends[:2], [2]int{0, 1})
	a.scene.title = fmt.Sprintf("Certified: {V ≤ %s} around the equilibrium", dec(level))
	a.caption()
	return a, nil
}

// equilibriumOf is the rational point of a basin certificate (the kernel
// accepted it).
func equilibriumOf(eqs []poly.RatFunc) ([]*big.Rat, error) {
	at := make([]*big.Rat, len(eqs))
	for i, e := range eqs {
		q, err := e.EvalVars(nil)
		if err != nil || !q.IsPoly() || !q.Num.IsConst() {
			return nil, fmt.Errorf("the equilibrium of a basin is not a rational point")
		}
		at[i] = q.Num.ConstTerm()
	}
	return at, nil
}

// sprocedureView is the section for a sublevel-sprocedure claim: all of
// {V ≤ c} is attracted; the picture's frame is the rays' extent of the set.
func (b *builder) sprocedureView(a *attractionView, sp *claims.SublevelSProcedure, level *big.Rat, v, vdot poly.RatFunc, cSym, set symbol) (*attractionView, error) {
	m := b.m
	lf, _ := level.Float64()
	a.Text = rich{"The kernel certifies the level ", relation{cSym, symEq, ratNode(level)}, fmt.Sprintf(" (about %.6g): every state of the sublevel set ", lf),
		set, " tends to the equilibrium. The whole set lies in the equilibrium's region of attraction; it is an estimate from inside, and the region itself may be larger."}
	mg, err := b.parse(sp.Margin)
	if err != nil {
		return nil, err
	}
	a.Method = rich{"Method: the S-procedure. An exact identity ", neg(vdotSym), " − m − s·(c − V) = σ holds in the states measured from the equilibrium, with the margin ",
		relation{symbol{"m", "<mi>m</mi>"}, symEq, polyNode(mg.Num)},
		fmt.Sprintf(" and s and σ sums of squares (Gram matrices of orders %d and %d factored exactly as LDLᵀ with D ≥ 0). On the set c − V ≥ 0, so ", len(sp.Multiplier.Basis), len(sp.Remainder.Basis)),
		neg(vdotSym), " is at least m, positive but at the equilibrium. V is positive definite and radially unbounded by its form, so the set is compact and positively invariant, and LaSalle's invariance principle gives convergence (Khalil, Nonlinear Systems, §8.2)."}
	a.Caution = "This is a property of the model stated above, with its parameters fixed as stated, not of the physical system: modelling error, disturbances, delay and saturation can make the true basin smaller than the certified set."
	if len(m.States) < 2 || len(m.FreeParams()) > 0 {
		a.Note = fmt.Sprintf("The set is not drawn: a picture needs at least two states and no free parameter, the model has %d states.", len(m.States))
		return a, nil
	}
	at, err := equilibriumOf(m.At)
	if err != nil {
		return nil, err
	}
	a.scene = newBasinScene(m.States, v.Num, vdot.Num, m.F, at, level, extentOf(v.Num, at, lf), [2]int{0, 1})
	a.scene.frame = "the set's extent"
	a.scene.title = fmt.Sprintf("Certified: {V ≤ %s}", dec(level))
	a.caption()
	return a, nil
}

// extentOf is a box around {V ≤ level} in the plane of the first two
// states (the others at the equilibrium), found along 720 rays from the
// equilibrium (float64, for the picture's frame only), a tenth wider.
func extentOf(v *poly.Poly, at []*big.Rat, level float64) [][]*big.Rat {
	n := len(at)
	fv := certify.NewFloatPoly(v, n)
	atf := make([]float64, n)
	for i := range n {
		atf[i], _ = at[i].Float64()
	}
	ext := make([]float64, 2)
	x := append([]float64(nil), atf...)
	for k := range 720 {
		th := 2 * math.Pi * float64(k) / 720
		u := []float64{math.Cos(th), math.Sin(th)}
		pt := func(t float64) []float64 {
			for i := range 2 {
				x[i] = atf[i] + t*u[i]
			}
			return x
		}
		lo, hi := 0.0, 1e-3
		for hi < 1e4 && fv.Eval(pt(hi)) < level {
			lo, hi = hi, 2*hi
		}
		for range 40 {
			if mid := (lo + hi) / 2; fv.Eval(pt(mid)) < level {
				lo = mid
			} else {
				hi = mid
			}
		}
		for i := range 2 {
			ext[i] = math.Max(ext[i], math.Abs(hi*u[i]))
		}
	}
	out := make([][]*big.Rat, 2)
	for i := range 2 {
		h := 1.1*ext[i] + 1e-9
		out[i] = []*big.Rat{new(big.Rat).SetFloat64(atf[i] - h), new(big.Rat).SetFloat64(atf[i] + h)}
	}
	return out
}

// caption is the picture's caption; with more than two states the
// picture is the slice in the plane of the first two, and the title says
// where the others are.
func (a *attractionView) caption() {
	cSym := symbol{"c", "<mi>c</mi>"}
	sc := a.scene
	slice := ""
	if len(sc.states) > 2 {
		var fixed []string
		for k, name := range sc.states[2:] {
			fixed = append(fixed, fmt.Sprintf("%s = %.6g", name, sc.at[k+2]))
		}
		sc.title += "\nslice " + strings.Join(fixed, ", ")
		sc.projected = true
		slice = fmt.Sprintf("The picture is the slice in the plane of %s and %s, the other states at the equilibrium (%s); trajectories are projected onto it. ", sc.states[0], sc.states[1], strings.Join(fixed, ", "))
	}
	frame := "the paved box (dotted)"
	if a.scene.frame != "" {
		frame = a.scene.frame + " (dotted)"
	}
	a.Caption = rich{slice + "The curve ", relation{vSym, symEq, cSym}, " (green) around the equilibrium bounds the certified set. Also shown: the curve ", relation{vdotSym, symEq, zeroNode},
		" (orange), " + frame + " and trajectories from just inside the set, integrated numerically. Both curves are drawn by sampling ", vSym, " and ", vdotSym,
		" on a grid of 300 by 300 points: the picture is a floating-point sketch, not a proof; the proof is the exact check of the certificate."}
}

// figure draws the section's picture in a format ("svg", "png"
// or "pdf").
func (a *attractionView) figure(format string) ([]byte, error) {
	p := a.scene.plot()
	return renderPlot(attractionSize, attractionSize, format, func(c draw.Canvas) { p.Draw(c) })
}

// svg draws the picture for inline HTML.
func (a *attractionView) svg() (string, error) {
	return drawSVG(a.scene.plot(), attractionSize, attractionSize)
}

const attractionSize = 5 * vg.Inch
