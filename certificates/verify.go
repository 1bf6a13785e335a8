package certificates

import (
	"fmt"
	"maps"
	"math/big"
	"slices"
	"strconv"
	"strings"

	"github.com/shopspring/decimal"

	"lyacert/model"
	"lyacert/poly"
)

// Check is one rule the checker applied, with its outcome.
type Check struct {
	Name   string `json:"name"`
	OK     bool   `json:"ok"`
	Reason string `json:"reason"`
}

// Result is the outcome of Verify.
type Result struct {
	Valid  bool    `json:"valid"`
	Checks []Check `json:"checks"`
}

// Verify re-checks a certificate from scratch with exact rational arithmetic,
// knowing nothing of how it was found. It re-reads the model text, recomputes
// V̇, the Gram matrices and the minors, and accepts a claim only through these
// rules:
//
//   - Sylvester's criterion: a symmetric matrix is positive definite iff all
//     its leading principal minors are > 0. The minors are obtained from the
//     claimed LDLᵀ factors after checking G = L·D·Lᵀ as an identity of
//     rational functions (det of a leading block of L·D·Lᵀ is the product of
//     the pivots, L being unit lower triangular).
//   - G = L·D·Lᵀ with D ≥ 0 is positive semidefinite, and its kernel is where
//     the rows of Lᵀ that belong to positive pivots vanish.
//   - Lyapunov's direct method: V with positive definite quadratic part and
//     V̇ with negative definite quadratic part give local asymptotic
//     stability; both exactly quadratic give global asymptotic stability (V
//     is then radially unbounded); V̇ exactly quadratic and negative
//     semidefinite gives stability.
//   - A polynomial is positive on a box when its exact rational-interval
//     enclosure there is (Moore 1966).
//   - Sturm's theorem: the number of distinct real roots of a polynomial in
//     an interval, which decides the sign of a condition on each piece of a
//     one-parameter region, and locates irrational endpoints.
//   - Set inversion (Moore 1966; Jaulin & Walter 1993): a region in several
//     parameters is a paving of a box whose every part is classified by the
//     exact centred form of each condition on it (see Paving).
//
// The digest is checked last; the mathematics must stand on its own. A
// signature, when present, must verify against the digest (see
// VerifySignature); Verify does not require one.
func Verify(d *Document) Result {
	// Room for the records of a typical certificate, grown by append beyond.
	c := &checker{doc: d, checks: make([]Check, 0, 64)}
	c.run()
	if d.Signature != nil {
		c.signature()
	}
	res := Result{Valid: true, Checks: c.checks}
	for _, ch := range c.checks {
		if !ch.OK {
			res.Valid = false
		}
	}
	if len(res.Checks) == 0 {
		res.Valid = false
	}
	return res
}

type checker struct {
	doc    *Document
	checks []Check
	m      *model.Model
	r      *poly.Ring
	box    []poly.Interval
	forms  []checkedForm
	conds  []poly.RatFunc // the condition polynomials q, > 0 required
}

type checkedForm struct {
	g       poly.Matrix
	l       poly.Matrix
	d       []poly.RatFunc
	zero    []bool // identically zero pivots
	minors  []poly.RatFunc
	nonzero int
	semidef bool
	basis   bool // a Gram matrix of the whole function in a monomial basis
}

func (c *checker) add(name string, ok bool, format string, args ...any) bool {
	c.checks = append(c.checks, Check{Name: name, OK: ok, Reason: reasonf(format, args)})
	return ok
}

