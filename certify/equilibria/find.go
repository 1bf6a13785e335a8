package equilibria

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/big"
	"slices"
	"strings"
	"time"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/certify"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"

	"gonum.org/v1/gonum/mat"

	"github.com/lyacert/lyacert/certify/direct"
	"github.com/lyacert/lyacert/certify/lyapunov"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// Certification methods.
const (
	// MethodFull: V = (x − x*)ᵀP(x − x*) was run through Check, the full
	// nonlinear argument of the model's derivative (local or global claim).
	MethodFull = "full"
	// MethodLinearization: Lyapunov's indirect method at the equilibrium, in
	// a claims.Linearization document (local stability or instability;
	// global stability when the model is affine, where the linearization is
	// the model itself).
	MethodLinearization = "linearization"
)

// CertifyOptions tune CertifyEquilibrium.
type CertifyOptions struct {
	// Q is the diagonal of Q in AᵀP + PA = −Q (AᵀPA − P = −Q); nil means
	// the identity. Every entry must be positive.
	Q []*big.Rat
	// Full runs the full nonlinear check at exact equilibria that the
	// linearization shows stable (MethodFull), unless the model is affine
	// (the linearization certificate is then global already); otherwise
	// every certificate is a linearization certificate.
	Full bool
	// Source names the model in the certificate (carries no claim).
	Source string
	// Issued is the certificate's issue time; "" leaves it empty, which
	// makes the certificate, and so its digest, a function of the model
	// alone (sweeps use that for reproducible output).
	Issued string
	// Exact uses the exact rational solution of the Lyapunov equation
	// (poly.LyapunovRat) as P at a rational equilibrium instead of a short
	// rounding of the float solution; where it cannot (an irrational
	// equilibrium, a singular equation, too many states) the rounded P is
	// used and Certification.ExactNote says why.
	Exact bool
}

// Sources of P (Certification.PSource).
const (
	// PRounded: the float solution rounded to short rationals.
	PRounded = "rounded"
	// PExact: the exact rational solution of the Lyapunov equation.
	PExact = "exact"
)

// Certification is the outcome of certifying one equilibrium.
type Certification struct {
	Method string
	// Verdict and Claim as in certificates: holds with local-asymptotic or
	// global-asymptotic, fails with unstable, or undecided with none.
	Verdict, Claim string
	// Reason explains the verdict in one sentence for people.
	Reason string
	// P is the rational Lyapunov matrix (nil when none was found) and
	// Tolerance the relative rounding tolerance that produced it (0: the
	// float solution itself).
	P         [][]*big.Rat
	Tolerance float64
	// PSource is PExact or PRounded (also when no P was found).
	PSource string
	// ExactNote says why the exact P was asked for and not used ("" when
	// it was used, or not asked for).
	ExactNote string
	// V is (x − x*)ᵀP(x − x*) at an exact equilibrium (nil otherwise).
	V *poly.RatFunc
	// Decay is the exact enclosure of −(JᵀP + PJ) (or P − JᵀPJ) over the
	// equilibrium's box, or its value at an exact equilibrium.
	Decay [][]poly.Interval
	// Check is the full check's result (MethodFull only).
	Check *direct.Result
	// Doc has passed checker.Verify; Verified is that result. Nil when
	// nothing was certified (verdict undecided).
	Doc      *claims.Document
	Verified checker.Outcome
}

// rationalizeTolerances are the relative tolerances tried, in order, when P
// is rounded to rationals over a common decimal denominator (roundCommon):
// the first P that passes the exact tests is kept, so P has the shortest
// entries that work (0 means the float itself).
var rationalizeTolerances = []float64{1e-2, 1e-3, 1e-6, 1e-9, 1e-12, 0}

