package branches

import (
	"context"
	"encoding/json"
	"errors"
	"math"
	"math/big"
	"math/rand/v2"
	"os/exec"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/model"
)

func mapOf(t testing.TB, m *model.Model, opts Options) *Analysis {
	t.Helper()
	an, err := Analyze(context.Background(), m, opts)
	if err != nil {
		t.Fatal(err)
	}
	if an.Map == nil {
		t.Fatalf("no map: %v", an.Notes)
	}
	return an
}

func box(pairs ...string) map[string][2]*big.Rat {
	out := map[string][2]*big.Rat{}
	for i := 0; i+2 < len(pairs)+1; i += 3 {
		out[pairs[i]] = [2]*big.Rat{rat(pairs[i+1]), rat(pairs[i+2])}
	}
	return out
}

// gridIn returns k×k rational points of the closed leaf (its corners
// included).
func gridIn(mp *Map, l Leaf, k int) [][]*big.Rat {
	lo, hi := mp.Corners(l)
	var out [][]*big.Rat
	idx := make([]int, len(lo))
	for {
		p := make([]*big.Rat, len(lo))
		for d := range lo {
			w := new(big.Rat).Sub(hi[d], lo[d])
			p[d] = w.Mul(w, big.NewRat(int64(idx[d]), int64(k-1))).Add(w, lo[d])
		}
		out = append(out, p)
		d := 0
		for d < len(idx) {
			idx[d]++
			if idx[d] < k {
				break
			}
			idx[d] = 0
			d++
		}
		if d == len(idx) {
			return out
		}
	}
}

// decidedShare is the share of the box where branch i's label is decided.
func decidedShare(mp *Map, i int) float64 {
	s := new(big.Rat)
	for _, l := range mp.Leaves {
		if !l.Labels[i].Undecided {
			s.Add(s, l.Share())
		}
	}
	f, _ := s.Float64()
	return f
}

// TestMapCompanionTwoGains checks the map of a companion form with two
// gains against the Routh–Hurwitz criterion for a cubic as stated in
// control handbooks (Dorf & Bishop, Modern Control Systems, §6.2, the
// third-order case: a₃λ³ + a₂λ² + a₁λ + a₀ with a₃ > 0 is Hurwitz iff
// a₂, a₁, a₀ > 0 and a₂a₁ > a₀a₃). Here x' = y, y' = z,
// z' = −k₁x − k₂y − 2z has det(λI − J) = λ³ + 2λ² + k₂λ + k₁; by hand, the
// Routh array has first column 1, 2, (2k₂ − k₁)/2, k₁, so the origin is
// stable iff k₁ > 0 and 2k₂ > k₁ (which gives k₂ > 0), and the number of
// eigenvalues with positive real part is the number of sign changes of
// that column. Every point of a grid inside every decided leaf must agree,
// exactly.
func TestMapCompanionTwoGains(t *testing.T) {
	m := parse(t, "gains.lya", `# Companion form with two gains (an invented scenario).
state x, y, z
parameter k1 in [-1, 4]
parameter k2 in [-1, 4]
x' = y
y' = z
z' = -k1*x - k2*y - 2*z
`)
	an := mapOf(t, m, Options{})
	mp := an.Map
	if len(an.Branches) != 1 || len(mp.Params) != 2 || mp.Params[0] != "k1" || mp.Params[1] != "k2" {
		t.Fatalf("branches %d, params %v", len(an.Branches), mp.Params)
	}
	if got := decidedShare(mp, 0); got < 0.9 {
		t.Fatalf("only %.3f of the box decided", got)
	}
	stable, unstable := 0, 0
	for _, l := range mp.Leaves {
		lab := l.Labels[0]
		if lab.Undecided {
			continue
		}
		for _, p := range gridIn(mp, l, 4) {
			k1, k2 := p[0], p[1]
			col := []int{1, 1, new(big.Rat).Sub(new(big.Rat).Mul(big.NewRat(2, 1), k2), k1).Sign(), k1.Sign()}
			changes := 0
			zero := false
			for j := 1; j < len(col); j++ {
				zero = zero || col[j] == 0
				if col[j]*col[j-1] < 0 {
					changes++
				}
			}
			if zero {
				// On the boundary of a closed leaf: the open leaf's label
				// says nothing about it.
				continue
			}
			if lab.Unstable != changes {
				t.Fatalf("k1 = %s, k2 = %s: leaf says %d unstable eigenvalues (%+v), Routh's column %d", k1.RatString(), k2.RatString(), lab.Unstable, lab, changes)
			}
		}
		switch lab.Stability {
		case "stable":
			stable++
		case "unstable":
			unstable++
		}
	}
	if stable == 0 || unstable == 0 {
		t.Fatalf("stable leaves %d, unstable %d", stable, unstable)
	}
}

