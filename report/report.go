package report

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math/big"
	"strings"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// Format is a report format.
type Format string

// The report formats.
const (
	Markdown Format = "md"   // GitHub-flavoured Markdown, math in $…$
	LaTeX    Format = "tex"  // a LaTeX fragment (amsmath), or a whole document
	HTML     Format = "html" // one self-contained, printable page
)

// Formats lists the report formats in the order they are documented.
var Formats = []Format{Markdown, LaTeX, HTML}

// ErrInvalid is returned for a certificate that the checker rejects: a
// report never presents such a certificate as evidence.
var ErrInvalid = errors.New("the certificate is invalid and proves nothing")

// Options control a report.
type Options struct {
	// Format is the output format; the zero value is Markdown.
	Format Format
	// WholeDocument makes a LaTeX report a whole document (preamble,
	// \begin{document} … \end{document}) rather than a fragment.
	WholeDocument bool
	// Checker names the checker and its version in the verification
	// record, for example "lyacert 0.1.0".
	Checker string
	// CertName is how the report refers to the certificate file in its
	// re-check instructions; "certificate.json" when empty.
	CertName string
	// Figure, when set, is given the plots that a Markdown report shows as
	// separate files (name is a suggested file name such as
	// "region-k.svg", data the SVG) and returns the path to reference them
	// by. Without it
	// a Markdown report omits its plots with a note; LaTeX and HTML
	// reports draw theirs inline and never call it.
	Figure func(name string, data []byte) (ref string, err error)
}

// Render writes the report of a certificate. The certificate is re-checked
// first with checker.Verify; the verification record in the report is
// that fresh result, never one stored anywhere. A certificate that the
// checker rejects gives an error wrapping ErrInvalid that lists the failed
// checks, and nothing is written.
func Render(w io.Writer, doc *claims.Document, opts Options) error {
	p, err := build(doc, opts)
	if err != nil {
		return err
	}
	var buf bytes.Buffer
	switch opts.Format {
	case Markdown, "":
		err = renderMarkdown(&buf, p, opts)
	case LaTeX:
		err = renderLaTeX(&buf, p, opts)
	case HTML:
		err = renderHTML(&buf, p)
	default:
		return fmt.Errorf("unknown report format %q (want md, tex or html)", opts.Format)
	}
	if err != nil {
		return err
	}
	_, err = w.Write(buf.Bytes())
	return err
}

// ParseFormat reads a format name: md (or markdown), tex (or latex), html.
func ParseFormat(s string) (Format, error) {
	switch strings.ToLower(s) {
	case "md", "markdown":
		return Markdown, nil
	case "tex", "latex":
		return LaTeX, nil
	case "html", "htm":
		return HTML, nil
	}
	return "", fmt.Errorf("unknown report format %q (want md, tex or html)", s)
}

// page is everything a report shows, independent of the format.
type page struct {
	Title       string
	Source      string
	Tool        string
	Issued      string
	Description [][]string // paragraphs of the model file's leading comment
	Verdict     verdictView
	Discrete    bool
	States      node
	Params      []rich
	Equations   []display
	Equilibrium rich
	ModelText   []string
	V, Vdot     display
	DerivName   node // V̇ or ΔV
	DerivRule   rich
	Shifted     []display
	Quadratic   rich // whether the higher terms cancel
	Squares     []display
	Grams       []display
	Minors      []rich
	Conditions  []rich
	Regions     []*regionView
	Product     bool // the regions are the factors of a product region
	Paving      *pavingView
	Witnesses   []rich
	Refutation  rich
	Kernel      rich
	Points      []rich // point pieces settled by nested certificates
	// Candidate is false for a certificate without V (a linearization).
	Candidate     bool
	Linearization *linearizationView
	Attraction    *attractionView
	Record        recordView
	Recheck       []string
	Cautions      []string
}

// display is an equation lhs = rhs (or another relation Op); the
// renderer breaks a wide right side into rows (fitter.rows).
type display struct {
	LHS node
	RHS node
	Op  node // nil for "="
}

func (d display) op() node {
	if d.Op == nil {
		return symEq
	}
	return d.Op
}

type verdictView struct {
	Word  string // holds, holds on part of the range, fails, undecided
	Class string // for HTML: holds, partial, fails, undecided
	Text  rich
}

