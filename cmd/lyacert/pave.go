package main

import (
	"bytes"
	"context"
	"fmt"
	"image/color"
	"io"
	"lyacert/certify/direct"
	"lyacert/checker"
	"math/big"
	"os"
	"os/signal"
	"path/filepath"
	"strings"

	"github.com/schollz/progressbar/v3"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"lyacert/certificates"
	"lyacert/model"
	"lyacert/poly"
)

// paveFlags are the options of check for regions in several parameters.
type paveFlags struct {
	Box        []string `name:"box" placeholder:"NAME=LO:HI" help:"Pave this range of a parameter instead of its allowed range (repeatable), e.g. --box r=0:2."`
	Resolution string   `name:"resolution" default:"1/256" placeholder:"P/Q" help:"Halve boxes until each side is at most this share of the box's side."`
	Plot       string   `name:"plot" placeholder:"FILE.svg|FILE.png" help:"Draw the paving (two parameters, or a 2-D slice) to this file."`
	Slice      []string `name:"slice" placeholder:"NAME=VALUE" help:"For more than two paved parameters: fix all but two for the plot (repeatable)."`
	Workers    int      `name:"workers" default:"0" help:"Goroutines for the paving (0: one per core); the result does not depend on it."`
}

// requested reports whether the user asked for a paving explicitly.
func (pf *paveFlags) requested() bool {
	return pf != nil && (len(pf.Box) > 0 || pf.Plot != "" || len(pf.Slice) > 0 || pf.Resolution != "1/256")
}

// options reads the flags into certify's paving options.
func (pf *paveFlags) options(e *env) (direct.PaveOptions, error) {
	var o direct.PaveOptions
	if pf == nil {
		return o, nil
	}
	res, err := constant(pf.Resolution, "--resolution")
	if err != nil {
		return o, err
	}
	o.Resolution = res
	o.Workers = pf.Workers
	o.Box = map[string][2]*big.Rat{}
	for _, s := range pf.Box {
		name, rng, ok := strings.Cut(s, "=")
		lo, hi, ok2 := strings.Cut(rng, ":")
		name = strings.TrimSpace(name)
		if !ok || !ok2 || name == "" {
			return o, fmt.Errorf("--box %q: expected NAME=LO:HI, e.g. r=0:2", s)
		}
		if _, dup := o.Box[name]; dup {
			return o, fmt.Errorf("--box %s: given twice", name)
		}
		l, err := constant(lo, "--box "+name+" (lower end)")
		if err != nil {
			return o, err
		}
		h, err := constant(hi, "--box "+name+" (upper end)")
		if err != nil {
			return o, err
		}
		o.Box[name] = [2]*big.Rat{l, h}
	}
	if f, ok := e.stderr.(*os.File); ok {
		if st, err := f.Stat(); err == nil && st.Mode()&os.ModeCharDevice != 0 {
			o.Progress = newBar(f)
		}
	}
	return o, nil
}

// constant reads an exact number or constant expression such as 1/256, -2, 0.35.
func constant(s, what string) (*big.Rat, error) {
	r := poly.NewRing(nil, nil)
	f, err := poly.ParseExpr(r, func(string) (poly.RatFunc, bool) { return poly.RatFunc{}, false }, strings.TrimSpace(s), poly.Pos{File: what, Line: 1, Col: 1})
	if err != nil {
		return nil, err
	}
	return f.Num.ConstTerm(), nil
}

// bar draws the paving's progress on a terminal.
type bar struct{ b *progressbar.ProgressBar }

func newBar(w io.Writer) *bar {
	return &bar{progressbar.NewOptions(1000,
		progressbar.OptionSetWriter(w),
		progressbar.OptionSetDescription("paving"),
		progressbar.OptionClearOnFinish(),
		progressbar.OptionSetWidth(30),
	)}
}

func (b *bar) Paved(share float64) {
	b.b.Set(int(share * 1000))
	if share >= 1 {
		b.b.Finish()
	}
}

// check runs the engine with the paving flags (defaults when pf is nil).
func (pf *paveFlags) check(m *model.Model, name string, e *env) (*direct.Result, error) {
	o, err := pf.options(e)
	if err != nil {
		return nil, fmt.Errorf("%w: %w", direct.ErrPaveOptions, err)
	}
	// An interrupt stops a long paving cleanly (nothing is written).
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	return direct.CheckPaving(ctx, m, name, o)
}

