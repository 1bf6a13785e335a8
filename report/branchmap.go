package report

import (
	"fmt"
	"image/color"
	"io"
	"math/big"
	"path/filepath"
	"strings"

	"github.com/lyacert/lyacert/certify/branches"
	"github.com/lyacert/lyacert/model"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// MapOutput is the JSON of the map over two or more free parameters
// (branches.Map): the box, the resolution, the leaves with one label per
// branch, and each branch's exact share of the box per label.
type MapOutput struct {
	Params     []string        `json:"params"`
	Box        []MapSideOutput `json:"box"`
	Resolution string          `json:"resolution"` // 2^-level of each side, as p/q
	Boxes      int             `json:"boxes"`      // boxes examined
	// Truncated: the bound on boxes stopped the bisection before the
	// resolution; some undecided leaves are larger.
	Truncated bool             `json:"truncated"`
	Leaves    []MapLeafOutput  `json:"leaves"`
	Shares    []MapShareOutput `json:"shares"`
}

// MapSideOutput is one side of the paved box: exact ends and their
// openness.
type MapSideOutput struct {
	Name     string `json:"name"`
	Lo       string `json:"lo"`
	Hi       string `json:"hi"`
	LoClosed bool   `json:"lo_closed"`
	HiClosed bool   `json:"hi_closed"`
}

// MapLeafOutput is one leaf: its exact corners (one entry per parameter of
// params) and the label of every branch on the whole leaf.
type MapLeafOutput struct {
	Lo     []string         `json:"lo"`
	Hi     []string         `json:"hi"`
	Labels []MapLabelOutput `json:"labels"`
}

// MapLabelOutput is one branch's label on a leaf: class and stability as
// in the one-parameter classification; class "undecided" where the exact
// tests do not decide it on the whole leaf, "absent" where the branch
// does not exist there.
type MapLabelOutput struct {
	Branch              int    `json:"branch"`
	Class               string `json:"class"`
	Stability           string `json:"stability"`
	Stable              bool   `json:"stable"`
	UnstableEigenvalues int    `json:"unstable_eigenvalues"`
}

// MapShareOutput is the exact share p/q of the box's volume where a
// branch has one label.
type MapShareOutput struct {
	Branch    int    `json:"branch"`
	Class     string `json:"class"`
	Stability string `json:"stability"`
	Share     string `json:"share"`
	Decimal   string `json:"decimal"`
}

// mapClass is a label's class on a leaf of a map.
func mapClass(l branches.Label) string {
	switch {
	case l.Undecided:
		return "undecided"
	case !l.Exists:
		return "absent"
	}
	return className(l)
}

func mapStability(l branches.Label) string {
	if !l.Exists && !l.Undecided {
		return "absent"
	}
	return l.Stability
}

func mapKey(l branches.Label) string {
	c, s := mapClass(l), mapStability(l)
	if c == s {
		return c
	}
	return c + ", " + s
}

// MapJSON is the JSON of an's map; nil when it has none.
func MapJSON(an *branches.Analysis) *MapOutput {
	mp := an.Map
	if mp == nil {
		return nil
	}
	res := new(big.Rat).SetFrac(big.NewInt(1), new(big.Int).Lsh(big.NewInt(1), uint(mp.Level)))
	out := &MapOutput{Params: mp.Params, Box: []MapSideOutput{}, Resolution: res.RatString(), Boxes: mp.Boxes,
		Truncated: mp.Truncated, Leaves: []MapLeafOutput{}, Shares: []MapShareOutput{}}
	for i, s := range mp.Box {
		out.Box = append(out.Box, MapSideOutput{Name: mp.Params[i], Lo: s.Lo.Value.RatString(), Hi: s.Hi.Value.RatString(), LoClosed: !s.Lo.Open, HiClosed: !s.Hi.Open})
	}
	for _, l := range mp.Leaves {
		lo, hi := mp.Corners(l)
		lo2 := MapLeafOutput{Lo: ratStrings(lo), Hi: ratStrings(hi), Labels: []MapLabelOutput{}}
		for i, lab := range l.Labels {
			lo2.Labels = append(lo2.Labels, MapLabelOutput{Branch: i + 1, Class: mapClass(lab), Stability: mapStability(lab),
				Stable: lab.Exists && lab.Stability == "stable", UnstableEigenvalues: lab.Unstable})
		}
		out.Leaves = append(out.Leaves, lo2)
	}
	for i := range an.Branches {
		for _, sh := range mapShares(mp, i) {
			out.Shares = append(out.Shares, MapShareOutput{Branch: i + 1, Class: sh.class, Stability: sh.stability,
				Share: sh.share.RatString(), Decimal: sh.share.FloatString(6)})
		}
	}
	return out
}

func ratStrings(xs []*big.Rat) []string {
	out := make([]string, len(xs))
	for i, x := range xs {
		out[i] = x.RatString()
	}
	return out
}

type mapShare struct {
	class, stability string
	share            *big.Rat
}

func mapShares(mp *branches.Map, i int) []mapShare {
	keys, shares := mp.Shares(i, mapKey)
	classes := map[string]branches.Label{}
	for _, l := range mp.Leaves {
		classes[mapKey(l.Labels[i])] = l.Labels[i]
	}
	out := make([]mapShare, len(keys))
	for j, k := range keys {
		out[j] = mapShare{mapClass(classes[k]), mapStability(classes[k]), shares[j]}
	}
	return out
}

// mapText writes the map of an for a terminal: the box, then per branch
// the share of the box of each label.
func mapText(w io.Writer, an *branches.Analysis) {
	mp := an.Map
	var sides []string
	for i, s := range mp.Box {
		sides = append(sides, mp.Params[i]+" ∈ "+s.String())
	}
	res := new(big.Rat).SetFrac(big.NewInt(1), new(big.Int).Lsh(big.NewInt(1), uint(mp.Level)))
	fmt.Fprintf(w, "\nClassification over the box %s\n", strings.Join(sides, " × "))
	fmt.Fprintf(w, "  boxes halved down to %s of each side while a label is undecided; every label below holds on the whole\n", res.RatString())
	fmt.Fprintf(w, "  box it is given for, its signs decided by exact centred forms; %d leaves (%d boxes examined)\n", len(mp.Leaves), mp.Boxes)
	if mp.Truncated {
		fmt.Fprintln(w, "  stopped by the bound on boxes: some undecided boxes are larger than the resolution")
	}
	for i, b := range an.Branches {
		fmt.Fprintf(w, "  branch %d", i+1)
		if !b.Isolated() {
			fmt.Fprint(w, " (non-isolated)")
		}
		fmt.Fprintln(w)
		shares := mapShares(mp, i)
		keys := make([]string, len(shares))
		width := 0
		for j, s := range shares {
			keys[j] = s.class
			if s.stability != s.class {
				keys[j] += ", " + s.stability
			}
			width = max(width, len([]rune(keys[j])))
		}
		for j, s := range shares {
			k := keys[j]
			f, _ := s.share.Float64()
			fmt.Fprintf(w, "    %s%s  %6.2f %% of the box (%s)\n", k, strings.Repeat(" ", width-len([]rune(k))), 100*f, s.share.RatString())
		}
	}
	fmt.Fprintln(w, "  --json lists every box with its exact corners; --plot draws the map (two parameters).")
}

// mapColors colour a map's labels: stable in greens, unstable in reds and
// oranges, the rest in greys.
func mapColor(l branches.Label) color.Color {
	switch {
	case l.Undecided:
		return color.RGBA{0xd9, 0xd9, 0xd9, 0xff}
	case !l.Exists:
		return color.RGBA{0xff, 0xff, 0xff, 0xff}
	}
	switch mapClass(l) + "/" + l.Stability {
	case "node/stable":
		return color.RGBA{0x1b, 0x9e, 0x77, 0xff}
	case "focus/stable":
		return color.RGBA{0x66, 0xc2, 0xa5, 0xff}
	case "node/unstable":
		return color.RGBA{0xd9, 0x5f, 0x02, 0xff}
	case "focus/unstable":
		return color.RGBA{0xfc, 0x8d, 0x62, 0xff}
	case "saddle/unstable":
		return color.RGBA{0xe7, 0x29, 0x8a, 0xff}
	}
	if l.Stability == "stable" {
		return color.RGBA{0xa6, 0xd8, 0x54, 0xff}
	}
	if l.Stability == "unstable" {
		return color.RGBA{0x8d, 0xa0, 0xcb, 0xff}
	}
	return color.RGBA{0x73, 0x73, 0x73, 0xff}
}

// BranchMap draws the map of an (two free parameters): one panel per
// isolated branch, each leaf filled by its label, with a legend of the
// labels met. format is "svg", "png" or "pdf".
func BranchMap(m *model.Model, an *branches.Analysis, format string) ([]byte, error) {
	mp := an.Map
	if mp == nil {
		return nil, fmt.Errorf("no map: it needs two free parameters with bounded ranges or boxes")
	}
	if len(mp.Params) != 2 {
		return nil, fmt.Errorf("the map has %d parameters (%s); the picture needs two: fix the others with --set", len(mp.Params), strings.Join(mp.Params, ", "))
	}
	legend := plot.NewLegend()
	legend.Top, legend.Left = true, true
	seen := map[string]bool{}
	var panels []*plot.Plot
	for i, b := range an.Branches {
		if !b.Isolated() {
			continue
		}
		p := plot.New()
		p.Title.Text = fmt.Sprintf("branch %d", i+1)
		p.X.Label.Text = plainName(mp.Params[0])
		p.Y.Label.Text = plainName(mp.Params[1])
		x0, _ := mp.Box[0].Lo.Value.Float64()
		x1, _ := mp.Box[0].Hi.Value.Float64()
		y0, _ := mp.Box[1].Lo.Value.Float64()
		y1, _ := mp.Box[1].Hi.Value.Float64()
		p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = x0, x1, y0, y1
		for _, l := range mp.Leaves {
			lab := l.Labels[i]
			lo, hi := mp.Corners(l)
			a, _ := lo[0].Float64()
			c, _ := lo[1].Float64()
			bb, _ := hi[0].Float64()
			d, _ := hi[1].Float64()
			pg, err := plotter.NewPolygon(plotter.XYs{{X: a, Y: c}, {X: bb, Y: c}, {X: bb, Y: d}, {X: a, Y: d}})
			if err != nil {
				return nil, err
			}
			pg.Color = mapColor(lab)
			pg.LineStyle.Width = vg.Points(0.2)
			pg.LineStyle.Color = color.Gray{0xa0}
			p.Add(pg)
			if k := mapKey(lab); !seen[k] {
				seen[k] = true
				sw, _ := plotter.NewPolygon(plotter.XYs{{X: 0, Y: 0}, {X: 1, Y: 0}, {X: 1, Y: 1}})
				sw.Color = mapColor(lab)
				sw.LineStyle.Width = vg.Points(0.5)
				legend.Add(k, sw)
			}
		}
		panels = append(panels, p)
	}
	if len(panels) == 0 {
		return nil, fmt.Errorf("no isolated branch to draw")
	}
	cols := min(len(panels), 2)
	rows := (len(panels) + cols - 1) / cols
	grid := make([][]*plot.Plot, rows)
	for r := range grid {
		grid[r] = make([]*plot.Plot, cols)
		for c := range cols {
			if k := r*cols + c; k < len(panels) {
				grid[r][c] = panels[k]
			}
		}
	}
	title := fmt.Sprintf("Equilibrium branches of %s over (%s, %s): labels decided on whole boxes", filepath.Base(m.File), plainName(mp.Params[0]), plainName(mp.Params[1]))
	w := vg.Length(18) * vg.Centimeter
	panel := vg.Length(8) * vg.Centimeter
	head := vg.Length(1)*vg.Centimeter + legend.Rectangle(draw.Canvas{}).Size().Y
	h := head + panel*vg.Length(rows)
	tp := plot.New()
	return renderPlot(w, h, format, func(c draw.Canvas) {
		ts := tp.Title.TextStyle
		ts.XAlign, ts.YAlign = draw.XCenter, draw.YTop
		c.FillText(ts, vg.Point{X: (c.Min.X + c.Max.X) / 2, Y: c.Max.Y - vg.Millimeter}, title)
		lc := c
		lc.Max.Y -= ts.Height(title) + vg.Millimeter*3
		lc.Min.X += vg.Centimeter * 1.5
		legend.Draw(lc)
		body := draw.Crop(c, 0, 0, 0, -head)
		cs := plot.Align(grid, draw.Tiles{Rows: rows, Cols: cols, PadX: vg.Millimeter * 6, PadY: vg.Millimeter * 4}, body)
		for r := range grid {
			for k := range grid[r] {
				if grid[r][k] != nil {
					grid[r][k].Draw(cs[r][k])
				}
			}
		}
	})
}
