package report

import (
	"fmt"
	"html"
	"math/big"
	"slices"
	"strings"
	"unicode"

	"github.com/lyacert/lyacert/poly"
)

// A node is a piece of mathematics as it is set: numbers, names, powers,
// products, signed sums and fractions. Polynomials are turned into nodes
// once and printed as LaTeX (md and tex reports) or as MathML (html
// reports: presentation markup, the content of a <math> element, which
// current browsers render natively). html returns well-formed XML: every
// name and number from a certificate is escaped, and only markup built
// here is left as markup. It is always exactly one element, so that it can
// stand as an argument of msup, msub or mfrac without an mrow around it.
type node interface {
	tex() string
	html() string
	// em is the width of the node set in LaTeX in the given style, in em
	// of the text font, estimated on the wide side (fit.go).
	em(st style) float64
}

// number is a non-negative rational, set as an integer or a fraction.
type number struct{ r *big.Rat }

// name is a variable (state or parameter) of a model.
type name struct{ s string }

// power is base^exp with exp ≥ 2.
type power struct {
	base node
	exp  int
}

// product is juxtaposition of factors.
type product []node

// sum is a signed sum; the first term may be negative.
type sum []term

type term struct {
	neg bool
	n   node
}

// fraction is num over den.
type fraction struct{ num, den node }

// parens groups a node.
type parens struct{ n node }

// symbol is fixed notation of ours, with its LaTeX and its MathML (markup
// of ours; text from elsewhere goes through mn or mtext, which escape it).
type symbol struct{ t, m string }

// relation is lhs op rhs.
type relation struct {
	lhs node
	op  symbol
	rhs node
}

var (
	symLess    = symbol{"<", "<mo>&lt;</mo>"}
	symGreater = symbol{">", "<mo>&gt;</mo>"}
	symLeq     = symbol{`\le`, "<mo>≤</mo>"}
	symGeq     = symbol{`\ge`, "<mo>≥</mo>"}
	symEq      = symbol{"=", "<mo>=</mo>"}
	symIn      = symbol{`\in`, "<mo>∈</mo>"}
	symApprox  = symbol{`\approx`, "<mo>≈</mo>"}
)

// MathML pieces. Text that is not ours (digits of a rational, a decimal
// from a certificate, a name) is escaped here.
func mn(s string) string    { return "<mn>" + html.EscapeString(s) + "</mn>" }
func mi(s string) string    { return "<mi>" + html.EscapeString(s) + "</mi>" }
func mo(s string) string    { return "<mo>" + html.EscapeString(s) + "</mo>" }
func mtext(s string) string { return "<mtext>" + html.EscapeString(s) + "</mtext>" }
func mrow(s string) string  { return "<mrow>" + s + "</mrow>" }

// thinSpace is LaTeX's \, (3/18 em).
const thinSpace = `<mspace width="0.1667em"></mspace>`

// decimalSym is a decimal number from a certificate ("-1.25"), set with a
// minus sign.
func decimalSym(s string) symbol {
	if strings.HasPrefix(s, "-") {
		return symbol{s, mrow(mo("−") + mn(s[1:]))}
	}
	return symbol{s, mn(s)}
}

// A number's digits are grouped in threes when it has five or more
// (digitGroups).
func (n number) tex() string {
	if n.r.IsInt() {
		return texDigits(n.r.Num().String(), false)
	}
	return `\frac{` + texDigits(n.r.Num().String(), false) + "}{" + texDigits(n.r.Denom().String(), false) + "}"
}

func (n number) html() string {
	if n.r.IsInt() {
		return mn(htmlDigits(n.r.Num().String()))
	}
	return "<mfrac>" + mn(htmlDigits(n.r.Num().String())) + mn(htmlDigits(n.r.Denom().String())) + "</mfrac>"
}

func (n name) tex() string  { return texName(n.s) }
func (n name) html() string { return htmlName(n.s) }

func (p power) tex() string {
	b := p.base.tex()
	if _, ok := p.base.(name); ok && strings.Contains(b, "_{") {
		b = "{" + b + "}"
	}
	return fmt.Sprintf("%s^{%d}", b, p.exp)
}

