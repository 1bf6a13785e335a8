package report

import (
	"bytes"
	"fmt"
	"image/color"
	"lyacert/certificates"
	"lyacert/checker"
	"math"
	"math/big"
	"regexp"
	"sort"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgsvg"
)

var (
	negInf = math.Inf(-1)
	posInf = math.Inf(1)

	// Colours that stay apart in greyscale print: a dark green for
	// "holds", a light red for "fails", mid grey for "undecided".
	holdsColor     = color.RGBA{0x1b, 0x78, 0x37, 0xff}
	failsColor     = color.RGBA{0xf4, 0xa5, 0x82, 0xff}
	undecidedColor = color.RGBA{0xbd, 0xbd, 0xbd, 0xff}
)

// view returns the stretch of the parameter axis to draw: the finite ends,
// with a quarter of their span added on an unbounded side.
func view(ps []stripPiece) (lo, hi float64) {
	lo, hi = posInf, negInf
	for _, p := range ps {
		for _, x := range []float64{p.lo, p.hi} {
			if !math.IsInf(x, 0) {
				lo, hi = math.Min(lo, x), math.Max(hi, x)
			}
		}
	}
	if lo > hi {
		lo, hi = -1, 1
	}
	span := hi - lo
	if span == 0 {
		span = math.Max(1, math.Abs(lo))
	}
	if math.IsInf(ps[0].lo, -1) {
		lo -= span / 4
	}
	if math.IsInf(ps[len(ps)-1].hi, 1) {
		hi += span / 4
	}
	if lo == hi {
		lo, hi = lo-1, hi+1
	}
	return lo, hi
}

func clamp(x, lo, hi float64) float64 { return math.Max(lo, math.Min(hi, x)) }

// stripSVG draws the one-parameter region as a strip along the parameter's
// range, each piece coloured by whether the conditions hold on it, with the
// piece ends marked on the axis. It is drawn with gonum/plot; the float64
// positions are for the picture only.
func stripSVG(rv *regionView) (string, error) {
	ps := rv.strip
	lo, hi := view(ps)
	p := plot.New()
	p.HideY()
	p.X.Label.Text = plainName(rv.Name)
	p.X.Min, p.X.Max = lo, hi
	p.Y.Min, p.Y.Max = 0, 1
	var ticks []plot.Tick
	seen := map[float64]bool{}
	addTick := func(x float64, label string) {
		if seen[x] {
			return
		}
		seen[x] = true
		ticks = append(ticks, plot.Tick{Value: x, Label: label})
	}
	for _, pc := range ps {
		a, b := clamp(pc.lo, lo, hi), clamp(pc.hi, lo, hi)
		if pc.point {
			w := (hi - lo) / 200
			a, b = a-w, b+w
		}
		poly, err := plotter.NewPolygon(plotter.XYs{{X: a, Y: 0.15}, {X: b, Y: 0.15}, {X: b, Y: 0.6}, {X: a, Y: 0.6}})
		if err != nil {
			return "", err
		}
		poly.Color = failsColor
		if pc.holds {
			poly.Color = holdsColor
		}
		poly.LineStyle.Width = vg.Points(0.5)
		poly.LineStyle.Color = color.Gray{0x40}
		p.Add(poly)
		addTick(a, tickLabel(pc.lo, pc.loText, lo, hi))
		addTick(b, tickLabel(pc.hi, pc.hiText, lo, hi))
	}
	sort.Slice(ticks, func(i, j int) bool { return ticks[i].Value < ticks[j].Value })
	// Drop labels that would overlap; the closed form above has them all.
	minGap := (hi - lo) / 14
	last := negInf
	for i := range ticks {
		if ticks[i].Value-last < minGap {
			ticks[i].Label = ""
			continue
		}
		last = ticks[i].Value
	}
	p.X.Tick.Marker = plot.ConstantTicks(ticks)
	p.Title.Text = "Where the conditions hold, along " + plainName(rv.Name)
	return drawSVG(p, 16*vg.Centimeter, 5*vg.Centimeter)
}

func tickLabel(x float64, text string, lo, hi float64) string {
	switch {
	case math.IsInf(x, -1):
		return "← −∞"
	case math.IsInf(x, 1):
		return "∞ →"
	}
	return text
}