type recordView struct {
	Checker   string
	Format    string
	Digest    string
	Valid     bool
	Passed    int
	Total     int
	Checks    []checker.Record
	Signature string
}

func build(doc *claims.Document, opts Options) (*page, error) {
	res := checker.Verify(doc)
	if !res.Valid {
		var failed []string
		for _, c := range res.Records {
			if !c.OK {
				failed = append(failed, c.Name+": "+c.Reason)
			}
		}
		if len(failed) == 0 {
			failed = []string{"no check was applied"}
		}
		return nil, fmt.Errorf("%w: %s", ErrInvalid, strings.Join(failed, "; "))
	}
	m, err := model.Parse("certificate model", []byte(doc.Model))
	if err != nil {
		return nil, fmt.Errorf("%w: the model text does not parse: %w", ErrInvalid, err)
	}
	b := &builder{doc: &docView{Document: doc, Contents: certificates.ContentsOf(doc), Claim: res.Kind, Verdict: res.Verdict}, m: m, r: m.Ring}
	p := &page{
		Source: doc.Source, Tool: doc.Tool, Issued: doc.Issued,
		Discrete: m.Discrete,
	}
	p.Title = "Lyapunov certificate"
	if doc.Source != "" {
		p.Title += ": " + doc.Source
	}
	p.Description = paragraphs(doc.Description)
	b.model(p)
	if err := b.derivation(p); err != nil {
		return nil, err
	}
	if err := b.regions(p); err != nil {
		return nil, err
	}
	if err := b.linearization(p); err != nil {
		return nil, err
	}
	p.Paving = pavingOf(b.doc)
	if p.Attraction, err = b.attractionOf(res); err != nil {
		return nil, err
	}
	b.verdict(p)
	b.record(p, res, opts)
	p.Cautions = cautions(b.doc)
	return p, nil
}

func paragraphs(lines []string) [][]string {
	var out [][]string
	var cur []string
	for _, l := range lines {
		if strings.TrimSpace(l) == "" {
			if len(cur) > 0 {
				out = append(out, cur)
				cur = nil
			}
			continue
		}
		cur = append(cur, l)
	}
	if len(cur) > 0 {
		out = append(out, cur)
	}
	return out
}

// docView is a verified certificate with its claims gathered by kind and the
// verdict the checker derived.
type docView struct {
	*claims.Document
	certificates.Contents
	Claim, Verdict string
}

type builder struct {
	doc *docView
	m   *model.Model
	r   *poly.Ring
	// alphas names the irrational region ends in order of appearance.
	alphas []alphaEnd
}

// parse reads a polynomial text of the certificate; Verify has read it
// already, so an error here is an internal inconsistency.
func (b *builder) parse(s string) (poly.RatFunc, error) {
	f, err := poly.Parse(b.r, s)
	if err != nil {
		return f, fmt.Errorf("reading %q from the certificate: %w", s, err)
	}
	return f, nil
}

func (b *builder) derivName() node {
	if b.m.Discrete {
		return deltaVSym
	}
	return vdotSym
}

func (b *builder) model(p *page) {
	m := b.m
	var states list
	for _, s := range m.States {
		states = append(states, name{s})
	}
	p.States = states
	for _, pr := range m.Params {
		p.Params = append(p.Params, paramRich(pr))
	}
	for i, s := range m.States {
		p.Equations = append(p.Equations, display{dotted{name{s}, m.Discrete}, ratFuncNode(m.F[i]), nil})
	}
	var at list
	for i, s := range m.States {
		at = append(at, relation{name{s}, symEq, ratFuncNode(m.At[i])})
	}
	if m.AtGiven {
		p.Equilibrium = rich{"The equilibrium, as stated in the model: ", at, "."}
	} else {
		p.Equilibrium = rich{"The equilibrium is the origin: ", at, "."}
	}
	p.ModelText = strings.Split(strings.TrimRight(m.Canonical(), "\n"), "\n")
}