func (p power) html() string {
	return "<msup>" + p.base.html() + mn(fmt.Sprint(p.exp)) + "</msup>"
}

func (p product) tex() string {
	parts := make([]string, len(p))
	for i, f := range p {
		parts[i] = f.tex()
	}
	// A thin space keeps a coefficient and a name, or two names, apart
	// without the look of a multiplication sign.
	return strings.Join(parts, `\,`)
}

func (p product) html() string {
	parts := make([]string, len(p))
	for i, f := range p {
		parts[i] = f.html()
	}
	return mrow(strings.Join(parts, thinSpace))
}

func (s sum) tex() string { return s.join(func(n node) string { return n.tex() }, "-", " + ", " - ") }
func (s sum) html() string {
	return mrow(s.join(func(n node) string { return n.html() }, mo("−"), mo("+"), mo("−")))
}

func (s sum) join(f func(node) string, lead, plus, minus string) string {
	var b strings.Builder
	for i, t := range s {
		switch {
		case i == 0 && t.neg:
			b.WriteString(lead)
		case i > 0 && t.neg:
			b.WriteString(minus)
		case i > 0:
			b.WriteString(plus)
		}
		b.WriteString(f(t.n))
	}
	return b.String()
}

func (f fraction) tex() string { return fmt.Sprintf(`\frac{%s}{%s}`, f.num.tex(), f.den.tex()) }
func (f fraction) html() string {
	return "<mfrac>" + f.num.html() + f.den.html() + "</mfrac>"
}

func (p parens) tex() string  { return `\left(` + p.n.tex() + `\right)` }
func (p parens) html() string { return mrow(mo("(") + p.n.html() + mo(")")) }

func (s symbol) tex() string  { return s.t }
func (s symbol) html() string { return s.m }

func (r relation) tex() string  { return r.lhs.tex() + " " + r.op.tex() + " " + r.rhs.tex() }
func (r relation) html() string { return mrow(r.lhs.html() + r.op.html() + r.rhs.html()) }

// greek maps the spelled-out and the Unicode Greek letters to LaTeX.
var greek = map[string]string{}

