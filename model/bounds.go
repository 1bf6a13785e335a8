package model

import (
	"errors"
	"fmt"
	"math"

	"github.com/lyacert/lyacert/poly"
)

// The derived polynomials (V̇ or ΔV, the residuals at the equilibrium, V and
// V̇ shifted to it) are computed after parsing by functions that return no
// error, so their size is bounded here, before any of them is built, from
// the shapes of the parsed expressions: degrees exactly as a product or
// composition gives them (an upper bound when terms cancel), terms and work
// by the number of monomials of that degree and the sizes of the factors.
// For ΔV = V(f(x)) − V(x) with V = x² + x^256 and f = x^256/2 the degree
// is 65536, far above any limit: refused here, it would otherwise overflow
// the exponents of a monomial.

// est is an upper estimate of a polynomial's size.
type est struct {
	deg, denDeg int
	terms, work int64
}

func shapeOf(f poly.RatFunc) est {
	d := 0
	for _, df := range f.Den {
		d += df.Mult * max(df.P.Degree(), 0)
	}
	return est{deg: max(f.Num.Degree(), 0), denDeg: d, terms: int64(f.Num.NumTerms())}
}

// monomials returns the number of monomials of degree at most d in n
// variables, binomial(n+d, n), saturated.
func monomials(n, d int) int64 {
	// binomial(n+d, n) = binomial(n+d, d): the loop runs over the smaller
	// of the two (the degree, for models with many states); every partial
	// product binomial(m+i, i) is an integer and they increase, so the
	// saturation is the same either way.
	m, k := max(n, d), min(n, d)
	r := int64(1)
	for i := 1; i <= k; i++ {
		r = poly.SatMul(r, int64(m+i)) / int64(i)
		if r >= math.MaxInt64/int64(n+d+1) {
			return math.MaxInt64
		}
	}
	return r
}

// powTerms bounds the terms of s^e.
func powTerms(s est, e, nvars int) int64 {
	t := int64(1)
	for range min(e, 64) {
		t = poly.SatMul(t, s.terms)
	}
	if e > 64 && s.terms > 1 {
		t = math.MaxInt64
	}
	return min(t, monomials(nvars, e*max(s.deg, 1)))
}

// compose estimates p with each state i replaced by a polynomial of shape
// sub[i] (has[i] true), as RatFunc.ComposeStates computes it: term by term,
// each power by repeated squaring, the images summed one by one.
func compose(p poly.RatFunc, sub []est, has []bool, nvars int) est {
	var out est
	out.denDeg = shapeOf(p).denDeg
	base := out.denDeg // p's own, computed once (not once per term)
	nt := int64(p.Num.NumTerms())
	var sum int64
	for _, t := range p.Num.Terms() {
		d, dd := 0, 0
		tt := int64(1)
		var w int64
		for i, e := range t.Exp {
			if e == 0 {
				continue
			}
			if !has[i] {
				d += e
				continue
			}
			d += e * sub[i].deg
			dd += e * sub[i].denDeg
			half := powTerms(sub[i], (e+1)/2, nvars)
			w = poly.SatAdd(w, poly.SatMul(half, half))
			tt = poly.SatMul(tt, powTerms(sub[i], e, nvars))
		}
		tt = min(tt, monomials(nvars, d))
		out.deg = max(out.deg, d)
		out.denDeg = max(out.denDeg, base+dd)
		sum = poly.SatAdd(sum, tt)
		out.work = poly.SatAdd(out.work, poly.SatAdd(w, tt))
	}
	out.terms = min(sum, monomials(nvars, out.deg))
	// Each image is added to the running sum, which is copied.
	out.work = poly.SatAdd(out.work, poly.SatMul(nt, out.terms))
	if out.denDeg > 0 {
		out.work = poly.SatAdd(out.work, poly.SatMul(out.terms, out.terms))
	}
	return out
}