// CertifyEquilibrium certifies one equilibrium of a model without free
// parameters through its linearization J: it solves AᵀP + PA = −Q
// (AᵀPA − P = −Q in discrete time) for A = J in floating point
// (Bartels–Stewart; Kitagawa/Barraud), rounds P to rationals over one
// decimal denominator of growing length until fraction-free elimination
// shows that M = −(JᵀP + PJ) (P − JᵀPJ) is positive definite — over the
// whole Krawczyk box for an enclosed equilibrium — and P is either positive
// definite (stable) or has a negative pivot (unstable), and writes a
// certificate that checker.Verify accepts. With one short denominator for P
// and one for J, M and every leading minor are computed with short integers.
// A stable affine model gets the global claim from the same certificate (the
// linearization is the model); with opts.Full an exact stable equilibrium of
// a nonlinear model is then certified by Check on V = (x − x*)ᵀP(x − x*),
// which can give a global claim.
//
// Nothing is claimed when the equilibrium is only approximate, when the
// Lyapunov equation is singular (eigenvalues on the imaginary axis or the
// unit circle, where the linearization decides nothing) or when no rounding
// passes; the verdict is then undecided with the reason. An error is
// returned only for a certificate the checker rejects (certify.ErrUnverified, a bug).
func CertifyEquilibrium(ctx context.Context, m *model.Model, e *Equilibrium, opts CertifyOptions) (*Certification, error) {
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	n := len(m.States)
	undecided := func(format string, args ...any) (*Certification, error) {
		return &Certification{Method: MethodLinearization, Verdict: checker.VerdictUndecided, Claim: checker.KindNone,
			PSource: PRounded, Reason: fmt.Sprintf(format, args...)}, nil
	}
	if e.Status == EquilibriumApproximate {
		return undecided("not certified: the Krawczyk test could not prove an equilibrium near this point (singular or ill-conditioned Jacobian)")
	}
	if err := requireFixed(m, "certification"); err != nil {
		return nil, err
	}
	f := make([]*poly.Poly, n)
	for i := range m.F {
		f[i] = m.F[i].Num
	}
	affine := !slices.ContainsFunc(f, func(fi *poly.Poly) bool { return fi.Degree() > 1 })
	note := ""
	if opts.Exact {
		c, why, err := certifyExact(ctx, m, e, opts, f, affine)
		if c != nil || err != nil {
			return c, err
		}
		note = why
	}
	undecidedNote := func(format string, args ...any) (*Certification, error) {
		c, err := undecided(format, args...)
		c.ExactNote = note
		return c, err
	}
	q := mat.NewDense(n, n, nil)
	for i := 0; i < n; i++ {
		qi := 1.0
		if opts.Q != nil {
			qi, _ = opts.Q[i].Float64()
		}
		q.Set(i, i, qi)
	}
	if !finiteWithin(e.Jacobian.RawMatrix().Data, FloatRange) {
		return undecidedNote("not certified: the linearization has entries beyond floating-point range (above %g in magnitude), so the floating-point solver cannot propose P", FloatRange)
	}
	pf, err := solveLyapunov(e.Jacobian, q, m.Discrete)
	if err != nil {
		where := "on or too near the imaginary axis (λi + λj ≈ 0)"
		if m.Discrete {
			where = "on or too near the unit circle (λi·λj ≈ 1)"
		}
		if !errors.Is(err, lyapunov.ErrSingular) {
			where = "that the solver could not handle (" + err.Error() + ")"
		}
		return undecidedNote("not certified: the linearization has eigenvalues %s, so it decides neither stability nor instability", where)
	}
	box := e.Box
	if e.Status == EquilibriumExact {
		box = make([]poly.Interval, n)
		for i, v := range e.Point {
			box[i] = poly.Point(v)
		}
	}
	pmax := 0.0
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			pmax = math.Max(pmax, math.Abs(pf.At(i, j)))
		}
	}
	for _, tol := range rationalizeTolerances {
		c, err := certifyWith(ctx, m, e, opts, roundCommon(pf, tol*pmax), tol, box, f, affine)
		if c != nil || err != nil {
			if c != nil {
				c.ExactNote = note
			}
			return c, err
		}
	}
	return undecidedNote("not certified: no rounding of the float solution P passed the exact tests (P definite or with a negative pivot, and %s ≻ 0)", decayName(m))
}

