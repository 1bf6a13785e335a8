package report

import (
	"bytes"
	"fmt"
	"image/color"
	"math"
	"math/big"
	"regexp"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/claims"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
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

// stripPlot draws the one-parameter region as a strip along the parameter's
// range, each piece coloured by whether the conditions hold on it, with the
// piece ends marked on the axis (an irrational end by its name and its
// decimal). It is drawn with gonum/plot; the float64 positions are for the
// picture only.
func stripPlot(rv *regionView) (*plot.Plot, error) {
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
			return nil, err
		}
		poly.Color = failsColor
		if pc.holds {
			poly.Color = holdsColor
		}
		poly.LineStyle.Width = vg.Points(0.5)
		poly.LineStyle.Color = color.Gray{0x40}
		p.Add(poly)
		addTick(clamp(pc.lo, lo, hi), tickLabel(pc.lo, pc.loText, pc.loName))
		addTick(clamp(pc.hi, lo, hi), tickLabel(pc.hi, pc.hiText, pc.hiName))
	}
	sort.Slice(ticks, func(i, j int) bool { return ticks[i].Value < ticks[j].Value })
	// Drop labels that would overlap; the closed form in the report and
	// the text output have them all.
	minGap := (hi - lo) / 9
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
	p.Legend.Add("every condition holds", swatch{holdsColor})
	p.Legend.Add("a condition fails", swatch{failsColor})
	p.Legend.Top = true
	return p, nil
}

// stripWidth and stripHeight are the strip's size.
const (
	stripWidth  = 16 * vg.Centimeter
	stripHeight = 5 * vg.Centimeter
)

// drawStrip draws a strip with room on both sides for the labels of its
// ends, which are centred on the ends of the axis.
func drawStrip(p *plot.Plot, c draw.Canvas) {
	p.Draw(draw.Crop(c, vg.Centimeter, -vg.Centimeter, 0, 0))
}

// stripSVG is stripPlot as an inline SVG element.
func stripSVG(rv *regionView) (string, error) {
	p, err := stripPlot(rv)
	if err != nil {
		return "", err
	}
	return drawSVGWith(stripWidth, stripHeight, func(c draw.Canvas) { drawStrip(p, c) })
}

// RegionPlot draws the one-parameter region of a certificate as a strip
// along the parameter's range: the exact pieces where every condition holds
// and where one fails, coloured, their ends marked (an irrational end by
// its name and decimal, as in the report). format is "svg", "png" or "pdf".
// The certificate is re-checked first, as for Render; one without a
// one-parameter region gives an error.
func RegionPlot(doc *claims.Document, format string) ([]byte, error) {
	p, err := build(doc, Options{})
	if err != nil {
		return nil, err
	}
	if len(p.Regions) == 0 {
		return nil, fmt.Errorf("the certificate has no one-parameter region to draw")
	}
	if len(p.Regions) > 1 {
		return nil, fmt.Errorf("the region is a product of %d one-parameter regions; draw its paving instead", len(p.Regions))
	}
	pl, err := stripPlot(p.Regions[0])
	if err != nil {
		return nil, err
	}
	return renderPlot(stripWidth, stripHeight, format, func(c draw.Canvas) { drawStrip(pl, c) })
}

// tickLabel is an end's label on the strip's axis: an irrational end by
// its name and decimal ("α1 ≈ 3.828").
func tickLabel(x float64, text string, alpha *sub) string {
	switch {
	case math.IsInf(x, -1):
		return "← −∞"
	case math.IsInf(x, 1):
		return "∞ →"
	case alpha != nil:
		return "α" + alpha.idx + " ≈ " + text
	}
	return text
}

var xmlProlog = regexp.MustCompile(`(?s)^<\?xml[^>]*\?>\s*(<!--.*?-->\s*)?`)

// drawSVG renders a plot as an SVG element for inline use: without the XML
// prolog, scaled to the page width by CSS.
func drawSVG(p *plot.Plot, w, h vg.Length) (string, error) {
	return drawSVGWith(w, h, func(c draw.Canvas) { p.Draw(c) })
}

func drawSVGWith(w, h vg.Length, f func(draw.Canvas)) (string, error) {
	b, err := renderPlot(w, h, "svg", f)
	if err != nil {
		return "", err
	}
	s := xmlProlog.ReplaceAllString(string(b), "")
	s = strings.Replace(s, "<svg ", `<svg role="img" class="plot" `, 1)
	return s, nil
}