// paramRich states a parameter's assumption: p ∈ [a, b], p > a, p = c
// (fixed), or any real value.
func paramRich(pr model.Param) rich {
	n := name{pr.Name}
	if pr.Fixed != nil {
		return rich{relation{n, symEq, ratNode(pr.Fixed)}, " (fixed)"}
	}
	lo, hi := pr.Range.Lo, pr.Range.Hi
	switch {
	case lo.Inf < 0 && hi.Inf > 0:
		return rich{n, " any real value"}
	case hi.Inf > 0 && lo.Open:
		return rich{relation{n, symGreater, ratNode(lo.Value)}}
	case hi.Inf > 0:
		return rich{relation{n, symGeq, ratNode(lo.Value)}}
	case lo.Inf < 0 && hi.Open:
		return rich{relation{n, symLess, ratNode(hi.Value)}}
	case lo.Inf < 0:
		return rich{relation{n, symLeq, ratNode(hi.Value)}}
	}
	iv := interval{lo: ratNode(lo.Value), hi: ratNode(hi.Value), loClosed: !lo.Open, hiClosed: !hi.Open}
	return rich{relation{n, symIn, iv}}
}

func (b *builder) derivation(p *page) error {
	d, m := b.doc, b.m
	dn := b.derivName()
	p.DerivName = dn
	if d.V == "" {
		return nil // no candidate: the certificate rests on its linearization
	}
	p.Candidate = true
	v, err := b.parse(d.V)
	if err != nil {
		return err
	}
	vdot, err := b.parse(d.Vdot)
	if err != nil {
		return err
	}
	p.V = display{vSym, ratFuncNode(v), nil}
	p.Vdot = display{dn, ratFuncNode(vdot), nil}
	if m.Discrete {
		p.DerivRule = rich{"The difference along the map, ", relation{dn, symEq, symbol{`V(f(x)) - V(x)`, mrow("<mi>V</mi><mo>(</mo><mi>f</mi><mo>(</mo><mi>x</mi><mo>)</mo><mo>)</mo><mo>−</mo><mi>V</mi><mo>(</mo><mi>x</mi><mo>)</mo>")}}, ", computed exactly:"}
	} else {
		p.DerivRule = rich{"The derivative along the flow, ", relation{dn, symEq, symbol{`\sum_i \frac{\partial V}{\partial x_i}\, f_i`, mrow("<munder><mo>∑</mo><mi>i</mi></munder><mfrac><mrow><mo>∂</mo><mi>V</mi></mrow><mrow><mo>∂</mo><msub><mi>x</mi><mi>i</mi></msub></mrow></mfrac>" + thinSpace + "<msub><mi>f</mi><mi>i</mi></msub>")}}, ", computed exactly:"}
	}
	states := b.r.StateMask()
	vs, ds := m.Shift(v), m.Shift(vdot)
	if m.AtGiven {
		p.Shifted = []display{
			{vSym, ratFuncNode(vs), nil},
			{dn, ratFuncNode(ds), nil},
		}
	}
	if len(d.Forms) == 2 {
		higher := ds.Sub(ds.Homogeneous(2, states)).Sub(ds.Homogeneous(1, states))
		if higher.IsZero() {
			p.Quadratic = rich{dn, " is a quadratic form in the states: every higher-order term cancels."}
		} else if z := d.Forms[1].Basis; len(z) > 0 && d.Forms[1].Margin != "" {
			p.Quadratic = rich{"The terms of ", dn, " of degree above two, ", ratFuncNode(higher), ", are taken into account: ", neg(dn),
				" as a whole, less a margin that is a sum of positive multiples of even powers of every state, is a Gram form in the monomial basis (" + strings.Join(z, ", ") + "), and its matrix being positive semidefinite makes it at least the margin, so positive away from the equilibrium."}
		} else if len(z) > 0 && d.Forms[1].Triangular != nil {
			p.Quadratic = rich{"The terms of ", dn, " of degree above two, ", ratFuncNode(higher), ", are taken into account: ", neg(dn),
				" as a whole is a Gram form in the monomial basis (" + strings.Join(z, ", ") + ")."}
		} else if len(z) > 0 {
			p.Quadratic = rich{"The terms of ", dn, " of degree above two, ", ratFuncNode(higher), ", are taken into account: ", neg(dn),
				" as a whole is a Gram form in the monomial basis (" + strings.Join(z, ", ") + "), and its matrix being positive definite with a pure power of every state in the basis makes it positive away from the equilibrium."}
		} else {
			p.Quadratic = rich{"The terms of ", dn, " of degree above two, ", ratFuncNode(higher), ", decide nothing near the equilibrium: the quadratic argument is local."}
		}
	}
	for _, f := range d.Forms {
		if f.Triangular != nil {
			var fn node = vSym
			if f.Name != "V" {
				fn = neg(dn)
			}
			p.Quadratic = append(p.Quadratic, " The Gram matrix of ", fn, " is only positive semidefinite, but its squares, taken in order, solve for "+strings.Join(f.Triangular, ", ")+
				" in turn (each is a non-zero multiple of a new state plus terms in the states before it): ", fn, " vanishes only at the equilibrium and grows without bound, so it is positive definite and radially unbounded.")
		}
		lhs := node(sub{vSym, "2"})
		if f.Name != "V" {
			lhs = neg(sub{dn, "2"})
		}
		if len(f.Basis) > 0 { // the whole function, in a monomial basis
			lhs = vSym
			if f.Name != "V" {
				lhs = neg(dn)
			}
		}
		if f.Margin != "" { // less the margin
			m, err := b.parse(f.Margin)
			if err != nil {
				return err
			}
			lhs = sum{{false, lhs}, {true, parens{ratFuncNode(m)}}}
		}
		sq, err := b.squares(f)
		if err != nil {
			return err
		}
		p.Squares = append(p.Squares, display{lhs, sq, nil})
		g, err := b.matrix(f.Gram)
		if err != nil {
			return err
		}
		gname := symbol{`G_{V}`, "<msub><mi>G</mi><mi>V</mi></msub>"}
		if f.Name != "V" {
			gname = symbol{`G_{-` + dn.tex() + `}`, "<msub><mi>G</mi>" + mrow(mo("−")+dn.html()) + "</msub>"}
		}
		p.Grams = append(p.Grams, display{gname, g, nil})
		var ms list
		for i, s := range f.Minors {
			mi, err := b.parse(s)
			if err != nil {
				return err
			}
			ms = append(ms, relation{sub{symbol{`\Delta`, `<mi mathvariant="normal">Δ</mi>`}, fmt.Sprint(i + 1)}, symEq, ratFuncNode(mi)})
		}
		who := rich{"of ", vSym, ": "}
		if f.Name != "V" {
			who = rich{"of ", neg(dn), ": "}
		}
		semidef := false
		for _, dk := range f.D {
			if dk == "0" {
				semidef = true
			}
		}
		if semidef {
			who = append(who[:len(who)-1], " (on the non-zero pivots): ")
		}
		p.Minors = append(p.Minors, append(who, ms))
	}
	for _, c := range d.Conditions {
		cr, err := b.condition(c)
		if err != nil {
			return err
		}
		p.Conditions = append(p.Conditions, cr)
	}
	for _, wt := range d.Witnesses {
		word := "fail"
		if wt.Holds {
			word = "hold"
		}
		p.Witnesses = append(p.Witnesses, rich{"the conditions " + word + " at ", b.paramPoint(wt.Params)})
	}
	if rf := d.Refutation; rf != nil {
		var pt list
		for _, s := range m.States {
			q, _ := new(big.Rat).SetString(rf.Point[s])
			pt = append(pt, relation{name{s}, symEq, ratNode(q)})
		}
		vq, _ := new(big.Rat).SetString(rf.V)
		dq, _ := new(big.Rat).SetString(rf.Vdot)
		p.Refutation = rich{"At ", pt}
		if len(rf.Params) > 0 {
			p.Refutation = append(p.Refutation, ", with ", b.paramPoint(rf.Params))
		}
		p.Refutation = append(p.Refutation, ": ", list{relation{vSym, symEq, ratNode(vq)}, relation{b.derivName(), symEq, ratNode(dq)}},
			", exactly. A Lyapunov function needs ", relation{vSym, symGreater, zeroNode}, " and ", relation{b.derivName(), symLess, zeroNode}, " away from the equilibrium, so this candidate fails there.")
	}
	if len(d.Kernel) > 0 && len(d.Forms) == 2 {
		eqs, err := b.kernel(d.Forms[1])
		if err != nil {
			return err
		}
		p.Kernel = rich{dn, " vanishes exactly where ", eqs, " (states measured from the equilibrium). Stability holds; asymptotic stability would need more, for example the invariance principle (LaSalle)."}
		if d.Invariance != nil {
			p.Kernel = rich{dn, " vanishes exactly where ", eqs, " (states measured from the equilibrium)."}
		}
	}
	if iv := d.Invariance; iv != nil {
		var gs list
		for _, v := range iv.States {
			g, err := b.parse(v.Poly)
			if err != nil {
				return err
			}
			gs = append(gs, ratFuncNode(g))
		}
		p.Kernel = append(p.Kernel, " By the invariance principle (LaSalle), no solution other than the equilibrium stays where ", dn,
			" vanishes: on such a solution the square bases of ", neg(b.derivName()), " and their derivatives along the flow vanish, and the certificate writes ",
			gs, " as exact combinations of them, each with the equilibrium's coordinate as its only real root (Sturm). Bounded solutions therefore tend to the equilibrium.")
	}
	for _, ap := range d.Algebraic {
		p.Points = append(p.Points, rich{"at " + ap.Param + " = " + ap.Value + " (the root of " + ap.Poly + " in (" + ap.Isolating[0] + ", " + ap.Isolating[1] +
			")), where the quadratic test is only semidefinite, Gram matrices of V and of ", neg(b.derivName()),
			" less margins Σ εᵢxᵢ^(2kᵢ), exact in the parameter, have pivots ≥ 0 there (signs at the root by gcd and Sturm sequences), which proves: " + claimWords[checker.KindGlobal]})
	}
	for _, pc := range d.Points {
		out := checker.Verify(pc.Certificate)
		p.Points = append(p.Points, rich{"at ", b.paramPoint(pc.Params), ", where the quadratic test is inconclusive, a certificate of the model with these values, nested in this one and re-checked with it, proves: " + claimWords[out.Kind] + " (digest " + pc.Certificate.Digest + ")"})
	}
	return nil
}