// TestMapLorenzHopf checks the map of the Lorenz system (Lorenz 1963) with
// σ = 10 over (r, b) against the classical results (Strogatz, Nonlinear
// Dynamics and Chaos, §9.2): the origin is stable iff r < 1; C± exist for
// r > 1 and are stable iff r < r_H = σ(σ + b + 3)/(σ − b − 1) (σ > b + 1),
// which is 470/19 for b = 8/3. Exact check at a grid inside every decided
// leaf, and the leaves at b = 8/3 place the Hopf value.
func TestMapLorenzHopf(t *testing.T) {
	m := readModel(t, "lorenz.lya")
	m, err := model.FixParams(m, []model.Setting{{Name: "sigma", Value: big.NewRat(10, 1)}})
	if err != nil {
		t.Fatal(err)
	}
	an := mapOf(t, m, Options{Box: box("r", "0", "30", "b", "1", "4")})
	mp := an.Map
	if mp.Params[0] != "r" || mp.Params[1] != "b" || len(an.Branches) != 3 {
		t.Fatalf("params %v, %d branches", mp.Params, len(an.Branches))
	}
	sigma := big.NewRat(10, 1)
	rH := func(b *big.Rat) *big.Rat {
		num := new(big.Rat).Add(sigma, b)
		num.Add(num, big.NewRat(3, 1)).Mul(num, sigma)
		den := new(big.Rat).Sub(sigma, b)
		den.Sub(den, big.NewRat(1, 1))
		return num.Quo(num, den)
	}
	if got := rH(big.NewRat(8, 3)); got.Cmp(big.NewRat(470, 19)) != 0 {
		t.Fatalf("r_H(8/3) = %s", got.RatString())
	}
	origin := originIndex(t, an)
	var below, above bool
	for _, l := range mp.Leaves {
		for i, lab := range l.Labels {
			if lab.Undecided || !lab.Exists {
				continue
			}
			for _, p := range gridIn(mp, l, 3) {
				r, b := p[0], p[1]
				var want string
				if i == origin {
					switch r.Cmp(big.NewRat(1, 1)) {
					case 0:
						continue
					case -1:
						want = "stable"
					default:
						want = "unstable"
					}
				} else {
					c := r.Cmp(rH(b))
					if c == 0 || r.Cmp(big.NewRat(1, 1)) <= 0 {
						continue
					}
					want = "stable"
					if c > 0 {
						want = "unstable"
					}
				}
				if lab.Stability != want {
					t.Fatalf("branch %d at r = %s, b = %s: %+v, want %s", i+1, r.RatString(), b.RatString(), lab, want)
				}
			}
			if i == origin {
				continue
			}
			lo, hi := mp.Corners(l)
			eight3 := big.NewRat(8, 3)
			if lo[1].Cmp(eight3) <= 0 && hi[1].Cmp(eight3) >= 0 {
				switch lab.Stability {
				case "stable":
					below = below || hi[0].Cmp(big.NewRat(24, 1)) >= 0
				case "unstable":
					above = above || lo[0].Cmp(big.NewRat(26, 1)) <= 0
				}
			}
		}
	}
	if !below || !above {
		t.Fatalf("at b = 8/3 no decided leaf near r_H = 470/19 on both sides (below %v, above %v)", below, above)
	}
	if got := decidedShare(mp, origin); got < 0.9 {
		t.Fatalf("origin: only %.3f decided", got)
	}
}

