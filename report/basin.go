package report

import (
	"fmt"
	"image/color"
	"io"
	"math"
	"math/big"
	"slices"
	"strings"

	"github.com/lyacert/lyacert/certify"
	"github.com/lyacert/lyacert/certify/basin"
	"github.com/lyacert/lyacert/certify/ode"
	"github.com/lyacert/lyacert/poly"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// BasinOutput is the JSON of a region-of-attraction estimate: the certified
// level c_lo, the level c_hi of an exact point with V̇ ≥ 0, both exact and
// in decimals, their relative gap, the point, how it was found, and the
// certificate's digest and re-check.
type BasinOutput struct {
	V              string            `json:"V"`
	Vdot           string            `json:"vdot"`
	Equilibrium    []string          `json:"equilibrium"`
	CLo            string            `json:"c_lo"`
	CLoDecimal     string            `json:"c_lo_decimal"`
	CHi            *string           `json:"c_hi"` // null when no point with V̇ ≥ 0 was found
	CHiDecimal     *string           `json:"c_hi_decimal"`
	Gap            *string           `json:"gap"` // (c_hi − c_lo)/c_hi, decimal
	Counterexample *CounterexampleJS `json:"counterexample"`
	// Parameters, with free parameters, are their ranges: c_lo holds for
	// every parameter value in the box (HoldsFor says so in words).
	Parameters  []ParamRangeJS `json:"parameters,omitempty"`
	HoldsFor    string         `json:"holds_for,omitempty"`
	Method      string         `json:"method"`
	Rule        string         `json:"rule"` // the kernel rule that proves c_lo
	Note        string         `json:"note"`
	Boxes       int            `json:"boxes"`
	Verdict     string         `json:"verdict"` // the direct method's, as the kernel derives it
	Claim       string         `json:"claim"`
	Digest      string         `json:"digest"`
	Checks      int            `json:"checks_passed"`
	Certificate string         `json:"certificate"`
	// Improve is set by basin --improve: the search over quadratic V.
	Improve *ImproveJS `json:"improve,omitempty"`
}

// ImproveJS is the outcome of basin --improve: the radii of the largest
// balls about the equilibrium inside the certified sets of the baseline
// and of the chosen V, the chosen P (exact) and the Q it came from (null
// when the baseline was kept).
type ImproveJS struct {
	Baseline     string      `json:"baseline"` // "the given V" or "Q = I"
	BaseLevel    string      `json:"baseline_c_lo"`
	BaseRadius   float64     `json:"baseline_radius"`
	Radius       float64     `json:"radius"`
	Ratio        float64     `json:"ratio"` // radius / baseline_radius
	P            [][]string  `json:"P"`
	Q            [][]float64 `json:"Q"`
	Candidates   int         `json:"candidates"`
	Unsuccessful int         `json:"unsuccessful"`
}

// CounterexampleJS is the exact point behind c_hi: the states, V and V̇ there.
type CounterexampleJS struct {
	Point map[string]string `json:"point"`
	// Params is the parameter value at which V̇ ≥ 0 holds at Point.
	Params map[string]string `json:"parameters,omitempty"`
	V      string            `json:"V"`
	Vdot   string            `json:"vdot"`
}

// ParamRangeJS is a free parameter's closed range [lo, hi], exact.
type ParamRangeJS struct {
	Name string `json:"name"`
	Lo   string `json:"lo"`
	Hi   string `json:"hi"`
}

// forEvery is how text and JSON name the scope of a level certified over
// a box of parameter values.
const forEvery = "every parameter value in the box"

// paramBox writes the box as "a ∈ [1, 2], b ∈ [0, 1]".
func paramBox(res *basin.Result) string {
	var parts []string
	for i, name := range res.Params {
		parts = append(parts, fmt.Sprintf("%s ∈ [%s, %s]", name, res.ParamBox[i].Lo.Value.RatString(), res.ParamBox[i].Hi.Value.RatString()))
	}
	return strings.Join(parts, ", ")
}

// counterParams writes the parameter value of the counterexample as
// "a = 1, b = 0".
func counterParams(res *basin.Result) string {
	var parts []string
	for i, name := range res.Params {
		parts = append(parts, name+" = "+res.CounterParams[i].RatString())
	}
	return strings.Join(parts, ", ")
}

// dec writes q with six significant digits.
func dec(q *big.Rat) string {
	f, _ := q.Float64()
	return fmt.Sprintf("%.6g", f)
}

// BasinJSON is the JSON of res; written is the certificate file, "" when none.
func BasinJSON(res *basin.Result, written string) BasinOutput {
	d := res.Direct
	out := BasinOutput{V: d.V.String(), Vdot: d.Vdot.String(), CLo: res.Level.RatString(), CLoDecimal: dec(res.Level),
		Method: res.Method, Rule: res.Rule, Note: res.Note, Boxes: res.Inside + res.Outside, Verdict: res.Check.Verdict, Claim: res.Check.Kind,
		Digest: res.Doc.Digest, Checks: len(res.Check.Records), Certificate: written}
	for _, a := range res.Equilibrium {
		out.Equilibrium = append(out.Equilibrium, a.RatString())
	}
	if res.Upper != nil {
		hi, hd, gap := res.Upper.RatString(), dec(res.Upper), fmt.Sprintf("%.4g", res.Gap())
		out.CHi, out.CHiDecimal, out.Gap = &hi, &hd, &gap
		ce := &CounterexampleJS{Point: map[string]string{}, V: res.Upper.RatString(), Vdot: res.CounterVdot.RatString()}
		for i, s := range d.Model.States {
			ce.Point[s] = res.Counterexample[i].RatString()
		}
		if len(res.CounterParams) > 0 {
			ce.Params = map[string]string{}
			for i, name := range res.Params {
				ce.Params[name] = res.CounterParams[i].RatString()
			}
		}
		out.Counterexample = ce
	}
	for i, name := range res.Params {
		out.Parameters = append(out.Parameters, ParamRangeJS{Name: name, Lo: res.ParamBox[i].Lo.Value.RatString(), Hi: res.ParamBox[i].Hi.Value.RatString()})
		out.HoldsFor = forEvery
	}
	return out
}

// ImproveJSON is the JSON of a search over quadratic V: the chosen
// estimate's, with the comparison to the baseline.
func ImproveJSON(imp *basin.Improvement, written string) BasinOutput {
	out := BasinJSON(imp.Result, written)
	js := &ImproveJS{Baseline: imp.BaseName, BaseLevel: imp.Base.Level.RatString(), BaseRadius: imp.BaseRadius, Radius: imp.Radius,
		Q: imp.Q, Candidates: imp.Tried, Unsuccessful: imp.Failed}
	if imp.BaseRadius > 0 {
		js.Ratio = imp.Radius / imp.BaseRadius
	}
	for _, row := range imp.P {
		var r []string
		for _, x := range row {
			r = append(r, x.RatString())
		}
		js.P = append(js.P, r)
	}
	out.Improve = js
	return out
}

// ImproveText writes a search over quadratic V for a terminal: the chosen
// estimate as BasinText does, then the comparison with the baseline.
func ImproveText(w io.Writer, imp *basin.Improvement, written string) error {
	if err := BasinText(w, imp.Result, written); err != nil {
		return err
	}
	ew := &errWriter{w: w}
	fmt.Fprintf(ew, "\nSearch over V = yᵀPy (y = x − x*, AᵀP + PA = −Q, A the linearization): %d candidates certified, %d without a level.\n", imp.Tried, imp.Failed)
	fmt.Fprintf(ew, "  largest ball about the equilibrium inside the certified set, radius sqrt(c_lo/λ_max(P)):\n")
	fmt.Fprintf(ew, "    %-12s c_lo = %s, radius %.6g\n", imp.BaseName+":", dec(imp.Base.Level), imp.BaseRadius)
	if imp.Q == nil {
		fmt.Fprintf(ew, "  no candidate did better; the estimate above is the baseline's.\n")
		return ew.err
	}
	var rows []string
	for _, row := range imp.P {
		var r []string
		for _, x := range row {
			r = append(r, x.RatString())
		}
		rows = append(rows, strings.Join(r, ", "))
	}
	fmt.Fprintf(ew, "    %-12s c_lo = %s, radius %.6g (%+.1f %%)\n", "chosen V:", dec(imp.Result.Level), imp.Radius, 100*(imp.Radius/imp.BaseRadius-1))
	fmt.Fprintf(ew, "  P = [%s], from Q = %s\n", strings.Join(rows, "; "), qString(imp.Q))
	fmt.Fprintf(ew, "  (λ_max(P) in floating point; the level and the certificate are exact)\n")
	return ew.err
}

func qString(q [][]float64) string {
	var rows []string
	for _, row := range q {
		var r []string
		for _, x := range row {
			r = append(r, fmt.Sprintf("%.4g", x))
		}
		rows = append(rows, strings.Join(r, ", "))
	}
	return "[" + strings.Join(rows, "; ") + "]"
}

// BasinText writes res for a terminal; written is the certificate file, ""
// when none. It returns the first write error.
func BasinText(w io.Writer, res *basin.Result, written string) error {
	ew := &errWriter{w: w}
	d := res.Direct
	m := d.Model
	modelHeader(ew, m)
	fmt.Fprintf(ew, "V  = %s\nV̇  = %s\n", d.V, d.Vdot)
	var at []string
	for _, a := range res.Equilibrium {
		at = append(at, a.RatString())
	}
	fmt.Fprintf(ew, "equilibrium (%s) = (%s)\n\n", strings.Join(m.States, ", "), strings.Join(at, ", "))
	fmt.Fprintf(ew, "Region of attraction by sublevel sets of V:\n")
	if res.SProcedure != nil {
		fmt.Fprintf(ew, "  c_lo = %s ≈ %s  certified: every state of {V ≤ c_lo} tends to the equilibrium\n", res.Level.RatString(), dec(res.Level))
		fmt.Fprintf(ew, "         (S-procedure, sublevel-sprocedure, re-checked exactly)\n")
	} else {
		fmt.Fprintf(ew, "  c_lo = %s ≈ %s  certified: every state in the component of {V ≤ c_lo} around the\n", res.Level.RatString(), dec(res.Level))
		fmt.Fprintf(ew, "         equilibrium tends to it (branch and bound, sublevel-basin, re-checked exactly)\n")
	}
	if len(res.Params) > 0 {
		fmt.Fprintf(ew, "         for %s: %s\n", forEvery, paramBox(res))
	}
	if res.Upper != nil {
		var pt []string
		for i, s := range m.States {
			pt = append(pt, s+" = "+res.Counterexample[i].RatString())
		}
		fmt.Fprintf(ew, "  c_hi = %s\n       ≈ %s  V̇ ≥ 0 at the exact point %s (V̇ = %s)\n", res.Upper.RatString(), dec(res.Upper), strings.Join(pt, ", "), dec(res.CounterVdot))
		if len(res.CounterParams) > 0 {
			fmt.Fprintf(ew, "         with the parameters at %s, so no level above c_hi can be certified for the whole box\n", counterParams(res))
		}
		fmt.Fprintf(ew, "  gap (c_hi − c_lo)/c_hi = %.2f %%\n", 100*res.Gap())
	} else {
		fmt.Fprintf(ew, "  c_hi: none found\n")
	}
	if res.Note != "" {
		fmt.Fprintf(ew, "  note: %s\n", res.Note)
	}
	fmt.Fprintf(ew, "  method: %s\n", res.Method)
	fmt.Fprintf(ew, "\nThe direct method: %s (%s); checker: %d checks passed.\n", res.Check.Verdict, res.Check.Kind, len(res.Check.Records))
	if written != "" {
		fmt.Fprintf(ew, "Certificate written to %s (lyacert verify %s re-checks it).\n", written, written)
	}
	return ew.err
}

// contour returns the segments of {f = 0} on a grid over the view (marching
// squares, common practice), for pictures only.
func contour(f func(x, y float64) float64, x0, x1, y0, y1 float64, cells int) [][4]float64 {
	var segs [][4]float64
	dx, dy := (x1-x0)/float64(cells), (y1-y0)/float64(cells)
	val := make([][]float64, cells+1)
	for i := range val {
		val[i] = make([]float64, cells+1)
		for j := range val[i] {
			val[i][j] = f(x0+float64(i)*dx, y0+float64(j)*dy)
		}
	}
	for i := range cells {
		for j := range cells {
			// Corners counter-clockwise, and the crossings on the four edges.
			cx := [4]float64{x0 + float64(i)*dx, x0 + float64(i+1)*dx, x0 + float64(i+1)*dx, x0 + float64(i)*dx}
			cy := [4]float64{y0 + float64(j)*dy, y0 + float64(j)*dy, y0 + float64(j+1)*dy, y0 + float64(j+1)*dy}
			cv := [4]float64{val[i][j], val[i+1][j], val[i+1][j+1], val[i][j+1]}
			var pts []float64
			for e := range 4 {
				a, b := cv[e], cv[(e+1)%4]
				if (a < 0) != (b < 0) {
					s := a / (a - b)
					pts = append(pts, cx[e]+s*(cx[(e+1)%4]-cx[e]), cy[e]+s*(cy[(e+1)%4]-cy[e]))
				}
			}
			for k := 0; k+3 < len(pts); k += 4 {
				segs = append(segs, [4]float64{pts[k], pts[k+1], pts[k+2], pts[k+3]})
			}
		}
	}
	return segs
}

// segLayer draws line segments (x0, y0, x1, y1).
type segLayer struct {
	segs  [][4]float64
	style draw.LineStyle
}

func (s *segLayer) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	for _, g := range s.segs {
		c.StrokeLines(s.style, c.ClipLinesXY([]vg.Point{{X: trX(g[0]), Y: trY(g[1])}, {X: trX(g[2]), Y: trY(g[3])}})...)
	}
}

