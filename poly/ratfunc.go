package poly

import (
	"fmt"
	"math/big"
	"slices"
	"strings"
)

// RatFunc is a quotient Num / Den of polynomials over Q whose denominator is a
// product of polynomials in the parameters only (division by a state is never
// formed). The denominator is kept as a list of primitive factors with
// multiplicities, and every operation cancels a factor that divides the
// numerator exactly, so that u²/g · g·(v − u) comes out as u²·(v − u) with no g
// left. The representation is not a unique normal form (two factors may share
// a common divisor); Equal compares by cross-multiplication.
type RatFunc struct {
	Num *Poly
	Den []DenFactor
}

// DenFactor is one factor of a denominator: a primitive polynomial with a
// positive leading coefficient, raised to Mult >= 1.
type DenFactor struct {
	P    *Poly
	Mult int
}

// FromPoly returns the rational function p/1.
func FromPoly(p *Poly) RatFunc { return RatFunc{Num: p.Clone()} }

// RatConst returns the constant rational function c.
func RatConst(r *Ring, c *big.Rat) RatFunc { return FromPoly(Const(r, c)) }

// Ring returns the ring of f.
func (f RatFunc) Ring() *Ring { return f.Num.ring }

// IsPoly reports whether f has no denominator.
func (f RatFunc) IsPoly() bool { return len(f.Den) == 0 }

// IsZero reports whether f is zero.
func (f RatFunc) IsZero() bool { return f.Num.IsZero() }

// IsOne reports whether f is the constant 1.
func (f RatFunc) IsOne() bool {
	return f.IsPoly() && f.Num.IsConst() && f.Num.ConstTerm().Cmp(big.NewRat(1, 1)) == 0
}

// DenPoly returns the denominator as one polynomial.
func (f RatFunc) DenPoly() *Poly {
	d := ConstInt(f.Num.ring, 1)
	for _, df := range f.Den {
		d.Mul(d, new(Poly).Pow(df.P, df.Mult))
	}
	return d
}

func (f RatFunc) clone() RatFunc {
	g := RatFunc{Num: f.Num.Clone()}
	for _, d := range f.Den {
		g.Den = append(g.Den, DenFactor{d.P.Clone(), d.Mult})
	}
	return g
}

// cancel divides out every denominator factor that divides the numerator.
func (f RatFunc) cancel() RatFunc {
	if f.Num.IsZero() {
		return RatFunc{Num: f.Num}
	}
	out := RatFunc{Num: f.Num}
	q := new(Poly)
	for _, d := range f.Den {
		m := d.Mult
		for m > 0 && q.DivExact(out.Num, d.P) {
			out.Num = q.Clone()
			m--
		}
		if m > 0 {
			out.Den = append(out.Den, DenFactor{d.P, m})
		}
	}
	return out
}

func findFactor(ds []DenFactor, p *Poly) int {
	for i, d := range ds {
		if d.P.Equal(p) {
			return i
		}
	}
	return -1
}

// Mul returns f·g.
func (f RatFunc) Mul(g RatFunc) RatFunc {
	switch {
	case g.IsPoly() && g.Num.IsConst():
		return f.ScaleRat(g.Num.constCoef())
	case f.IsPoly() && f.Num.IsConst():
		return g.ScaleRat(f.Num.constCoef())
	}
	out := RatFunc{Num: new(Poly).Mul(f.Num, g.Num)}
	out.Den = mergeDen(f.Den, g.Den, func(a, b int) int { return a + b })
	return out.cancel()
}

func mergeDen(a, b []DenFactor, combine func(int, int) int) []DenFactor {
	var out []DenFactor
	for _, d := range a {
		out = append(out, DenFactor{d.P, d.Mult})
	}
	for _, d := range b {
		if i := findFactor(out, d.P); i >= 0 {
			out[i].Mult = combine(out[i].Mult, d.Mult)
		} else {
			out = append(out, DenFactor{d.P, d.Mult})
		}
	}
	return out
}