func init() {
	lower := "alpha beta gamma delta epsilon zeta eta theta iota kappa lambda mu nu xi pi rho sigma tau upsilon phi chi psi omega"
	uni := "αβγδεζηθικλμνξπρστυφχψω"
	ur := []rune(uni)
	for i, g := range strings.Fields(lower) {
		greek[g] = `\` + g
		greek[string(ur[i])] = `\` + g
	}
	upper := "Gamma Delta Theta Lambda Xi Pi Sigma Upsilon Phi Psi Omega"
	uu := []rune("ΓΔΘΛΞΠΣΥΦΨΩ")
	for i, g := range strings.Fields(upper) {
		greek[g] = `\` + g
		greek[string(uu[i])] = `\` + g
	}
	greek["varepsilon"], greek["vartheta"], greek["varphi"] = `\varepsilon`, `\vartheta`, `\varphi`
}

// greekHTML maps a spelled-out Greek name to its letter.
var greekHTML = map[string]string{}

func init() {
	lower := strings.Fields("alpha beta gamma delta epsilon zeta eta theta iota kappa lambda mu nu xi pi rho sigma tau upsilon phi chi psi omega")
	for i, r := range []rune("αβγδεζηθικλμνξπρστυφχψω") {
		greekHTML[lower[i]] = string(r)
	}
	upper := strings.Fields("Gamma Delta Theta Lambda Xi Pi Sigma Upsilon Phi Psi Omega")
	for i, r := range []rune("ΓΔΘΛΞΠΣΥΦΨΩ") {
		greekHTML[upper[i]] = string(r)
	}
	greekHTML["varepsilon"], greekHTML["vartheta"], greekHTML["varphi"] = "ε", "ϑ", "φ"
}

// splitName splits a variable name into its base and subscript: "x_ref" →
// ("x", "ref"), "x12" → ("x", "12"), "sigma2" → ("sigma", "2"), "u" → ("u", "").
func splitName(s string) (base, sub string) {
	if i := strings.IndexRune(s, '_'); i > 0 && i < len(s)-1 {
		return s[:i], s[i+1:]
	}
	i := len(s)
	for i > 0 {
		r := rune(s[i-1])
		if r < '0' || r > '9' {
			break
		}
		i--
	}
	if i > 0 && i < len(s) {
		return s[:i], s[i:]
	}
	return s, ""
}

// texName sets a variable name in math mode: one letter as itself, a Greek
// name as the letter, other names upright-italic as one word (so that "kp"
// is not read as k·p), digits or an underscore part as a subscript.
func texName(s string) string {
	base, sub := splitName(s)
	out := texNamePart(base)
	if sub != "" {
		out += "_{" + texNamePart(sub) + "}"
	}
	return out
}

func texNamePart(s string) string {
	if g, ok := greek[s]; ok {
		return g
	}
	rs := []rune(s)
	if len(rs) == 1 && rs[0] < 128 && unicode.IsLetter(rs[0]) {
		return s
	}
	allDigits := true
	for _, r := range rs {
		if r < '0' || r > '9' {
			allDigits = false
		}
	}
	if allDigits {
		return s
	}
	return `\mathit{` + texMathText(s) + `}`
}

// texMathText escapes a name's characters for \mathit: ASCII letters and
// digits as they are, Greek letters by command, "_" escaped, anything else
// through \text (amsmath), which pdflatex sets from its UTF-8 support.
func texMathText(s string) string {
	var b strings.Builder
	for _, r := range s {
		switch {
		case r < 128 && (unicode.IsLetter(r) || unicode.IsDigit(r)):
			b.WriteRune(r)
		case r == '_':
			b.WriteString(`\_`)
		default:
			if g, ok := greek[string(r)]; ok {
				b.WriteString(g + " ")
			} else {
				b.WriteString(`\text{` + texText(string(r)) + `}`)
			}
		}
	}
	return b.String()
}

// htmlName sets a variable name in MathML as texName does in LaTeX.
func htmlName(s string) string {
	base, sub := splitName(s)
	out := htmlNamePart(base)
	if sub != "" {
		out = "<msub>" + out + htmlNamePart(sub) + "</msub>"
	}
	return out
}

// htmlNamePart is one mi or mn: a one-letter mi is italic by MathML's
// rule, a longer one upright, so a word-name gets the class that the
// stylesheet sets in italics (as \mathit does).
func htmlNamePart(s string) string {
	if g, ok := greekHTML[s]; ok {
		if unicode.IsUpper([]rune(s)[0]) {
			// Upright, as \Omega is.
			return `<mi mathvariant="normal">` + g + "</mi>"
		}
		s = g
	}
	if strings.Trim(s, "0123456789") == "" {
		return mn(s)
	}
	if len([]rune(s)) == 1 {
		return mi(s)
	}
	return `<mi class="word">` + html.EscapeString(s) + "</mi>"
}

// ratNode sets a rational of any sign.
func ratNode(r *big.Rat) node {
	if r.Sign() < 0 {
		return sum{{true, number{new(big.Rat).Abs(r)}}}
	}
	return number{r}
}

// monomialNode sets the monomial with exponents e in r's names; nil for 1.
func monomialNode(r *poly.Ring, e []int) []node {
	var fs []node
	for i, x := range e {
		switch {
		case x == 1:
			fs = append(fs, name{r.Name(i)})
		case x > 1:
			fs = append(fs, power{name{r.Name(i)}, x})
		}
	}
	return fs
}

// polyNode sets a polynomial term by term in descending graded
// lexicographic order, as in its canonical text.
func polyNode(p *poly.Poly) node {
	ts := p.Terms()
	if len(ts) == 0 {
		return number{new(big.Rat)}
	}
	var s sum
	for _, t := range ts {
		abs := new(big.Rat).Abs(t.Coef)
		fs := monomialNode(p.Ring(), t.Exp)
		if abs.Cmp(big.NewRat(1, 1)) != 0 || len(fs) == 0 {
			fs = append([]node{number{abs}}, fs...)
		}
		s = append(s, term{t.Coef.Sign() < 0, factorsNode(fs)})
	}
	if len(s) == 1 && !s[0].neg {
		return s[0].n
	}
	return s
}

func factorsNode(fs []node) node {
	if len(fs) == 1 {
		return fs[0]
	}
	return product(fs)
}

// denNode sets a denominator: its factors with their multiplicities.
func denNode(den []poly.DenFactor) node {
	// In the order of the canonical text: by each factor's text.
	den = slices.Clone(den)
	slices.SortStableFunc(den, func(a, b poly.DenFactor) int { return strings.Compare(a.P.String(), b.P.String()) })
	var fs []node
	for _, d := range den {
		var b node = polyNode(d.P)
		if d.P.NumTerms() > 1 && (d.Mult > 1 || len(den) > 1) {
			b = parens{b}
		}
		if d.Mult > 1 {
			b = power{b, d.Mult}
		}
		fs = append(fs, b)
	}
	return factorsNode(fs)
}

// ratFuncNode sets a rational function the way its canonical text reads:
// collected by state monomials in descending graded order, each with its
// coefficient in the parameters, a denominator as a fraction:
// "x^2/sigma + y^2" is \frac{x^{2}}{\sigma} + y^{2}.
func ratFuncNode(f poly.RatFunc) node {
	r := f.Ring()
	states := r.StateMask()
	if f.IsZero() {
		return number{new(big.Rat)}
	}
	if f.Num.DegreeIn(states) <= 0 {
		if f.IsPoly() {
			return polyNode(f.Num)
		}
		num := f.Num
		neg := num.Lead().Coef.Sign() < 0
		if neg {
			num = new(poly.Poly).Neg(num)
		}
		fr := fraction{polyNode(num), denNode(f.Den)}
		if neg {
			return sum{{true, fr}}
		}
		return fr
	}
	var exps [][]int
	seen := map[string]bool{}
	for _, t := range f.Num.Terms() {
		se := make([]int, len(t.Exp))
		for i, x := range t.Exp {
			if states[i] {
				se[i] = x
			}
		}
		k := fmt.Sprint(se)
		if !seen[k] {
			seen[k] = true
			exps = append(exps, se)
		}
	}
	slices.SortStableFunc(exps, func(a, b []int) int { return -poly.GradedCompare(a, b) })
	var s sum
	for _, e := range exps {
		c := f.Coefficient(e, states)
		neg := c.Num.Lead().Coef.Sign() < 0
		if neg {
			c = c.Neg()
		}
		mono := monomialNode(r, e)
		var fs []node
		switch {
		case c.Num.NumTerms() == 1:
			t := c.Num.Lead()
			if t.Coef.Cmp(big.NewRat(1, 1)) != 0 || (len(mono) == 0 && c.Num.IsConst()) {
				fs = append(fs, number{t.Coef})
			}
			fs = append(fs, monomialNode(r, t.Exp)...)
		default:
			fs = append(fs, parens{polyNode(c.Num)})
		}
		fs = append(fs, mono...)
		var n node = factorsNode(fs)
		if !c.IsPoly() {
			n = fraction{n, denNode(c.Den)}
		}
		s = append(s, term{neg, n})
	}
	if len(s) == 1 && !s[0].neg {
		return s[0].n
	}
	return s
}

// continued sets the rest of a broken sum: a leading "+" or "−" for the first term.
func continued(n node, tex bool) string {
	s, ok := n.(sum)
	body := ""
	neg := false
	if ok {
		neg = s[0].neg
		first := append(sum{{false, s[0].n}}, s[1:]...)
		if tex {
			body = first.tex()
		} else {
			body = first.html()
		}
	} else if tex {
		body = n.tex()
	} else {
		body = n.html()
	}
	switch {
	case neg && tex:
		return "- " + body
	case neg:
		return mrow(mo("−") + body)
	case tex:
		return "+ " + body
	}
	return mrow(mo("+") + body)
}