func (s *segLayer) Thumbnail(c *draw.Canvas) {
	y := c.Center().Y
	c.StrokeLine2(s.style, c.Min.X, y, c.Max.X, y)
}

// BasinPlot draws an estimate in the plane of two states (plane names
// them; the first two when it is empty), the others at the equilibrium:
// the boundary of the certified sublevel set {V = c_lo} in that slice, the
// curve V̇ = 0 there, the counterexample (projected onto the plane when the
// model has more states), and trajectories of the Dormand–Prince
// integrator, in every state, from points of the slice just inside the set
// (solid) and just outside {V ≤ c_hi} (dashed), drawn projected onto the
// plane. The picture is float64 and proves nothing.
func BasinPlot(res *basin.Result, format string, plane ...string) ([]byte, error) {
	m := res.Direct.Model
	if len(res.Params) > 0 {
		return nil, fmt.Errorf("the plot needs every parameter fixed (free: %s)", strings.Join(res.Params, ", "))
	}
	if len(m.States) < 2 {
		return nil, fmt.Errorf("the plot needs at least two states, the model has %d", len(m.States))
	}
	ij, err := planeOf(m.States, plane)
	if err != nil {
		return nil, err
	}
	var fs [][]*big.Rat
	for _, i := range ij {
		fs = append(fs, []*big.Rat{res.Box[i].Lo.Value, res.Box[i].Hi.Value})
	}
	s := newBasinScene(m.States, res.Direct.V.Num, res.Direct.Vdot.Num, m.F, res.Equilibrium, res.Level, fs, ij)
	if res.SProcedure != nil {
		s.frame = "box searched"
	}
	s.title = fmt.Sprintf("Region of attraction: {V ≤ %s} certified", dec(res.Level))
	if res.Upper != nil {
		s.title += fmt.Sprintf(", c_hi = %s", dec(res.Upper))
		s.upper, _ = res.Upper.Float64()
		for _, i := range ij {
			x, _ := res.Counterexample[i].Float64()
			s.counter = append(s.counter, x)
		}
	}
	if len(m.States) > 2 {
		var fixed []string
		for k, name := range m.States {
			if k != ij[0] && k != ij[1] {
				fixed = append(fixed, name+" = "+res.Equilibrium[k].RatString())
			}
		}
		s.title += "\nslice " + strings.Join(fixed, ", ")
		s.projected = true
	}
	return renderPlot(6*vg.Inch, 6*vg.Inch, format, func(c draw.Canvas) { s.plot().Draw(c) })
}