// reasonf returns fmt.Sprintf(format, args...). The verbs and arguments
// that check records use — %s, %v and %q of strings, %d and %v of ints, %v
// of bools, %s and %v of poly.Interval, and %% — are formatted directly,
// which a certificate's hundreds of records make worth it; anything else
// (flags, widths, other types, a count mismatch) goes to fmt.Sprintf.
func reasonf(format string, args []any) string {
	var buf [160]byte
	b := buf[:0]
	next := 0
	for i := 0; i < len(format); i++ {
		ch := format[i]
		if ch != '%' {
			b = append(b, ch)
			continue
		}
		if i+1 < len(format) && format[i+1] == '%' {
			b = append(b, '%')
			i++
			continue
		}
		if i+1 >= len(format) || next >= len(args) {
			return fmt.Sprintf(format, args...)
		}
		verb := format[i+1]
		switch a := args[next].(type) {
		case string:
			switch verb {
			case 's', 'v':
				b = append(b, a...)
			case 'q':
				b = strconv.AppendQuote(b, a)
			default:
				return fmt.Sprintf(format, args...)
			}
		case int:
			if verb != 'd' && verb != 'v' {
				return fmt.Sprintf(format, args...)
			}
			b = strconv.AppendInt(b, int64(a), 10)
		case bool:
			if verb != 'v' {
				return fmt.Sprintf(format, args...)
			}
			b = strconv.AppendBool(b, a)
		case poly.Interval:
			if verb != 's' && verb != 'v' {
				return fmt.Sprintf(format, args...)
			}
			b = append(b, a.String()...)
		default:
			return fmt.Sprintf(format, args...)
		}
		next++
		i++
	}
	if next != len(args) {
		return fmt.Sprintf(format, args...)
	}
	return string(b)
}

func (c *checker) parse(what, s string) (poly.RatFunc, bool) {
	f, err := poly.Parse(c.r, s)
	if err != nil {
		c.add(what, false, "cannot read %q: %v", s, err)
		return poly.RatFunc{}, false
	}
	return f, true
}

func (c *checker) run() {
	d := c.doc
	if !c.add("format", d.Format == Format, "format %q", d.Format) {
		return
	}
	m, err := model.Parse("certificate model", []byte(d.Model))
	if !c.add("model", err == nil, "the model text parses%s", errSuffix(err)) {
		return
	}
	c.m, c.r, c.box = m, m.Ring, m.Box()
	if !c.system() {
		return
	}
	if d.Linearization != nil {
		c.linearization()
		return
	}
	err = m.CheckEquilibrium()
	if !c.add("equilibrium", err == nil, "f vanishes at the stated equilibrium for every parameter value%s", errSuffix(err)) {
		return
	}
	if !c.add("V", m.V != nil, "the model states the candidate V") {
		return
	}
	v, ok := c.parse("V", d.V)
	if !ok || !c.add("V", v.Equal(*m.V), "V equals the model's candidate") {
		return
	}
	vdot := m.Derivative(v)
	claimed, ok := c.parse("vdot", d.Vdot)
	what := "V̇ = Σ ∂V/∂xᵢ·fᵢ"
	if m.Discrete {
		what = "ΔV = V(f(x)) − V(x)"
	}
	if !ok || !c.add("vdot", claimed.Equal(vdot), "the claimed %s equals the recomputed one", what) {
		return
	}
	if len(d.Forms) == 0 {
		// Without forms the document can only refute, or claim nothing.
		bare := d.Claim == ClaimNone && len(d.Conditions) == 0 && d.Region == nil && len(d.Witnesses) == 0 && len(d.Kernel) == 0
		switch {
		case !c.add("verdict", bare && (d.Verdict == VerdictFails || d.Verdict == VerdictUndecided),
			"a certificate without quadratic forms claims nothing beyond a refutation"):
			return
		case !c.add("verdict", d.Verdict != VerdictFails || d.Refutation != nil, "a failing verdict comes with a refutation"):
			return
		}
		if d.Refutation != nil && !c.refutation(v, vdot) {
			return
		}
		digest, err := d.ComputeDigest()
		c.add("digest", err == nil && digest == d.Digest, "the SHA-256 digest of the canonical serialization matches")
		return
	}
	vs, ds := m.Shift(v), m.Shift(vdot)
	states := c.r.StateMask()
	low := func(f poly.RatFunc) bool {
		return f.Homogeneous(0, states).IsZero() && f.Homogeneous(1, states).IsZero()
	}
	if !c.add("vanishing", low(vs) && low(ds), "V and its derivative have no constant or linear part at the equilibrium") {
		return
	}
	n := len(m.States)
	vq, dq := vs.Homogeneous(2, states), ds.Homogeneous(2, states)
	higherV := !vs.Sub(vq).IsZero()
	higherD := !ds.Sub(dq).IsZero()
	grams := []poly.Matrix{poly.GramMatrix(vq, n), poly.GramMatrix(dq.Neg(), n)}
	wholes := []poly.RatFunc{vs, ds.Neg()}
	names := []string{"V", "-Vdot"}
	if !c.add("forms", len(d.Forms) == 2, "two quadratic forms, V and -Vdot") {
		return
	}
	for i, f := range d.Forms {
		g := grams[i]
		if len(f.Basis) > 0 {
			var ok bool
			if g, ok = c.basisGram(names[i], f, wholes[i]); !ok {
				return
			}
		}
		cf, ok := c.form(names[i], f, g)
		cf.basis = len(f.Basis) > 0
		if !ok {
			return
		}
		c.forms = append(c.forms, cf)
	}
	if !c.claim(higherV, higherD) {
		return
	}
	if !c.conditions() {
		return
	}
	if !c.verdict() {
		return
	}
	if d.Refutation != nil && !c.refutation(v, vdot) {
		return
	}
	digest, err := d.ComputeDigest()
	c.add("digest", err == nil && digest == d.Digest, "the SHA-256 digest of the canonical serialization matches")
}

