package sos_test

import (
	"context"
	"fmt"
	"math/big"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/certify/sos"
	"github.com/lyacert/lyacert/poly"
)

func parse(t testing.TB, vars []string, text string) *poly.Poly {
	t.Helper()
	r := poly.NewRing(vars, nil)
	f, err := poly.Parse(r, text)
	if err != nil {
		t.Fatal(err)
	}
	return f.Num
}

// gramPoly returns zᵀGz exactly.
func gramPoly(p *poly.Poly, res *sos.Result, g [][]*big.Rat) *poly.Poly {
	r := p.Ring()
	z := make([]*poly.Poly, len(res.Basis))
	for a, e := range res.Basis {
		full := make([]int, r.NumVars())
		for i, v := range res.Vars {
			full[v] = e[i]
		}
		z[a] = poly.Monomial(r, full, big.NewRat(1, 1))
	}
	s := poly.Zero(r)
	for a := range z {
		for b := range z {
			s.Add(s, new(poly.Poly).Scale(new(poly.Poly).Mul(z[a], z[b]), g[a][b]))
		}
	}
	return s
}

// checkCertificate re-checks a certificate from scratch: the identity
// p = zᵀGz (minus the margin) and G = LDLᵀ with positive pivots.
func checkCertificate(t *testing.T, p *poly.Poly, res *sos.Result) {
	t.Helper()
	c := res.Certificate
	target := p
	if c.Epsilon != nil {
		r := p.Ring()
		target = p.Clone()
		for _, v := range res.Vars {
			e := make([]int, r.NumVars())
			e[v] = p.Degree()
			target.Sub(target, poly.Monomial(r, e, c.Epsilon))
		}
	}
	if !gramPoly(p, res, c.Gram).Equal(target) {
		t.Fatalf("zᵀGz ≠ p")
	}
	n := len(c.Gram)
	for i := 0; i < n; i++ {
		if c.Factor.D[i].Sign() <= 0 {
			t.Fatalf("pivot %d = %v", i, c.Factor.D[i])
		}
		for j := 0; j < n; j++ {
			s := new(big.Rat)
			for k := 0; k < n; k++ {
				s.Add(s, new(big.Rat).Mul(new(big.Rat).Mul(c.Factor.L[i][k], c.Factor.D[k]), c.Factor.L[j][k]))
			}
			if s.Cmp(c.Gram[i][j]) != 0 {
				t.Fatalf("LDLᵀ ≠ G at (%d,%d)", i, j)
			}
		}
	}
}

// checkRefutation: L(p) < 0 exactly, M_ab = L(z_a z_b), M = LDLᵀ with
// positive pivots (or M = 0).
func checkRefutation(t *testing.T, p *poly.Poly, res *sos.Result) {
	t.Helper()
	f := res.NotSOS
	val := new(big.Rat)
	for _, term := range p.Terms() {
		e := make([]int, len(res.Vars))
		for i, v := range res.Vars {
			e[i] = term.Exp[v]
		}
		if m, ok := f.Moments[sos.Key(e)]; ok {
			val.Add(val, new(big.Rat).Mul(term.Coef, m))
		}
	}
	if val.Cmp(f.Value) != 0 || val.Sign() >= 0 {
		t.Fatalf("L(p) = %v, recorded %v", val, f.Value)
	}
	for a := range res.Basis {
		for b := range res.Basis {
			e := make([]int, len(res.Vars))
			for i := range e {
				e[i] = res.Basis[a][i] + res.Basis[b][i]
			}
			m := f.Moments[sos.Key(e)]
			if m == nil {
				m = new(big.Rat)
			}
			if m.Cmp(f.Moment[a][b]) != 0 {
				t.Fatalf("M(%d,%d) is not L(z_a z_b)", a, b)
			}
		}
	}
	for _, d := range f.Factor.D {
		if d.Sign() <= 0 {
			t.Fatalf("moment pivot %v", d)
		}
	}
}

func TestWorkedExamples(t *testing.T) {
	cases := []struct {
		name, source string
		vars         []string
		text         string
		basis        int
	}{
		// (x² − y²)² + y⁴: common practice (hand computation).
		{"quartic", "common practice", []string{"x", "y"}, "x^4 - 2*x^2*y^2 + 2*y^4", 3},
		// The worked example of Parrilo, Math. Program. 96 (2003), §3
		// (from memory): 2x⁴ + 2x³y − x²y² + 5y⁴ is a sum of squares in
		// the basis (x², y², xy).
		{"parrilo", "Parrilo 2003, worked example (from memory)", []string{"x", "y"}, "2*x^4 + 2*x^3*y - x^2*y^2 + 5*y^4", 3},
		// x⁴ + y⁴ + z⁴ − x²yz is an AM–GM form; such forms are sums of
		// squares (Hurwitz 1891; from memory).
		{"amgm", "Hurwitz 1891 (AM–GM forms are SOS), from memory", []string{"x", "y", "z"}, "x^4 + y^4 + z^4 - x^2*y*z", 6},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			p := parse(t, c.vars, c.text)
			for _, margin := range []bool{false, true} {
				res, err := sos.Find(context.Background(), p, &sos.Options{Margin: margin})
				if err != nil {
					t.Fatal(err)
				}
				if res.Certificate == nil {
					t.Fatalf("%s (%s): no certificate (margin %v, status %v)", c.text, c.source, margin, res.SolverStatus)
				}
				if len(res.Basis) != c.basis {
					t.Errorf("basis %v, want %d elements", res.Basis, c.basis)
				}
				checkCertificate(t, p, res)
			}
		})
	}
}