// checkDerived refuses, at the line that causes it, a model whose derived
// polynomials would exceed the degree, terms or work limits.
func (m *Model) checkDerived(errs *poly.Errors, lim poly.Limits) {
	r := m.Ring
	n := r.NumVars()
	has := make([]bool, n)
	fs := make([]est, n)
	for i := range m.States {
		has[i] = true
		fs[i] = shapeOf(m.F[i])
	}
	check := func(pos poly.Pos, what string, e est) bool {
		switch {
		case max(e.deg, e.denDeg) > lim.Degree:
			errs.Add(pos, "%s", poly.Exceeded("degree", fmt.Sprintf("%s would have degree %d", what, max(e.deg, e.denDeg)), lim.Degree))
		case e.terms > int64(lim.Terms):
			errs.Add(pos, "%s", poly.Exceeded("terms", fmt.Sprintf("%s could have %s terms", what, count(e.terms)), lim.Terms))
		case e.work > int64(lim.Work):
			errs.Add(pos, "%s", poly.Exceeded("work", fmt.Sprintf("computing %s could take %s term products", what, count(e.work)), lim.Work))
		default:
			return true
		}
		return false
	}
	// The equilibrium: F at the point (a composition with parameter
	// expressions), then the shift x → x + at.
	var shift []est
	if m.AtGiven {
		at := make([]est, n)
		shift = make([]est, n)
		for i := range m.States {
			at[i] = shapeOf(m.At[i])
			shift[i] = est{deg: max(at[i].deg, 1), denDeg: at[i].denDeg, terms: at[i].terms + 1}
		}
		for i := range m.States {
			if !check(m.FPos[i], "the residual of "+m.States[i]+" at the equilibrium", compose(m.F[i], at, has, n)) {
				return
			}
		}
	}
	if m.V == nil {
		return
	}
	v := *m.V
	var dv est
	what := "V̇"
	if m.Discrete {
		what = "ΔV = V(f(x)) − V(x)"
		dv = compose(v, fs, has, n)
		dv.terms = poly.SatAdd(dv.terms, int64(v.Num.NumTerms()))
	} else {
		sv := shapeOf(v)
		// ∂V/∂xᵢ has the terms of V that contain xᵢ (with[i] of them), one degree less.
		dd := make([]int, len(m.States))
		with := make([]int64, len(m.States))
		for i := range dd {
			dd[i] = -1
		}
		for _, t := range v.Num.Terms() {
			s := 0
			for _, e := range t.Exp {
				s += e
			}
			for i := range dd {
				if t.Exp[i] > 0 {
					dd[i] = max(dd[i], s-1)
					with[i]++
				}
			}
		}
		for i := range m.States {
			if dd[i] >= 0 {
				dv.deg = max(dv.deg, dd[i]+fs[i].deg)
			}
			dv.denDeg += fs[i].denDeg
		}
		// Σ ∂V/∂xᵢ·fᵢ: each product costs with[i]·terms(fᵢ) term products,
		// and adding it to the running sum at most one per term of the sum,
		// which never has more terms than there are monomials of its degree.
		most := monomials(n, dv.deg)
		for i := range m.States {
			t := poly.SatMul(with[i], fs[i].terms)
			dv.terms = min(poly.SatAdd(dv.terms, t), most)
			dv.work = poly.SatAdd(dv.work, poly.SatAdd(t, dv.terms))
		}
		dv.denDeg += sv.denDeg
	}
	if !check(m.VPos, what, dv) || shift == nil {
		return
	}
	if !check(m.VPos, "V in coordinates centred at the equilibrium", compose(v, shift, has, n)) {
		return
	}
	// V̇ shifted: its terms are not known yet; take the worst term of its
	// degree in every state.
	worst := est{deg: dv.deg, denDeg: dv.denDeg, terms: dv.terms}
	var sh est
	for i := range m.States {
		p := powTerms(shift[i], worst.deg, n)
		sh.deg = max(sh.deg, worst.deg*shift[i].deg)
		sh.denDeg = max(sh.denDeg, worst.denDeg+worst.deg*shift[i].denDeg)
		sh.terms = poly.SatAdd(sh.terms, poly.SatMul(worst.terms, p))
		sh.work = poly.SatAdd(sh.work, poly.SatMul(worst.terms, poly.SatMul(p, p)))
	}
	sh.terms = min(sh.terms, monomials(n, sh.deg))
	check(m.VPos, what+" in coordinates centred at the equilibrium", sh)
}

func count(n int64) string {
	if n == math.MaxInt64 {
		return "more than 9·10¹⁸"
	}
	return fmt.Sprint(n)
}

// checkCanonical parses the model's canonical text again within the same
// limits: what is accepted must be readable back (a certificate carries that
// text), and an expansion can make it longer or costlier than the input.
// An error is reported at the declaration whose canonical line fails.
func (m *Model) checkCanonical(errs *poly.Errors, lim poly.Limits) {
	c := m.Canonical()
	_, err := parse("canonical text", []byte(c), lim, false)
	if err == nil {
		return
	}
	// Canonical lines: states, one per parameter, one per equation, V, at.
	origin := []poly.Pos{m.StatePos[0]}
	for _, p := range m.Params {
		origin = append(origin, p.Pos)
	}
	origin = append(origin, m.FPos...)
	if m.V != nil {
		origin = append(origin, m.VPos)
	}
	if m.AtGiven {
		origin = append(origin, m.AtPos)
	}
	var list poly.ErrorList
	if !errors.As(err, &list) || len(list) == 0 {
		errs.Add(m.StatePos[0], "the model's canonical text cannot be read back: %v", err)
		return
	}
	e := list[0]
	pos := m.StatePos[0]
	if e.Pos.Line >= 1 && e.Pos.Line <= len(origin) {
		pos = origin[e.Pos.Line-1]
	}
	errs.Add(pos, "the expanded (canonical) form of this line cannot be read back: %s", e.Msg)
}
