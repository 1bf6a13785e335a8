package direct

import (
	"fmt"
	"math/big"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// TestMarginForm: testdata/models/margin.lya (constructed, hand-checked:
// −V̇ = 2(x⁴ + y⁴) + 2(x²y − xy²)²) has only singular Gram matrices of −V̇,
// since x⁴y², x³y³ and x²y⁴ are reached by x²y and xy² alone, with the
// block 2·[[1, −1], [−1, 1]]. The margin form certifies −V̇ ≥ ε(x⁴ + y⁴)
// with 0 < ε ≤ 2, and the kernel accepts it: global asymptotic stability.
func TestMarginForm(t *testing.T) {
	res, err := Check(loadCase(t, "margin.lya", nil), "margin.lya")
	if err != nil {
		t.Fatal(err)
	}
	if res.Verdict != checker.VerdictHolds || res.Claim != checker.KindGlobal || !res.Check.Valid || res.Check.Kind != checker.KindGlobal {
		t.Fatalf("verdict %s (%s), kernel %v %s; reason %q notes %q", res.Verdict, res.Claim, res.Check.Valid, res.Check.Kind, res.Reason, res.Notes)
	}
	mgs := certificates.ClaimsOf[*claims.MarginGram](res.Doc)
	if len(mgs) != 1 || mgs[0].Of != "-Vdot" || len(res.Methods) != 2 || res.Methods[1].Name != MethodMargin {
		t.Fatalf("want one margin form of −V̇; claims %d, methods %v", len(mgs), res.Methods)
	}
	r := res.Model.Ring
	m := poly.MustParse(r, mgs[0].Margin).Num
	eps := m.Coefficient([]int{4, 0}, r.StateMask()).ConstTerm()
	if !m.EvenPowers(2) || eps.Sign() <= 0 || eps.Cmp(big.NewRat(2, 1)) > 0 {
		t.Errorf("margin %s: want ε(x⁴ + y⁴) with 0 < ε ≤ 2", mgs[0].Margin)
	}
	if !slices.Contains(mgs[0].D, "0") {
		t.Errorf("pivots %v: the Gram matrix of −V̇ less the margin is singular", mgs[0].D)
	}
}

// TestMotzkinNotSOS: testdata/models/motzkin.lya (constructed) has
// −V̇ = x⁴y² + x²y⁴ − 3x²y²z² + z⁶, Motzkin's form, non-negative but no
// sum of squares (Motzkin 1967). No Gram certificate may appear; the
// engine's moment separation is in the certificate and the kernel reports
// it, with the verdict undecided. The basis is the half Newton polytope
// of the form: z³, xyz, xy², x²y (Reznick 1978; its vertices halve
// (4,2,0), (2,4,0), (0,0,6), and (1,1,1) is their centroid).
func TestMotzkinNotSOS(t *testing.T) {
	res, err := Check(loadCase(t, "motzkin.lya", nil), "motzkin.lya")
	if err != nil {
		t.Fatal(err)
	}
	if res.Verdict != checker.VerdictUndecided || !res.Check.Valid || res.Check.Verdict != checker.VerdictUndecided {
		t.Fatalf("verdict %s, kernel %v %s", res.Verdict, res.Check.Valid, res.Check.Verdict)
	}
	if len(certificates.ClaimsOf[*claims.MonomialGram](res.Doc))+len(certificates.ClaimsOf[*claims.MarginGram](res.Doc)) > 0 {
		t.Fatal("a Gram certificate for Motzkin's form")
	}
	ns := certificates.ClaimsOf[*claims.NotSOS](res.Doc)
	if len(ns) != 1 || ns[0].Of != "-Vdot" || !slices.Equal(res.Check.NotSOS, []string{"-Vdot"}) {
		t.Fatalf("moment separations %v, kernel %v", ns, res.Check.NotSOS)
	}
	got := slices.Sorted(slices.Values(ns[0].Basis))
	if want := []string{"x*y*z", "x*y^2", "x^2*y", "z^3"}; !slices.Equal(got, want) {
		t.Errorf("basis %v, want %v", got, want)
	}
}

// systemFor returns a model with V = (x² + y²)/2 and −V̇ = p, a polynomial
// in x, y without constant or linear terms: each term of p divisible by x
// goes to x' (divided by −x), the others to y' (divided by −y), so that
// x·x' + y·y' = −p exactly (constructed, common practice).
func systemFor(t *testing.T, p *poly.Poly) *model.Model {
	t.Helper()
	r := p.Ring()
	f := [2]*poly.Poly{poly.Zero(r), poly.Zero(r)}
	for _, term := range p.Terms() {
		e := slices.Clone(term.Exp)
		i := 0
		if e[0] == 0 {
			i = 1
		}
		e[i]--
		f[i].Sub(f[i], poly.Monomial(r, e, term.Coef))
	}
	src := fmt.Sprintf("state x, y\nx' = %s\ny' = %s\nV = (x^2 + y^2)/2\n", f[0], f[1])
	m, err := model.Parse("random.lya", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// randomForm returns a random polynomial in x, y with small rational
// coefficients and terms of degrees lo to hi only.
func randomForm(rng *rand.Rand, lo, hi int) string {
	var terms []string
	for d := lo; d <= hi; d++ {
		for i := 0; i <= d; i++ {
			if rng.IntN(3) == 0 {
				continue
			}
			terms = append(terms, fmt.Sprintf("(%d/%d)*x^%d*y^%d", rng.IntN(11)-5, 1+rng.IntN(4), i, d-i))
		}
	}
	if len(terms) == 0 {
		return "x"
	}
	return strings.Join(terms, " + ")
}

// TestRandomSOSCertified: −V̇ = Σ qₖ² + ε(x² + y² + x⁴ + y⁴) with random
// rational qₖ without constant term is positive definite and radially
// unbounded by construction, and is a sum of squares with a positive
// definite Gram matrix in its Newton basis; check must prove global
// asymptotic stability, re-checked by the kernel (common practice).
func TestRandomSOSCertified(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 17))
	r := poly.NewRing([]string{"x", "y"}, nil)
	searched := 0
	for k := range 6 {
		var sq []string
		for range 4 {
			sq = append(sq, "("+randomForm(rng, 1, 2)+")^2")
		}
		eps := fmt.Sprintf("1/%d", 1<<(2+rng.IntN(6)))
		text := strings.Join(sq, " + ") + " + " + eps + "*(x^2 + y^2 + x^4 + y^4)"
		p := poly.MustParse(r, text).Num
		res, err := Check(systemFor(t, p), "random.lya")
		if err != nil {
			t.Fatal(err)
		}
		if res.Verdict != checker.VerdictHolds || res.Claim != checker.KindGlobal || !res.Check.Valid {
			t.Errorf("case %d: −V̇ = %s: verdict %s (%s); notes %q", k, text, res.Verdict, res.Claim, res.Notes)
		}
		if len(res.Methods) == 2 && res.Methods[1].Name != MethodCanonical && res.Methods[1].Name != MethodQuadratic {
			searched++
		}
	}
	// The canonical Gram matrix (cross terms shared equally) is rarely
	// positive definite for such sums: the SDP must have been needed.
	if searched == 0 {
		t.Errorf("no case needed the semidefinite search")
	}
	t.Logf("%d of 6 cases by the semidefinite search", searched)
}

// TestRandomPlantedNegative: −V̇ = Σ qₖ² − c·x²y² with random homogeneous
// quadratic qₖ and c = Σ qₖ(1, 1)² + 1, so −V̇(1, 1) = −1 < 0 exactly
// (constructed): never a certificate; the check refutes V at an exact
// point where V̇ > 0, and V̇ there is recomputed here.
func TestRandomPlantedNegative(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 29))
	r := poly.NewRing([]string{"x", "y"}, nil)
	one := []*big.Rat{big.NewRat(1, 1), big.NewRat(1, 1)}
	separated := 0
	defer func() { t.Logf("%d of 6 with an exact moment separation besides", separated) }()
	for k := range 6 {
		var sq []string
		for range 3 {
			sq = append(sq, "("+randomForm(rng, 2, 2)+")^2")
		}
		s := poly.MustParse(r, strings.Join(sq, " + ")).Num
		c := s.Eval(one)
		c.Add(c, big.NewRat(1, 1))
		p := new(poly.Poly).Sub(s, poly.Monomial(r, []int{2, 2}, c))
		if p.Eval(one).Cmp(big.NewRat(-1, 1)) != 0 {
			t.Fatal("planting failed")
		}
		res, err := Check(systemFor(t, p), "random.lya")
		if err != nil {
			t.Fatal(err)
		}
		if res.Verdict == checker.VerdictHolds || res.Verdict == checker.VerdictOnRegion {
			t.Fatalf("case %d: −V̇ = %s, negative at (1, 1), yet %s", k, p, res.Verdict)
		}
		if len(certificates.ClaimsOf[*claims.MonomialGram](res.Doc))+len(certificates.ClaimsOf[*claims.MarginGram](res.Doc)) > 0 {
			t.Fatalf("case %d: a Gram certificate for −V̇ = %s", k, p)
		}
		separated += len(res.Check.NotSOS)
		if res.Verdict != checker.VerdictFails || res.Refutation == nil || !res.Check.Refuted {
			t.Errorf("case %d: −V̇ = %s: verdict %s, no exact refutation", k, p, res.Verdict)
			continue
		}
		x := make([]*big.Rat, 2)
		for i, st := range []string{"x", "y"} {
			x[i], _ = new(big.Rat).SetString(res.Refutation.Point[st])
		}
		if v := p.Eval(x); v.Sign() >= 0 {
			t.Errorf("case %d: −V̇ = %v ≥ 0 at the refuting point %v", k, v, res.Refutation.Point)
		}
	}
}