// squares sets Σ dₖ·(xₖ + Σᵢ>ₖ Lᵢₖ·xᵢ)² from a form's factors, skipping
// zero pivots (Lagrange's completing of squares read off G = L·D·Lᵀ).
func (b *builder) squares(f certificates.FormView) (node, error) {
	n := len(f.D)
	var s sum
	for k := 0; k < n; k++ {
		dk, err := b.parse(f.D[k])
		if err != nil {
			return nil, err
		}
		if dk.IsZero() {
			continue
		}
		lin, err := b.squareBase(f, k)
		if err != nil {
			return nil, err
		}
		var sq node
		ln := ratFuncNode(lin)
		if _, single := ln.(name); single {
			sq = power{ln, 2}
		} else {
			sq = power{parens{ln}, 2}
		}
		// A pivot that is a sum keeps its sign inside the parentheses, so
		// that each square visibly carries its own coefficient.
		negd := dk.Num.NumTerms() == 1 && dk.Num.Lead().Coef.Sign() < 0
		if negd {
			dk = dk.Neg()
		}
		dn := ratFuncNode(dk)
		var t node
		switch x := dn.(type) {
		case number:
			if x.r.Cmp(big.NewRat(1, 1)) == 0 {
				t = sq
			} else {
				t = product{dn, sq}
			}
		case sum:
			t = product{parens{dn}, sq}
		default:
			t = product{dn, sq}
		}
		s = append(s, term{negd, t})
	}
	if len(s) == 0 {
		return zeroNode, nil
	}
	if len(s) == 1 && !s[0].neg {
		return s[0].n, nil
	}
	return s, nil
}

