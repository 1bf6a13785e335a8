package report

import (
	"fmt"
	"math/big"
	"strconv"

	"github.com/lyacert/lyacert/claims"
)

// regionView is the one-parameter region: the pieces of the parameter's
// range in closed form, the irrational ends, and the strip plot.
type regionView struct {
	Param    node
	Name     string // the parameter's name as written in the model
	Pieces   []pieceView
	Ends     []rich // what each α stands for
	HoldsSet node   // the union of the holding pieces
	strip    []stripPiece
	Figure   string // Markdown: the plot's file, when written
	Note     string // Markdown: why it was not
	SVG      string // HTML: the plot
}

type pieceView struct {
	Holds bool
	Set   rich
}

// alphaEnd is an irrational region end: the root of Poly in (Iso[0], Iso[1]).
type alphaEnd struct {
	poly    string
	iso     [2]string
	decimal string
	sym     sub
}

// stripPiece is a piece as drawn: its ends as float64 for the picture only
// (±Inf for unbounded ends), their labels, and whether it holds.
type stripPiece struct {
	lo, hi           float64
	loText, hiText   string
	loName, hiName   *sub // the name of an irrational end, nil for others
	holds, point     bool
	loClosed, hiOpen bool
}

// regions shows the one-parameter regions: the region itself, or the
// factors of a product region of several parameters.
func (b *builder) regions(p *page) error {
	rg := b.doc.Region
	if rg == nil {
		return nil
	}
	var rs []claims.SturmRegion
	if rg.Param != "" {
		rs = append(rs, claims.SturmRegion{Param: rg.Param, Intervals: rg.Intervals, Pieces: rg.Pieces})
	}
	if rg.Paving != nil {
		rs = append(rs, rg.Paving.Product...)
	}
	for _, r := range rs {
		rv, err := b.region(r)
		if err != nil {
			return err
		}
		p.Regions = append(p.Regions, rv)
	}
	p.Product = rg.Paving != nil && len(rg.Paving.Product) > 0
	return nil
}

func (b *builder) region(rg claims.SturmRegion) (*regionView, error) {
	first := len(b.alphas)
	pi, ok := b.r.Index(rg.Param)
	if !ok {
		return nil, fmt.Errorf("the region's parameter %q is not in the model", rg.Param)
	}
	rv := &regionView{Param: name{rg.Param}, Name: rg.Param}
	var holds []node
	for _, pc := range rg.Pieces {
		lo, err := b.end(pc.Lo, pc.LoPoly, pc.LoIsolating)
		if err != nil {
			return nil, err
		}
		hi, err := b.end(pc.Hi, pc.HiPoly, pc.HiIsolating)
		if err != nil {
			return nil, err
		}
		point := pc.Lo == pc.Hi && pc.LoPoly == pc.HiPoly && pc.LoClosed && pc.HiClosed
		iv := interval{lo: lo, hi: hi, loClosed: pc.LoClosed, hiClosed: pc.HiClosed, point: point}
		word := pieceWord(pc)
		rv.Pieces = append(rv.Pieces, pieceView{pc.Holds, rich{word + " for ", relation{rv.Param, symIn, iv}}})
		rv.strip = append(rv.strip, stripPiece{
			lo: endFloat(pc.Lo), hi: endFloat(pc.Hi), loText: endLabel(pc.Lo), hiText: endLabel(pc.Hi),
			loName: b.alphaOf(lo), hiName: b.alphaOf(hi),
			holds: pc.Holds, point: point, loClosed: pc.LoClosed, hiOpen: !pc.HiClosed,
		})
	}
	for _, pc := range mergeAdjacent(rg.Intervals) {
		lo, err := b.end(pc.Lo, pc.LoPoly, pc.LoIsolating)
		if err != nil {
			return nil, err
		}
		hi, err := b.end(pc.Hi, pc.HiPoly, pc.HiIsolating)
		if err != nil {
			return nil, err
		}
		point := pc.Lo == pc.Hi && pc.LoPoly == pc.HiPoly && pc.LoClosed && pc.HiClosed
		holds = append(holds, interval{lo: lo, hi: hi, loClosed: pc.LoClosed, hiClosed: pc.HiClosed, point: point})
	}
	if len(rv.strip) == 0 {
		return nil, fmt.Errorf("the region of %s has no pieces", rg.Param)
	}
	switch len(holds) {
	case 0:
		rv.HoldsSet = emptySet
	case 1:
		rv.HoldsSet = holds[0]
	default:
		rv.HoldsSet = union(holds)
	}
	ends, err := b.alphaDefs(first, pi)
	if err != nil {
		return nil, err
	}
	rv.Ends = ends
	return rv, nil
}