// TestMapAgainstScipy compares the labels of decided leaves with the
// eigenvalues that scipy computes (reference library: scipy.linalg.eigvals,
// Debian python3-scipy) at random parameter values inside them: the number
// of eigenvalues with positive real part (modulus above 1 for maps), the
// stability, and the type (saddle iff 0 < #unstable < n, focus iff a
// complex pair, node iff all real; common practice).
func TestMapAgainstScipy(t *testing.T) {
	py := scipyPython(t)
	lorenz := readModel(t, "lorenz.lya")
	lorenz, err := model.FixParams(lorenz, []model.Setting{{Name: "sigma", Value: big.NewRat(10, 1)}})
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name string
		m    *model.Model
		opts Options
	}{
		{"lorenz", lorenz, Options{Box: box("r", "0", "30", "b", "1/2", "4")}},
		{"oscillator", parse(t, "osc.lya", `# Damped oscillator with a cubic spring (an invented scenario).
state x, y
parameter c in [-2, 2]
parameter k in [-2, 2]
x' = y
y' = -k*x - c*y - x^3
`), Options{}},
		{"fold", parse(t, "fold.lya", `# A fold of two equilibria whose Jacobian keeps the square root
# (an invented scenario): x = (b ± √(b² + 4a))/2, trace −1 − b ∓ √(b² + 4a).
state x, y
parameter a in [-1, 2]
parameter b in [-2, 2]
x' = y - x^2 + a
y' = b*x - y
`), Options{}},
		{"map", parse(t, "map.lya", `# A two-gain linear map (an invented scenario).
state x, y
parameter a in [-2, 2]
parameter d in [-2, 2]
x+ = a*x + y/2
y+ = -x/2 + d*y
`), Options{}},
	}
	rng := rand.New(rand.NewPCG(1, 2))
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			an := mapOf(t, tc.m, tc.opts)
			mp := an.Map
			n := len(tc.m.States)
			type probe struct {
				lab Label
				J   [][]float64
				at  string
			}
			var probes []probe
			for _, l := range mp.Leaves {
				lo, hi := mp.Corners(l)
				for i, b := range an.Branches {
					lab := l.Labels[i]
					if lab.Undecided || !lab.Exists || !b.Isolated() {
						continue
					}
					at := make([]*big.Rat, tc.m.Ring.NumVars())
					for k := range at {
						at[k] = new(big.Rat)
					}
					var where []string
					for d, v := range mp.Vars {
						u := big.NewRat(int64(1+rng.IntN(999)), 1000)
						w := new(big.Rat).Sub(hi[d], lo[d])
						at[v] = w.Mul(w, u).Add(w, lo[d])
						where = append(where, mp.Params[d]+"="+at[v].RatString())
					}
					J := make([][]float64, n)
					for r := range n {
						J[r] = make([]float64, n)
						for c := range n {
							J[r][c] = surdAt(t, b.Jacobian[r][c], at)
						}
					}
					probes = append(probes, probe{lab, J, strings.Join(where, ", ")})
				}
			}
			if len(probes) < 50 {
				t.Fatalf("only %d probes", len(probes))
			}
			var mats [][][]float64
			for _, p := range probes {
				mats = append(mats, p.J)
			}
			in, _ := json.Marshal(mats)
			cmd := exec.Command(py, "-c", scipyEigs)
			cmd.Stdin = strings.NewReader(string(in))
			out, err := cmd.Output()
			if err != nil {
				t.Fatalf("python: %v", err)
			}
			var eigs [][2][]float64
			if err := json.Unmarshal(out, &eigs); err != nil {
				t.Fatal(err)
			}
			checked := 0
			for k, p := range probes {
				re, im := eigs[k][0], eigs[k][1]
				unstable, complexPair, ambiguous := 0, false, false
				for j := range re {
					v := re[j]
					if tc.m.Discrete {
						v = math.Hypot(re[j], im[j]) - 1
					}
					if math.Abs(v) < 1e-7 {
						ambiguous = true
					}
					if v > 0 {
						unstable++
					}
					if math.Abs(im[j]) > 1e-7 {
						complexPair = true
					} else if math.Abs(im[j]) > 0 {
						ambiguous = true
					}
				}
				if ambiguous {
					continue
				}
				checked++
				l := p.lab
				if l.Unstable != unstable || (l.Stability == "stable") != (unstable == 0) {
					t.Fatalf("%s: label %+v, scipy %d unstable (%v + %vi)", p.at, l, unstable, re, im)
				}
				switch l.Kind {
				case "saddle":
					if unstable == 0 || unstable == n {
						t.Fatalf("%s: saddle, scipy %d unstable", p.at, unstable)
					}
				case "focus":
					if !complexPair {
						t.Fatalf("%s: focus, scipy real eigenvalues %v", p.at, re)
					}
				case "node":
					if complexPair {
						t.Fatalf("%s: node, scipy complex eigenvalues %v + %vi", p.at, re, im)
					}
				}
			}
			if checked < 50 {
				t.Fatalf("only %d probes checked", checked)
			}
		})
	}
}