// Add returns f + g.
func (f RatFunc) Add(g RatFunc) RatFunc {
	if f.IsPoly() && g.IsPoly() {
		return RatFunc{Num: new(Poly).Add(f.Num, g.Num)}
	}
	common := mergeDen(f.Den, g.Den, func(a, b int) int { return max(a, b) })
	num := Zero(f.Num.ring)
	for _, h := range []RatFunc{f, g} {
		t := h.Num.Clone()
		for _, d := range common {
			m := d.Mult
			if i := findFactor(h.Den, d.P); i >= 0 {
				m -= h.Den[i].Mult
			}
			if m > 0 {
				t.Mul(t, new(Poly).Pow(d.P, m))
			}
		}
		num.Add(num, t)
	}
	return RatFunc{Num: num, Den: common}.cancel()
}

// Neg returns -f.
func (f RatFunc) Neg() RatFunc {
	g := f.clone()
	g.Num.Neg(g.Num)
	return g
}

// Sub returns f - g.
func (f RatFunc) Sub(g RatFunc) RatFunc {
	if f.IsPoly() && g.IsPoly() {
		return RatFunc{Num: new(Poly).Sub(f.Num, g.Num)}
	}
	return f.Add(g.Neg())
}

// ScaleRat returns c·f.
func (f RatFunc) ScaleRat(c *big.Rat) RatFunc {
	g := f.clone()
	g.Num.Scale(g.Num, c)
	if c.Sign() == 0 {
		g.Den = nil
	}
	return g
}

// Pow returns f^n, n >= 0.
func (f RatFunc) Pow(n int) RatFunc {
	out := RatFunc{Num: new(Poly).Pow(f.Num, n)}
	if n > 0 {
		for _, d := range f.Den {
			out.Den = append(out.Den, DenFactor{d.P.Clone(), d.Mult * n})
		}
	}
	return out
}

// DenominatorFactors splits a non-zero polynomial in the parameters into a
// rational constant and primitive factors (each variable of its monomial
// content separately, and the rest as one factor).
func DenominatorFactors(p *Poly) (*big.Rat, []DenFactor) {
	c, q := p.PrimitivePart()
	n := p.ring.NumVars()
	minExp := make([]int, n)
	first := true
	for k := range q.terms {
		e := unkey(k)
		for i := range e {
			if first || e[i] < minExp[i] {
				minExp[i] = e[i]
			}
		}
		first = false
	}
	var out []DenFactor
	for i, m := range minExp {
		if m > 0 {
			out = append(out, DenFactor{Var(p.ring, i), m})
		}
	}
	rest := Zero(p.ring)
	for k, a := range q.terms {
		e := unkey(k)
		for i := range e {
			e[i] -= minExp[i]
		}
		rest.terms[key(e)] = a // shared (see Poly)
	}
	if !rest.IsConst() {
		out = append(out, DenFactor{rest, 1})
	}
	return c, out
}

// Quo returns f / g. g must be non-zero and free of states; Quo panics otherwise.
func (f RatFunc) Quo(g RatFunc) RatFunc {
	if g.IsZero() {
		panic("poly: division by zero")
	}
	if g.IsPoly() && g.Num.IsConst() {
		// Division by a constant: scale, no denominator.
		return f.ScaleRat(new(big.Rat).Inv(g.Num.constCoef()))
	}
	mask := g.Num.ring.StateMask()
	if g.Num.DegreeIn(mask) > 0 {
		panic("poly: division by a state expression")
	}
	c, factors := DenominatorFactors(g.Num)
	num := f.Num.Clone()
	num.Scale(num, new(big.Rat).Inv(c))
	for _, d := range g.Den {
		num.Mul(num, new(Poly).Pow(d.P, d.Mult))
	}
	out := RatFunc{Num: num, Den: mergeDen(f.Den, factors, func(a, b int) int { return a + b })}
	return out.cancel()
}

// Derivative returns ∂f/∂v_i for a state variable i (the denominator does not
// depend on states, so only the numerator is differentiated).
func (f RatFunc) Derivative(i int) RatFunc {
	if !f.Num.ring.IsState(i) {
		panic("poly: RatFunc derivative in a parameter")
	}
	g := f.clone()
	g.Num.Derivative(g.Num, i)
	return g.cancel()
}

// Equal reports whether f and g are equal as rational functions.
func (f RatFunc) Equal(g RatFunc) bool {
	if f.IsPoly() && g.IsPoly() {
		return f.Num.Equal(g.Num)
	}
	a := new(Poly).Mul(f.Num, g.DenPoly())
	b := new(Poly).Mul(g.Num, f.DenPoly())
	return a.Equal(b)
}

