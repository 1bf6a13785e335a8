package report

import (
	"html"
	"math/big"
	"strings"
)

// rich is running text that mixes words and mathematics: each item is a
// string (escaped for the format when printed, so it may come from the
// user) or a node (set as inline mathematics).
type rich []any

// Additional node kinds used in sentences and displays.
type (
	// interval is a real interval with open or closed ends; a point when
	// both ends are the same closed number.
	interval struct {
		lo, hi             node
		loClosed, hiClosed bool
		point              bool
	}
	// list is comma-separated nodes.
	list []node
	// matrix is a matrix of nodes.
	matrix [][]node
	// dotted is the derivative notation for a state: ẋ, or x⁺ for a map.
	dotted struct {
		n        name
		discrete bool
	}
	// sub is a node with a subscript of ours (an index or "2").
	sub struct {
		n   node
		idx string
	}
)

var (
	infinity  = symbol{`\infty`, "<mi>∞</mi>"}
	vdotSym   = symbol{`\dot V`, dotAbove("<mi>V</mi>")}
	deltaVSym = symbol{`\Delta V`, `<mrow><mi mathvariant="normal">Δ</mi><mi>V</mi></mrow>`}
	vSym      = symbol{"V", "<mi>V</mi>"}
	emptySet  = symbol{`\emptyset`, `<mi mathvariant="normal">∅</mi>`}
	zeroNode  = number{new(big.Rat)}
)

func (iv interval) tex() string {
	if iv.point {
		return `\{` + iv.lo.tex() + `\}`
	}
	l, r := "(", ")"
	if iv.loClosed {
		l = "["
	}
	if iv.hiClosed {
		r = "]"
	}
	return l + iv.lo.tex() + ", " + iv.hi.tex() + r
}

func (iv interval) html() string {
	if iv.point {
		return mrow(mo("{") + iv.lo.html() + mo("}"))
	}
	l, r := "(", ")"
	if iv.loClosed {
		l = "["
	}
	if iv.hiClosed {
		r = "]"
	}
	return mrow(mo(l) + iv.lo.html() + mo(",") + iv.hi.html() + mo(r))
}

func (l list) tex() string {
	parts := make([]string, len(l))
	for i, n := range l {
		parts[i] = n.tex()
	}
	return strings.Join(parts, ",\\ ")
}

func (l list) html() string {
	parts := make([]string, len(l))
	for i, n := range l {
		parts[i] = n.html()
	}
	return mrow(strings.Join(parts, mo(",")+`<mspace width="0.5em"></mspace>`))
}

func (m matrix) tex() string {
	rows := make([]string, len(m))
	for i, r := range m {
		cells := make([]string, len(r))
		for j, c := range r {
			cells[j] = c.tex()
		}
		rows[i] = strings.Join(cells, " & ")
	}
	// Rows of fractions in text style need more than the baseline
	// distance between them, or they touch.
	sep := ` \\ `
	if hasFraction(m) {
		sep = ` \\[1ex] `
	}
	return `\begin{pmatrix} ` + strings.Join(rows, sep) + ` \end{pmatrix}`
}

// A matrix is an mtable between stretched parentheses, as pmatrix.
func (m matrix) html() string {
	var b strings.Builder
	b.WriteString(mo("(") + `<mtable class="matrix">`)
	for _, r := range m {
		b.WriteString("<mtr>")
		for _, c := range r {
			b.WriteString("<mtd>" + c.html() + "</mtd>")
		}
		b.WriteString("</mtr>")
	}
	b.WriteString("</mtable>" + mo(")"))
	return mrow(b.String())
}

// dotAbove is the time-derivative dot over a MathML element.
func dotAbove(s string) string { return `<mover accent="true">` + s + "<mo>˙</mo></mover>" }

// The dot (or the plus) goes on the name's base, before its subscript:
// ẋ₁, x₁⁺.
func (d dotted) tex() string {
	base, sub := splitName(d.n.s)
	s := texNamePart(base)
	if d.discrete {
		s += "^{+}"
	} else {
		s = `\dot{` + s + `}`
	}
	if sub != "" {
		s += "_{" + texNamePart(sub) + "}"
	}
	return s
}

func (d dotted) html() string {
	base, sub := splitName(d.n.s)
	s := htmlNamePart(base)
	switch {
	case d.discrete && sub != "":
		return "<msubsup>" + s + htmlNamePart(sub) + mo("+") + "</msubsup>"
	case d.discrete:
		return "<msup>" + s + mo("+") + "</msup>"
	case sub != "":
		return "<msub>" + dotAbove(s) + htmlNamePart(sub) + "</msub>"
	}
	return dotAbove(s)
}

func (s sub) tex() string {
	if _, ok := s.n.(symbol); ok {
		return s.n.tex() + "_{" + s.idx + "}"
	}
	return "{" + s.n.tex() + "}_{" + s.idx + "}"
}
func (s sub) html() string {
	idx := mi(s.idx)
	if strings.Trim(s.idx, "0123456789") == "" {
		idx = mn(s.idx)
	}
	return "<msub>" + s.n.html() + idx + "</msub>"
}

// neg is −n.
func neg(n node) node { return sum{{true, n}} }

// texRich sets running text for LaTeX: words escaped, math in $…$.
func texRich(r rich) string {
	var b strings.Builder
	for _, it := range r {
		switch v := it.(type) {
		case string:
			b.WriteString(texText(v))
		case list:
			// One formula an item, so that a long list can break
			// between them.
			for i, n := range v {
				if i > 0 {
					b.WriteString(", ")
				}
				b.WriteString(texInline(n))
			}
		case node:
			b.WriteString(texInline(v))
		}
	}
	return b.String()
}

// mdRich sets running text for Markdown: words escaped, math in $…$ (the
// math of GitHub-flavoured Markdown).
func mdRich(r rich) string {
	var b strings.Builder
	for _, it := range r {
		switch v := it.(type) {
		case string:
			b.WriteString(mdText(v))
		case node:
			b.WriteString(texInline(v))
		}
	}
	return b.String()
}

// htmlRich sets running text for HTML: words escaped, math as inline MathML.
func htmlRich(r rich) string {
	var b strings.Builder
	for _, it := range r {
		switch v := it.(type) {
		case string:
			b.WriteString(html.EscapeString(v))
		case node:
			b.WriteString(htmlInline(v))
		}
	}
	return b.String()
}

// inlineMath is a node as an inline math element.
func inlineMath(n node) string { return "<math>" + n.html() + "</math>" }