// Plot formats: the extensions a picture may be written with.
var PlotFormats = []string{"svg", "png", "pdf"}

// renderPlot draws on a w×h canvas of the format ("svg", "png" or "pdf")
// and returns the file's bytes.
func renderPlot(w, h vg.Length, format string, f func(draw.Canvas)) ([]byte, error) {
	var buf bytes.Buffer
	if format == "svg" {
		c := &measuredSVG{Canvas: vgsvg.New(w, h)}
		f(draw.New(c))
		if _, err := c.WriteTo(&buf); err != nil {
			return nil, fmt.Errorf("drawing the plot: %w", err)
		}
		return fixSVGText(buf.Bytes(), c.widths), nil
	}
	if !slices.Contains(PlotFormats, format) {
		return nil, fmt.Errorf("unknown picture format %q (want svg, png or pdf)", format)
	}
	c, err := draw.NewFormattedCanvas(w, h, format)
	if err != nil {
		return nil, err
	}
	f(draw.New(c))
	if _, err := c.WriteTo(&buf); err != nil {
		return nil, fmt.Errorf("drawing the plot: %w", err)
	}
	return buf.Bytes(), nil
}

// measuredSVG records the width gonum/plot measured for every string it
// sets, in order: the layout (legends flush with the right edge, centred
// titles) was computed with these widths.
type measuredSVG struct {
	*vgsvg.Canvas
	widths []vg.Length
}

func (c *measuredSVG) FillString(f font.Face, pt vg.Point, s string) {
	c.widths = append(c.widths, f.Width(s))
	c.Canvas.FillString(f, pt, s)
}

// svgFontStack replaces the single font gonum/plot names (Liberation
// Serif, whose metrics it lays text out with) by a stack: the same font,
// then metric-compatible ones (Times New Roman, Tinos), then any serif.
const svgFontStack = `font-family:'Liberation Serif','Times New Roman',Tinos,Times,serif`

var svgText = regexp.MustCompile(`<text x="[^"]*" y="[^"]*"`)

// fixSVGText gives every text element the font stack and its measured
// width as textLength: a browser that has none of the fonts (Chromium on a
// system without Liberation falls back to a wider serif) squeezes or
// stretches the glyphs to the width the layout assumed, so that no legend
// or label runs past the picture's edge.
func fixSVGText(b []byte, widths []vg.Length) []byte {
	i := 0
	b = svgText.ReplaceAllFunc(b, func(m []byte) []byte {
		if i >= len(widths) {
			return m
		}
		w := widths[i]
		i++
		return fmt.Appendf(slices.Clone(m), ` textLength="%.2f" lengthAdjust="spacingAndGlyphs"`, w.Points())
	})
	b = bytes.ReplaceAll(b, []byte("font-family:Liberation Serif"), []byte(svgFontStack))
	// A margin of svgMargin points all round: a fallback font may have a
	// taller ascent than the one the layout measured, and a title at the
	// top edge would lose its accents.
	return svgSize.ReplaceAllFunc(b, func(m []byte) []byte {
		g := svgSize.FindSubmatch(m)
		var w, h float64
		fmt.Sscan(string(g[1]), &w)
		fmt.Sscan(string(g[2]), &h)
		return fmt.Appendf(nil, `<svg width="%.2fpt" height="%.2fpt" viewBox="%g %g %.2f %.2f"`, w+2*svgMargin, h+2*svgMargin, -svgMargin, -svgMargin, w+2*svgMargin, h+2*svgMargin)
	})
}

const svgMargin = 4.0 // points

var svgSize = regexp.MustCompile(`<svg width="([0-9.]+)pt" height="([0-9.]+)pt" viewBox="0 0 [0-9.]+ [0-9.]+"`)

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
	label := func(pos float64, v float64, text string, alpha *sub) {
		if pos-last < 9 && !math.IsInf(last, -1) {
			return
		}
		last = pos
		t := texText(text)
		switch {
		case alpha != nil:
			t = "$" + alpha.tex() + ` \approx ` + strings.ReplaceAll(text, "−", "-") + "$"
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
		label(x(pc.lo), pc.lo, pc.loText, pc.loName)
	}
	end := ps[len(ps)-1]
	label(x(end.hi), end.hi, end.hiText, end.hiName)
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
	SVG        string // the drawing, for HTML and (as a file) Markdown
	Figure     string // Markdown: the drawing's file, when written
	Note       string // why there is no drawing
	params     []string
	leaves     []certificates.PavingLeaf
}

