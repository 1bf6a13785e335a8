package report

import (
	"fmt"
	"math/big"
	"strings"
	"unicode"
)

// Fitting mathematics to the page. TeX breaks a paragraph, but not a
// display, a matrix or a fraction, and MathML in a browser breaks neither:
// so the reports estimate how wide each formula is set and break long sums,
// wide matrices and long numbers themselves.
//
// Widths are in em of the text font (at 11 pt, 1 em = 10.95 pt). The
// estimate follows TeX's rules for math (Knuth, The TeXbook, Appendix G)
// with the widths of Computer Modern rounded up: a digit is 0.5 em, a
// letter 0.6 em, a binary operator with its medium spaces 1.22 em
// (0.78 + 2·4/18), a relation with its thick spaces 1.34 em
// (0.78 + 2·5/18), a thin space 3/18 em; a fraction is as wide as the wider
// of its numerator and denominator plus the null delimiters (2·1.2 pt);
// scripts and the parts of a fraction in text style are one style smaller
// (cmr8 digits are 0.39 em of the 11 pt text, cmr6 ones 0.34 em). The
// estimate errs on the wide side; TestWidthEstimate compares it with the
// widths pdflatex measures.

// style is TeX's math style: display, text, script or scriptscript.
type style int

const (
	displayStyle style = iota
	textStyle
	scriptStyle
	scriptScriptStyle
)

// scale is the size of a style's characters relative to the text size,
// rounded up (the smaller fonts are drawn relatively wider).
func (s style) scale() float64 {
	switch s {
	case scriptStyle:
		return 0.8
	case scriptScriptStyle:
		return 0.7
	}
	return 1
}

// frac is the style of a fraction's numerator and denominator.
func (s style) frac() style {
	if s == displayStyle {
		return textStyle
	}
	return s.script()
}

// script is the style of a superscript or subscript.
func (s style) script() style {
	if s >= scriptStyle {
		return scriptScriptStyle
	}
	return scriptStyle
}

// spaced reports whether a style puts space around operators and
// relations (TeX drops it in script styles).
func (s style) spaced() bool { return s <= textStyle }

// Widths in em at text size.
const (
	emDigit    = 0.5
	emLetter   = 0.6
	emUpper    = 0.8
	emThin     = 3.0 / 18
	emSign     = 0.78 // + − as a unary sign, without space
	emBinSpace = 2 * 4.0 / 18
	emRelSpace = 2 * 5.0 / 18
	emParen    = 0.39
	emBigParen = 0.75 // \left( around a display fraction, or a matrix's
	emNullDel  = 0.22 // the null delimiters of a fraction
	emComma    = 0.28
)

func binEm(st style) float64 {
	if st.spaced() {
		return (emSign + emBinSpace) * st.scale()
	}
	return emSign * st.scale()
}

func relEm(st style) float64 {
	if st.spaced() {
		return (emSign + emRelSpace) * st.scale()
	}
	return emSign * st.scale()
}

// digitGroups splits a string of digits into groups of three counted from
// the right, when it has five digits or more, as ISO 80000-1 (7.3.1,
// from memory) and the SI Brochure (5.4.4, from memory) recommend for long
// numbers; shorter ones stay one group.
func digitGroups(s string) []string {
	if len(s) < 5 {
		return []string{s}
	}
	var out []string
	first := len(s) % 3
	if first > 0 {
		out = append(out, s[:first])
	}
	for i := first; i < len(s); i += 3 {
		out = append(out, s[i:i+3])
	}
	return out
}

// digitsEm is the width of a digit string set in groups.
func digitsEm(s string, st style) float64 {
	g := len(digitGroups(s))
	return (float64(len(s))*emDigit + float64(g-1)*emThin) * st.scale()
}

// texDigits sets a digit string in groups separated by thin spaces;
// breakable puts a permitted line break before each thin space (TeX drops
// the space at a break, as it drops every kern after one).
func texDigits(s string, breakable bool) string {
	sep := `\,`
	if breakable {
		sep = `\allowbreak\,`
	}
	return strings.Join(digitGroups(s), sep)
}

