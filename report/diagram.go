package report

import (
	"fmt"
	"image/color"
	"math"
	"math/big"
	"path/filepath"
	"slices"
	"strings"

	"github.com/lyacert/lyacert/certify/branches"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// branchColors tell the branches apart (a colour-blind safe palette).
var branchColors = []color.Color{
	color.RGBA{0x00, 0x72, 0xb2, 0xff},
	color.RGBA{0xd5, 0x5e, 0x00, 0xff},
	color.RGBA{0x00, 0x9e, 0x73, 0xff},
	color.RGBA{0xcc, 0x79, 0xa7, 0xff},
	color.RGBA{0x56, 0xb4, 0xe9, 0xff},
	color.RGBA{0xe6, 0x9f, 0x00, 0xff},
	color.RGBA{0x00, 0x00, 0x00, 0xff},
}

// diagramSamples is the number of parameter values a branch's curve is
// drawn through across the whole view.
const diagramSamples = 400

// DiagramView is the stretch of the parameter axis a bifurcation diagram
// draws: the range's finite ends, and beyond a bifurcation value on an
// unbounded side a quarter of the known span (at least 1).
func DiagramView(an *branches.Analysis) (lo, hi float64) {
	var known []float64
	for _, b := range an.Bifurcations {
		known = append(known, urootFloat(b.Value))
	}
	rlo, rhi := an.Range.Lo, an.Range.Hi
	if rlo.Inf == 0 && rlo.Value != nil {
		f, _ := rlo.Value.Float64()
		known = append(known, f)
	}
	if rhi.Inf == 0 && rhi.Value != nil {
		f, _ := rhi.Value.Float64()
		known = append(known, f)
	}
	if len(known) == 0 {
		return -1, 1
	}
	mn, mx := slices.Min(known), slices.Max(known)
	w := math.Max(mx-mn, 1)
	lo, hi = mn, mx
	if rlo.Inf != 0 || rlo.Value == nil {
		lo = mn - w/4
	}
	if rhi.Inf != 0 || rhi.Value == nil {
		hi = mx + w/4
	}
	return lo, hi
}

func urootFloat(r poly.URoot) float64 {
	if r.Exact != nil {
		f, _ := r.Exact.Float64()
		return f
	}
	m := new(big.Rat).Add(r.Lo, r.Hi)
	f, _ := m.Quo(m, big.NewRat(2, 1)).Float64()
	return f
}

func endFloatOf(e poly.End) float64 {
	switch {
	case e.Inf < 0:
		return math.Inf(-1)
	case e.Inf > 0:
		return math.Inf(1)
	case e.Rational():
		f, _ := e.Value.Float64()
		return f
	}
	return urootFloat(poly.URoot{Poly: e.P, Lo: e.A, Hi: e.B})
}

// surdFloat evaluates a + b·√w at the parameter value t (index pi of the
// ring) exactly, then rounds; ok is false where it is undefined. The
// float64 is for the picture only.
func surdFloat(x branches.Surd, n, pi int, t float64) (float64, bool) {
	q := new(big.Rat)
	if q.SetFloat64(t) == nil {
		return 0, false
	}
	at := make([]*big.Rat, n)
	for i := range at {
		at[i] = new(big.Rat)
	}
	at[pi] = q
	a, err := x.A.Eval(at)
	if err != nil {
		return 0, false
	}
	v, _ := a.Float64()
	if x.IsRational() {
		return v, true
	}
	b, err := x.B.Eval(at)
	if err != nil {
		return 0, false
	}
	w, err := x.W.Eval(at)
	if err != nil || w.Sign() < 0 {
		return 0, false
	}
	bf, _ := b.Float64()
	wf, _ := w.Float64()
	return v + bf*math.Sqrt(wf), true
}

// DiagramStates checks a --plot state choice: "" draws every state.
func DiagramStates(m *model.Model, state string) ([]int, error) {
	if state == "" {
		out := make([]int, len(m.States))
		for i := range out {
			out[i] = i
		}
		return out, nil
	}
	i := slices.Index(m.States, state)
	if i < 0 {
		return nil, fmt.Errorf("no state %q in the model (states: %v)", state, m.States)
	}
	return []int{i}, nil
}

// BifurcationDiagram draws the branches of an (one free parameter) against
// that parameter, one panel per state in states: solid where the branch is
// stable, dashed where it is not (unstable or not hyperbolic), the
// bifurcation values marked and named with their exact values in the
// legend. format is "svg", "png" or "pdf".
func BifurcationDiagram(m *model.Model, an *branches.Analysis, states []int, format string) ([]byte, error) {
	if an.Param == "" {
		return nil, fmt.Errorf("a bifurcation diagram needs exactly one free parameter")
	}
	if !an.ClosedForm {
		return nil, fmt.Errorf("no closed form for the branches (%s): nothing to draw", an.Reason)
	}
	pi, _ := an.Ring.Index(an.Param)
	n := len(an.Ring.Names())
	lo, hi := DiagramView(an)
	step := (hi - lo) / diagramSamples
	legend := plot.NewLegend()
	legend.Top, legend.Left = true, true
	plots := make([][]*plot.Plot, len(states))
	for row, k := range states {
		p := plot.New()
		p.X.Label.Text = plainName(an.Param)
		p.Y.Label.Text = plainName(m.States[k])
		p.X.Min, p.X.Max = lo, hi
		var ys []float64
		for i, b := range an.Branches {
			if !b.Isolated() {
				continue
			}
			col := branchColors[i%len(branchColors)]
			first := true
			for _, pc := range BranchPieces(an, i) {
				if pc.Span.Point() {
					continue
				}
				a, z := math.Max(endFloatOf(pc.Span.Lo), lo), math.Min(endFloatOf(pc.Span.Hi), hi)
				if a >= z {
					continue
				}
				// Sample strictly inside the open piece, on the view's grid.
				eps := (z - a) * 1e-9
				ts := []float64{a + eps}
				for t := lo + step*math.Ceil((a-lo)/step); t < z; t += step {
					if t > a+eps {
						ts = append(ts, t)
					}
				}
				ts = append(ts, z-eps)
				var pts plotter.XYs
				for _, t := range ts {
					if y, ok := surdFloat(b.Coords[k], n, pi, t); ok && !math.IsInf(y, 0) && !math.IsNaN(y) {
						pts = append(pts, plotter.XY{X: t, Y: y})
						ys = append(ys, y)
					}
				}
				if len(pts) < 2 {
					continue
				}
				l, err := plotter.NewLine(pts)
				if err != nil {
					return nil, err
				}
				l.LineStyle.Color = col
				l.LineStyle.Width = vg.Points(1.6)
				if pc.Label.Stability != "stable" {
					l.LineStyle.Dashes = []vg.Length{vg.Points(5), vg.Points(3)}
				}
				p.Add(l)
				if first && row == 0 {
					solid := &plotter.Line{LineStyle: draw.LineStyle{Color: col, Width: vg.Points(1.6)}}
					legend.Add(fmt.Sprintf("branch %d", i+1), solid)
					first = false
				}
			}
		}
		var marks []float64
		for j, bf := range an.Bifurcations {
			t := urootFloat(bf.Value)
			var pts plotter.XYs
			for _, i := range bf.Branches {
				if y, ok := surdFloat(an.Branches[i].Coords[k], n, pi, t); ok {
					pts = append(pts, plotter.XY{X: t, Y: y})
					marks = append(marks, y)
				}
			}
			if len(pts) == 0 {
				continue
			}
			s, err := plotter.NewScatter(pts)
			if err != nil {
				return nil, err
			}
			s.GlyphStyle.Shape = diagramGlyphs[j%len(diagramGlyphs)]
			s.GlyphStyle.Radius = vg.Points(4)
			s.GlyphStyle.Color = color.Black
			p.Add(s)
			if row == 0 {
				o := bifurcationOutput(an, bf, pi)
				v := o.Value
				if o.Poly != nil {
					v = "root of " + *o.Poly + " ≈ " + shortDecimal(o.Decimal)
				} else if strings.Contains(o.Value, "/") {
					v += " ≈ " + shortDecimal(o.Decimal)
				}
				legend.Add(fmt.Sprintf("%s at %s = %s", o.Kind, plainName(an.Param), v), s)
			}
		}
		p.Y.Min, p.Y.Max = diagramYRange(ys, marks)
		p.Add(plotter.NewGrid())
		plots[row] = []*plot.Plot{p}
	}
	dashed := &plotter.Line{LineStyle: draw.LineStyle{Color: color.Gray{0x60}, Width: vg.Points(1.6), Dashes: []vg.Length{vg.Points(5), vg.Points(3)}}}
	legend.Add("solid: stable; dashed: unstable or not hyperbolic", dashed)
	title := plot.New()
	title.Title.Text = fmt.Sprintf("Equilibrium branches of %s along %s", filepath.Base(m.File), plainName(an.Param))
	w := vg.Length(18) * vg.Centimeter
	panel := vg.Length(7) * vg.Centimeter
	head := vg.Length(1)*vg.Centimeter + legend.Rectangle(draw.Canvas{}).Size().Y
	h := head + panel*vg.Length(len(states))
	return renderPlot(w, h, format, func(c draw.Canvas) {
		// The title, then the legend under it, then the panels.
		ts := title.Title.TextStyle
		ts.XAlign, ts.YAlign = draw.XCenter, draw.YTop
		c.FillText(ts, vg.Point{X: (c.Min.X + c.Max.X) / 2, Y: c.Max.Y - vg.Millimeter}, title.Title.Text)
		lc := c
		lc.Max.Y -= ts.Height(title.Title.Text) + vg.Millimeter*3
		lc.Min.X += vg.Centimeter * 1.5
		legend.Draw(lc)
		body := draw.Crop(c, 0, 0, 0, -head)
		cs := plot.Align(plots, draw.Tiles{Rows: len(states), Cols: 1, PadY: vg.Millimeter * 4}, body)
		for r := range plots {
			plots[r][0].Draw(cs[r][0])
		}
	})
}

// diagramYRange is the vertical range of a panel: the bulk of the curves'
// values (a branch may run off to infinity where its denominator
// vanishes), the bifurcation marks, and a margin.
func diagramYRange(ys, marks []float64) (lo, hi float64) {
	if len(ys) == 0 && len(marks) == 0 {
		return -1, 1
	}
	slices.Sort(ys)
	lo, hi = math.Inf(1), math.Inf(-1)
	if len(ys) > 0 {
		lo, hi = ys[len(ys)*2/100], ys[len(ys)-1-len(ys)*2/100]
	}
	for _, y := range marks {
		lo, hi = math.Min(lo, y), math.Max(hi, y)
	}
	pad := (hi - lo) * 0.08
	if pad == 0 {
		pad = math.Max(math.Abs(hi)/2, 1)
	}
	return lo - pad, hi + pad
}

var diagramGlyphs = []draw.GlyphDrawer{draw.CircleGlyph{}, draw.SquareGlyph{}, draw.TriangleGlyph{}, draw.CrossGlyph{}, draw.PlusGlyph{}, draw.RingGlyph{}}

// shortDecimal keeps six significant digits of a decimal for a legend.
func shortDecimal(s string) string {
	f, _, err := big.ParseFloat(s, 10, 64, big.ToNearestEven)
	if err != nil {
		return s
	}
	v, _ := f.Float64()
	return fmt.Sprintf("%.6g", v)
}