func errSuffix(err error) string {
	if err == nil {
		return ""
	}
	return ": " + strings.ReplaceAll(err.Error(), "\n", "; ")
}

// system compares the certificate's restatement of the model with the model.
func (c *checker) system() bool {
	s, m := c.doc.System, c.m
	time := "continuous"
	if m.Discrete {
		time = "discrete"
	}
	if !c.add("system", s.Time == time, "time %q", s.Time) {
		return false
	}
	if !c.add("system", slices.Equal(s.States, m.States), "states %v", s.States) {
		return false
	}
	ok := len(s.Params) == len(m.Params)
	for i := 0; ok && i < len(s.Params); i++ {
		p := m.Params[i]
		ok = s.Params[i].Name == p.Name && s.Params[i].Range == model.RangeText(p)
	}
	if !c.add("system", ok, "parameters and assumptions as in the model") {
		return false
	}
	if !c.add("system", len(s.Equations) == len(m.F) && len(s.Equilibrium) == len(m.At), "one equation and one equilibrium coordinate per state") {
		return false
	}
	for i := range m.F {
		f, ok := c.parse("system", s.Equations[i])
		if !ok || !c.add("system", f.Equal(m.F[i]), "equation of %s as in the model", m.States[i]) {
			return false
		}
		if lz := c.doc.Linearization; lz != nil && len(lz.Box) > 0 {
			continue // a box restates the equilibrium; linearization checks it
		}
		a, ok := c.parse("system", s.Equilibrium[i])
		if !ok || !c.add("system", a.Equal(m.At[i]), "equilibrium coordinate %s as in the model", m.States[i]) {
			return false
		}
	}
	return true
}