var xmlProlog = regexp.MustCompile(`(?s)^<\?xml[^>]*\?>\s*(<!--.*?-->\s*)?`)

// drawSVG renders a plot as an SVG element for inline use: without the XML
// prolog, scaled to the page width by CSS.
func drawSVG(p *plot.Plot, w, h vg.Length) (string, error) {
	c := vgsvg.New(w, h)
	p.Draw(draw.New(c))
	var buf bytes.Buffer
	if _, err := c.WriteTo(&buf); err != nil {
		return "", fmt.Errorf("drawing the plot: %w", err)
	}
	s := xmlProlog.ReplaceAllString(buf.String(), "")
	s = strings.Replace(s, "<svg ", `<svg role="img" class="plot" `, 1)
	return s, nil
}

// plainName is a parameter name for plot labels: a Greek name as its
// letter, others as written.
func plainName(s string) string {
	base, sub := splitName(s)
	if g, ok := greekHTML[base]; ok {
		base = g
	}
	if sub != "" {
		return base + "_" + sub
	}
	return base
}

// stripPicture draws the same strip in LaTeX's picture environment, which
// needs no package: a filled bar where every condition holds, an open box
// where one fails, ends labelled below.
func stripPicture(rv *regionView) string {
	ps := rv.strip
	lo, hi := view(ps)
	const width = 120.0 // mm
	x := func(v float64) float64 { return (clamp(v, lo, hi) - lo) / (hi - lo) * width }
	var b strings.Builder
	b.WriteString("\\begin{center}\n\\setlength{\\unitlength}{1mm}\n")
	fmt.Fprintf(&b, "\\begin{picture}(%.0f,18)\n", width)
	last := math.Inf(-1)
	label := func(pos float64, v float64, text string) {
		if pos-last < 9 && !math.IsInf(last, -1) {
			return
		}
		last = pos
		t := texText(text)
		switch {
		case math.IsInf(v, -1):
			t = `$-\infty$`
		case math.IsInf(v, 1):
			t = `$\infty$`
		}
		fmt.Fprintf(&b, "\\put(%.2f,4){\\makebox(0,0)[t]{\\scriptsize %s}}\n", pos, t)
	}
	for _, pc := range ps {
		a, c := x(pc.lo), x(pc.hi)
		w := c - a
		if pc.point {
			a, w = a-0.3, 0.6
		}
		if pc.holds {
			fmt.Fprintf(&b, "\\put(%.2f,6){\\rule{%.2fmm}{5mm}}\n", a, w)
		} else {
			fmt.Fprintf(&b, "\\put(%.2f,6){\\framebox(%.2f,5){}}\n", a, w)
		}
		label(x(pc.lo), pc.lo, pc.loText)
	}
	end := ps[len(ps)-1]
	label(x(end.hi), end.hi, end.hiText)
	fmt.Fprintf(&b, "\\put(%.0f,13){\\makebox(0,0)[r]{\\small $%s$: filled where every condition holds, open where one fails}}\n", width, texName(rv.Name))
	b.WriteString("\\end{picture}\n\\end{center}\n")
	return b.String()
}

type pavingView struct {
	Params     list
	Box        rich
	Resolution node
	Counts     []rich
	Leaves     int
	SVG        string // the drawing, for HTML
	Note       string // why there is no drawing
}

// maxDrawnLeaves bounds the boxes drawn in a paving's picture; the counts
// and fractions stand for all of them.
const maxDrawnLeaves = 20000

