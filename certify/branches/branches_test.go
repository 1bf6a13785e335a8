package branches

import (
	"context"
	"math/big"
	"os"
	"path/filepath"
	"testing"

	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

func readModel(t testing.TB, name string) *model.Model {
	t.Helper()
	src, err := os.ReadFile(filepath.Join("..", "..", "testdata", "models", name))
	if err != nil {
		t.Fatal(err)
	}
	return parse(t, name, string(src))
}

func parse(t testing.TB, name, src string) *model.Model {
	t.Helper()
	m, err := model.Parse(name, []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	return m
}

func analyze(t testing.TB, m *model.Model) *Analysis {
	t.Helper()
	an, err := Analyze(context.Background(), m, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if !an.ClosedForm {
		t.Fatalf("no closed form: %s", an.Reason)
	}
	return an
}

func rat(s string) *big.Rat {
	q, ok := new(big.Rat).SetString(s)
	if !ok {
		panic(s)
	}
	return q
}

// end is a rational end ("" for an infinity of the given sign).
type end struct {
	v      string
	inf    int
	closed bool
}

func spansEqual(got []poly.Span, want [][2]end) bool {
	if len(got) != len(want) {
		return false
	}
	match := func(e poly.End, w end) bool {
		if w.inf != 0 {
			return e.Inf == w.inf
		}
		return e.Rational() && e.Value.Cmp(rat(w.v)) == 0 && e.Closed == w.closed
	}
	for i, s := range got {
		if !match(s.Lo, want[i][0]) || !match(s.Hi, want[i][1]) {
			return false
		}
	}
	return true
}

func spansString(ss []poly.Span) string {
	out := ""
	for _, s := range ss {
		out += "[" + endString(s.Lo) + ", " + endString(s.Hi) + "] "
	}
	return out
}

func isStable(l Label) bool { return l.Exists && l.Stability == "stable" }

func kindIs(k string) func(Label) bool {
	return func(l Label) bool { return l.Exists && l.Kind == k }
}

// findBranch returns the index of the branch with the given value of
// state 0 at the parameter point pt (nil: the branch with a rational zero
// coordinate) — here used to tell the origin from the other branches.
func originIndex(t *testing.T, an *Analysis) int {
	for i, b := range an.Branches {
		zero := true
		for _, c := range b.Coords {
			zero = zero && c.IsZero()
		}
		if zero {
			return i
		}
	}
	t.Fatal("no origin branch")
	return -1
}

// Lorenz 1963; Strogatz, Nonlinear Dynamics and Chaos, §9.2: with σ = 10,
// b = 8/3 the origin is stable for 0 ≤ r < 1 and a saddle for r > 1;
// C± = (±√(b(r−1)), ±√(b(r−1)), r−1) are born in a pitchfork at r = 1 and
// lose stability in a Hopf bifurcation at r_H = σ(σ + b + 3)/(σ − b − 1) =
// 470/19.
func TestLorenzClassic(t *testing.T) {
	m := readModel(t, "lorenz-classic.lya")
	an := analyze(t, m)
	if len(an.Branches) != 3 {
		t.Fatalf("%d branches, want 3", len(an.Branches))
	}
	o := originIndex(t, an)
	r, _ := m.Ring.Index("r")
	b := poly.RatConst(m.Ring, big.NewRat(8, 3))
	rm1 := poly.FromPoly(new(poly.Poly).Sub(poly.Var(m.Ring, r), poly.ConstInt(m.Ring, 1)))
	for i, br := range an.Branches {
		if i == o {
			continue
		}
		x := br.Coords[0]
		if !x.Equal(br.Coords[1]) || !br.Coords[2].Equal(Rational(rm1)) || !x.Mul(x).Equal(Rational(b.Mul(rm1))) {
			t.Errorf("C± branch %d = %v, want x = y = ±√(b(r−1)), z = r − 1", i, br.Coords)
		}
		if br.Pair < 0 || br.Pair == o {
			t.Errorf("branch %d has pair %d", i, br.Pair)
		}
	}
	inf := end{inf: 1}
	if got := an.Where(o, isStable); !spansEqual(got, [][2]end{{{v: "0"}, {v: "1"}}}) {
		t.Errorf("origin stable on %s, want (0, 1)", spansString(got))
	}
	if got := an.Where(o, kindIs("saddle")); !spansEqual(got, [][2]end{{{v: "1"}, inf}}) {
		t.Errorf("origin a saddle on %s, want (1, ∞)", spansString(got))
	}
	for i := range an.Branches {
		if i == o {
			continue
		}
		if got := an.Where(i, isStable); !spansEqual(got, [][2]end{{{v: "1"}, {v: "470/19"}}}) {
			t.Errorf("C± stable on %s, want (1, 470/19)", spansString(got))
		}
		if got := an.Where(i, func(l Label) bool { return l.Exists }); !spansEqual(got, [][2]end{{{v: "1", closed: true}, inf}}) {
			t.Errorf("C± exist on %s, want [1, ∞)", spansString(got))
		}
		// Lyapunov's theorem: P(r) ≻ 0 exactly where C± is stable.
		if got := an.Branches[i].Quadratic.Region; !spansEqual(got, [][2]end{{{v: "1"}, {v: "470/19"}}}) {
			t.Errorf("C± P ≻ 0 on %s, want (1, 470/19)", spansString(got))
		}
	}
	if got := an.Branches[o].Quadratic.Region; !spansEqual(got, [][2]end{{{v: "0"}, {v: "1"}}}) {
		t.Errorf("origin P ≻ 0 on %s, want (0, 1)", spansString(got))
	}
	want := []struct {
		kind, at string
		n        int
	}{{"pitchfork", "1", 3}, {"hopf", "470/19", 2}}
	if len(an.Bifurcations) != len(want) {
		t.Fatalf("bifurcations %+v", an.Bifurcations)
	}
	for i, w := range want {
		bf := an.Bifurcations[i]
		if bf.Kind != w.kind || bf.Value.Exact == nil || bf.Value.Exact.Cmp(rat(w.at)) != 0 || len(bf.Branches) != w.n {
			t.Errorf("bifurcation %d: %s at %v (%v), want %s at %s", i, bf.Kind, bf.Value.Exact, bf.Branches, w.kind, w.at)
		}
	}
}

// Lorenz 1963; Strogatz §9.2: the Hopf value of C± is
// r_H = σ(σ + b + 3)/(σ − b − 1) for symbolic σ, b: the Hurwitz determinant
// H₂ of C± vanishes there (checked at sample σ, b) and not nearby.
func TestLorenzSymbolicHopf(t *testing.T) {
	m := readModel(t, "lorenz.lya")
	an := analyze(t, m)
	ix := func(n string) int { i, _ := m.Ring.Index(n); return i }
	for _, sb := range [][2]string{{"10", "8/3"}, {"16", "4"}, {"7", "1/2"}} {
		sigma, b := rat(sb[0]), rat(sb[1])
		rh := new(big.Rat).Add(sigma, b)
		rh.Add(rh, big.NewRat(3, 1)).Mul(rh, sigma)
		den := new(big.Rat).Sub(sigma, b)
		rh.Quo(rh, den.Sub(den, big.NewRat(1, 1)))
		for i, br := range an.Branches {
			if br.W == nil {
				continue
			}
			h2 := br.Hurwitz[1]
			if !h2.IsRational() {
				t.Fatalf("H₂ of C± not rational: %s", h2)
			}
			at := func(r *big.Rat) *big.Rat {
				x := make([]*big.Rat, m.Ring.NumVars())
				for k := range x {
					x[k] = new(big.Rat)
				}
				x[ix("sigma")], x[ix("b")], x[ix("r")] = sigma, b, r
				v, err := h2.A.Eval(x)
				if err != nil {
					t.Fatal(err)
				}
				return v
			}
			if at(rh).Sign() != 0 || at(new(big.Rat).Add(rh, big.NewRat(1, 100))).Sign() == 0 {
				t.Errorf("branch %d: H₂ at σ=%s b=%s r=%s is %s", i, sigma, b, rh, at(rh))
			}
		}
	}
}

// Routh–Hurwitz criterion for s³ + a2 s² + a1 s + a0 (handbook form):
// stable iff a2 > 0, a0 > 0 and a2·a1 > a0; the Hurwitz determinants and,
// by Lyapunov's theorem, the leading minors of P must agree on a grid.
func TestCompanionRouthHurwitz(t *testing.T) {
	m := readModel(t, "companion3.lya")
	an := analyze(t, m)
	if len(an.Branches) != 1 {
		t.Fatalf("%d branches", len(an.Branches))
	}
	br := an.Branches[0]
	ix := func(n string) int { i, _ := m.Ring.Index(n); return i }
	vals := []string{"-1", "1/2", "1", "2", "3"}
	for _, a0 := range vals {
		for _, a1 := range vals {
			for _, a2 := range vals {
				x := make([]*big.Rat, m.Ring.NumVars())
				for k := range x {
					x[k] = new(big.Rat)
				}
				x[ix("a0")], x[ix("a1")], x[ix("a2")] = rat(a0), rat(a1), rat(a2)
				want := rat(a2).Sign() > 0 && rat(a0).Sign() > 0 && new(big.Rat).Mul(rat(a2), rat(a1)).Cmp(rat(a0)) > 0
				allPos := func(xs []Surd) bool {
					for _, h := range xs {
						v, err := h.A.Eval(x)
						if err != nil || v.Sign() <= 0 {
							return false
						}
					}
					return true
				}
				if got := allPos(br.Stable); got != want {
					t.Errorf("a0=%s a1=%s a2=%s: Hurwitz says %v, handbook %v", a0, a1, a2, got, want)
				}
				if d, err := br.Quadratic.SystemDet.A.Eval(x); err != nil || d.Sign() == 0 {
					continue
				}
				if got := allPos(br.Quadratic.Minors); got != want {
					t.Errorf("a0=%s a1=%s a2=%s: P ≻ 0 is %v, want %v", a0, a1, a2, got, want)
				}
			}
		}
	}
}

// A model of our own: x' = y, y' = a·x − x³ − y. Hand computation with the
// trace–determinant classification (common practice; Strogatz §5.2): at the
// origin τ = −1, Δ = −a, τ² − 4Δ = 1 + 4a: a stable focus for a < −1/4, a
// stable node on (−1/4, 0), a saddle for a > 0; the pair (±√a, 0) is born in
// a pitchfork at a = 0 with τ = −1, Δ = 2a: a stable node on (0, 1/8) and a
// stable focus for a > 1/8 (τ² = 4Δ at a = 1/8).
func TestTwoStateTraceDeterminant(t *testing.T) {
	m := parse(t, "duffing.lya", "state x, y\nparameter a\nx' = y\ny' = a*x - x^3 - y\n")
	an := analyze(t, m)
	if len(an.Branches) != 3 {
		t.Fatalf("%d branches", len(an.Branches))
	}
	o := originIndex(t, an)
	inf, ninf := end{inf: 1}, end{inf: -1}
	checks := []struct {
		branch func(int) bool
		keep   func(Label) bool
		want   [][2]end
	}{
		{func(i int) bool { return i == o }, kindIs("focus"), [][2]end{{ninf, {v: "-1/4"}}}},
		{func(i int) bool { return i == o }, kindIs("node"), [][2]end{{{v: "-1/4"}, {v: "0"}}}},
		{func(i int) bool { return i == o }, kindIs("degenerate node"), [][2]end{{{v: "-1/4", closed: true}, {v: "-1/4", closed: true}}}},
		{func(i int) bool { return i == o }, kindIs("saddle"), [][2]end{{{v: "0"}, inf}}},
		{func(i int) bool { return i != o }, kindIs("node"), [][2]end{{{v: "0"}, {v: "1/8"}}}},
		{func(i int) bool { return i != o }, kindIs("focus"), [][2]end{{{v: "1/8"}, inf}}},
		{func(i int) bool { return i != o }, isStable, [][2]end{{{v: "0"}, inf}}},
	}
	for k, c := range checks {
		for i := range an.Branches {
			if !c.branch(i) {
				continue
			}
			if got := an.Where(i, c.keep); !spansEqual(got, c.want) {
				t.Errorf("check %d branch %d: %s", k, i, spansString(got))
			}
		}
	}
	for i, b := range an.Branches {
		if b.Trace == nil || !b.Trace.Equal(intSurd(m.Ring, -1)) {
			t.Errorf("branch %d: trace %v, want −1", i, b.Trace)
		}
	}
	if len(an.Bifurcations) != 1 || an.Bifurcations[0].Kind != "pitchfork" || an.Bifurcations[0].Value.Exact.Sign() != 0 {
		t.Errorf("bifurcations %+v, want one pitchfork at 0", an.Bifurcations)
	}
}

// The logistic map x ↦ r·x(1 − x) (May 1976; common practice): the fixed
// point 1 − 1/r is stable for 1 < r < 3 and period-doubles at r = 3; it
// crosses the fixed point 0 at r = 1 (transcritical).
func TestLogisticPeriodDoubling(t *testing.T) {
	m := readModel(t, "logistic.lya")
	an := analyze(t, m)
	o := originIndex(t, an)
	nz := 1 - o
	if got := an.Where(nz, isStable); !spansEqual(got, [][2]end{{{v: "1"}, {v: "3"}}}) {
		t.Errorf("1 − 1/r stable on %s, want (1, 3)", spansString(got))
	}
	if got := an.Branches[nz].Quadratic.Region; !spansEqual(got, [][2]end{{{v: "1"}, {v: "3"}}}) {
		t.Errorf("P > 0 on %s, want (1, 3)", spansString(got))
	}
	var pd, tc bool
	for _, bf := range an.Bifurcations {
		switch {
		case bf.Kind == "period-doubling" && bf.Value.Exact.Cmp(big.NewRat(3, 1)) == 0 && len(bf.Branches) == 1 && bf.Branches[0] == nz:
			pd = true
		case bf.Kind == "transcritical" && bf.Value.Exact.Cmp(big.NewRat(1, 1)) == 0:
			tc = true
		}
	}
	if !pd || !tc {
		t.Errorf("bifurcations %+v", an.Bifurcations)
	}
}

// Jury's conditions for a 2-state map (Jury 1964): with p(λ) = λ² − τλ + Δ
// the eigenvalues lie in the unit disc iff 1 − τ + Δ > 0, 1 + τ + Δ > 0 and
// Δ < 1. A linear map of our own, x ↦ y, y ↦ −d·x + c·y (τ = c, Δ = d),
// compared on a grid; its Neimark–Sacker value for c = 1 is d = 1
// (complex pair on the unit circle, |τ| < 2).
func TestJuryTwoStateMap(t *testing.T) {
	m := parse(t, "map2.lya", "state x, y\nparameter c\nparameter d\nx+ = y\ny+ = -d*x + c*y\n")
	an := analyze(t, m)
	br := an.Branches[0]
	ix := func(n string) int { i, _ := m.Ring.Index(n); return i }
	vals := []string{"-3", "-2", "-1", "-1/2", "0", "1/3", "1", "3/2", "2", "5/2"}
	for _, c := range vals {
		for _, d := range vals {
			x := make([]*big.Rat, m.Ring.NumVars())
			for k := range x {
				x[k] = new(big.Rat)
			}
			x[ix("c")], x[ix("d")] = rat(c), rat(d)
			tau, del := rat(c), rat(d)
			one := big.NewRat(1, 1)
			a := new(big.Rat).Sub(one, tau)
			bb := new(big.Rat).Add(one, tau)
			want := a.Add(a, del).Sign() > 0 && bb.Add(bb, del).Sign() > 0 && del.Cmp(one) < 0
			got := true
			for _, h := range br.Stable {
				v, err := h.A.Eval(x)
				if err != nil || v.Sign() <= 0 {
					got = false
				}
			}
			if got != want {
				t.Errorf("c=%s d=%s: stable %v, Jury %v", c, d, got, want)
			}
		}
	}
	m1 := parse(t, "map1.lya", "state x, y\nparameter d\nx+ = y\ny+ = -d*x + y\n")
	an1 := analyze(t, m1)
	ns := false
	for _, bf := range an1.Bifurcations {
		if bf.Kind == "neimark-sacker" && bf.Value.Exact != nil && bf.Value.Exact.Cmp(big.NewRat(1, 1)) == 0 {
			ns = true
		}
	}
	if !ns {
		t.Errorf("bifurcations %+v, want neimark-sacker at d = 1", an1.Bifurcations)
	}
}

// Non-isolated equilibria (hand computation): x' = x·y, y' = x·y vanishes on
// both axes, two lines of equilibria.
func TestNonIsolated(t *testing.T) {
	m := parse(t, "axes.lya", "state x, y\nx' = x*y\ny' = x*y\n")
	an := analyze(t, m)
	if len(an.Branches) != 2 {
		t.Fatalf("%d branches", len(an.Branches))
	}
	for _, b := range an.Branches {
		if b.Isolated() || len(b.Free) != 1 {
			t.Errorf("branch %v free %v, want a line", b.Coords, b.Free)
		}
	}
	if an.Pieces[0].Labels[0].Kind != "non-isolated" {
		t.Errorf("label %+v", an.Pieces[0].Labels[0])
	}
}

// A cubic with a symbolic coefficient has no closed form here (hand
// computation: x' = y, y' = x³ − x − p leads to x³ − x − p = 0).
func TestNoClosedForm(t *testing.T) {
	m := parse(t, "cubic.lya", "state x, y\nparameter p\nx' = y\ny' = x^3 - x - p\n")
	an, err := Analyze(context.Background(), m, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if an.ClosedForm || an.Reason == "" || len(an.Branches) != 0 {
		t.Errorf("closed form %v (%q), %d branches", an.ClosedForm, an.Reason, len(an.Branches))
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := Analyze(ctx, readModel(t, "lorenz.lya"), Options{}); err == nil {
		t.Error("cancelled context: no error")
	}
}

// The quadratic map x ↦ x² − 1/2 (hand computation, as in its model file):
// fixed points (1 ± √3)/2, the smaller attracting, the larger repelling.
func TestQuadMapNoParams(t *testing.T) {
	m := readModel(t, "quadmap.lya")
	an := analyze(t, m)
	if len(an.Branches) != 2 || len(an.Pieces) != 1 {
		t.Fatalf("%d branches, %d pieces", len(an.Branches), len(an.Pieces))
	}
	for i, b := range an.Branches {
		x := b.Coords[0]
		// x = 1/2 ± √3/2: 4x² − 4x − 2 = 0 and the sign of B tells which.
		q := x.Mul(x).Mul(intSurd(m.Ring, 4)).Sub(x.Mul(intSurd(m.Ring, 4))).Sub(intSurd(m.Ring, 2))
		if !q.IsZero() {
			t.Errorf("branch %d: %s is not a fixed point", i, x)
		}
		bs, _ := evaluator{ring: m.Ring, pi: -1}.ratSign(x.B, ratPoint(new(big.Rat)))
		wantStable := bs < 0
		if got := an.Pieces[0].Labels[i].Stability == "stable"; got != wantStable {
			t.Errorf("branch %d (%s): stable %v", i, x, got)
		}
	}
}