// ComposeStates returns f with each state i replaced by sub[i] (nil keeps the
// state), simultaneously. The substitutes may carry denominators.
func (f RatFunc) ComposeStates(sub []RatFunc, has []bool) RatFunc {
	if f.IsPoly() {
		// Constant substitutes (a point, as in a residual) are an
		// evaluation: the same polynomial without the detour through
		// rational functions.
		if vals, ok := constSubstitutes(sub, has); ok {
			return RatFunc{Num: new(Poly).EvalVars(f.Num, vals)}
		}
	}
	r := f.Num.ring
	result := RatFunc{Num: Zero(r)}
	for _, t := range f.Num.sortedTerms() {
		rest := append([]int(nil), t.Exp...)
		for i := range rest {
			if has[i] {
				rest[i] = 0
			}
		}
		term := FromPoly(Monomial(r, rest, t.Coef))
		for i, e := range t.Exp {
			if has[i] && e > 0 {
				term = term.Mul(sub[i].Pow(e))
			}
		}
		result = result.Add(term)
	}
	den := RatFunc{Num: ConstInt(r, 1), Den: f.Den}
	return result.Mul(den)
}

// constSubstitutes returns the values of the substitutes selected by has
// when every one of them is a constant polynomial.
func constSubstitutes(sub []RatFunc, has []bool) (map[int]*big.Rat, bool) {
	vals := map[int]*big.Rat{}
	for i, h := range has {
		if !h {
			continue
		}
		if !sub[i].IsPoly() || !sub[i].Num.IsConst() {
			return nil, false
		}
		vals[i] = sub[i].Num.ConstTerm()
	}
	return vals, true
}

// EvalVars substitutes rational values for the variables in vals.
func (f RatFunc) EvalVars(vals map[int]*big.Rat) (RatFunc, error) {
	num := new(Poly).EvalVars(f.Num, vals)
	out := FromPoly(num)
	for _, d := range f.Den {
		dv := new(Poly).EvalVars(d.P, vals)
		if dv.IsZero() {
			return RatFunc{}, fmt.Errorf("denominator %s vanishes", d.P)
		}
		out = out.Quo(FromPoly(new(Poly).Pow(dv, d.Mult)))
	}
	return out, nil
}

// Eval returns f at a point (one value per ring variable); an error when the
// denominator vanishes there.
func (f RatFunc) Eval(x []*big.Rat) (*big.Rat, error) {
	d := f.DenPoly().Eval(x)
	if d.Sign() == 0 {
		return nil, fmt.Errorf("denominator vanishes")
	}
	return new(big.Rat).Quo(f.Num.Eval(x), d), nil
}

// Homogeneous returns the part of f whose numerator has degree d in the
// variables selected by in (valid split because the denominator is free of
// states when in selects states).
func (f RatFunc) Homogeneous(d int, in []bool) RatFunc {
	g := RatFunc{Num: f.Num.Homogeneous(d, in)}
	for _, df := range f.Den {
		g.Den = append(g.Den, DenFactor{df.P.Clone(), df.Mult})
	}
	return g.cancel()
}

// Coefficient returns the coefficient of the state monomial e as a rational
// function of the parameters.
func (f RatFunc) Coefficient(e []int, in []bool) RatFunc {
	g := RatFunc{Num: f.Num.Coefficient(e, in)}
	for _, df := range f.Den {
		g.Den = append(g.Den, DenFactor{df.P.Clone(), df.Mult})
	}
	return g.cancel()
}

// DegreeIn returns the degree of the numerator in the selected variables.
func (f RatFunc) DegreeIn(in []bool) int { return f.Num.DegreeIn(in) }

// String returns the canonical text of f, collected by state monomials in
// descending graded order, each with its coefficient in the parameters:
// "x^2/sigma + y^2 + z^2", "-2*x^2 + 2*(r + 1)*x*y - 2*b*z^2". Parameter-only
// functions print as "(num)/(den)". The text re-parses to an equal rational
// function.
func (f RatFunc) String() string { return f.Format(f.Num.ring.names) }