// form checks G = L·D·Lᵀ and the minors of one form.
func (c *checker) form(name string, f Form, g poly.Matrix) (checkedForm, bool) {
	n := len(g)
	cf := checkedForm{g: g}
	if !c.add("form "+name, f.Name == name, "form named %q", f.Name) {
		return cf, false
	}
	mat := func(rows [][]string, what string) (poly.Matrix, bool) {
		if len(rows) != n {
			c.add("form "+name, false, "%s has %d rows, want %d", what, len(rows), n)
			return nil, false
		}
		out := poly.NewMatrix(c.r, n)
		for i := range rows {
			if len(rows[i]) != n {
				c.add("form "+name, false, "%s row %d has %d entries, want %d", what, i+1, len(rows[i]), n)
				return nil, false
			}
			for j := range rows[i] {
				e, ok := c.parse("form "+name, rows[i][j])
				if !ok {
					return nil, false
				}
				out[i][j] = e
			}
		}
		return out, true
	}
	claimedG, ok := mat(f.Gram, "the Gram matrix")
	if !ok || !c.add("gram "+name, claimedG.Equal(g), "the Gram matrix equals the one recomputed from the model") {
		return cf, false
	}
	l, ok := mat(f.L, "L")
	if !ok || !c.add("ldl "+name, len(f.D) == n, "%d pivots", len(f.D)) {
		return cf, false
	}
	cf.l = l
	dm := poly.NewMatrix(c.r, n)
	cf.zero = make([]bool, n)
	for i := range f.D {
		p, ok := c.parse("ldl "+name, f.D[i])
		if !ok {
			return cf, false
		}
		cf.d = append(cf.d, p)
		dm[i][i] = p
		cf.zero[i] = p.IsZero()
	}
	one := poly.RatConst(c.r, big.NewRat(1, 1))
	for i := 0; i < n; i++ {
		for j := i; j < n; j++ {
			want := poly.FromPoly(poly.Zero(c.r))
			if i == j {
				want = one
			}
			if !c.add("ldl "+name, l[i][j].Equal(want), "L is unit lower triangular (entry %d,%d)", i+1, j+1) {
				return cf, false
			}
		}
		if cf.zero[i] {
			cf.semidef = true
			for k := i + 1; k < n; k++ {
				if !c.add("ldl "+name, l[k][i].IsZero(), "a zero pivot has a zero column of L below it (column %d)", i+1) {
					return cf, false
				}
			}
		}
	}
	prod := l.Mul(dm).Mul(l.Transpose())
	if !c.add("ldl "+name, prod.Equal(g), "L·D·Lᵀ reproduces the Gram matrix exactly") {
		return cf, false
	}
	// Minors: of G itself (no zero pivot), or of its principal submatrix on
	// the positive pivots (semidefinite).
	p := one
	var want []poly.RatFunc
	for i := 0; i < n; i++ {
		if cf.zero[i] {
			continue
		}
		p = p.Mul(cf.d[i])
		want = append(want, p)
	}
	cf.nonzero = len(want)
	if !c.add("minors "+name, len(f.Minors) == len(want), "%d minors, one per non-zero pivot", len(f.Minors)) {
		return cf, false
	}
	for i, s := range f.Minors {
		mi, ok := c.parse("minors "+name, s)
		if !ok || !c.add("minors "+name, mi.Equal(want[i]), "minor %d equals the product of the first pivots", i+1) {
			return cf, false
		}
		if !c.add("minors "+name, c.denominatorsNonzero(mi), "the denominator of minor %d is non-zero on the parameter box", i+1) {
			return cf, false
		}
		cf.minors = append(cf.minors, mi)
	}
	if cf.semidef {
		for i := range cf.d {
			for j := 0; j < n; j++ {
				if !c.add("ldl "+name, c.denominatorsNonzero(cf.d[i]) && c.denominatorsNonzero(l[j][i]), "semidefinite factors are defined on the whole parameter box") {
					return cf, false
				}
			}
		}
	}
	return cf, true
}

func (c *checker) denominatorsNonzero(f poly.RatFunc) bool {
	for _, d := range f.Den {
		if d.P.Enclose(c.box).ContainsZero() {
			return false
		}
	}
	return true
}