// finish writes the plot and reports on standard error a paving that was
// asked for and could not be made; it returns an exit code: 0 when nothing
// went wrong, exitInput when the plot cannot be made.
func (pf *paveFlags) finish(res *direct.Result, e *env) int {
	if pf == nil {
		return 0
	}
	paved := res.Region != nil && res.Region.Paving != nil
	if !paved && pf.requested() {
		why := res.PavingNote
		if why == "" {
			why = "no paving: the conditions that remain involve fewer than two parameters"
		}
		fmt.Fprintln(e.stderr, "lyacert: "+why)
		if pf.Plot != "" {
			return exitInput // what was asked for cannot be drawn
		}
		return 0
	}
	if pf.Plot == "" {
		return 0
	}
	if err := writePlot(pf.Plot, res.Region.Paving, pf.Slice); err != nil {
		fmt.Fprintln(e.stderr, "lyacert: --plot:", err)
		return exitInput
	}
	return 0
}

// renderPaving writes the paving for people: box, resolution, the three
// classes with their exact shares, and the product form when there is one.
func renderPaving(w io.Writer, res *direct.Result) {
	pv := res.Region.Paving
	sum, _ := certificates.Summarize(pv) // verified: well formed
	fmt.Fprintf(w, "Region of (%s) by set inversion (every inside box re-checked exactly)\n", strings.Join(pv.Params, ", "))
	var sides []string
	for i, s := range pv.Box {
		sides = append(sides, pv.Params[i]+" ∈ "+intervalText(s))
	}
	fmt.Fprintf(w, "  box          %s (volume %s)\n", strings.Join(sides, ", "), sum.Volume)
	fmt.Fprintf(w, "  resolution   %s of each side\n", pv.Resolution)
	for _, c := range []struct {
		name  string
		n     int
		share string
		note  string
	}{
		{"inside", sum.Inside, sum.InsideFraction, ", merged into " + boxes(len(sum.InsideBoxes))},
		{"outside", sum.Outside, sum.OutsideFraction, ""},
		{"undecided", sum.Undecided, sum.UndecidedFraction, ""},
	} {
		fmt.Fprintf(w, "  %-12s %s, %s of the box (%s)%s\n", c.name, boxes(c.n), percent(c.share), c.share, c.note)
	}
	if res.Paving != nil && res.Paving.Rejected > 0 {
		fmt.Fprintf(w, "  (%d float proposals were not confirmed by the exact test and were refined)\n", res.Paving.Rejected)
	}
	if len(res.Region.Paving.Product) > 0 {
		fmt.Fprintln(w, "  closed form (each condition involves one parameter):")
		fmt.Fprintf(w, "    %s\n", productText(res.Region.Paving.Product))
		var isol []string
		for _, f := range res.Region.Paving.Product {
			for _, iv := range f.Intervals {
				for _, e := range [][3]string{{iv.Lo, iv.LoPoly, isoText(iv.LoIsolating)}, {iv.Hi, iv.HiPoly, isoText(iv.HiIsolating)}} {
					if s := fmt.Sprintf("    %s is the root of %s in %s", e[0], e[1], e[2]); e[1] != "" && !containsStr(isol, s) {
						isol = append(isol, s)
					}
				}
			}
		}
		for _, s := range isol {
			fmt.Fprintln(w, s)
		}
	}
	fmt.Fprintln(w)
}

func boxes(n int) string {
	if n == 1 {
		return "1 box"
	}
	return fmt.Sprintf("%d boxes", n)
}

// productText writes a product region as "r ∈ [0, 1) × b ∈ (0, 4]".
func productText(fs []checker.SturmRegion) string {
	var parts []string
	for _, f := range fs {
		var ivs []string
		for _, iv := range f.Intervals {
			ivs = append(ivs, intervalText(iv))
		}
		if len(ivs) == 0 {
			ivs = []string{"∅"}
		}
		parts = append(parts, f.Param+" ∈ "+strings.Join(ivs, " ∪ "))
	}
	return strings.Join(parts, " × ")
}

// pavingWhere says where a paved region holds, for the verdict line.
func pavingWhere(res *direct.Result) string {
	pv := res.Region.Paving
	if len(pv.Product) > 0 {
		return "for " + productText(pv.Product)
	}
	sum, _ := certificates.Summarize(pv) // verified: well formed
	return fmt.Sprintf("on the inside boxes of the paving (%s of the box)", percent(sum.InsideFraction))
}