const scipyEigs = `
import json, sys
import numpy as np
from scipy.linalg import eigvals
out = []
for J in json.load(sys.stdin):
    ev = eigvals(np.array(J, dtype=float))
    out.append([[float(v.real) for v in ev], [float(v.imag) for v in ev]])
json.dump(out, sys.stdout)
`

// scipyPython returns a python3 that imports scipy, or skips the test.
func scipyPython(t *testing.T) string {
	t.Helper()
	for _, p := range []string{"/usr/bin/python3", "python3"} {
		path, err := exec.LookPath(p)
		if err != nil {
			continue
		}
		if exec.Command(path, "-c", "import scipy.linalg").Run() == nil {
			return path
		}
	}
	t.Skip("no python3 with scipy (Debian: apt-get install python3-scipy): the eigenvalue reference is skipped")
	return ""
}

// surdAt evaluates a + b·√w at a rational parameter point exactly, then
// rounds.
func surdAt(t *testing.T, x Surd, at []*big.Rat) float64 {
	t.Helper()
	a, err := x.A.Eval(at)
	if err != nil {
		t.Fatal(err)
	}
	v, _ := a.Float64()
	if x.IsRational() {
		return v
	}
	b, err1 := x.B.Eval(at)
	w, err2 := x.W.Eval(at)
	if err := errors.Join(err1, err2); err != nil {
		t.Fatal(err)
	}
	bf, _ := b.Float64()
	wf, _ := w.Float64()
	return v + bf*math.Sqrt(wf)
}

// TestMapNeedsBox: an unbounded free parameter without a box gives no map
// and a note naming it.
func TestMapNeedsBox(t *testing.T) {
	m := readModel(t, "lorenz.lya")
	m, err := model.FixParams(m, []model.Setting{{Name: "sigma", Value: big.NewRat(10, 1)}})
	if err != nil {
		t.Fatal(err)
	}
	an, err := Analyze(context.Background(), m, Options{Box: box("r", "0", "30")})
	if err != nil {
		t.Fatal(err)
	}
	if an.Map != nil || len(an.Notes) == 0 || !strings.Contains(an.Notes[len(an.Notes)-1], "--box b=") {
		t.Fatalf("map %v, notes %v", an.Map != nil, an.Notes)
	}
	if _, err := Analyze(context.Background(), m, Options{Box: box("r", "3", "2", "b", "1", "2")}); err == nil {
		t.Fatal("an empty box was accepted")
	}
	if _, err := Analyze(context.Background(), m, Options{Box: box("q", "0", "1", "b", "1", "2")}); err == nil {
		t.Fatal("a box of an unknown parameter was accepted")
	}
}

// TestMapCentreCandidate: x' = ay, y' = −bx has trace 0 and determinant ab
// (hand computation): a centre candidate where ab > 0 and a saddle where
// ab < 0 (trace–determinant classification, common practice). With
// a ∈ [1, 2], b ∈ [−1, 2], every decided leaf must say so at its centre,
// and the undecided ones must touch b = 0.
func TestMapCentreCandidate(t *testing.T) {
	m := parse(t, "cc.lya", "# A lossless oscillator with two gains (an invented scenario).\nstate x, y\nparameter a in [1, 2]\nparameter b in [-1, 2]\nx' = a*y\ny' = -b*x\n")
	an := mapOf(t, m, Options{})
	for _, l := range an.Map.Leaves {
		lo, hi := an.Map.Corners(l)
		lab := l.Labels[0]
		switch {
		case lab.Undecided:
			if lo[1].Sign() > 0 || hi[1].Sign() < 0 {
				t.Fatalf("undecided away from b = 0: b ∈ [%s, %s]", lo[1].RatString(), hi[1].RatString())
			}
		case lo[1].Sign() > 0:
			if lab.Kind != "centre candidate" {
				t.Fatalf("b ∈ [%s, %s]: %+v", lo[1].RatString(), hi[1].RatString(), lab)
			}
		case hi[1].Sign() < 0:
			if lab.Kind != "saddle" || lab.Unstable != 1 {
				t.Fatalf("b ∈ [%s, %s]: %+v", lo[1].RatString(), hi[1].RatString(), lab)
			}
		default:
			t.Fatalf("leaf across b = 0 decided: %+v", lab)
		}
	}
}
