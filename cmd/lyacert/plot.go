package main

import (
	"bytes"
	"image/color"
	"path/filepath"
	"slices"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"lyacert/certificates"
)

// categoryColors are chosen to stay apart for colour-blind readers
// (blue, light blue, orange, grey).
var categoryColors = [...]color.Color{
	catUndecided: color.RGBA{0xbb, 0xbb, 0xbb, 0xff},
	catUnstable:  color.RGBA{0xe6, 0x7e, 0x22, 0xff},
	catMixed:     color.RGBA{0x9e, 0xca, 0xe1, 0xff},
	catStable:    color.RGBA{0x21, 0x66, 0xac, 0xff},
}

// verdictCells draws one cell per grid point coloured by its category, and
// a black line wherever neighbouring cells differ: the boundary of the
// certified region as the grid resolves it.
type verdictCells struct {
	xs, ys []float64                // the distinct values of each axis, ascending
	cat    map[[2]int]pointCategory // by (x index, y index)
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

var legendNames = [...]string{
	catUndecided: "not decided",
	catUnstable:  "all certified unstable",
	catMixed:     "some certified stable",
	catStable:    "all certified stable",
}

// swatch is a legend entry's filled square.
type swatch struct{ c color.Color }

func (s swatch) Thumbnail(c *draw.Canvas) {
	c.FillPolygon(s.c, []vg.Point{c.Min, {X: c.Max.X, Y: c.Min.Y}, c.Max, {X: c.Min.X, Y: c.Max.Y}})
}

// plotSweep draws the categories of the grid points: a strip over one swept
// parameter, a heat map over two. The file's extension picks the format.
func plotSweep(path, title string, points []gridPoint) error {
	names := points[0].names
	v := &verdictCells{cat: map[[2]int]pointCategory{}}
	axis := func(i int) []float64 {
		var vs []float64
		for _, p := range points {
			if !slices.Contains(vs, p.values[i]) {
				vs = append(vs, p.values[i])
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
	for _, p := range points {
		xi := slices.Index(v.xs, p.values[0])
		yi := 0
		if len(names) == 2 {
			yi = slices.Index(v.ys, p.values[1])
		}
		v.cat[[2]int{xi, yi}] = p.cat
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
	seen := map[pointCategory]bool{}
	for _, c := range v.cat {
		seen[c] = true
	}
	leg := plot.NewLegend()
	for _, c := range []pointCategory{catStable, catMixed, catUnstable, catUndecided} {
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
	wt, err := draw.NewFormattedCanvas(width, height, strings.TrimPrefix(strings.ToLower(filepath.Ext(path)), "."))
	if err != nil {
		return err
	}
	// The plot on the left, the legend beside it where it hides no cell.
	dc := draw.New(wt)
	p.Draw(draw.Crop(dc, 0, -legend, 0, 0))
	leg.Draw(draw.Crop(dc, width-legend+vg.Centimeter/2, 0, 0, -vg.Centimeter))
	var buf bytes.Buffer
	if _, err := wt.WriteTo(&buf); err != nil {
		return err
	}
	return certificates.WriteFileAtomic(path, buf.Bytes(), 0o644)
}