// htmlDigits is the MathML of a digit string, its groups separated by
// thin spaces (U+2009).
func htmlDigits(s string) string { return strings.Join(digitGroups(s), "\u2009") }

func (n number) em(st style) float64 {
	num, den := n.r.Num().String(), n.r.Denom().String()
	if n.r.IsInt() {
		return digitsEm(num, st)
	}
	return max(digitsEm(num, st.frac()), digitsEm(den, st.frac())) + emNullDel*st.scale()
}

func (n name) em(st style) float64 { return texEm(texName(n.s), st) }

func (p power) em(st style) float64 {
	return p.base.em(st) + 0.05 + float64(len(fmt.Sprint(p.exp)))*emDigit*st.script().scale()
}

func (p product) em(st style) float64 {
	w := 0.0
	for i, f := range p {
		if i > 0 {
			w += emThin * st.scale()
		}
		w += f.em(st)
	}
	return w
}

func (s sum) em(st style) float64 {
	w := 0.0
	for i, t := range s {
		w += termEm(t, i == 0, st)
	}
	return w
}

// termEm is the width of a term of a sum with its sign: a unary sign on
// the first term, a binary operator with its spaces on the others.
func termEm(t term, lead bool, st style) float64 {
	w := t.n.em(st)
	switch {
	case !lead:
		w += binEm(st)
	case t.neg:
		w += emSign * st.scale()
	}
	return w
}

func (f fraction) em(st style) float64 {
	return max(f.num.em(st.frac()), f.den.em(st.frac())) + emNullDel*st.scale()
}

func (p parens) em(st style) float64 {
	pw := emParen
	if hasFraction(p.n) && st == displayStyle {
		pw = emBigParen
	}
	return p.n.em(st) + 2*pw*st.scale()
}

func (s symbol) em(st style) float64 { return texEm(s.t, st) }

func (r relation) em(st style) float64 { return r.lhs.em(st) + relEm(st) + r.rhs.em(st) }

func (iv interval) em(st style) float64 {
	if iv.point {
		return iv.lo.em(st) + 2*0.5*st.scale()
	}
	return iv.lo.em(st) + iv.hi.em(st) + (2*emParen+emComma+emThin)*st.scale()
}

func (l list) em(st style) float64 {
	w := 0.0
	for i, n := range l {
		if i > 0 {
			w += (emComma + 0.33 + emThin) * st.scale()
		}
		w += n.em(st)
	}
	return w
}

// Matrix cells are in text style (amsmath's pmatrix is an array).
func (m matrix) em(st style) float64 { return matrixEm(m, textStyle) }

// matrixEm is a matrix's width with its cells set in style cell: the
// columns, 2·\arraycolsep (10 pt) between them, and the parentheses.
func matrixEm(m matrix, cell style) float64 {
	ws := columnEms(m, cell)
	w := 2 * matrixParenEm
	for j, c := range ws {
		if j > 0 {
			w += colSepEm
		}
		w += c
	}
	return w
}

// colSepEm is the space between two columns of a matrix, matrixParenEm
// the width of one of its extensible parentheses.
const (
	colSepEm      = 0.95
	matrixParenEm = 1.0
)

func columnEms(m matrix, cell style) []float64 {
	var ws []float64
	for _, r := range m {
		for j, c := range r {
			if j >= len(ws) {
				ws = append(ws, 0)
			}
			ws[j] = max(ws[j], c.em(cell))
		}
	}
	return ws
}

func (d dotted) em(st style) float64 { return name{d.n.s}.em(st) + 0.4*st.scale() }

func (s sub) em(st style) float64 {
	return s.n.em(st) + float64(len(s.idx))*emLetter*st.script().scale()
}

func (u union) em(st style) float64 {
	w := 0.0
	for i, n := range u {
		if i > 0 {
			w += binEm(st)
		}
		w += n.em(st)
	}
	return w
}