// maxPictureLeaves bounds the boxes drawn in LaTeX's picture environment,
// which keeps every box in TeX's memory; above it the LaTeX report says
// where the drawing is.
const maxPictureLeaves = 4000

// pavingPicture draws a paving in LaTeX's picture environment, which needs
// no package: the leaves projected on the first two paved parameters (on
// the first alone, as a strip, when there is one), a filled box where every
// condition holds, a framed one where the paving is undecided, nothing
// where a condition fails. The positions are rounded for the picture only.
func pavingPicture(v *pavingView) string {
	if len(v.leaves) == 0 || len(v.leaves) > maxPictureLeaves {
		return ""
	}
	f := func(q *big.Rat) float64 { x, _ := q.Float64(); return x }
	x0, x1 := math.Inf(1), math.Inf(-1)
	y0, y1 := 0.0, 1.0
	two := len(v.params) > 1
	if two {
		y0, y1 = math.Inf(1), math.Inf(-1)
	}
	for _, lf := range v.leaves {
		x0, x1 = math.Min(x0, f(lf.Lo[0])), math.Max(x1, f(lf.Hi[0]))
		if two {
			y0, y1 = math.Min(y0, f(lf.Lo[1])), math.Max(y1, f(lf.Hi[1]))
		}
	}
	const width = 110.0 // mm
	height := 12.0
	if two {
		height = 80
	}
	if x1 <= x0 || y1 <= y0 {
		return ""
	}
	sx, sy := width/(x1-x0), height/(y1-y0)
	var b strings.Builder
	b.WriteString("\\begin{center}\n\\setlength{\\unitlength}{1mm}\n")
	fmt.Fprintf(&b, "\\begin{picture}(%.0f,%.0f)(-12,-10)\n", width+12, height+12)
	order := map[byte]int{claims.PaveInside: 0, claims.PaveOutside: 1, claims.PaveUndecided: 2}
	sorted := append([]certificates.PavingLeaf(nil), v.leaves...)
	sort.SliceStable(sorted, func(i, j int) bool { return order[sorted[i].Class] < order[sorted[j].Class] })
	for _, lf := range sorted {
		a, c := (f(lf.Lo[0])-x0)*sx, (f(lf.Hi[0])-x0)*sx
		lo, hi := 0.0, height
		if two {
			lo, hi = (f(lf.Lo[1])-y0)*sy, (f(lf.Hi[1])-y0)*sy
		}
		switch lf.Class {
		case claims.PaveInside:
			fmt.Fprintf(&b, "\\put(%.2f,%.2f){\\rule{%.2fmm}{%.2fmm}}\n", a, lo, c-a, hi-lo)
		case claims.PaveUndecided:
			fmt.Fprintf(&b, "\\put(%.2f,%.2f){\\framebox(%.2f,%.2f){}}\n", a, lo, c-a, hi-lo)
		}
	}
	fmt.Fprintf(&b, "\\put(0,0){\\framebox(%.0f,%.0f){}}\n", width, height)
	num := func(x float64) string {
		return strings.ReplaceAll(strconv.FormatFloat(x, 'g', 4, 64), "-", "$-$")
	}
	fmt.Fprintf(&b, "\\put(0,-2){\\makebox(0,0)[t]{\\scriptsize %s}}\n", num(x0))
	fmt.Fprintf(&b, "\\put(%.0f,-2){\\makebox(0,0)[t]{\\scriptsize %s}}\n", width, num(x1))
	fmt.Fprintf(&b, "\\put(%.0f,-6){\\makebox(0,0)[t]{\\small $%s$}}\n", width/2, texName(v.params[0]))
	if two {
		fmt.Fprintf(&b, "\\put(-1,0){\\makebox(0,0)[r]{\\scriptsize %s}}\n", num(y0))
		fmt.Fprintf(&b, "\\put(-1,%.0f){\\makebox(0,0)[r]{\\scriptsize %s}}\n", height, num(y1))
		fmt.Fprintf(&b, "\\put(-6,%.0f){\\makebox(0,0)[r]{\\small $%s$}}\n", height/2, texName(v.params[1]))
	}
	b.WriteString("\\end{picture}\n\\end{center}\n")
	b.WriteString("\\noindent Filled: every condition holds on the box; framed: undecided at the resolution; blank: some condition fails on all of it.")
	if len(v.params) > 2 {
		b.WriteString(" The boxes are projected on the first two paved parameters, undecided ones drawn last.")
	}
	b.WriteString("\n")
	return b.String()
}

