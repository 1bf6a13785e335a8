package checker

import (
	"context"
	"fmt"
	"slices"
	"strings"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// Kinds of claim and verdicts that Verify derives.
const (
	KindGlobal   = "global-asymptotic"
	KindLocal    = "local-asymptotic"
	KindStable   = "stable"
	KindUnstable = "unstable"
	KindNone     = "none"

	VerdictHolds     = "holds"
	VerdictOnRegion  = "holds-on-region"
	VerdictFails     = "fails"
	VerdictUndecided = "undecided"
)

// Record is one check the kernel made, with its outcome.
type Record struct {
	Name   string `json:"name"`
	OK     bool   `json:"ok"`
	Reason string `json:"reason"`
}

// Outcome is what Verify found: whether every claim holds, the record of
// checks, and the verdict and kind of claim derived from the verified claims.
// Refuted says that an exact point refutes the candidate itself (not only
// the argument); Region names the rules the region of parameters rests on
// ("" when the conditions are settled without one). Basin is the level c of
// a verified sublevel-basin claim (the component of {V ≤ c} around the
// equilibrium lies in its region of attraction) or sublevel-sprocedure
// claim (all of {V ≤ c} does); "" without one.
type Outcome struct {
	Valid   bool     `json:"valid"`
	Verdict string   `json:"verdict"`
	Kind    string   `json:"kind"`
	Refuted bool     `json:"refuted"`
	Region  string   `json:"region"`
	Basin   string   `json:"basin,omitempty"`
	Records []Record `json:"checks"`

	// NotSOS names the functions ("V", "-Vdot") proven no sum of squares
	// in a stated basis (moment-separation); no verdict rests on it.
	NotSOS []string `json:"not_sos,omitempty"`
}

// rule is one entry of the rule table: a claim type and its check.
type rule struct {
	name  string
	rank  int // claims come in ascending rank
	check func(c *run, cl claims.Claim) bool
}

// rules is the kernel's rule table, in the order claims must appear (set in
// init: point-check verifies nested claims by the same table).
var rules []rule

func init() { rules = ruleTable() }

func ruleTable() []rule {
	return []rule{
		{"orbital-derivative", 0, (*run).derivative},
		{"quadratic-part-ldl", 1, (*run).quadraticPart},
		{"monomial-gram-ldl", 1, (*run).monomialGram},
		{"margin-gram-ldl", 1, (*run).marginGram},
		{"box-multiplier-sos", 1, (*run).boxMultiplier},
		{"triangular-squares", 2, (*run).triangular},
		{"minor-condition", 2, (*run).minorCondition},
		{"semidefinite-kernel", 3, (*run).nullSpace},
		{"invariance", 3, (*run).invariance},
		{"point-check", 3, (*run).pointCheck},
		{"algebraic-point", 3, (*run).algebraicPoint},
		{"sturm-region", 4, (*run).sturmRegion},
		{"paving", 4, (*run).paving},
		{"witness-points", 4, (*run).witnessPoints},
		{"refutation", 5, (*run).refutation},
		{"moment-separation", 5, (*run).momentSeparation},
		{"krawczyk-enclosure", 6, (*run).krawczyk},
		{"linearization", 7, (*run).linearization},
		{"vertex-lyapunov", 7, (*run).vertexLyapunov},
		{"sublevel-basin", 8, (*run).sublevelBasin},
		{"sublevel-sprocedure", 8, (*run).sublevelSProcedure},
	}
}

// Verify re-checks d: the model text and its parameters, every claim by the
// rule it names, the verdict derived from them, the digest and a present
// signature (see the package documentation).
func Verify(d *claims.Document) Outcome { return VerifyContext(context.Background(), d) }

// VerifyContext is Verify within ctx's deadline: a run that ctx stops is
// invalid (its record says so), never a verdict.
func VerifyContext(ctx context.Context, d *claims.Document) Outcome {
	c := &run{ctx: ctx, doc: d, records: make([]Record, 0, 64), forms: map[string]*checkedForm{}, seen: map[string]bool{}, sturm: map[string]*poly.Sturm{}, points: map[string]*[2]string{}}
	verdict, kind := c.verify()
	if d.Signature != nil {
		c.signature()
	}
	out := Outcome{Valid: c.ok() && len(c.records) > 0, Records: c.records, Verdict: verdict, Kind: kind, Refuted: c.refuted, Basin: c.basin, NotSOS: c.notSOS}
	if out.Valid {
		out.Region = strings.Join(slices.DeleteFunc([]string{"sturm-region", "paving", "witness-points"}, func(r string) bool { return !c.seen[r] }), " + ")
	} else {
		out.Verdict, out.Kind, out.Refuted, out.Basin, out.NotSOS = "", "", false, "", nil
	}
	return out
}

// run is the state of one verification: the facts established so far.
type run struct {
	ctx     context.Context
	doc     *claims.Document
	records []Record
	failed  bool
	m       *model.Model
	r       *poly.Ring
	box     []poly.Interval
	seen    map[string]bool
	sturm   map[string]*poly.Sturm // the algebraic ends' polynomials, read once
	nested  bool                   // the certificate of a point-check: no deeper nesting
	points  map[string]*[2]string  // verdict and kind proven at parameter points
	atPoint string                 // the weakest kind a holding point piece uses
	byConds bool                   // some piece holds by its conditions

	// The direct method.
	derived     bool         // the orbital derivative was checked
	v, vdot     poly.RatFunc // V and V̇ (ΔV)
	higherV     bool         // V has terms of degree > 2 at the equilibrium
	higherD     bool         // so has V̇
	forms       map[string]*checkedForm
	minors      []slot         // the minors of the forms, in the order verified
	conds       []poly.RatFunc // the conditions q > 0 still required
	region      *regionFacts   // what a one-parameter region or a paving showed
	witness     *[2]bool       // witness points: the conditions hold at one, fail at one
	hasKernel   bool
	invariant   bool // the largest invariant set in {V̇ = 0} is the equilibrium
	refuted     bool
	equilibrium []poly.Interval // a box (or point) established by krawczyk-enclosure
	linear      string          // the kind a linearization gave
	basin       string          // the level of a verified sublevel set in the region of attraction
	notSOS      []string        // the functions a moment separation showed no sum of squares
}

// slot is the index-th leading minor of a form.
type slot struct {
	form  string
	index int
	minor poly.RatFunc
}

type checkedForm struct {
	g, l    poly.Matrix
	z       []poly.RatFunc // the basis, in the model's coordinates
	d       []poly.RatFunc
	zero    []bool // identically zero pivots
	minors  []poly.RatFunc
	semidef bool
	basis   bool // a Gram matrix of the whole function in a monomial basis
}

func (c *run) ok() bool { return !c.failed }

func (c *run) add(name string, ok bool, format string, args ...any) bool {
	c.records = append(c.records, Record{Name: name, OK: ok, Reason: fmt.Sprintf(format, args...)})
	if !ok {
		c.failed = true
	}
	return ok
}

func (c *run) parse(what, s string) (poly.RatFunc, bool) {
	f, err := poly.Parse(c.r, s)
	if err != nil {
		c.add(what, false, "cannot read %q: %v", s, err)
		return poly.RatFunc{}, false
	}
	return f, true
}

// once records that a claim identified by key appears for the first time.
func (c *run) once(key string) bool {
	if !c.add(key, !c.seen[key], "stated once") {
		return false
	}
	c.seen[key] = true
	return true
}

func (c *run) verify() (verdict, kind string) {
	d := c.doc
	if !c.add("format", d.Format == claims.Format, "format %q", d.Format) {
		return
	}
	m, err := model.Parse("certificate model", []byte(d.Model))
	if !c.add("model", err == nil, "the model text parses%s", errSuffix(err)) {
		return
	}
	c.m, c.r, c.box = m, m.Ring, m.Box()
	same := len(d.Parameters) == len(m.Params)
	for i := 0; same && i < len(m.Params); i++ {
		same = d.Parameters[i] == claims.Parameter{Name: m.Params[i].Name, Range: model.RangeText(m.Params[i])}
	}
	if !c.add("parameters", same, "the parameters and their assumptions are restated as in the model") ||
		!c.add("claims", len(d.Claims) > 0, "the certificate states claims") {
		return
	}
	last := 0
	for i, cl := range d.Claims {
		k := slices.IndexFunc(rules, func(r rule) bool { return cl != nil && r.name == cl.Rule() })
		if err := c.ctx.Err(); err != nil {
			c.add("claims", false, "stopped before claim %d: %v", i+1, err)
			return
		}
		if !c.add("claims", k >= 0, "claim %d names a rule of the kernel", i+1) ||
			!c.add("claims", rules[k].rank >= last, "claim %d (%s) comes in the order of the rule table", i+1, rules[k].name) ||
			!rules[k].check(c, cl) {
			return
		}
		last = rules[k].rank
	}
	verdict, kind = c.conclude()
	if c.failed {
		return
	}
	digest, err := d.ComputeDigest()
	c.add("digest", err == nil && digest == d.Digest, "the SHA-256 digest of the canonical serialization matches")
	return verdict, kind
}

// conclude derives the verdict and the kind of claim from the verified claims,
// and refuses a certificate whose claims do not form one argument: every
// minor with its condition, a region only where conditions remain, a kernel
// exactly where stability rests on it.
func (c *run) conclude() (verdict, kind string) {
	if c.linear != "" {
		if !c.add("claims", !c.derived && c.refuted == false, "a linearization certificate claims nothing else") {
			return
		}
		if c.linear == KindUnstable {
			return VerdictFails, KindUnstable
		}
		return VerdictHolds, c.linear
	}
	if !c.add("claims", c.derived, "the certificate states V's derivative along the flow or a linearization") {
		return
	}
	if !c.add("claims", c.equilibrium == nil, "a Krawczyk enclosure comes with a linearization") {
		return
	}
	fv, fd := c.forms["V"], c.forms["-Vdot"]
	if fv == nil && fd == nil {
		// Nothing but the derivative, and perhaps a refutation.
		if c.refuted {
			return VerdictFails, KindNone
		}
		return VerdictUndecided, KindNone
	}
	if !c.add("claims", fv != nil && fd != nil, "forms for both V and −V̇") {
		return
	}
	minors := len(fv.minors) + len(fd.minors)
	if !c.add("claims", len(c.conds) == minors, "one condition per minor (%d, stated %d)", minors, len(c.conds)) {
		return
	}
	// The kind of claim the forms support (Lyapunov's direct method).
	switch {
	case fv.semidef, fd.semidef && c.higherD && !fd.basis:
		kind = KindNone
	case fd.semidef:
		kind = KindStable
	case (!c.higherV || fv.basis) && (!c.higherD || fd.basis):
		kind = KindGlobal
	default:
		kind = KindLocal
	}
	// Conditions free of parameters decide the test everywhere at once.
	constant, positive := true, true
	for _, q := range c.conds {
		constant = constant && q.Num.IsConst()
		positive = positive && q.Num.IsConst() && q.Num.ConstTerm().Sign() > 0
	}
	region := c.regionVerdict()
	switch {
	case kind == KindNone:
		if !c.add("claims", region == "", "no region without a claim it could support") {
			return
		}
		verdict = VerdictUndecided
	case region != "":
		verdict = region
	case positive:
		verdict = VerdictHolds
	case constant:
		verdict = VerdictFails
	default:
		verdict = VerdictUndecided
	}
	switch {
	case verdict == VerdictFails && !c.refuted:
		verdict = VerdictUndecided // a failing test alone refutes nothing
	case kind == KindNone && c.refuted:
		verdict = VerdictFails
	}
	if verdict == VerdictFails || verdict == VerdictUndecided {
		kind = KindNone
	}
	needKernel := kind == KindStable && !fd.basis
	c.add("claims", c.hasKernel == needKernel, "a kernel of −V̇ exactly when stability rests on a semidefinite V̇ (%v)", needKernel)
	switch {
	case !c.invariant:
	case !c.add("claims", kind == KindStable, "the invariance principle only where V̇ is semidefinite"):
	case !c.higherV || fv.basis: // V radially unbounded: every solution bounded
		kind = KindGlobal
	default: // small sublevel sets of V are compact and positively invariant
		kind = KindLocal
	}
	if c.atPoint != "" && (kindRank(c.atPoint) < kindRank(kind) || !c.byConds) {
		kind = c.atPoint // a region claims what its weakest holding piece proves
	}
	return verdict, kind
}

// regionFacts is what a verified region says of the conditions: they hold
// somewhere, fail somewhere, hold on the whole allowed range, or on none of it.
type regionFacts struct {
	used                    map[int]bool // the parameters the conditions involve
	holds, fails, all, none bool
}

// regionVerdict is what the region claims say: "holds" on the whole allowed
// range, "fails" on all of it, "holds-on-region" when proven to hold
// somewhere and to fail somewhere, else "undecided"; "" without a region.
func (c *run) regionVerdict() string {
	r := c.region
	if r == nil && c.witness == nil {
		return ""
	} else if r == nil {
		r = &regionFacts{}
	}
	holds, fails := r.holds, r.fails
	if c.witness != nil {
		holds, fails = holds || c.witness[0], fails || c.witness[1]
	}
	switch {
	case r.all:
		return VerdictHolds
	case r.none:
		return VerdictFails
	case holds && fails:
		return VerdictOnRegion
	}
	return VerdictUndecided
}

func errSuffix(err error) string {
	if err == nil {
		return ""
	}
	return ": " + strings.ReplaceAll(err.Error(), "\n", "; ")
}

// signature records the check of a present signature. Verify does not
// require one; a present one must verify, since a reader would otherwise take
// a forged or stale signature at face value.
func (c *run) signature() {
	if _, err := c.doc.VerifySignature(); err != nil {
		c.add("signature", false, "%v", err)
	} else {
		c.add("signature", true, "the ed25519 signature of the digest by the key it names is valid")
	}
}