// Format is String with other variable names.
func (f RatFunc) Format(names []string) string {
	r := f.Num.ring
	states := r.StateMask()
	if f.Num.IsZero() {
		return "0"
	}
	if f.Num.DegreeIn(states) <= 0 {
		return formatQuotient(f.Num.formatTerms(names), f.Num.NumTerms() > 1, f.Den, names)
	}
	if len(f.Den) == 0 && f.Num.DegreeIn(r.ParamMask()) <= 0 {
		// No parameter: every group of formatGrouped is one term with a
		// constant coefficient, printed exactly as formatTerms prints it
		// (TestFormatWithoutParameters), without a polynomial per group.
		return f.Num.formatTerms(names)
	}
	return f.formatGrouped(names, states)
}

// formatGrouped prints f's terms grouped by their state monomial, each
// with its coefficient in the parameters.
func (f RatFunc) formatGrouped(names []string, states []bool) string {
	r := f.Num.ring
	// Group the terms by their state monomial.
	type group struct {
		exp  []int
		coef *Poly
	}
	var groups []*group
	index := map[string]*group{}
	for _, t := range f.Num.sortedTerms() {
		se := make([]int, len(t.Exp))
		pe := make([]int, len(t.Exp))
		for i, x := range t.Exp {
			if states[i] {
				se[i] = x
			} else {
				pe[i] = x
			}
		}
		k := key(se)
		g, ok := index[k]
		if !ok {
			g = &group{exp: se, coef: Zero(r)}
			index[k] = g
			groups = append(groups, g)
		}
		// Distinct terms with the same state monomial differ in their
		// parameter monomial, so the key is new; t.Coef is Terms' copy.
		g.coef.terms[key(pe)] = t.Coef
	}
	slices.SortStableFunc(groups, func(a, b *group) int {
		switch {
		case gradedLess(b.exp, a.exp):
			return -1
		case gradedLess(a.exp, b.exp):
			return 1
		}
		return 0
	})
	var b strings.Builder
	for i, g := range groups {
		c := RatFunc{Num: g.coef, Den: f.Den}.cancel()
		neg := c.Num.lead().Coef.Sign() < 0
		if neg {
			c.Num = new(Poly).Neg(c.Num)
		}
		switch {
		case i == 0 && neg:
			b.WriteString("-")
		case i > 0 && neg:
			b.WriteString(" - ")
		case i > 0:
			b.WriteString(" + ")
		}
		mono := formatMonomial(g.exp, names)
		switch {
		case c.Num.NumTerms() == 1:
			t := c.Num.lead()
			parts := []string{}
			pm := formatMonomial(t.Exp, names)
			if !isOne(t.Coef) || (pm == "" && mono == "") {
				parts = append(parts, RatString(t.Coef))
			}
			if pm != "" {
				parts = append(parts, pm)
			}
			if mono != "" {
				parts = append(parts, mono)
			}
			b.WriteString(strings.Join(parts, "*"))
		case mono == "":
			b.WriteString("(" + c.Num.formatTerms(names) + ")")
		default:
			b.WriteString("(" + c.Num.formatTerms(names) + ")*" + mono)
		}
		if len(c.Den) > 0 {
			b.WriteString("/" + formatDen(c.Den, names))
		}
	}
	return b.String()
}

func formatQuotient(num string, multi bool, den []DenFactor, names []string) string {
	if len(den) == 0 {
		return num
	}
	if multi {
		num = "(" + num + ")"
	}
	return num + "/" + formatDen(den, names)
}

func formatDen(den []DenFactor, names []string) string {
	var parts []string
	for _, d := range sortedDen(den, names) {
		s := d.P.formatTerms(names)
		if d.P.NumTerms() > 1 || (strings.ContainsAny(s, "*^") && d.Mult > 1) {
			s = "(" + s + ")"
		}
		if d.Mult > 1 {
			s = fmt.Sprintf("%s^%d", s, d.Mult)
		}
		parts = append(parts, s)
	}
	out := strings.Join(parts, "*")
	if len(parts) > 1 {
		out = "(" + out + ")"
	}
	return out
}

func sortedDen(ds []DenFactor, names []string) []DenFactor {
	out := append([]DenFactor(nil), ds...)
	for i := 1; i < len(out); i++ {
		for j := i; j > 0 && out[j].P.formatTerms(names) < out[j-1].P.formatTerms(names); j-- {
			out[j], out[j-1] = out[j-1], out[j]
		}
	}
	return out
}