// claim checks that the kind of claim follows from the shape of V and V̇.
func (c *checker) claim(higherV, higherD bool) bool {
	d := c.doc
	fv, fd := c.forms[0], c.forms[1]
	asserted := d.Verdict == VerdictHolds || d.Verdict == VerdictOnRegion
	switch d.Verdict {
	case VerdictHolds, VerdictOnRegion, VerdictFails, VerdictUndecided:
	default:
		return c.add("claim", false, "unknown verdict %q", d.Verdict)
	}
	if !asserted {
		if !c.add("claim", d.Claim == ClaimNone, "a %s verdict claims nothing (claim %q)", d.Verdict, d.Claim) {
			return false
		}
		return c.add("claim", len(d.Kernel) == 0, "no kernel without a claim")
	}
	if (fv.basis && fv.semidef) || (fd.basis && fd.semidef) {
		return c.add("claim", false, "a form in a monomial basis must be definite")
	}
	switch d.Claim {
	case ClaimGlobal:
		// A definite Gram matrix in a basis with a pure power of every
		// state makes the whole function positive away from the origin
		// (and V radially unbounded); without a basis the function must be
		// exactly its quadratic part.
		return c.add("claim", (!higherV || fv.basis) && (!higherD || fd.basis) && !fv.semidef && !fd.semidef,
			"global asymptotic stability needs V and −V̇ positive definite as wholes: exactly quadratic, or a definite Gram matrix in a monomial basis") &&
			c.add("claim", len(d.Kernel) == 0, "no kernel for a definite form")
	case ClaimLocal:
		return c.add("claim", !fv.semidef && !fd.semidef, "local asymptotic stability needs definite quadratic parts") &&
			c.add("claim", len(d.Kernel) == 0, "no kernel for a definite form")
	case ClaimStable:
		if !c.add("claim", !fv.semidef && fd.semidef && !higherD && !fd.basis,
			"stability from a semidefinite V̇ needs V̇ exactly quadratic and V's quadratic part definite") {
			return false
		}
		return c.kernel(fd)
	}
	return c.add("claim", false, "unknown claim %q", d.Claim)
}

// kernel checks the basis of the set where the semidefinite form vanishes.
func (c *checker) kernel(f checkedForm) bool {
	var zeros []int
	for i, z := range f.zero {
		if z {
			zeros = append(zeros, i)
		}
	}
	if !c.add("kernel", len(c.doc.Kernel) == len(zeros), "one kernel vector per zero pivot") {
		return false
	}
	n := len(f.g)
	for k, vs := range c.doc.Kernel {
		if !c.add("kernel", len(vs) == n, "kernel vector %d has %d entries", k+1, len(vs)) {
			return false
		}
		vec := make(poly.Matrix, n)
		for i, s := range vs {
			e, ok := c.parse("kernel", s)
			if !ok {
				return false
			}
			vec[i] = []poly.RatFunc{e}
		}
		for j, z := range zeros {
			want := int64(0)
			if j == k {
				want = 1
			}
			if !c.add("kernel", vec[z][0].Equal(poly.RatConst(c.r, big.NewRat(want, 1))), "kernel vector %d is %d at coordinate %d (independence)", k+1, want, z+1) {
				return false
			}
		}
		gv := f.g.Mul(vec)
		for i := range gv {
			if !c.add("kernel", gv[i][0].IsZero(), "G·k = 0 for kernel vector %d", k+1) {
				return false
			}
		}
	}
	return true
}

// conditions checks the factorization of every minor and recomputes the
// condition polynomial each must satisfy (> 0).
func (c *checker) conditions() bool {
	d := c.doc
	type slot struct {
		form  string
		index int
		minor poly.RatFunc
	}
	var want []slot
	for i, f := range c.forms {
		for k, mi := range f.minors {
			want = append(want, slot{d.Forms[i].Name, k + 1, mi})
		}
	}
	if !c.add("conditions", len(d.Conditions) == len(want), "one condition per minor (%d)", len(want)) {
		return false
	}
	for i, cd := range d.Conditions {
		w := want[i]
		if !c.add("conditions", cd.Form == w.form && cd.Index == w.index, "condition %d is minor %d of %s", i+1, w.index, w.form) {
			return false
		}
		mi, ok := c.parse("conditions", cd.Minor)
		if !ok || !c.add("conditions", mi.Equal(w.minor), "condition %d states its minor", i+1) {
			return false
		}
		k, ok := parseRat(cd.Constant)
		if !c.add("conditions", ok && k.Sign() != 0, "condition %d has a non-zero rational constant", i+1) {
			return false
		}
		target := new(poly.Poly).Mul(mi.Num, mi.DenPoly())
		prod := poly.Const(c.r, k)
		sign := k.Sign()
		q := poly.ConstInt(c.r, 1)
		for _, fd := range cd.Factors {
			f, ok := c.parse("conditions", fd.Poly)
			if !ok || !c.add("conditions", f.IsPoly() && !f.Num.IsConst() && f.Num.DegreeIn(c.r.StateMask()) == 0 && fd.Power >= 1,
				"factor %s of condition %d is a non-constant polynomial in the parameters with a positive power", fd.Poly, i+1) {
				return false
			}
			pw := new(poly.Poly).Pow(f.Num, fd.Power)
			prod.Mul(prod, pw)
			status := FactorStatus(f.Num, fd.Power, c.box)
			if !c.add("conditions", status == fd.Status, "factor %s^%d of condition %d is %s (claimed %s)", fd.Poly, fd.Power, i+1, status, fd.Status) {
				return false
			}
			switch status {
			case StatusNegative:
				sign = -sign
			case StatusCondition:
				q.Mul(q, pw)
			}
		}
		if !c.add("conditions", prod.Equal(target), "condition %d: constant × factors = numerator × denominator of the minor", i+1) {
			return false
		}
		if sign < 0 {
			q.Neg(q)
		}
		claimed, ok := c.parse("conditions", cd.Condition)
		if !ok || !c.add("conditions", claimed.IsPoly() && claimed.Num.Equal(q), "condition %d: %s > 0 is what remains", i+1, cd.Condition) {
			return false
		}
		c.conds = append(c.conds, poly.FromPoly(q))
	}
	return true
}

