package report

import (
	"fmt"
	"math/big"
	"strings"

	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"

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

// attractionOf presents the certificate's sublevel-basin claim, which
// checker.Verify has accepted (res.Basin is its level), or returns nil.
func (b *builder) attractionOf(res checker.Outcome) (*attractionView, error) {
	var cl *claims.SublevelBasin
	for _, c := range b.doc.Claims {
		if s, ok := c.(*claims.SublevelBasin); ok {
			cl = s
		}
	}
	if cl == nil || res.Basin == "" || b.doc.V == "" {
		return nil, nil
	}
	m := b.m
	level, ok := new(big.Rat).SetString(cl.Level)
	if !ok {
		return nil, fmt.Errorf("reading the level %q from the certificate", cl.Level)
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
	if len(m.States) != 2 {
		a.Note = fmt.Sprintf("The set is not drawn: a picture needs two states, the model has %d.", len(m.States))
		return a, nil
	}
	at := make([]*big.Rat, 2)
	for i := range 2 {
		q, err := m.At[i].EvalVars(nil)
		if err != nil || !q.IsPoly() || !q.Num.IsConst() {
			return nil, fmt.Errorf("the equilibrium of a basin is not a rational point")
		}
		at[i] = q.Num.ConstTerm()
	}
	a.scene = newBasinScene(m.States, v.Num, vdot.Num, m.F, at, level, ends)
	a.scene.title = fmt.Sprintf("Certified: {V ≤ %s} around the equilibrium", dec(level))
	a.Caption = rich{"The curve ", relation{vSym, symEq, cSym}, " (green) around the equilibrium bounds the certified set. Also shown: the curve ", relation{vdotSym, symEq, zeroNode},
		" (orange), the paved box (dotted) and trajectories from just inside the set, integrated numerically. Both curves are drawn by sampling ", vSym, " and ", vdotSym,
		" on a grid of 300 by 300 points: the picture is a floating-point sketch, not a proof; the proof is the exact check of the boxes."}
	return a, nil
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
