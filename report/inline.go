package report

import (
	"html"
	"math/big"
	"strings"
)

// Long numbers in running text. A built-up fraction cannot be broken, and
// a certificate's rationals may have a hundred digits: in a sentence a
// rational whose numerator or denominator has more than longDigits digits
// is set in the solidus form n/d (ISO 80000-2 allows a/b for a fraction in
// running text, from memory), its digits in groups of three (digitGroups),
// with a permitted line break between two groups and after the solidus. A
// number so broken continues, in groups of three, at the start of the next
// line. Where such a number is a factor of a product it is put in
// parentheses, so that (n/d)·k cannot be read as n/(d·k).

// longDigits is the most digits a numerator or denominator in running text
// may have and still be set as a built-up fraction.
const longDigits = 10

func isLong(r *big.Rat) bool {
	return len(r.Num().String()) > longDigits || len(r.Denom().String()) > longDigits
}

// slashNumber is a non-negative rational set breakably in running text.
type slashNumber struct {
	r     *big.Rat
	paren bool
}

func (n slashNumber) tex() string {
	s := texDigits(n.r.Num().String(), true)
	if !n.r.IsInt() {
		s += `/\allowbreak ` + texDigits(n.r.Denom().String(), true)
		if n.paren {
			s = "(" + s + ")"
		}
	}
	return s
}

func (n slashNumber) html() string {
	s := mn(htmlDigits(n.r.Num().String()))
	if !n.r.IsInt() {
		s += mo("/") + mn(htmlDigits(n.r.Denom().String()))
		if n.paren {
			s = mo("(") + s + mo(")")
		}
	}
	return mrow(s)
}

// text is the number as HTML text outside a math element, where the
// browser may break it: at the thin spaces (U+2009, a break opportunity of
// Unicode's line breaking algorithm, UAX #14) and after the solidus.
func (n slashNumber) text() string {
	s := html.EscapeString(htmlDigits(n.r.Num().String()))
	if !n.r.IsInt() {
		s += "/<wbr>" + html.EscapeString(htmlDigits(n.r.Denom().String()))
		if n.paren {
			s = "(" + s + ")"
		}
	}
	return `<span class="num">` + s + `</span>`
}

func (n slashNumber) em(st style) float64 {
	w := digitsEm(n.r.Num().String(), st)
	if !n.r.IsInt() {
		w += digitsEm(n.r.Denom().String(), st) + emDigit*st.scale()
		if n.paren {
			w += 2 * emParen * st.scale()
		}
	}
	return w
}

// inlineForm returns n as set in running text: its long numbers in the
// breakable solidus form. Built-up fractions of polynomials keep their
// numbers, which cannot break there anyway.
func inlineForm(n node) node {
	return rewrite(n, func(m node) node {
		switch v := m.(type) {
		case number:
			if isLong(v.r) {
				return slashNumber{r: v.r}
			}
			return m
		case fraction:
			if v.em(textStyle) <= longFracEm {
				return m
			}
			return slashFraction{inlineForm(v.num), inlineForm(v.den)}
		case radical:
			if len(v.w.String()) > longDigits {
				return rootNumber{v.w}
			}
			return m
		case product:
			out := make(product, len(v))
			for i, f := range v {
				if x, ok := f.(number); ok && isLong(x.r) {
					out[i] = slashNumber{r: x.r, paren: true}
				} else {
					out[i] = inlineForm(f)
				}
			}
			return out
		}
		return nil
	})
}

// longFracEm is the widest a built-up fraction of formulas may be in
// running text; a wider one is set in the solidus form.
const longFracEm = 8.0

// slashFraction is num/den in running text, each in parentheses when it is
// a sum or a product; the line may break after the solidus.
type slashFraction struct{ num, den node }

func needsParens(n node) bool {
	switch n.(type) {
	case sum, product, slashFraction:
		return true
	}
	return false
}