// maxDrawnLeaves bounds the boxes drawn in a paving's picture; the counts
// and fractions stand for all of them.
const maxDrawnLeaves = 20000

// newPavingView shows a several-parameter paving: its box, its resolution,
// the classes' counts and exact shares of the volume, and a picture of the
// leaves projected on the first two paved parameters.
func newPavingView(pv *claims.Paving) *pavingView {
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
	v.params = pv.Params
	if err == nil {
		v.leaves = leaves
	}
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
	order := map[byte]int{claims.PaveInside: 0, claims.PaveOutside: 1, claims.PaveUndecided: 2}
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
		case claims.PaveInside:
			pg.Color = holdsColor
		case claims.PaveOutside:
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

// classColors are the paving classes' colours, those of the strips.
var classColors = map[byte]color.Color{
	claims.PaveInside:    holdsColor,
	claims.PaveOutside:   failsColor,
	claims.PaveUndecided: undecidedColor,
}

var classNames = map[byte]string{
	claims.PaveInside:    "inside: the conditions hold (proven)",
	claims.PaveOutside:   "outside: a condition fails (proven)",
	claims.PaveUndecided: "undecided at the resolution",
}

// PavingPlot draws a paving's leaves, coloured by class, over the two
// parameters that fixed leaves free, and returns the picture in format
// ("svg" or "png"). fixed gives a value to every other paved parameter (by
// its index in pv.Params), each within its side of the box: a leaf is drawn
// when the value lies in it, its lower end included, its upper end only at
// the top of the box. The float64 positions are for the picture only.
func PavingPlot(pv *claims.Paving, fixed map[int]*big.Rat, format string) ([]byte, error) {
	leaves, err := certificates.Leaves(pv)
	if err != nil {
		return nil, err
	}
	var axes []int
	for i := range pv.Params {
		if _, ok := fixed[i]; !ok {
			axes = append(axes, i)
		}
	}
	if len(axes) != 2 {
		return nil, fmt.Errorf("the plot needs exactly two free axes, not %d", len(axes))
	}
	p := plot.New()
	p.Title.Text = "Paving of (" + strings.Join(pv.Params, ", ") + ") at resolution " + pv.Resolution
	if len(fixed) > 0 {
		var fs []string
		for i := range pv.Params {
			if v, ok := fixed[i]; ok {
				fs = append(fs, pv.Params[i]+" = "+v.RatString())
			}
		}
		p.Title.Text += ", slice " + strings.Join(fs, ", ")
	}
	p.X.Label.Text, p.Y.Label.Text = pv.Params[axes[0]], pv.Params[axes[1]]
	x0, _ := new(big.Rat).SetString(pv.Box[axes[0]].Lo)
	x1, _ := new(big.Rat).SetString(pv.Box[axes[0]].Hi)
	y0, _ := new(big.Rat).SetString(pv.Box[axes[1]].Lo)
	y1, _ := new(big.Rat).SetString(pv.Box[axes[1]].Hi)
	p.X.Min, _ = x0.Float64()
	p.X.Max, _ = x1.Float64()
	p.Y.Min, _ = y0.Float64()
	p.Y.Max, _ = y1.Float64()
	p.Y.Max += (p.Y.Max - p.Y.Min) / 5 // room for the legend above the box
	layers := map[byte]*boxLayer{}
	for _, c := range []byte{claims.PaveInside, claims.PaveOutside, claims.PaveUndecided} {
		layers[c] = &boxLayer{fill: classColors[c]}
	}
	for _, lf := range leaves {
		in := true
		for i, v := range fixed {
			top, _ := new(big.Rat).SetString(pv.Box[i].Hi)
			in = in && lf.Lo[i].Cmp(v) <= 0 && (v.Cmp(lf.Hi[i]) < 0 || v.Cmp(top) == 0)
		}
		if !in {
			continue
		}
		var r [4]float64
		r[0], _ = lf.Lo[axes[0]].Float64()
		r[1], _ = lf.Hi[axes[0]].Float64()
		r[2], _ = lf.Lo[axes[1]].Float64()
		r[3], _ = lf.Hi[axes[1]].Float64()
		layers[lf.Class].boxes = append(layers[lf.Class].boxes, r)
	}
	for _, c := range []byte{claims.PaveInside, claims.PaveOutside, claims.PaveUndecided} {
		p.Add(layers[c])
		p.Legend.Add(classNames[c]+", "+boxes(len(layers[c].boxes)), layers[c])
	}
	p.Legend.Top = true
	return renderPlot(6*vg.Inch, 5*vg.Inch, format, func(c draw.Canvas) { p.Draw(c) })
}

// boxLayer is a plot.Plotter of filled axis-parallel boxes
// (x0, x1, y0, y1), drawn at float64 positions for the picture only.
type boxLayer struct {
	boxes [][4]float64
	fill  color.Color
}

func (b *boxLayer) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	for _, r := range b.boxes {
		pts := []vg.Point{
			{X: trX(r[0]), Y: trY(r[2])}, {X: trX(r[1]), Y: trY(r[2])},
			{X: trX(r[1]), Y: trY(r[3])}, {X: trX(r[0]), Y: trY(r[3])},
		}
		clipped := c.ClipPolygonXY(pts)
		c.FillPolygon(b.fill, clipped)
		// A hairline in the same colour hides the seams that
		// anti-aliasing leaves between adjacent boxes.
		if len(clipped) > 0 {
			c.StrokeLines(draw.LineStyle{Color: b.fill, Width: vg.Points(0.3)}, append(clipped, clipped[0]))
		}
	}
}