func (r radical) em(st style) float64 { return digitsEm(r.w.String(), st) + 1.0*st.scale() }

// texEm estimates the width of a piece of LaTeX of our own notation (a
// symbol, a name): every command a letter wide except the spacing and
// structure commands, spaces around relations and operators as in a
// formula. It errs on the wide side, as the fractions in it count their
// numerator and denominator together.
func texEm(s string, st style) float64 {
	w := 0.0
	rs := []rune(s)
	for i := 0; i < len(rs); i++ {
		r := rs[i]
		switch {
		case r == '\\':
			j := i + 1
			for j < len(rs) && unicode.IsLetter(rs[j]) {
				j++
			}
			if j == i+1 && j < len(rs) {
				j++ // a control symbol: \, \{ …
			}
			cmd := string(rs[i+1 : j])
			i = j - 1
			switch cmd {
			case ",":
				w += emThin
			case ";", " ":
				w += 0.33
			case "quad":
				w += 1
			case "left", "right", "mathit", "mathsf", "text", "frac", "mathrm":
			case "le", "ge", "in", "approx":
				w += emSign + emRelSpace
			case "cup", "cdot":
				w += emSign + emBinSpace
			default:
				w += 1
			}
		case r == '_' || r == '^':
			// the script that follows is counted at full size: wide side
		case r == '{' || r == '}' || r == ' ':
		case r >= '0' && r <= '9':
			w += emDigit
		case r == '=' || r == '<' || r == '>':
			w += emSign + emRelSpace
		case r == '+' || r == '-':
			w += emSign + emBinSpace
		case r == '(' || r == ')' || r == '[' || r == ']' || r == '.' || r == ',':
			w += 0.45
		case unicode.IsUpper(r):
			w += emUpper
		default:
			w += emLetter
		}
	}
	return w * st.scale()
}

// hasFraction reports whether a node is set with a built-up fraction.
func hasFraction(n node) bool {
	found := false
	walk(n, func(m node) bool {
		switch v := m.(type) {
		case fraction, stackedNumber:
			found = true
		case number:
			if !v.r.IsInt() {
				found = true
			}
		}
		return !found
	})
	return found
}

// walk calls f on n and, while f returns true, on the parts of n.
func walk(n node, f func(node) bool) {
	if !f(n) {
		return
	}
	switch v := n.(type) {
	case sum:
		for _, t := range v {
			walk(t.n, f)
		}
	case product:
		for _, x := range v {
			walk(x, f)
		}
	case list:
		for _, x := range v {
			walk(x, f)
		}
	case union:
		for _, x := range v {
			walk(x, f)
		}
	case power:
		walk(v.base, f)
	case fraction:
		walk(v.num, f)
		walk(v.den, f)
	case parens:
		walk(v.n, f)
	case relation:
		walk(v.lhs, f)
		walk(v.rhs, f)
	case interval:
		walk(v.lo, f)
		walk(v.hi, f)
	case sub:
		walk(v.n, f)
	case slashFraction:
		walk(v.num, f)
		walk(v.den, f)
	case matrix:
		for _, r := range v {
			for _, c := range r {
				walk(c, f)
			}
		}
	}
}

// rewrite returns n with f applied to it and, where f leaves a node as it
// is (returns nil), to its parts.
func rewrite(n node, f func(node) node) node {
	if m := f(n); m != nil {
		return m
	}
	switch v := n.(type) {
	case sum:
		out := make(sum, len(v))
		for i, t := range v {
			out[i] = term{t.neg, rewrite(t.n, f)}
		}
		return out
	case product:
		out := make(product, len(v))
		for i, x := range v {
			out[i] = rewrite(x, f)
		}
		return out
	case list:
		out := make(list, len(v))
		for i, x := range v {
			out[i] = rewrite(x, f)
		}
		return out
	case union:
		out := make(union, len(v))
		for i, x := range v {
			out[i] = rewrite(x, f)
		}
		return out
	case power:
		return power{rewrite(v.base, f), v.exp}
	case fraction:
		return fraction{rewrite(v.num, f), rewrite(v.den, f)}
	case parens:
		return parens{rewrite(v.n, f)}
	case relation:
		return relation{rewrite(v.lhs, f), v.op, rewrite(v.rhs, f)}
	case interval:
		v.lo, v.hi = rewrite(v.lo, f), rewrite(v.hi, f)
		return v
	case sub:
		return sub{rewrite(v.n, f), v.idx}
	case matrix:
		out := make(matrix, len(v))
		for i, r := range v {
			for _, c := range r {
				out[i] = append(out[i], rewrite(c, f))
			}
		}
		return out
	}
	return n
}