// FactorStatus classifies f^power over the parameter box by its exact
// interval enclosure: positive (the power is even and f keeps away from zero,
// or the power is odd and f > 0), negative (odd power, f < 0), or a condition.
func FactorStatus(f *poly.Poly, power int, box []poly.Interval) string {
	e := f.Enclose(box)
	switch {
	case power%2 == 0 && !e.ContainsZero():
		return StatusPositive
	case power%2 == 1 && e.Positive():
		return StatusPositive
	case power%2 == 1 && e.Negative():
		return StatusNegative
	}
	return StatusCondition
}

// verdict checks the verdict against the conditions: discharged, on a
// one-parameter region, or at witness points.
func (c *checker) verdict() bool {
	d := c.doc
	used := map[int]bool{}
	// Every condition discharged: each is a positive constant.
	allPositiveConst := true
	for _, q := range c.conds {
		for _, v := range q.Num.VarsUsed() {
			used[v] = true
		}
		if !q.Num.IsConst() || q.Num.ConstTerm().Sign() <= 0 {
			allPositiveConst = false
		}
	}
	if d.Region != nil && d.Region.Paving != nil {
		return c.paving(used)
	}
	if d.Region != nil {
		return c.region(used)
	}
	if len(d.Witnesses) > 0 {
		return c.witnesses(used)
	}
	switch d.Verdict {
	case VerdictHolds:
		return c.add("verdict", allPositiveConst, "every condition is discharged by the assumptions")
	case VerdictFails:
		// The refutation, checked after the verdict, is what makes it fail.
		return c.add("verdict", d.Refutation != nil, "a failing verdict comes with a refutation")
	case VerdictUndecided:
		return c.add("verdict", true, "nothing is claimed")
	}
	return c.add("verdict", false, "verdict %q needs a region or witnesses", d.Verdict)
}

func (c *checker) witnesses(used map[int]bool) bool {
	d := c.doc
	holds, fails, ok := c.witnessPoints(used)
	if !ok {
		return false
	}
	switch d.Verdict {
	case VerdictOnRegion:
		return c.add("verdict", holds && fails, "the conditions hold at one witness and fail at another")
	case VerdictUndecided:
		return c.add("verdict", true, "nothing is claimed")
	}
	return c.add("verdict", false, "verdict %q cannot rest on witness points", d.Verdict)
}