// Thumbnail draws the legend's swatch.
func (b *boxLayer) Thumbnail(c *draw.Canvas) {
	pts := []vg.Point{
		{X: c.Min.X, Y: c.Min.Y}, {X: c.Max.X, Y: c.Min.Y},
		{X: c.Max.X, Y: c.Max.Y}, {X: c.Min.X, Y: c.Max.Y},
	}
	c.FillPolygon(b.fill, pts)
}

// SweepCategory sums up the verdicts at one grid point of a sweep.
type SweepCategory int

// The categories of a grid point.
const (
	SweepUndecided SweepCategory = iota // nothing certified either way, or no equilibrium
	SweepUnstable                       // every equilibrium certified unstable
	SweepMixed                          // some certified stable, not all
	SweepStable                         // every equilibrium certified stable
)

// SweepCell is a grid point of a sweep as SweepPlot draws it: its values of
// the swept parameters and its category.
type SweepCell struct {
	Values   []float64
	Category SweepCategory
}

// categoryColors are chosen to stay apart for colour-blind readers
// (blue, light blue, orange, grey).
var categoryColors = [...]color.Color{
	SweepUndecided: color.RGBA{0xbb, 0xbb, 0xbb, 0xff},
	SweepUnstable:  color.RGBA{0xe6, 0x7e, 0x22, 0xff},
	SweepMixed:     color.RGBA{0x9e, 0xca, 0xe1, 0xff},
	SweepStable:    color.RGBA{0x21, 0x66, 0xac, 0xff},
}

var legendNames = [...]string{
	SweepUndecided: "not decided",
	SweepUnstable:  "all certified unstable",
	SweepMixed:     "some certified stable",
	SweepStable:    "all certified stable",
}

// verdictCells draws one cell per grid point coloured by its category, and
// a black line wherever neighbouring cells differ: the boundary of the
// certified region as the grid resolves it.
type verdictCells struct {
	xs, ys []float64                // the distinct values of each axis, ascending
	cat    map[[2]int]SweepCategory // by (x index, y index)
}

func edges(vs []float64) []float64 {
	if len(vs) == 1 {
		return []float64{vs[0] - 0.5, vs[0] + 0.5}
	}
	out := make([]float64, len(vs)+1)
	out[0] = vs[0] - (vs[1]-vs[0])/2
	for i := 1; i < len(vs); i++ {
		out[i] = (vs[i-1] + vs[i]) / 2
	}
	out[len(vs)] = vs[len(vs)-1] + (vs[len(vs)-1]-vs[len(vs)-2])/2
	return out
}

func (v *verdictCells) DataRange() (xmin, xmax, ymin, ymax float64) {
	ex, ey := edges(v.xs), edges(v.ys)
	return ex[0], ex[len(ex)-1], ey[0], ey[len(ey)-1]
}