// certifyExact certifies the equilibrium with the exact solution P of the
// Lyapunov equation. The decay matrix is then Q itself, positive definite,
// so only P's pivots remain to decide: P ≻ 0 (stable) or a negative pivot
// (unstable). P is nonsingular (by the inertia theorem of Ostrowski and
// Schneider, and its analogue for maps, A has no eigenvalue on the
// imaginary axis, or on the unit circle), but an indefinite
// P can still have a zero leading pivot; the rounded P is tried then. A nil
// Certification with a note asks the caller for the rounded P.
func certifyExact(ctx context.Context, m *model.Model, e *Equilibrium, opts CertifyOptions, f []*poly.Poly, affine bool) (*Certification, string, error) {
	n := len(m.States)
	if e.Status != EquilibriumExact || e.ExactJacobian == nil {
		return nil, "the exact solution of the Lyapunov equation needs a rational equilibrium, and this one is irrational (enclosed in a Krawczyk box), so P is the rounded float solution", nil
	}
	if n > poly.MaxLyapunovStates {
		return nil, fmt.Sprintf("the Lyapunov equation is solved by exact elimination for at most %d states, and the model has %d, so P is the rounded float solution", poly.MaxLyapunovStates, n), nil
	}
	q := make([][]*big.Rat, n)
	for i := range q {
		q[i] = make([]*big.Rat, n)
		for j := range q[i] {
			q[i][j] = new(big.Rat)
		}
		q[i][i].SetInt64(1)
		if opts.Q != nil {
			q[i][i].Set(opts.Q[i])
		}
	}
	p, ok := poly.LyapunovRat(e.ExactJacobian, q, m.Discrete)
	if !ok {
		return nil, "the Lyapunov equation is singular at this equilibrium (two eigenvalues with λi + λj = 0, or λi·λj = 1 for a map), so it has no exact solution and P is the rounded solution of a shifted equation", nil
	}
	box := make([]poly.Interval, n)
	for i, v := range e.Point {
		box[i] = poly.Point(v)
	}
	c, err := certifyWith(ctx, m, e, opts, p, 0, box, f, affine)
	if c == nil && err == nil {
		return nil, "the exact P has a zero leading pivot, so P is the rounded float solution", nil
	}
	if c != nil {
		c.PSource = PExact
	}
	return c, "", err
}

// certifyWith runs the exact tests on one proposed P and, when they pass,
// writes and re-checks the certificate; nil, nil means they did not pass.
func certifyWith(ctx context.Context, m *model.Model, e *Equilibrium, opts CertifyOptions, p [][]*big.Rat, tol float64, box []poly.Interval, f []*poly.Poly, affine bool) (*Certification, error) {
	n := len(m.States)
	var decay [][]poly.Interval
	proven := false
	if e.ExactJacobian != nil {
		mm := poly.DecayAt(e.ExactJacobian, m.Discrete, p)
		if !floatDefinite(mm, 1e-8) {
			return nil, nil // too coarse: not worth the exact elimination
		}
		decay = pointIntervals(mm)
		// Both definite with a margin that floating point cannot
		// blur: the kernel's exact elimination will agree, and runs
		// once, in the kernel, instead of twice.
		proven = floatDefinite(mm, -1e-9*float64(n)) && floatDefinite(p, -1e-9*float64(n))
	} else {
		decay = poly.DecayEnclosure(f, m.Discrete, p, box)
	}
	k := -1
	if !proven {
		// The two eliminations are independent: P's runs beside M's.
		var pivot *big.Rat
		done := make(chan struct{})
		go func() {
			defer close(done)
			k, pivot = poly.FirstNonPositivePivot(p)
		}()
		definite := poly.PositiveDefiniteOn(decay)
		<-done
		if !definite || (k >= 0 && pivot.Sign() == 0) {
			return nil, nil
		}
	}
	c := &Certification{Method: MethodLinearization, P: p, Tolerance: tol, Decay: decay, PSource: PRounded}
	switch {
	case k < 0 && affine:
		c.Verdict, c.Claim = checker.VerdictHolds, checker.KindGlobal
		c.Reason = "the model is affine, so " + dotWord(m) + " = −(x − x*)ᵀM(x − x*) everywhere, with M = " + decayName(m) + " ≻ 0 and P ≻ 0 exactly (Lyapunov's direct method, global)"
	case k < 0:
		c.Verdict, c.Claim = checker.VerdictHolds, checker.KindLocal
		c.Reason = "the linearization is stable: P ≻ 0 and " + decayName(m) + " ≻ 0 exactly (Lyapunov's indirect method)"
	default:
		c.Verdict, c.Claim = checker.VerdictFails, checker.KindUnstable
		c.Reason = fmt.Sprintf("the equilibrium is unstable: %s ≻ 0 exactly and P has a negative pivot (%d), so −V grows near the equilibrium (Lyapunov's instability theorem)", decayName(m), k+1)
	}
	if e.Status == EquilibriumExact && (opts.Full || affine) {
		v := poly.FromPoly(poly.QuadraticAbout(m.Ring, p, e.Point))
		c.V = &v
	}
	if k < 0 && opts.Full && e.Status == EquilibriumExact && !affine {
		if err := c.full(ctx, m, e, opts); err != nil {
			return nil, err
		}
		if c.Doc != nil {
			return c, nil
		}
	}
	doc := linearizationDoc(m, e, p, decay, opts)
	if err := certificates.Seal(doc); err != nil {
		return nil, err
	}
	c.Doc = doc
	c.Verified = checker.VerifyContext(ctx, doc)
	if err := certify.Agrees(c.Verified, c.Verdict, c.Claim); err != nil {
		return nil, err
	}
	return c, nil
}