// witnessPoints checks every witness exactly and reports whether the
// conditions hold at one and fail at another.
func (c *checker) witnessPoints(used map[int]bool) (holds, fails, ok bool) {
	for i, w := range c.doc.Witnesses {
		what := fmt.Sprintf("witness %d", i+1)
		vals, ok := c.paramValues(w.Params, what)
		if !ok {
			return false, false, false
		}
		same := len(vals) == len(used)
		for v := range vals {
			same = same && used[v]
		}
		if !c.add(what, same, "gives exactly the parameters the conditions involve") {
			return false, false, false
		}
		if !c.add(what, len(w.Values) == len(c.conds), "states the value of every condition") {
			return false, false, false
		}
		all := true
		for j, q := range c.conds {
			x := new(poly.Poly).EvalVars(q.Num, vals).ConstTerm()
			claimed, ok := parseRat(w.Values[j])
			if !c.add(what, ok && claimed.Cmp(x) == 0, "condition %d is %s there", j+1, w.Values[j]) {
				return false, false, false
			}
			all = all && x.Sign() > 0
		}
		if !c.add(what, all == w.Holds, "the conditions hold there: %v", all) {
			return false, false, false
		}
		holds = holds || all
		fails = fails || !all
	}
	return holds, fails, true
}

// paramValues reads values of some free parameters, each inside its range.
func (c *checker) paramValues(vals map[string]string, what string) (map[int]*big.Rat, bool) {
	out := map[int]*big.Rat{}
	// In name order, so that the record of checks is the same every time.
	for _, name := range slices.Sorted(maps.Keys(vals)) {
		s := vals[name]
		p, ok := c.m.Param(name)
		i, isVar := c.r.Index(name)
		if !c.add(what, ok && isVar && p.Fixed == nil, "%s is a free parameter", name) {
			return nil, false
		}
		v, ok := parseRat(s)
		if !c.add(what, ok && p.Range.Contains(v), "%s = %s lies in %s", name, s, p.Range) {
			return nil, false
		}
		out[i] = v
	}
	return out, true
}

// refutation checks a point where V ≤ 0 or V̇ ≥ 0: the values are recomputed
// as functions of the parameters left free, and their sign must hold on the
// whole box by exact interval enclosure. Every fixed parameter must matter.
func (c *checker) refutation(v, vdot poly.RatFunc) bool {
	rf := c.doc.Refutation
	vals, ok := c.paramValues(rf.Params, "refutation")
	if !ok {
		return false
	}
	n := len(c.m.States)
	if !c.add("refutation", len(rf.Point) == n, "the point gives every state") {
		return false
	}
	point := map[int]*big.Rat{}
	for i, s := range c.m.States {
		val, ok := parseRat(rf.Point[s])
		if !c.add("refutation", ok, "state %s = %q is a rational", s, rf.Point[s]) {
			return false
		}
		point[i] = val
	}
	at := func(f poly.RatFunc, params map[int]*big.Rat) (poly.RatFunc, bool) {
		all := map[int]*big.Rat{}
		maps.Copy(all, point)
		maps.Copy(all, params)
		g, err := f.EvalVars(all)
		return g, err == nil
	}
	vv, ok1 := at(v, vals)
	dv, ok2 := at(vdot, vals)
	cv, ok3 := c.parse("refutation", rf.V)
	cd, ok4 := c.parse("refutation", rf.Vdot)
	if !c.add("refutation", ok1 && ok2 && ok3 && ok4 && vv.Equal(cv) && dv.Equal(cd), "V = %s and V̇ = %s there, exactly", rf.V, rf.Vdot) {
		return false
	}
	// The point differs from the equilibrium for every remaining parameter
	// value: some coordinate differs from a constant equilibrium coordinate.
	differs := false
	for i := range c.m.States {
		e, ok := at(c.m.At[i], vals)
		if ok && e.IsPoly() && e.Num.IsConst() && e.Num.ConstTerm().Cmp(point[i]) != 0 {
			differs = true
		}
	}
	if !c.add("refutation", differs, "the point is not the equilibrium") {
		return false
	}
	for _, i := range slices.Sorted(maps.Keys(vals)) { // sorted: the same record every time
		rest := maps.Clone(vals)
		delete(rest, i)
		a, _ := at(v, rest)
		b, _ := at(vdot, rest)
		if !c.add("refutation", a.Num.UsesVar(i) || b.Num.UsesVar(i) || denUses(a, i) || denUses(b, i), "V or V̇ there depends on %s, which the refutation fixes", c.r.Name(i)) {
			return false
		}
	}
	neg := vv.Num.Enclose(c.box).Mul(denSign(vv, c.box))
	pos := dv.Num.Enclose(c.box).Mul(denSign(dv, c.box))
	return c.add("refutation", neg.NonPositive() || pos.NonNegative(), "V ≤ 0 or V̇ ≥ 0 there, for every value of the parameters left free")
}