func (b *builder) matrix(rows [][]string) (matrix, error) {
	out := make(matrix, len(rows))
	for i, r := range rows {
		for _, s := range r {
			e, err := b.parse(s)
			if err != nil {
				return nil, err
			}
			out[i] = append(out[i], ratFuncNode(e))
		}
	}
	return out, nil
}

// kernel sets the equations of the set where a semidefinite form vanishes:
// the rows of Lᵀ that belong to positive pivots.
func (b *builder) kernel(f certificates.FormView) (list, error) {
	var eqs list
	n := len(f.D)
	for k := 0; k < n; k++ {
		if f.D[k] == "0" {
			continue
		}
		lin, err := b.squareBase(f, k)
		if err != nil {
			return nil, err
		}
		eqs = append(eqs, relation{ratFuncNode(lin), symEq, zeroNode})
	}
	return eqs, nil
}

// paramPoint sets parameter values in the model's order.
func (b *builder) paramPoint(vals map[string]string) list {
	var out list
	for _, pr := range b.m.FreeParams() {
		s, ok := vals[pr.Name]
		if !ok {
			continue
		}
		q, _ := new(big.Rat).SetString(s)
		out = append(out, relation{name{pr.Name}, symEq, ratNode(q)})
	}
	return out
}

// condition states what one minor requires after the assumptions.
func (b *builder) condition(c claims.MinorCondition) (rich, error) {
	form := node(vSym)
	if c.Form != "V" {
		form = neg(b.derivName())
	}
	delta := sub{symbol{`\Delta`, `<mi mathvariant="normal">Δ</mi>`}, fmt.Sprint(c.Index)}
	out := rich{"Minor ", delta, " of ", form, ": "}
	var discharged []any
	for _, f := range c.Factors {
		fp, err := b.parse(f.Poly)
		if err != nil {
			return nil, err
		}
		var fn node = ratFuncNode(fp)
		if f.Power > 1 {
			if fp.Num.NumTerms() > 1 {
				fn = parens{fn}
			}
			fn = power{fn, f.Power}
		}
		switch f.Status {
		case claims.StatusPositive:
			discharged = append(discharged, relation{fn, symGreater, zeroNode})
		case claims.StatusNegative:
			discharged = append(discharged, relation{fn, symLess, zeroNode})
		}
	}
	q, err := b.parse(c.Condition)
	if err != nil {
		return nil, err
	}
	req := conditionNode(q.Num)
	switch {
	case req == nil:
		out = append(out, relation{delta, symGreater, zeroNode}, " holds for every allowed parameter value")
	case q.Num.IsConst():
		out = append(out, relation{delta, symGreater, zeroNode}, " fails for every parameter value")
	default:
		out = append(out, relation{delta, symGreater, zeroNode}, " requires ", req)
	}
	if len(discharged) > 0 {
		out = append(out, " (")
		for i, d := range discharged {
			if i > 0 {
				out = append(out, "; ")
			}
			out = append(out, d)
		}
		out = append(out, " by the assumptions)")
	}
	return append(out, "."), nil
}