func (f slashFraction) tex() string {
	part := func(n node) string {
		if needsParens(n) {
			return "(" + n.tex() + ")"
		}
		return n.tex()
	}
	return part(f.num) + `/\allowbreak ` + part(f.den)
}

func (f slashFraction) html() string {
	part := func(n node) string {
		if needsParens(n) {
			return mo("(") + n.html() + mo(")")
		}
		return n.html()
	}
	return mrow(part(f.num) + mo("/") + part(f.den))
}

func (f slashFraction) em(st style) float64 {
	return f.num.em(st) + f.den.em(st) + (emDigit+4*emParen)*st.scale()
}

// rootNumber is √w with a long w in running text, set (w)^{1/2} so that
// the digits of w may break.
type rootNumber struct{ w *big.Int }

func (r rootNumber) tex() string { return "(" + texDigits(r.w.String(), true) + ")^{1/2}" }
func (r rootNumber) html() string {
	return "<msup>" + mrow(mo("(")+mn(htmlDigits(r.w.String()))+mo(")")) + "<mfrac><mn>1</mn><mn>2</mn></mfrac></msup>"
}
func (r rootNumber) em(st style) float64 {
	return digitsEm(r.w.String(), st) + (2*emParen+1.2)*st.scale()
}

// text is the root as HTML text, breakable like a slashNumber's.
func (r rootNumber) text() string {
	return `<span class="num">(` + html.EscapeString(htmlDigits(r.w.String())) + `)<sup>1/2</sup></span>`
}

// texInline is a node as inline LaTeX math.
func texInline(n node) string { return "$" + inlineForm(n).tex() + "$" }

// htmlInline is a node as inline HTML: one math element, or, when it has
// long numbers, math elements with the numbers as text between them, since
// a browser does not break a line inside a math element.
func htmlInline(n node) string {
	n = inlineForm(n)
	has := false
	walk(n, func(m node) bool {
		switch m.(type) {
		case slashNumber, rootNumber:
			has = true
		}
		return !has
	})
	if !has {
		return inlineMath(n)
	}
	var b strings.Builder
	var math []string
	flush := func() {
		if len(math) > 0 {
			b.WriteString("<math>" + mrow(strings.Join(math, "")) + "</math>")
			math = nil
		}
	}
	var emit func(node)
	emit = func(n node) {
		switch v := n.(type) {
		case slashNumber:
			flush()
			b.WriteString(v.text())
		case rootNumber:
			flush()
			b.WriteString(v.text())
		case slashFraction:
			for i, p := range []node{v.num, v.den} {
				if i > 0 {
					math = append(math, mo("/"))
				}
				if needsParens(p) {
					math = append(math, mo("("))
				}
				emit(p)
				if needsParens(p) {
					math = append(math, mo(")"))
				}
			}
		case relation:
			emit(v.lhs)
			math = append(math, v.op.html())
			flush()
			b.WriteString(" ")
			emit(v.rhs)
		case sum:
			for i, t := range v {
				switch {
				case t.neg:
					math = append(math, mo("−"))
				case i > 0:
					math = append(math, mo("+"))
				}
				emit(t.n)
			}
		case product:
			for i, f := range v {
				if i > 0 {
					math = append(math, thinSpace)
				}
				emit(f)
			}
		case list:
			for i, x := range v {
				if i > 0 {
					math = append(math, mo(","))
					flush()
					b.WriteString(" ")
				}
				emit(x)
			}
		case interval:
			if v.point {
				math = append(math, mo("{"))
				emit(v.lo)
				math = append(math, mo("}"))
				break
			}
			l, r := "(", ")"
			if v.loClosed {
				l = "["
			}
			if v.hiClosed {
				r = "]"
			}
			math = append(math, mo(l))
			emit(v.lo)
			math = append(math, mo(","))
			emit(v.hi)
			math = append(math, mo(r))
		default:
			math = append(math, v.html())
		}
	}
	emit(n)
	flush()
	return b.String()
}