func (v *verdictCells) Plot(c draw.Canvas, plt *plot.Plot) {
	trX, trY := plt.Transforms(&c)
	ex, ey := edges(v.xs), edges(v.ys)
	for key, cat := range v.cat {
		x0, x1 := trX(ex[key[0]]), trX(ex[key[0]+1])
		y0, y1 := trY(ey[key[1]]), trY(ey[key[1]+1])
		// A hair wider than the cell, so that anti-aliasing leaves no seams.
		x1, y1 = x1+vg.Points(0.3), y1+vg.Points(0.3)
		c.FillPolygon(categoryColors[cat], []vg.Point{{X: x0, Y: y0}, {X: x1, Y: y0}, {X: x1, Y: y1}, {X: x0, Y: y1}})
	}
	line := draw.LineStyle{Color: color.Black, Width: vg.Points(1.5)}
	for key, cat := range v.cat {
		if right, ok := v.cat[[2]int{key[0] + 1, key[1]}]; ok && right != cat {
			x := trX(ex[key[0]+1])
			c.StrokeLine2(line, x, trY(ey[key[1]]), x, trY(ey[key[1]+1]))
		}
		if up, ok := v.cat[[2]int{key[0], key[1] + 1}]; ok && up != cat {
			y := trY(ey[key[1]+1])
			c.StrokeLine2(line, trX(ex[key[0]]), y, trX(ex[key[0]+1]), y)
		}
	}
}

// swatch is a legend entry's filled square.
type swatch struct{ c color.Color }

func (s swatch) Thumbnail(c *draw.Canvas) {
	c.FillPolygon(s.c, []vg.Point{c.Min, {X: c.Max.X, Y: c.Min.Y}, c.Max, {X: c.Min.X, Y: c.Max.Y}})
}

// SweepPlot draws the categories of a sweep's grid points: a strip over one
// swept parameter, a heat map over two (names are the swept parameters, in
// the order of each cell's values). format is "svg", "png" or "pdf".
func SweepPlot(title string, names []string, cells []SweepCell, format string) ([]byte, error) {
	if len(names) != 1 && len(names) != 2 {
		return nil, fmt.Errorf("a sweep plot draws one or two swept parameters, not %d", len(names))
	}
	if len(cells) == 0 {
		return nil, fmt.Errorf("a sweep plot needs at least one grid point")
	}
	v := &verdictCells{cat: map[[2]int]SweepCategory{}}
	axis := func(i int) []float64 {
		var vs []float64
		for _, p := range cells {
			if !slices.Contains(vs, p.Values[i]) {
				vs = append(vs, p.Values[i])
			}
		}
		slices.Sort(vs)
		return vs
	}
	v.xs = axis(0)
	v.ys = []float64{0}
	if len(names) == 2 {
		v.ys = axis(1)
	}
	for _, p := range cells {
		xi := slices.Index(v.xs, p.Values[0])
		yi := 0
		if len(names) == 2 {
			yi = slices.Index(v.ys, p.Values[1])
		}
		v.cat[[2]int{xi, yi}] = p.Category
	}
	p := plot.New()
	p.Title.Text = "lyacert sweep: " + title
	p.X.Label.Text = names[0]
	if len(names) == 2 {
		p.Y.Label.Text = names[1]
	} else {
		p.HideY()
	}
	p.Add(v)
	seen := map[SweepCategory]bool{}
	for _, c := range v.cat {
		seen[c] = true
	}
	leg := plot.NewLegend()
	for _, c := range []SweepCategory{SweepStable, SweepMixed, SweepUnstable, SweepUndecided} {
		if seen[c] {
			leg.Add(legendNames[c], swatch{categoryColors[c]})
		}
	}
	leg.Top, leg.Left = true, true
	width, height := 22*vg.Centimeter, 12*vg.Centimeter
	if len(names) == 1 {
		height = 7 * vg.Centimeter
	}
	legend := 6 * vg.Centimeter
	// The plot on the left, the legend beside it where it hides no cell.
	return renderPlot(width, height, format, func(dc draw.Canvas) {
		p.Draw(draw.Crop(dc, 0, -legend, 0, 0))
		leg.Draw(draw.Crop(dc, width-legend+vg.Centimeter/2, 0, 0, -vg.Centimeter))
	})
}