// readable is a condition q > 0 as the text and the reports state it.
type readable struct {
	always, never bool     // q is a positive, or a non-positive, constant
	param         string   // set when q is linear in this one parameter:
	below         bool     // q > 0 iff param < bound (else param > bound)
	bound         *big.Rat //
}

// readCondition reads q > 0 for people: as a bound on one parameter when q
// is linear in it (a·p + c > 0 iff p > −c/a for a > 0, p < −c/a for
// a < 0), as always or never true when q is constant; otherwise it stays
// q > 0 (the zero value).
func readCondition(q *poly.Poly) readable {
	if q.IsConst() {
		if q.ConstTerm().Sign() > 0 {
			return readable{always: true}
		}
		return readable{never: true}
	}
	vars := q.VarsUsed()
	if len(vars) == 1 && q.Degree() == 1 {
		u, _ := q.Univariate(vars[0])
		a, c := u.Coeffs()[1], u.Coeffs()[0]
		x := new(big.Rat).Neg(c)
		x.Quo(x, a)
		return readable{param: q.Ring().Name(vars[0]), below: a.Sign() < 0, bound: x}
	}
	return readable{}
}

// conditionNode sets q > 0 readably (see readCondition): "r < 1" for a
// linear condition in one parameter; nil when q is a positive constant.
func conditionNode(q *poly.Poly) node {
	c := readCondition(q)
	switch {
	case c.always:
		return nil
	case c.param != "":
		op := symGreater
		if c.below {
			op = symLess
		}
		return relation{name{c.param}, op, ratNode(c.bound)}
	}
	return relation{polyNode(q), symGreater, zeroNode}
}

var claimWords = map[string]string{
	checker.KindGlobal:   "the equilibrium is globally asymptotically stable",
	checker.KindLocal:    "the equilibrium is locally asymptotically stable",
	checker.KindStable:   "the equilibrium is stable in the sense of Lyapunov (the derivative is only semidefinite)",
	checker.KindUnstable: "the equilibrium is unstable",
}