// stackedNumber is a non-negative rational too long for a line in a
// display: its numerator and denominator each set as a block of lines of
// digit groups, perLine groups a line.
type stackedNumber struct {
	r       *big.Rat
	perLine int
}

// stackLines breaks a digit string into lines of perLine groups.
func stackLines(s string, perLine int) []string {
	gs := digitGroups(s)
	var out []string
	for len(gs) > 0 {
		k := min(perLine, len(gs))
		out = append(out, strings.Join(gs[:k], " "))
		gs = gs[k:]
	}
	return out
}

func (n stackedNumber) texPart(s string) string {
	ls := stackLines(s, n.perLine)
	if len(ls) == 1 {
		return texDigits(s, false)
	}
	for i, l := range ls {
		ls[i] = strings.ReplaceAll(l, " ", `\,`)
	}
	return `\begin{array}{@{}l@{}}` + strings.Join(ls, `\\`) + `\end{array}`
}

func (n stackedNumber) htmlPart(s string) string {
	ls := stackLines(s, n.perLine)
	if len(ls) == 1 {
		return mn(htmlDigits(s))
	}
	var b strings.Builder
	b.WriteString(`<mtable class="digits">`)
	for _, l := range ls {
		b.WriteString("<mtr><mtd>" + mn(strings.ReplaceAll(l, " ", "\u2009")) + "</mtd></mtr>")
	}
	b.WriteString("</mtable>")
	return b.String()
}

func (n stackedNumber) tex() string {
	if n.r.IsInt() {
		return n.texPart(n.r.Num().String())
	}
	return `\frac{` + n.texPart(n.r.Num().String()) + "}{" + n.texPart(n.r.Denom().String()) + "}"
}

func (n stackedNumber) html() string {
	if n.r.IsInt() {
		return n.htmlPart(n.r.Num().String())
	}
	return "<mfrac>" + n.htmlPart(n.r.Num().String()) + n.htmlPart(n.r.Denom().String()) + "</mfrac>"
}

func (n stackedNumber) em(st style) float64 {
	part := func(s string, st style) float64 {
		ls := stackLines(s, n.perLine)
		if len(ls) > 1 {
			// An array sets its cells in text style whatever the
			// style around it.
			st = textStyle
		}
		w := 0.0
		for _, l := range ls {
			w = max(w, digitsEm(strings.ReplaceAll(l, " ", ""), st))
		}
		return w
	}
	if n.r.IsInt() {
		return part(n.r.Num().String(), st)
	}
	return max(part(n.r.Num().String(), st.frac()), part(n.r.Denom().String(), st.frac())) + emNullDel*st.scale()
}

// stackNumbers returns n with every number wider than w em (in style st)
// stacked in lines at most w wide.
func stackNumbers(n node, w float64, st style) node {
	return rewrite(n, func(m node) node {
		x, ok := m.(number)
		if !ok || x.em(st) <= w {
			return nil
		}
		ps := st
		if !x.r.IsInt() {
			ps = st.frac()
		}
		group := (3*emDigit + emThin) * ps.scale()
		if ps > textStyle {
			// Stacked lines are an array, in text style (stackedNumber.em).
			group = 3*emDigit + emThin
		}
		return stackedNumber{x.r, max(1, int(w/group))}
	})
}
