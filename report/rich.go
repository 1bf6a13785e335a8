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
	infinity  = symbol{`\infty`, "∞"}
	vdotSym   = symbol{`\dot V`, `<span class="dotted"><i>V</i></span>`}
	deltaVSym = symbol{`\Delta V`, "Δ<i>V</i>"}
	vSym      = symbol{"V", "<i>V</i>"}
	emptySet  = symbol{`\emptyset`, "∅"}
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
		return "{" + iv.lo.html() + "}"
	}
	l, r := "(", ")"
	if iv.loClosed {
		l = "["
	}
	if iv.hiClosed {
		r = "]"
	}
	return l + iv.lo.html() + ", " + iv.hi.html() + r
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
	return strings.Join(parts, ", ")
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
	return `\begin{pmatrix} ` + strings.Join(rows, ` \\ `) + ` \end{pmatrix}`
}

func (m matrix) html() string {
	var b strings.Builder
	b.WriteString(`<table class="matrix">`)
	for _, r := range m {
		b.WriteString("<tr>")
		for _, c := range r {
			b.WriteString("<td>" + c.html() + "</td>")
		}
		b.WriteString("</tr>")
	}
	b.WriteString("</table>")
	return b.String()
}

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
	if d.discrete {
		s += "<sup>+</sup>"
	} else {
		s = `<span class="dotted">` + s + `</span>`
	}
	if sub != "" {
		s += "<sub>" + htmlNamePart(sub) + "</sub>"
	}
	return s
}

func (s sub) tex() string {
	if _, ok := s.n.(symbol); ok {
		return s.n.tex() + "_{" + s.idx + "}"
	}
	return "{" + s.n.tex() + "}_{" + s.idx + "}"
}
func (s sub) html() string { return s.n.html() + "<sub>" + html.EscapeString(s.idx) + "</sub>" }

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
				b.WriteString("$" + n.tex() + "$")
			}
		case node:
			b.WriteString("$" + v.tex() + "$")
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
			b.WriteString("$" + v.tex() + "$")
		}
	}
	return b.String()
}

// htmlRich sets running text for HTML: words escaped, math as HTML.
func htmlRich(r rich) string {
	var b strings.Builder
	for _, it := range r {
		switch v := it.(type) {
		case string:
			b.WriteString(html.EscapeString(v))
		case node:
			b.WriteString(`<span class="math">` + v.html() + `</span>`)
		}
	}
	return b.String()
}