// TestMotzkin: x⁴y² + x²y⁴ − 3x²y² + 1 is non-negative (AM–GM) but not a
// sum of squares (Motzkin 1967). Its half Newton polytope has the lattice
// points 1, xy, x²y, xy² (Reznick 1978), and the x²y² coefficient can only
// come from (xy)², whose Gram entry would have to be −3.
func TestMotzkin(t *testing.T) {
	p := parse(t, []string{"x", "y"}, "x^4*y^2 + x^2*y^4 - 3*x^2*y^2 + 1")
	res, err := sos.Find(context.Background(), p, nil)
	if err != nil {
		t.Fatal(err)
	}
	if res.Certificate != nil {
		t.Fatal("a certificate for Motzkin's polynomial")
	}
	// Of the degree-3 candidates 1, x, y, x², xy, y², x²y, xy², the pruning
	// must drop x, y, x², y²: ½N(p) = conv{(0,0), (2,1), (1,2)} is the set
	// a ≤ 2b, b ≤ 2a, a + b ≤ 3 (hand computation), which (1,0), (0,1),
	// (2,0) and (0,2) violate.
	if got := fmt.Sprint(res.Basis); got != "[[0 0] [1 1] [1 2] [2 1]]" {
		t.Errorf("basis %v, want 1, xy, xy², x²y", got)
	}
	if res.NotSOS == nil {
		t.Fatal("no refutation")
	}
	checkRefutation(t, p, res)
	// Motzkin + (1/4)x²y²: the same basis, and the forced entry is still
	// −11/4 < 0 (hand computation).
	q := parse(t, []string{"x", "y"}, "x^4*y^2 + x^2*y^4 - 11/4*x^2*y^2 + 1")
	res, err = sos.Find(context.Background(), q, nil)
	if err != nil {
		t.Fatal(err)
	}
	if res.Certificate != nil || res.NotSOS == nil {
		t.Fatal("variant: want a refutation")
	}
	checkRefutation(t, q, res)
}

func randomPoly(rng *rand.Rand, vars []string, deg int) string {
	var terms []string
	var rec func(i, d int, mono []string)
	rec = func(i, d int, mono []string) {
		if i == len(vars) {
			if rng.IntN(3) == 0 {
				return
			}
			c := fmt.Sprintf("(%d/%d)", rng.IntN(11)-5, 1+rng.IntN(4))
			terms = append(terms, strings.Join(append([]string{c}, mono...), "*"))
			return
		}
		for e := 0; e <= deg-d; e++ {
			m := mono
			if e > 0 {
				m = append(append([]string(nil), mono...), fmt.Sprintf("%s^%d", vars[i], e))
			}
			rec(i+1, d+e, m)
		}
	}
	rec(0, 0, nil)
	if len(terms) == 0 {
		return "1"
	}
	return strings.Join(terms, "+")
}

// TestRandomSOS: Σ qₖ² for random rational qₖ (more squares than
// variables, so generically positive definite Gram matrices exist) always
// gets a certificate (common practice).
func TestRandomSOS(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 13))
	for k := 0; k < 12; k++ {
		vars := []string{"x", "y", "z"}[:2+k%2]
		var sq []string
		for j := 0; j < 7; j++ {
			sq = append(sq, "("+randomPoly(rng, vars, 2)+")^2")
		}
		text := strings.Join(sq, "+")
		p := parse(t, vars, text)
		res, err := sos.Find(context.Background(), p, nil)
		if err != nil {
			t.Fatal(err)
		}
		if res.Certificate == nil {
			t.Errorf("case %d: no certificate for %s (status %v, margin %g)", k, text, res.SolverStatus, res.Sizes.Margin)
			continue
		}
		checkCertificate(t, p, res)
	}
}

// TestPlantedNegative: p = Σ qₖ² − c·(product of squares) + ... with an
// exact point a where p(a) < 0 (evaluated exactly) never gets a
// certificate, and gets a checked refutation when one is found.
func TestPlantedNegative(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 8))
	found := 0
	for k := 0; k < 8; k++ {
		vars := []string{"x", "y"}
		var sq []string
		for j := 0; j < 3; j++ {
			sq = append(sq, "("+randomPoly(rng, vars, 2)+")^2")
		}
		// Subtract more than the sum of squares at (1, 1).
		r := poly.NewRing(vars, nil)
		s := poly.MustParse(r, strings.Join(sq, "+")).Num
		one := []*big.Rat{big.NewRat(1, 1), big.NewRat(1, 1)}
		v := s.Eval(one)
		v.Add(v, big.NewRat(1, 1))
		p := new(poly.Poly).Sub(s, new(poly.Poly).Scale(poly.MustParse(r, "x^2*y^2").Num, v))
		if p.Eval(one).Sign() >= 0 {
			t.Fatalf("planting failed")
		}
		res, err := sos.Find(context.Background(), p, nil)
		if err != nil {
			t.Fatal(err)
		}
		if res.Certificate != nil {
			t.Fatalf("certificate for %v, negative at (1,1)", p)
		}
		if res.NotSOS != nil {
			checkRefutation(t, p, res)
			found++
		}
	}
	t.Logf("%d of 8 refuted exactly", found)
}