// solveLyapunov solves the Lyapunov (Stein) equation for A in floating
// point. When it is singular — eigenvalues with λi + λj = 0 (λiλj = 1),
// which includes saddles with opposite eigenvalues as well as centres — it
// retries with A + sI ((1 + s)·A) for a few small s: the P found then
// solves AᵀP + PA = −(Q + 2sP) instead, which the exact tests judge like any
// other proposal (a centre still fails them).
func solveLyapunov(a, q *mat.Dense, discrete bool) (*mat.SymDense, error) {
	solve := func(a *mat.Dense) (*mat.SymDense, error) {
		if discrete {
			return lyapunov.Discrete(a, q)
		}
		return lyapunov.Continuous(a, q)
	}
	p, err := solve(a)
	if err == nil || !errors.Is(err, lyapunov.ErrSingular) {
		return p, err
	}
	n, _ := a.Dims()
	norm := 1 + mat.Norm(a, math.Inf(1))
	for _, s := range []float64{1e-3, -1e-3, 1e-2, -1e-2, 1e-1, -1e-1} {
		var b mat.Dense
		if discrete {
			b.Scale(1+s, a)
		} else {
			b.CloneFrom(a)
			for i := 0; i < n; i++ {
				b.Set(i, i, b.At(i, i)+s*norm)
			}
		}
		if p, e2 := solve(&b); e2 == nil {
			return p, nil
		}
	}
	return nil, err
}

// roundCommon rounds the float solution P to rationals over one decimal
// denominator 10ᵏ, k ≥ 0 the least with 10⁻ᵏ ≤ 2·tol (every entry within tol):
// P is then an integer matrix over 10ᵏ, so the decay matrix and the leading
// minors that prove P and M definite are computed with short integers
// (where rounding each entry on its own gives unrelated denominators whose
// lcm is as long as all of them together). tol ≤ 0, or a denominator beyond
// 10³⁰⁰, keeps the floats themselves (dyadic rationals). Only proposes:
// exact arithmetic then checks.
func roundCommon(pf *mat.SymDense, tol float64) [][]*big.Rat {
	n, _ := pf.Dims()
	k := 0
	if tol > 0 {
		k = max(0, int(math.Ceil(-math.Log10(2*tol))))
	}
	p := make([][]*big.Rat, n)
	for i := range p {
		p[i] = make([]*big.Rat, n)
	}
	den := new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(k)), nil)
	scale := math.Pow10(k)
	for i := 0; i < n; i++ {
		for j := i; j < n; j++ {
			x := pf.At(i, j)
			var v *big.Rat
			if r := math.Round(x * scale); tol > 0 && k <= 300 && math.Abs(r) < 1<<62 {
				v = new(big.Rat).SetFrac(big.NewInt(int64(r)), den)
			} else {
				v = new(big.Rat).SetFloat64(x)
			}
			p[i][j], p[j][i] = v, v
		}
	}
	return p
}

// floatDefinite reports that gonum's Cholesky factorization of the
// symmetric matrix a + shift·μ·I succeeds in floating point, μ = maxᵢⱼ|aᵢⱼ|.
//
// With a positive shift (10⁻⁸) it screens a rounding before the exact test:
// a failure means that the exact elimination would fail too, or pass only by
// a hair that a finer rounding gives with room to spare.
//
// With a negative shift −c of at least 10⁻⁹·n it shows a ≻ 0: the computed
// factor C satisfies CᵀC = fl(a) − cμI + E with ‖E‖₂ ≤ (n+1)·u·n·μ (the
// backward error of Cholesky's method, Demmel 1989; u = 2⁻⁵³), and
// ‖fl(a) − a‖₂ ≤ n·u·μ, both far below cμ, so
// a = CᵀC + cμI − E − (fl(a) − a) ≻ 0 (the argument of Rump's floating-point
// tests of definiteness). The engine uses it only to skip its own exact
// elimination; the kernel decides.
func floatDefinite(a [][]*big.Rat, shift float64) bool {
	n := len(a)
	s := mat.NewSymDense(n, nil)
	mu := 0.0
	for i := range n {
		for j := i; j < n; j++ {
			v, _ := a[i][j].Float64()
			if math.IsInf(v, 0) || math.IsNaN(v) {
				return false
			}
			s.SetSym(i, j, v)
			mu = math.Max(mu, math.Abs(v))
		}
	}
	for i := range n {
		s.SetSym(i, i, s.At(i, i)+shift*mu)
	}
	var c mat.Cholesky
	return c.Factorize(s)
}