func denUses(f poly.RatFunc, i int) bool {
	for _, d := range f.Den {
		if d.P.UsesVar(i) {
			return true
		}
	}
	return false
}

// denSign returns an interval with the sign of f's denominator on the box
// (the whole line when it is not fixed), so that num·sign has f's sign.
func denSign(f poly.RatFunc, box []poly.Interval) poly.Interval {
	one := poly.Point(big.NewRat(1, 1))
	if len(f.Den) == 0 {
		return one
	}
	e := f.DenPoly().Enclose(box)
	switch {
	case e.Positive():
		return one
	case e.Negative():
		return poly.Point(big.NewRat(-1, 1))
	}
	return poly.Entire()
}

func parseRat(s string) (*big.Rat, bool) {
	if s == "" || strings.ContainsAny(s, " \t\n") {
		return nil, false
	}
	q, ok := new(big.Rat).SetString(s)
	return q, ok
}

// parseDecimal reads a decimal and returns it with half a unit of its last digit.
func parseDecimal(s string) (*big.Rat, *big.Rat, bool) {
	dv, err := decimal.NewFromString(s)
	if err != nil || dv.Exponent() < -1000 || dv.Exponent() > 1000 {
		return nil, nil, false
	}
	half := decimal.New(5, dv.Exponent()-1)
	return dv.Rat(), half.Rat(), true
}

// basisGram checks a Gram matrix stated in a monomial basis z: every basis
// element is a monomial in the states with coefficient 1, they are distinct,
// a pure power of every state is among them, and zᵀGz equals the whole
// function exactly. Then G ≻ 0 gives zᵀGz > 0 unless z = 0, and z = 0 only
// at the origin (the pure powers vanish only there): the function is
// positive definite, and at least λ_min(G)·Σ xᵢ^(2kᵢ), so radially
// unbounded.
func (c *checker) basisGram(name string, f Form, whole poly.RatFunc) (poly.Matrix, bool) {
	n := len(f.Basis)
	z := make([]*poly.Poly, n)
	pure := make([]bool, len(c.m.States))
	seen := map[string]bool{}
	for i, s := range f.Basis {
		b, ok := c.parse("basis "+name, s)
		if !ok {
			return nil, false
		}
		mono := b.IsPoly() && b.Num.IsMonomial() && b.Num.Lead().Coef.Cmp(big.NewRat(1, 1)) == 0 &&
			b.Num.DegreeIn(c.r.ParamMask()) == 0 && b.Num.Degree() >= 1
		if !c.add("basis "+name, mono && !seen[b.Num.String()], "basis element %s is a new monomial in the states with coefficient 1", s) {
			return nil, false
		}
		seen[b.Num.String()] = true
		if vars := b.Num.VarsUsed(); len(vars) == 1 {
			pure[vars[0]] = true
		}
		z[i] = b.Num
	}
	for i, s := range c.m.States {
		if !c.add("basis "+name, pure[i], "the basis has a pure power of %s", s) {
			return nil, false
		}
	}
	if !c.add("basis "+name, len(f.Gram) == n, "the Gram matrix has one row per basis element") {
		return nil, false
	}
	g := poly.NewMatrix(c.r, n)
	for i := range f.Gram {
		if !c.add("basis "+name, len(f.Gram[i]) == n, "Gram row %d has one entry per basis element", i+1) {
			return nil, false
		}
		for j, s := range f.Gram[i] {
			e, ok := c.parse("basis "+name, s)
			if !ok || !c.add("basis "+name, e.DegreeIn(c.r.StateMask()) <= 0, "Gram entry %d,%d is free of states", i+1, j+1) {
				return nil, false
			}
			g[i][j] = e
		}
	}
	if !c.add("basis "+name, poly.QuadraticFormIn(g, z).Equal(whole), "zᵀGz equals the whole function exactly (all degrees)") {
		return nil, false
	}
	return g, true
}