func (b *builder) verdict(p *page) {
	d := b.doc
	claim := claimWords[d.Claim]
	v := &p.Verdict
	switch d.Verdict {
	case checker.VerdictHolds:
		v.Word, v.Class = "holds", "holds"
		v.Text = rich{"Holds: " + claim}
		if len(b.m.FreeParams()) > 0 {
			v.Text = append(v.Text, " for every allowed parameter value")
		}
		v.Text = append(v.Text, ".")
	case checker.VerdictOnRegion:
		v.Word, v.Class = "holds on part of the range", "partial"
		v.Text = rich{"Holds on part of the range: " + claim}
		switch {
		case len(p.Regions) > 0:
			v.Text = append(v.Text, " for ")
			for i, rv := range p.Regions {
				if i > 0 {
					v.Text = append(v.Text, " and ")
				}
				v.Text = append(v.Text, relation{rv.Param, symIn, rv.HoldsSet})
			}
			if p.Product {
				v.Text = append(v.Text, " within the paved box")
			}
			rest := "the argument fails for the other allowed values"
			if len(p.Regions) == 1 && !p.Product && d.Region != nil {
				rest = elsewhere(d.Region.Pieces)
			}
			v.Text = append(v.Text, "; "+rest+".")
		case p.Paving != nil:
			v.Text = append(v.Text, " on the boxes of the paving where every condition holds; see the paving below.")
		default:
			v.Text = append(v.Text, " where the conditions hold; they hold at some allowed parameter values and fail at others (see the witnesses).")
		}
	case checker.VerdictFails:
		v.Word, v.Class = "fails", "fails"
		v.Text = rich{"Fails: the candidate does not prove stability"}
		if d.Claim == checker.KindUnstable {
			v.Text = rich{"Fails: the equilibrium is unstable, proven through its linearization"}
		}
		if d.Refutation != nil {
			v.Text = append(v.Text, "; an exact counterexample is given below")
		}
		v.Text = append(v.Text, ".")
	default:
		v.Word, v.Class = "undecided", "undecided"
		v.Text = rich{"Undecided: the quadratic test proves nothing here; no claim is made."}
	}
}

func (b *builder) record(p *page, res checker.Outcome, opts Options) {
	d := b.doc
	r := recordView{Checker: opts.Checker, Format: d.Format, Digest: d.Digest, Valid: res.Valid, Total: len(res.Records), Checks: res.Records}
	if r.Checker == "" {
		r.Checker = "lyacert (version not stated)"
	}
	for _, c := range res.Records {
		if c.OK {
			r.Passed++
		}
	}
	cert := opts.CertName
	if cert == "" {
		cert = "certificate.json"
	}
	p.Recheck = []string{"lyacert verify " + shellQuote(cert)}
	if pub, err := d.Signer(); err == nil {
		fp := certificates.Fingerprint(pub)
		r.Signature = "Signed with ed25519 by the key with fingerprint " + fp + "; the signature verifies against the digest. " +
			"A signature says who issued the certificate, not that it is correct: the checks above say that."
		p.Recheck = append(p.Recheck, "lyacert verify --trust SIGNER.pub.pem "+shellQuote(cert))
	} else {
		r.Signature = "Not signed."
	}
	p.Record = r
}

// shellQuote quotes a file name for a POSIX shell when it needs it.
func shellQuote(s string) string {
	safe := s != ""
	for _, r := range s {
		if !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || strings.ContainsRune("-_./+:@", r)) {
			safe = false
		}
	}
	if safe {
		return s
	}
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}

func cautions(d *docView) []string {
	out := []string{
		"This certificate proves a property of the model stated above, under its stated assumptions on the parameters; it is not a statement about the physical system.",
		"Modelling error, unmodelled dynamics, saturation, delay and sampling can void it, as can parameter values outside the stated ranges.",
	}
	if d.Claim == checker.KindLocal {
		out = append(out, "The claim is local: it holds in some neighbourhood of the equilibrium whose size this certificate does not give.")
	}
	out = append(out,
		"The checker re-derives the mathematics from the certificate alone; it cannot tell whether the model describes the system.",
		"Defer to the applicable standards and to licensed engineering judgement.")
	return out
}

// squareBase returns zₖ + Σᵢ>ₖ Lᵢₖ·zᵢ from a form's factors, z the form's
// monomial basis or, without one, the states.
func (b *builder) squareBase(f certificates.FormView, k int) (poly.RatFunc, error) {
	n := len(f.D)
	z := make([]poly.RatFunc, n)
	l := poly.NewMatrix(b.r, n)
	var err error
	for i := range n {
		if len(f.Basis) == 0 {
			z[i] = poly.FromPoly(poly.Var(b.r, i))
		} else if z[i], err = b.parse(f.Basis[i]); err != nil {
			return z[i], err
		}
		for j := range i {
			if l[i][j], err = b.parse(f.L[i][j]); err != nil {
				return l[i][j], err
			}
		}
	}
	return poly.SquareBase(l, z, k), nil
}