func pointIntervals(a [][]*big.Rat) [][]poly.Interval {
	out := make([][]poly.Interval, len(a))
	for i := range a {
		for _, v := range a[i] {
			out[i] = append(out[i], poly.Point(v))
		}
	}
	return out
}

func decayName(m *model.Model) string {
	if m.Discrete {
		return "P − AᵀPA"
	}
	return "−(AᵀP + PA)"
}

// full runs Check on V = (x − x*)ᵀP(x − x*) with the model's equilibrium set
// to x*. It leaves c.Doc nil when Check does not confirm the claim (the
// linearization certificate is used then).
func (c *Certification) full(ctx context.Context, m *model.Model, e *Equilibrium, opts CertifyOptions) error {
	mc := *m
	mc.V = c.V
	mc.At = make([]poly.RatFunc, len(e.Point))
	for i, v := range e.Point {
		mc.At[i] = poly.RatConst(m.Ring, v)
	}
	mc.AtGiven = true
	res, err := direct.CheckPaving(ctx, &mc, opts.Source, direct.PaveOptions{})
	if err != nil {
		return err
	}
	if res.Verdict != checker.VerdictHolds {
		return nil
	}
	if opts.Issued == "" {
		res.Doc.Issued = ""
		if err := certificates.Seal(res.Doc); err != nil {
			return err
		}
		res.Check = checker.VerifyContext(ctx, res.Doc)
		if err := certify.Agrees(res.Check, res.Verdict, res.Claim); err != nil {
			return err
		}
	}
	c.Method, c.Check, c.Doc, c.Verified = MethodFull, res, res.Doc, res.Check
	c.Verdict, c.Claim = res.Verdict, res.Claim
	if res.Claim == checker.KindGlobal {
		c.Reason = "V and its derivative are exactly quadratic with definite forms (Lyapunov's direct method, global)"
	} else {
		c.Reason = "the quadratic parts of V and of −" + dotWord(m) + " are positive definite (Lyapunov's direct method, local)"
	}
	return nil
}

func dotWord(m *model.Model) string {
	if m.Discrete {
		return "ΔV"
	}
	return "V̇"
}

// linearizationDoc builds the claims.Linearization document: the
// model without a candidate, its equilibrium as the "at" point (exact) or
// as the box (enclosed), P, the Krawczyk data and the enclosure of M.
func linearizationDoc(m *model.Model, e *Equilibrium, p [][]*big.Rat, decay [][]poly.Interval, opts CertifyOptions) *claims.Document {
	n := len(m.States)
	// The canonical text of the model without a candidate, with the exact
	// equilibrium as its "at" line (model.Canonical's form) or with none.
	mc := *m
	mc.V, mc.AtGiven = nil, false
	text := mc.Canonical()
	lz := &claims.Linearization{}
	var kz *claims.KrawczykEnclosure
	if e.Status == EquilibriumExact {
		parts := make([]string, n)
		for i, v := range e.Point {
			parts[i] = m.States[i] + " = " + poly.RatString(v) // the text of the constant RatConst(v)
		}
		text += "at " + strings.Join(parts, ", ") + "\n"
	} else {
		kz = &claims.KrawczykEnclosure{Preconditioner: ratMatrixText(e.Y)}
		for i, iv := range e.Box {
			kz.Box = append(kz.Box, claims.IntervalText(iv))
			kz.Krawczyk = append(kz.Krawczyk, claims.IntervalText(e.K[i]))
		}
	}
	lz.P = ratMatrixText(p)
	lz.Decay = make([][][2]string, n)
	for i := range decay {
		for j := range decay[i] {
			lz.Decay[i] = append(lz.Decay[i], claims.IntervalText(decay[i][j]))
		}
	}
	d := certify.NewDocument(m, opts.Source)
	d.Issued, d.Model = opts.Issued, text
	if kz != nil {
		d.Claims = append(d.Claims, kz)
	}
	d.Claims = append(d.Claims, lz)
	return d
}

func ratMatrixText(a [][]*big.Rat) [][]string {
	out := make([][]string, len(a))
	for i := range a {
		for _, v := range a[i] {
			out[i] = append(out[i], poly.RatString(v))
		}
	}
	return out
}

