package report

import (
	"bytes"
	"fmt"
	htmltemplate "html/template"
	"io"
	"math/big"
	"slices"
	"strings"
	texttemplate "text/template"

	"github.com/lyacert/lyacert/certify/branches"
	"github.com/lyacert/lyacert/certify/equilibria"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// AnalysisOptions control the report of an analysis of equilibrium
// branches (RenderAnalysis).
type AnalysisOptions struct {
	// Format is the output format; the zero value is Markdown.
	Format Format
	// WholeDocument makes a LaTeX report a whole document.
	WholeDocument bool
	// Tool names the program and its version, for example "lyacert 0.1.0".
	Tool string
	// Figure is given the bifurcation diagram of a Markdown or LaTeX report
	// (a PNG; LaTeX includes it with \includegraphics), with a suggested
	// file name, and returns the path to reference it by. Without it those
	// reports omit the diagram with a note; an HTML report draws it inline
	// (SVG) and never calls it.
	Figure func(name string, data []byte) (ref string, err error)
	// States are the states drawn in the diagram (DiagramStates); nil draws
	// one panel per state.
	States []int
}

// analysisPage is everything an analysis report shows.
type analysisPage struct {
	Title       string
	Source      string
	Tool        string
	Description [][]string
	Discrete    bool
	States      node
	Params      []rich
	Equations   []display
	ClosedForm  bool
	Reason      string
	Complete    string
	Notes       []string
	Branches    []branchView
	Param       node // the classified parameter; nil with none
	Ends        []rich
	Bifurcs     []rich
	Diagram     *diagramView
	Map         *mapView // two or more free parameters: the map over their box
	Samples     []sampleView
	SampledNote string
	Note        string
	Cautions    []string
}

// branchView is one branch: its coordinates, where it exists, and its
// classification along the parameter.
type branchView struct {
	ID       int
	Coords   []display
	Exists   rich
	Isolated bool
	Pieces   []rich
}

// mapView is the map over several free parameters: each branch's share of
// the box per label, and the picture for two parameters.
type mapView struct {
	Title, Intro string
	Branches     []mapBranchView
	Diagram      *diagramView
}

type mapBranchView struct {
	ID    int
	Lines []string
}

// diagramView is the bifurcation diagram: inline SVG (HTML), or a PNG
// file beside the report (Markdown, LaTeX).
type diagramView struct {
	SVG     string
	Figure  string
	Note    string
	Caption string
}

// sampleView is one grid value of a sampled analysis, as lines of text.
type sampleView struct {
	Head  string
	Lines []string
}

// analysisNoteReport is the report's closing note on what it is.
const analysisNoteReport = "Every decision in it is exact (rational arithmetic, Sturm sequences), but no certificate is written for it and the checker has not re-checked it. Fix every parameter to certify one equilibrium (lyacert find --set)."

// analysisCaution is the caution of an analysis report.
const analysisCaution = "This analysis is of the model above under its stated assumptions, not of the physical system. Modelling error, unmodelled dynamics, saturation, delay and sampling can change the equilibria and their stability. Defer to the applicable standards and to licensed engineering judgement."

var symNeq = symbol{`\ne`, "<mo>≠</mo>"}

// RenderAnalysis writes the report of an analysis of the equilibrium
// branches of m with free parameters (certify/branches): the model, the
// branches in closed form, their classification and the bifurcations along
// the one free parameter, and the bifurcation diagram; where the branches
// have no closed form, the sampled analysis s when given (nil otherwise).
func RenderAnalysis(w io.Writer, m *model.Model, an *branches.Analysis, s *equilibria.Sampling, opts AnalysisOptions) error {
	p, err := buildAnalysis(m, an, s, opts)
	if err != nil {
		return err
	}
	if err := analysisMap(p, m, an, opts); err != nil {
		return err
	}
	if err := analysisDiagram(p, m, an, opts); err != nil {
		return err
	}
	var buf bytes.Buffer
	switch opts.Format {
	case Markdown, "":
		err = analysisMD.Execute(&buf, p)
	case LaTeX:
		err = analysisTeX.Execute(&buf, analysisTeXData{p, opts.WholeDocument})
	case HTML:
		err = analysisHTML.Execute(&buf, p)
	default:
		return fmt.Errorf("unknown report format %q (want md, tex or html)", opts.Format)
	}
	if err != nil {
		return err
	}
	_, err = w.Write(buf.Bytes())
	return err
}

type analysisTeXData struct {
	*analysisPage
	WholeDocument bool
}

func buildAnalysis(m *model.Model, an *branches.Analysis, s *equilibria.Sampling, opts AnalysisOptions) (*analysisPage, error) {
	b := &builder{m: m, r: m.Ring}
	p := &analysisPage{
		Title: "Equilibrium analysis", Source: m.File, Tool: opts.Tool, Discrete: m.Discrete,
		Description: paragraphs(m.Description), ClosedForm: an.ClosedForm,
		Reason: strings.TrimPrefix(an.Reason, "no closed form: "), Notes: append(slices.Clone(an.Notes), degenerateReportNotes(m, an)...),
		Note: analysisNoteReport, Cautions: []string{analysisCaution},
	}
	if m.File != "" {
		p.Title += ": " + m.File
	}
	var states list
	for _, st := range m.States {
		states = append(states, name{st})
	}
	p.States = states
	for _, pr := range m.Params {
		p.Params = append(p.Params, paramRich(pr))
	}
	for i, st := range m.States {
		p.Equations = append(p.Equations, display{dotted{name{st}, m.Discrete}, ratFuncNode(m.F[i]), nil})
	}
	if !an.ClosedForm {
		if s != nil {
			p.SampledNote = SampledNote
			p.Samples = sampleViews(m, s)
		}
		return p, nil
	}
	p.Complete = "The list is complete for every parameter value."
	if len(an.Degenerate) > 0 {
		p.Complete = "The list is complete at every parameter value except those named in the notes below."
	}
	if hasNonzero(an) {
		p.Complete = "The list is complete at every parameter value where no condition the elimination divided by vanishes; where one does, fix the parameters there to see that point."
	}
	pi := -1
	if an.Param != "" {
		pi, _ = an.Ring.Index(an.Param)
		p.Param = name{an.Param}
	}
	for i, br := range an.Branches {
		bv := branchView{ID: i + 1, Isolated: br.Isolated()}
		for k, st := range m.States {
			bv.Coords = append(bv.Coords, display{name{st}, surdNode(br.Coords[k]), nil})
		}
		bv.Exists = existsRich(br)
		if pi >= 0 && br.Isolated() {
			for _, pc := range BranchPieces(an, i) {
				iv := spanOutput(pc.Span, an.Ring, pi)
				set, err := b.intervalNode(iv)
				if err != nil {
					return nil, err
				}
				text := className(pc.Label) + ", " + pc.Label.Stability
				if pc.Label.Stability == "unstable" && pc.Label.Unstable > 0 {
					text += fmt.Sprintf(" (%d unstable eigenvalue", pc.Label.Unstable)
					if pc.Label.Unstable > 1 {
						text += "s"
					}
					text += ")"
				}
				bv.Pieces = append(bv.Pieces, rich{relation{p.Param, symIn, set}, ": " + text})
			}
		}
		p.Branches = append(p.Branches, bv)
	}
	if pi >= 0 {
		for _, bf := range an.Bifurcations {
			o := bifurcationOutput(an, bf, pi)
			pt := ""
			if o.Poly != nil {
				pt = *o.Poly
			}
			v, err := b.end(o.Value, pt, o.Isolating)
			if err != nil {
				return nil, err
			}
			var val node = relation{p.Param, symEq, v}
			if o.Poly == nil && strings.Contains(o.Value, "/") {
				val = relation{val, symApprox, decimalSym(shortDecimal(o.Decimal))}
			}
			p.Bifurcs = append(p.Bifurcs, rich{val, ": " + o.Kind + " (" + bifurcationBranches(o) + ")."})
		}
		ends, err := b.alphaDefs(0, pi)
		if err != nil {
			return nil, err
		}
		p.Ends = ends
	}
	return p, nil
}

// existsRich says where a branch exists: w ≥ 0 under its square root,
// and the conditions c ≠ 0 the elimination divided by.
func existsRich(br *branches.Branch) rich {
	if neverReal(br) {
		return rich{"No real equilibrium: the expression under the square root is negative for every parameter value."}
	}
	var conds, assumes list
	if br.W != nil {
		conds = append(conds, relation{ratFuncNode(*br.W), symGeq, zeroNode})
	}
	seen := map[string]bool{}
	for _, c := range br.Nonzero {
		if !seen[c.String()] {
			seen[c.String()] = true
			assumes = append(assumes, relation{polyNode(c), symNeq, zeroNode})
		}
	}
	if len(conds) == 0 && len(assumes) == 0 {
		return rich{"It exists for every parameter value."}
	}
	var r rich
	if len(conds) > 0 {
		r = append(r, "It exists where ", conds, ".")
	}
	if len(assumes) > 0 {
		if len(r) > 0 {
			r = append(r, " ")
		}
		r = append(r, "It was derived assuming ", assumes, " (the elimination divided by these).")
	}
	return r
}

// intervalNode sets a piece of the parameter's range, with its irrational
// ends named α₁, α₂, … (builder.end).
func (b *builder) intervalNode(iv IntervalOutput) (node, error) {
	lp, hp := "", ""
	if iv.LoPoly != nil {
		lp = *iv.LoPoly
	}
	if iv.HiPoly != nil {
		hp = *iv.HiPoly
	}
	lo, err := b.end(iv.Lo, lp, iv.LoIsolating)
	if err != nil {
		return nil, err
	}
	hi, err := b.end(iv.Hi, hp, iv.HiIsolating)
	if err != nil {
		return nil, err
	}
	point := iv.Lo == iv.Hi && lp == hp && iv.LoClosed && iv.HiClosed
	return interval{lo: lo, hi: hi, loClosed: iv.LoClosed, hiClosed: iv.HiClosed, point: point}, nil
}

// sqrtNode is √n for any node n.
type sqrtNode struct{ n node }

func (r sqrtNode) tex() string         { return `\sqrt{` + r.n.tex() + `}` }
func (r sqrtNode) html() string        { return "<msqrt>" + r.n.html() + "</msqrt>" }
func (r sqrtNode) em(st style) float64 { return r.n.em(st) + 1.0*st.scale() }

// surdNode sets a + b·√w (branches.Surd).
func surdNode(x branches.Surd) node {
	if x.IsRational() {
		return ratFuncNode(x.A)
	}
	var rad node = sqrtNode{ratFuncNode(*x.W)}
	neg := false
	bf := x.B
	if c, ok := constOf(bf); ok {
		if c.Sign() < 0 {
			neg = true
			c = new(big.Rat).Neg(c)
		}
		if c.Cmp(big.NewRat(1, 1)) != 0 {
			rad = product{ratNode(c), rad}
		}
	} else {
		rad = product{parens{ratFuncNode(bf)}, rad}
	}
	if x.A.IsZero() {
		if neg {
			return sum{{true, rad}}
		}
		return rad
	}
	return sum{{false, ratFuncNode(x.A)}, {neg, rad}}
}

// constOf is f's value when f is a constant.
func constOf(f poly.RatFunc) (*big.Rat, bool) {
	if !f.IsPoly() || f.Num.Degree() > 0 {
		return nil, false
	}
	if f.IsZero() {
		return new(big.Rat), true
	}
	return f.Num.ConstTerm(), true
}

// sampleViews writes each grid value of a sampled analysis as text.
func sampleViews(m *model.Model, s *equilibria.Sampling) []sampleView {
	var out []sampleView
	for i := range s.Points {
		pt := &s.Points[i]
		sv := sampleView{Head: s.Param + " = " + pt.Value.RatString()}
		if pt.Err != "" {
			sv.Lines = []string{"not analysed: " + pt.Err}
			out = append(out, sv)
			continue
		}
		eqs := pt.Result.Search.Equilibria
		if len(eqs) == 0 {
			sv.Lines = []string{"no equilibrium"}
		}
		for j := range eqs {
			sv.Lines = append(sv.Lines, equilibriumText(m, &eqs[j])+": "+eqs[j].Class+", "+pt.SampleStability(j))
		}
		out = append(out, sv)
	}
	return out
}

// analysisDiagram draws the bifurcation diagram for the page: inline SVG
// for HTML, a PNG file through opts.Figure for Markdown and LaTeX.
func analysisDiagram(p *analysisPage, m *model.Model, an *branches.Analysis, opts AnalysisOptions) error {
	if !an.ClosedForm || an.Param == "" {
		return nil
	}
	states := opts.States
	if states == nil {
		for i := range m.States {
			states = append(states, i)
		}
	}
	d := &diagramView{Caption: "Each branch against " + an.Param + ": solid where stable, dashed where unstable or not hyperbolic; the bifurcations are marked and named in the legend. The drawing samples the exact branches in floating point; the exact values are above."}
	switch opts.Format {
	case HTML:
		svg, err := BifurcationDiagram(m, an, states, "svg")
		if err != nil {
			return err
		}
		d.SVG = inlineSVG(svg)
	default:
		// PNG for both: gonum's PDF backend sets only the standard fonts,
		// which lack the legend's ≈.
		ext := "png"
		if opts.Figure == nil {
			d.Note = "The bifurcation diagram is in the HTML report, or beside this file when it is written to a file."
			break
		}
		data, err := BifurcationDiagram(m, an, states, ext)
		if err != nil {
			return err
		}
		ref, err := opts.Figure("diagram."+ext, data)
		if err != nil {
			return err
		}
		d.Figure = ref
	}
	p.Diagram = d
	return nil
}

// analysisMap adds the map over several free parameters: the shares of
// each label per branch, and the picture for two parameters (inline SVG
// for HTML, a PNG through opts.Figure for Markdown and LaTeX).
func analysisMap(p *analysisPage, m *model.Model, an *branches.Analysis, opts AnalysisOptions) error {
	mp := an.Map
	if !an.ClosedForm || mp == nil {
		return nil
	}
	res := new(big.Rat).SetFrac(big.NewInt(1), new(big.Int).Lsh(big.NewInt(1), uint(mp.Level)))
	var sides []string
	for i, s := range mp.Box {
		sides = append(sides, mp.Params[i]+" in "+s.String())
	}
	v := &mapView{Title: "Classification over the box of " + strings.Join(mp.Params, " and "),
		Intro: "The box " + strings.Join(sides, ", ") + " is halved down to " + res.RatString() + " of each side while a label is undecided. Every label below holds on the whole box it is given for: the signs it rests on (trace, determinant, discriminant, Hurwitz determinants) are decided there by exact centred forms. Shares are exact shares of the box's volume."}
	for i := range an.Branches {
		bv := mapBranchView{ID: i + 1}
		for _, sh := range mapShares(mp, i) {
			k := sh.class
			if sh.stability != sh.class {
				k += ", " + sh.stability
			}
			f, _ := sh.share.Float64()
			bv.Lines = append(bv.Lines, fmt.Sprintf("%s: %.2f %% of the box (%s)", k, 100*f, sh.share.RatString()))
		}
		v.Branches = append(v.Branches, bv)
	}
	if len(mp.Params) == 2 {
		d := &diagramView{Caption: "Each panel is one branch over (" + strings.Join(mp.Params, ", ") + "); a box is coloured by the label decided on all of it, grey where undecided, white where the branch does not exist."}
		switch opts.Format {
		case HTML:
			svg, err := BranchMap(m, an, "svg")
			if err != nil {
				return err
			}
			d.SVG = inlineSVG(svg)
		default:
			if opts.Figure == nil {
				d.Note = "The map is in the HTML report, or beside this file when it is written to a file."
				break
			}
			data, err := BranchMap(m, an, "png")
			if err != nil {
				return err
			}
			ref, err := opts.Figure("map.png", data)
			if err != nil {
				return err
			}
			d.Figure = ref
		}
		v.Diagram = d
	}
	p.Map = v
	return nil
}

// inlineSVG makes an SVG file an element for an HTML page: no XML
// declaration or doctype, and the class that the page's style sizes.
func inlineSVG(data []byte) string {
	s := string(data)
	if i := strings.Index(s, "<svg"); i >= 0 {
		s = s[i:]
	}
	return strings.Replace(s, "<svg", `<svg class="plot" role="img"`, 1)
}

var analysisMD = texttemplate.Must(texttemplate.New("analysis.md.tmpl").Funcs(texttemplate.FuncMap{
	"t": mdText,
	"r": mdRich,
	"m": texInline,
	"disp": func(ds []display) string {
		return "$$\n\\begin{aligned}\n" + texAlign(ds) + "\n\\end{aligned}\n$$"
	},
}).ParseFS(templateFiles, "templates/analysis.md.tmpl"))

var analysisTeX = texttemplate.Must(texttemplate.New("analysis.tex.tmpl").Funcs(texttemplate.FuncMap{
	"reason": texReason,
	"t":      texReason,
	"r":      texRich,
	"m":      texInline,
	"disp": func(ds []display) string {
		return "\\begin{align*}\n" + texAlign(ds) + "\n\\end{align*}"
	},
	"longcode": func(s string) string { return `\texttt{` + texBreakable(s) + `}` },
}).ParseFS(templateFiles, "templates/analysis.tex.tmpl"))

// analysisHTML gets as trusted HTML only the mathematics and the diagram
// built here; every other string is escaped by html/template.
var analysisHTML = htmltemplate.Must(htmltemplate.New("analysis.html.tmpl").Funcs(htmltemplate.FuncMap{
	"r":    func(x rich) htmltemplate.HTML { return htmltemplate.HTML(htmlRich(x)) },
	"m":    func(n node) htmltemplate.HTML { return htmltemplate.HTML(htmlInline(n)) },
	"disp": func(ds []display) htmltemplate.HTML { return htmltemplate.HTML(htmlAlign(ds)) },
	"svg":  func(s string) htmltemplate.HTML { return htmltemplate.HTML(s) },
}).ParseFS(templateFiles, "templates/analysis.html.tmpl"))