// planeOf returns the indices of the two states of a plot's plane, named
// in plane (the first two states when it is empty).
func planeOf(states, plane []string) ([2]int, error) {
	if len(plane) == 0 {
		return [2]int{0, 1}, nil
	}
	var ij [2]int
	if len(plane) != 2 || plane[0] == plane[1] {
		return ij, fmt.Errorf("the plane of the plot is two different states, not %q", strings.Join(plane, ","))
	}
	for k, name := range plane {
		i := slices.Index(states, name)
		if i < 0 {
			return ij, fmt.Errorf("the plane of the plot names %q, not a state (states: %s)", name, strings.Join(states, ", "))
		}
		ij[k] = i
	}
	return ij, nil
}

// basinScene is what a picture of a certified sublevel set shows, in the
// plane of two states (the others at the equilibrium), all in float64: V,
// V̇ and the right-hand sides in every state, the equilibrium, the level
// c_lo, the box's sides in the plane and, when known, c_hi with its point
// in the plane.
type basinScene struct {
	states    []string
	ij        [2]int
	v, vd     certify.FloatPoly
	f         []certify.FloatPoly
	at        []float64
	level     float64
	box       [4]float64 // x0, x1, y0, y1 in the plane
	upper     float64    // 0 when unknown
	counter   []float64  // nil when unknown
	title     string
	frame     string // the legend of the box drawn; "" for "paved box"
	projected bool   // more than two states: trajectories and point projected
}