// FindOptions tune Find.
type FindOptions struct {
	Q      []*big.Rat // diagonal of Q; nil for the identity
	All    bool       // certify every equilibrium, not only the model's
	Source string
	Exact  bool // P is the exact solution of the Lyapunov equation where it can be (CertifyOptions.Exact)
}

// FindResult is what Find found and certified.
type FindResult struct {
	Model  *model.Model
	Search *EquilibriumSearch
	// Target is the index in Search.Equilibria of the model's equilibrium
	// (its "at" point, or the origin), −1 when the origin is not one.
	Target int
	// Certs[i] certifies Search.Equilibria[i]; nil when not attempted.
	Certs []*Certification
}

// ErrNoTarget reports a model whose origin is not an equilibrium and that
// names none.
var ErrNoTarget = errors.New("the origin is not an equilibrium of this model")

// ErrNonIsolated reports that the model's equilibrium (its "at" point, or
// the origin) is not isolated: every neighbourhood of it holds other
// equilibria, which stay where they are, so it is not asymptotically stable
// and no Lyapunov function certifies it (common practice).
var ErrNonIsolated = errors.New("the equilibrium is not isolated (it lies on a curve or surface of equilibria), so it is not asymptotically stable")

// isEquilibrium reports that pt (the states) solves the equilibrium
// equations exactly.
func isEquilibrium(m *model.Model, pt []*big.Rat) bool {
	g, err := model.EquilibriumEquations(m.F, m.Discrete)
	if err != nil {
		return false
	}
	x := make([]*big.Rat, m.Ring.NumVars())
	for i := range x {
		x[i] = new(big.Rat)
		if i < len(pt) {
			x[i] = pt[i]
		}
	}
	for _, gi := range g {
		if gi.Eval(x).Sign() != 0 {
			return false
		}
	}
	return true
}

// pointText writes a point as "x = 0, y = 0".
func pointText(m *model.Model, pt []*big.Rat) string {
	var parts []string
	for i, s := range m.States {
		parts = append(parts, s+" = "+pt[i].RatString())
	}
	return strings.Join(parts, ", ")
}

// Find lists the equilibria of a model without free parameters and
// certifies the model's own (its "at" point, or the origin), or every one
// with opts.All. Rational equilibria that the linearization shows stable go
// through the full check (Check on V = (x − x*)ᵀP(x − x*)); the others get
// linearization checker. Input errors (free parameters, an "at" point
// that is not an equilibrium, no target) are returned as errors.
func Find(ctx context.Context, m *model.Model, opts FindOptions) (*FindResult, error) {
	if err := requireFixed(m, "find"); err != nil {
		return nil, err
	}
	if m.AtGiven {
		if err := m.CheckEquilibrium(); err != nil {
			return nil, err
		}
	}
	search, err := FindEquilibria(m)
	if err != nil {
		return nil, err
	}
	res := &FindResult{Model: m, Search: search, Target: -1, Certs: make([]*Certification, len(search.Equilibria))}
	target := atPoint(m)
	for i, e := range search.Equilibria {
		if e.Status == EquilibriumExact && slices.EqualFunc(e.Point, target, func(a, b *big.Rat) bool { return a.Cmp(b) == 0 }) {
			res.Target = i
		}
	}
	if res.Target < 0 && !opts.All && search.Complete && isEquilibrium(m, target) {
		// The search lists every isolated equilibrium when it is complete,
		// so an equilibrium it does not list lies on a curve or surface of
		// them (a singular linear system: the kernel of its matrix).
		return nil, fmt.Errorf("at %s: %w", pointText(m, target), ErrNonIsolated)
	}
	if res.Target < 0 && !opts.All {
		return nil, &poly.Error{Pos: poly.Pos{File: m.File, Line: 1, Col: 1},
			Msg: ErrNoTarget.Error() + "; name one with an \"at\" line, or certify every equilibrium found with --all"}
	}
	co := CertifyOptions{Q: opts.Q, Full: true, Source: opts.Source, Exact: opts.Exact, Issued: time.Now().UTC().Format(time.RFC3339)}
	for i := range search.Equilibria {
		if !opts.All && i != res.Target {
			continue
		}
		c, err := CertifyEquilibrium(ctx, m, &search.Equilibria[i], co)
		if err != nil {
			return nil, err
		}
		res.Certs[i] = c
	}
	return res, nil
}