// newPavingView shows a several-parameter paving: its box, its resolution,
// the classes' counts and exact shares of the volume, and a picture of the
// leaves projected on the first two paved parameters.
func newPavingView(pv *checker.Paving) *pavingView {
	v := &pavingView{}
	for _, s := range pv.Params {
		v.Params = append(v.Params, name{s})
	}
	var sides list
	for i, s := range pv.Box {
		if i >= len(pv.Params) {
			break
		}
		lo, ok1 := new(big.Rat).SetString(s.Lo)
		hi, ok2 := new(big.Rat).SetString(s.Hi)
		if !ok1 || !ok2 {
			continue
		}
		sides = append(sides, relation{name{pv.Params[i]}, symIn, interval{lo: ratNode(lo), hi: ratNode(hi), loClosed: s.LoClosed, hiClosed: s.HiClosed}})
	}
	v.Box = rich{sides}
	if q, ok := new(big.Rat).SetString(pv.Resolution); ok {
		v.Resolution = ratNode(q)
	}
	share := func(n int, frac, what string) rich {
		r := rich{fmt.Sprintf("%d boxes %s", n, what)}
		if q, ok := new(big.Rat).SetString(frac); ok {
			f, _ := q.Float64()
			r = append(r, ", an exact share ", ratNode(q), fmt.Sprintf(" (about %.6g%%) of the box's volume", 100*f))
		}
		return r
	}
	sum, err := certificates.Summarize(pv)
	if err != nil {
		v.Note = "The paving could not be summarized: " + err.Error()
		return v
	}
	v.Counts = []rich{
		share(sum.Inside, sum.InsideFraction, "where every condition holds"),
		share(sum.Outside, sum.OutsideFraction, "where some condition fails throughout"),
		share(sum.Undecided, sum.UndecidedFraction, "left undecided at the resolution"),
	}
	leaves, err := certificates.Leaves(pv)
	v.Leaves = len(leaves)
	switch {
	case err != nil:
		v.Note = "The paving could not be drawn: " + err.Error()
	case len(leaves) > maxDrawnLeaves:
		v.Note = fmt.Sprintf("The paving has %d boxes, too many to draw; the counts above stand for all of them.", len(leaves))
	default:
		v.SVG, err = pavingSVG(pv.Params, leaves)
		if err != nil {
			v.Note = "The paving could not be drawn: " + err.Error()
		}
	}
	return v
}

// pavingSVG draws the leaves of a paving, projected on its first two
// parameters (on the first alone, as a strip, when there is one).
func pavingSVG(params []string, leaves []certificates.PavingLeaf) (string, error) {
	p := plot.New()
	p.X.Label.Text = plainName(params[0])
	if len(params) > 1 {
		p.Y.Label.Text = plainName(params[1])
		p.Title.Text = "Paving of the parameter box"
		if len(params) > 2 {
			p.Title.Text += " (projected on " + plainName(params[0]) + ", " + plainName(params[1]) + ")"
		}
	} else {
		p.HideY()
		p.Title.Text = "Paving along " + plainName(params[0])
	}
	f := func(q *big.Rat) float64 { x, _ := q.Float64(); return x }
	// Undecided and outside boxes last, so that in a projection they show
	// over inside ones: the picture errs on the side of caution.
	order := map[byte]int{checker.PaveInside: 0, checker.PaveOutside: 1, checker.PaveUndecided: 2}
	sorted := append([]certificates.PavingLeaf(nil), leaves...)
	sort.SliceStable(sorted, func(i, j int) bool { return order[sorted[i].Class] < order[sorted[j].Class] })
	for _, lf := range sorted {
		x0, x1 := f(lf.Lo[0]), f(lf.Hi[0])
		y0, y1 := 0.0, 1.0
		if len(params) > 1 {
			y0, y1 = f(lf.Lo[1]), f(lf.Hi[1])
		}
		pg, err := plotter.NewPolygon(plotter.XYs{{X: x0, Y: y0}, {X: x1, Y: y0}, {X: x1, Y: y1}, {X: x0, Y: y1}})
		if err != nil {
			return "", err
		}
		pg.Color = undecidedColor
		pg.LineStyle.Width = vg.Points(0.2)
		pg.LineStyle.Color = color.Gray{0x60}
		switch lf.Class {
		case checker.PaveInside:
			pg.Color = holdsColor
		case checker.PaveOutside:
			pg.Color = failsColor
		default:
			// A thick outline keeps even the smallest undecided box
			// visible.
			pg.LineStyle.Width = vg.Points(1.5)
			pg.LineStyle.Color = color.Gray{0x30}
		}
		p.Add(pg)
	}
	return drawSVG(p, 14*vg.Centimeter, 11*vg.Centimeter)
}