// percent writes an exact share as a percentage for people.
func percent(share string) string {
	q, ok := new(big.Rat).SetString(share)
	if !ok {
		return share
	}
	pc := new(big.Rat).Mul(q, big.NewRat(100, 1))
	s := pc.FloatString(2)
	// Never round a share that is not exactly 0 or 100% to look like one.
	switch {
	case s == "100.00" && pc.Cmp(big.NewRat(100, 1)) < 0:
		return ">99.99%"
	case s == "0.00" && pc.Sign() > 0:
		return "<0.01%"
	}
	return s + "%"
}

// Colours that stay apart in greyscale print, as in the reports: dark green
// inside, light red outside, mid grey undecided.
var classColors = map[byte]color.Color{
	checker.PaveInside:    color.RGBA{0x1b, 0x78, 0x37, 0xff},
	checker.PaveOutside:   color.RGBA{0xf4, 0xa5, 0x82, 0xff},
	checker.PaveUndecided: color.RGBA{0xbd, 0xbd, 0xbd, 0xff},
}

var classNames = map[byte]string{
	checker.PaveInside:    "inside: the conditions hold (proven)",
	checker.PaveOutside:   "outside: a condition fails (proven)",
	checker.PaveUndecided: "undecided at the resolution",
}

// writePlot draws the paving's leaves, coloured by class, over the first two
// parameters not fixed by a slice, and writes it (SVG or PNG by the file's
// extension) atomically. Slices fix every parameter but two; a leaf is drawn
// when the slice value lies in it (its lower end included, its upper end only
// at the top of the box).
func writePlot(path string, pv *checker.Paving, slice []string) error {
	format := strings.ToLower(strings.TrimPrefix(filepath.Ext(path), "."))
	if format != "svg" && format != "png" {
		return fmt.Errorf("%s: the file must end in .svg or .png", path)
	}
	leaves, err := certificates.Leaves(pv)
	if err != nil {
		return err
	}
	fixed := map[int]*big.Rat{}
	for _, s := range slice {
		name, val, ok := strings.Cut(s, "=")
		name = strings.TrimSpace(name)
		if !ok {
			return fmt.Errorf("--slice %q: expected NAME=VALUE", s)
		}
		i := indexOf(pv.Params, name)
		if i < 0 {
			return fmt.Errorf("--slice %s: not a paved parameter (paved: %s)", name, strings.Join(pv.Params, ", "))
		}
		v, err := constant(val, "--slice "+name)
		if err != nil {
			return err
		}
		lo, _ := new(big.Rat).SetString(pv.Box[i].Lo)
		hi, _ := new(big.Rat).SetString(pv.Box[i].Hi)
		if v.Cmp(lo) < 0 || v.Cmp(hi) > 0 {
			return fmt.Errorf("--slice %s=%s lies outside the paved side [%s, %s]", name, v.RatString(), pv.Box[i].Lo, pv.Box[i].Hi)
		}
		fixed[i] = v
	}
	var axes []int
	for i := range pv.Params {
		if _, ok := fixed[i]; !ok {
			axes = append(axes, i)
		}
	}
	if len(axes) != 2 {
		return fmt.Errorf("the plot needs exactly two free axes: %d parameters are paved (%s), so give --slice for all but two", len(pv.Params), strings.Join(pv.Params, ", "))
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
	for _, c := range []byte{checker.PaveInside, checker.PaveOutside, checker.PaveUndecided} {
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
	for _, c := range []byte{checker.PaveInside, checker.PaveOutside, checker.PaveUndecided} {
		p.Add(layers[c])
		p.Legend.Add(classNames[c]+", "+boxes(len(layers[c].boxes)), layers[c])
	}
	p.Legend.Top = true
	wt, err := p.WriterTo(6*vg.Inch, 5*vg.Inch, format)
	if err != nil {
		return err
	}
	var buf bytes.Buffer
	if _, err := wt.WriteTo(&buf); err != nil {
		return err
	}
	return certificates.WriteFileAtomic(path, buf.Bytes(), 0o644)
}

func indexOf(xs []string, s string) int {
	for i, x := range xs {
		if x == s {
			return i
		}
	}
	return -1
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