// alphaDefs says what each irrational end named since b.alphas[first]
// stands for: its closed form when it is a quadratic surd, its decimal,
// and the polynomial and isolating interval that define it exactly.
func (b *builder) alphaDefs(first, pi int) ([]rich, error) {
	var out []rich
	for _, a := range b.alphas[first:] {
		f, err := b.parse(a.poly)
		if err != nil {
			return nil, err
		}
		lo, _ := new(big.Rat).SetString(a.iso[0])
		hi, _ := new(big.Rat).SetString(a.iso[1])
		iso := interval{lo: ratNode(lo), hi: ratNode(hi)}
		r := rich{relation{a.sym, symApprox, decimalSym(a.decimal)}}
		if u, ok := f.Num.Univariate(pi); ok {
			if cf, ok := quadraticRoot(u, lo, hi); ok {
				r = rich{relation{relation{a.sym, symEq, cf}, symApprox, decimalSym(a.decimal)}}
			}
		}
		r = append(r, ", the root of ", relation{ratFuncNode(f), symEq, zeroNode}, " in ", iso, " (the only one there, by Sturm's theorem).")
		out = append(out, r)
	}
	return out, nil
}

// union is a union of intervals.
type union []node

func (u union) tex() string {
	s := ""
	for i, n := range u {
		if i > 0 {
			s += ` \cup `
		}
		s += n.tex()
	}
	return s
}

func (u union) html() string {
	s := ""
	for i, n := range u {
		if i > 0 {
			s += mo("∪")
		}
		s += n.html()
	}
	return mrow(s)
}

// end sets one end of a piece: ±∞, a rational, or a named irrational root.
func (b *builder) end(value, polyText string, iso *[2]string) (node, error) {
	switch {
	case polyText == "" && value == "-inf":
		return neg(infinity), nil
	case polyText == "" && value == "inf":
		return infinity, nil
	case polyText == "":
		q, ok := new(big.Rat).SetString(value)
		if !ok {
			return nil, fmt.Errorf("region end %q is not a rational", value)
		}
		return ratNode(q), nil
	}
	if iso == nil {
		return nil, fmt.Errorf("region end %q has no isolating interval", value)
	}
	for _, a := range b.alphas {
		if a.poly == polyText && a.iso == *iso {
			return a.sym, nil
		}
	}
	a := alphaEnd{poly: polyText, iso: *iso, decimal: value, sym: sub{symbol{`\alpha`, "<mi>α</mi>"}, strconv.Itoa(len(b.alphas) + 1)}}
	b.alphas = append(b.alphas, a)
	return a.sym, nil
}

// endFloat is an end's value for drawing only; the claim rests on the exact
// ends above.
func endFloat(s string) float64 {
	switch s {
	case "-inf":
		return negInf
	case "inf":
		return posInf
	}
	if q, ok := new(big.Rat).SetString(s); ok {
		f, _ := q.Float64()
		return f
	}
	return 0
}

// alphaOf returns the named irrational end n, or nil when n is not one.
func (b *builder) alphaOf(n node) *sub {
	for i := range b.alphas {
		if b.alphas[i].sym == n {
			return &b.alphas[i].sym
		}
	}
	return nil
}

// endLabel is a short label for an end on the plot's axis.
func endLabel(s string) string {
	switch s {
	case "-inf":
		return "−∞"
	case "inf":
		return "∞"
	}
	q, ok := new(big.Rat).SetString(s)
	if !ok {
		return s
	}
	if q.IsInt() || len(q.RatString()) <= 6 {
		return minusSign(q.RatString())
	}
	f, _ := q.Float64()
	return minusSign(strconv.FormatFloat(f, 'g', 4, 64))
}

func minusSign(s string) string {
	if len(s) > 0 && s[0] == '-' {
		return "−" + s[1:]
	}
	return s
}

// pavingOf shows the paving of a several-parameter region, if any.
func pavingOf(d *docView) *pavingView {
	if d.Region == nil || d.Region.Paving == nil {
		return nil
	}
	return newPavingView(d.Region.Paving)
}