// newBasinScene converts the exact data of a basin to float64; sides are
// the box's [lo, hi] for the two states ij of the plane.
func newBasinScene(states []string, v, vdot *poly.Poly, f []poly.RatFunc, at []*big.Rat, level *big.Rat, sides [][]*big.Rat, ij [2]int) *basinScene {
	n := len(states)
	s := &basinScene{states: states, ij: ij, v: certify.NewFloatPoly(v, n), vd: certify.NewFloatPoly(vdot, n), at: make([]float64, n)}
	for i := range n {
		s.f = append(s.f, certify.NewFloatPoly(f[i].Num, n))
		s.at[i], _ = at[i].Float64()
	}
	for k := range 2 {
		s.box[2*k], _ = sides[k][0].Float64()
		s.box[2*k+1], _ = sides[k][1].Float64()
	}
	s.level, _ = level.Float64()
	return s
}

// point is the state with the plane's coordinates (x, y), the others at
// the equilibrium.
func (s *basinScene) point(x, y float64) []float64 {
	pt := append([]float64(nil), s.at...)
	pt[s.ij[0]], pt[s.ij[1]] = x, y
	return pt
}

// plot draws the scene: the curves V = c_lo and V̇ = 0 in the plane by
// marching squares on a 300 × 300 grid, trajectories of the Dormand–Prince
// integrator from points just inside {V ≤ c_lo} (solid) and, with c_hi,
// just outside {V ≤ c_hi} (dashed), the counterexample and the box.
func (s *basinScene) plot() *plot.Plot {
	v, vd, fs, clo := s.v, s.vd, s.f, s.level
	box := s.box
	i, j := s.ij[0], s.ij[1]
	// A margin of a quarter around the paved box.
	wx, wy := box[1]-box[0], box[3]-box[2]
	x0, x1, y0, y1 := box[0]-wx/4, box[1]+wx/4, box[2]-wy/4, box[3]+wy/4
	p := plot.New()
	p.Title.Text = s.title
	p.X.Label.Text, p.Y.Label.Text = s.states[i], s.states[j]
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = x0, x1, y0, y1
	level := &segLayer{contour(func(x, y float64) float64 { return v.Eval(s.point(x, y)) - clo }, x0, x1, y0, y1, 300),
		draw.LineStyle{Color: holdsColor, Width: vg.Points(2)}}
	zero := &segLayer{contour(func(x, y float64) float64 { return vd.Eval(s.point(x, y)) }, x0, x1, y0, y1, 300),
		draw.LineStyle{Color: color.RGBA{0xd9, 0x5f, 0x02, 0xff}, Width: vg.Points(1)}}
	frame := &segLayer{[][4]float64{{box[0], box[2], box[1], box[2]}, {box[1], box[2], box[1], box[3]}, {box[1], box[3], box[0], box[3]}, {box[0], box[3], box[0], box[2]}},
		draw.LineStyle{Color: color.Gray{0xa0}, Width: vg.Points(0.7), Dashes: []vg.Length{vg.Points(1), vg.Points(2)}}}
	p.Add(frame, level, zero)
	p.Legend.Add("V = c_lo (certified)", level)
	p.Legend.Add("V̇ = 0", zero)
	if s.frame == "" {
		p.Legend.Add("paved box", frame)
	} else {
		p.Legend.Add(s.frame, frame)
	}
	rhs := func(x, dx []float64) {
		for k := range fs {
			dx[k] = fs[k].Eval(x)
		}
	}
	far := 10 * math.Max(x1-x0, y1-y0)
	traj := func(start []float64, dashed bool) *plotter.Line {
		r, _ := ode.Integrate(rhs, 0, 30, start, ode.Options{RelTol: 1e-7, AbsTol: 1e-9, MaxSteps: 20000,
			Stop: func(_ float64, x []float64) bool {
				for k := range x {
					if math.Abs(x[k]-s.at[k]) > far {
						return true
					}
				}
				return false
			}})
		if r == nil {
			return nil
		}
		var pts plotter.XYs
		for _, x := range r.X {
			pts = append(pts, plotter.XY{X: x[i], Y: x[j]})
		}
		l, err := plotter.NewLine(pts)
		if err != nil {
			return nil
		}
		l.Color = color.RGBA{0x44, 0x44, 0x44, 0xff}
		l.Width = vg.Points(0.7)
		if dashed {
			l.Dashes = []vg.Length{vg.Points(3), vg.Points(2)}
		}
		return l
	}
	// Starts on rays from the equilibrium in the plane: where V reaches
	// 0.95·c_lo (inside) and 1.1·c_hi (outside).
	atx, aty := s.at[i], s.at[j]
	ray := func(th, c float64) []float64 {
		lo, hi := 0.0, 1e-3
		pt := func(t float64) []float64 { return s.point(atx+t*math.Cos(th), aty+t*math.Sin(th)) }
		for hi < 1e3 && v.Eval(pt(hi)) < c {
			lo, hi = hi, hi*1.5
		}
		for range 50 {
			if mid := (lo + hi) / 2; v.Eval(pt(mid)) < c {
				lo = mid
			} else {
				hi = mid
			}
		}
		return pt(hi)
	}
	var inL, outL *plotter.Line
	for k := range 6 {
		th := 2*math.Pi*float64(k)/6 + 0.3
		if l := traj(ray(th, 0.95*clo), false); l != nil {
			p.Add(l)
			inL = l
		}
		if s.upper > 0 && k%2 == 0 {
			if l := traj(ray(th, 1.1*s.upper), true); l != nil {
				p.Add(l)
				outL = l
			}
		}
	}
	proj := ""
	if s.projected {
		proj = " (projected)"
	}
	if inL != nil {
		p.Legend.Add("trajectories from inside"+proj, inL)
	}
	if outL != nil {
		p.Legend.Add("from V = 1.1·c_hi"+proj, outL)
	}
	if s.counter != nil {
		sc, err := plotter.NewScatter(plotter.XYs{{X: s.counter[0], Y: s.counter[1]}})
		if err == nil {
			sc.GlyphStyle.Shape = draw.CrossGlyph{}
			sc.GlyphStyle.Radius = vg.Points(7)
			sc.GlyphStyle.Color = color.RGBA{0xb2, 0x18, 0x2b, 0xff}
			p.Add(sc)
			p.Legend.Add("counterexample (V̇ ≥ 0)"+proj, sc)
		}
	}
	p.Legend.Top = true
	// The view, set again: Add widens it to every point of an escaping
	// trajectory, which would shrink the set to a sliver.
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = x0, x1, y0, y1
	return p
}
