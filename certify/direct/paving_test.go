package direct

import (
	"context"
	"encoding/json"
	"errors"
	"math"
	"math/big"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/claims"

	"gonum.org/v1/gonum/mat"

	"github.com/lyacert/lyacert/certify/pave"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
)

// Sources named in the tables:
//   - "Strogatz §9.2": S. H. Strogatz, Nonlinear Dynamics and Chaos, §9.2:
//     for the Lorenz equations with V = x²/σ + y² + z², V̇ < 0 away from the
//     origin exactly when r < 1, for every σ > 0 and b > 0.
//   - "by hand": invented models whose region is worked out in the comment.
//   - "gonum": gonum.org/v1/gonum/mat.EigenSym as an independent float
//     reference for positive definiteness.

func pavingModel(t testing.TB, file string) *model.Model {
	t.Helper()
	src, err := os.ReadFile(filepath.Join("..", "..", "testdata", "models", file))
	if err != nil {
		t.Fatal(err)
	}
	m, err := model.Parse(file, src)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

func rat(s string) *big.Rat {
	q, ok := new(big.Rat).SetString(s)
	if !ok {
		panic("bad rational " + s)
	}
	return q
}

func pavingBox(kv ...string) map[string][2]*big.Rat {
	out := map[string][2]*big.Rat{}
	for i := 0; i < len(kv); i += 3 {
		out[kv[i]] = [2]*big.Rat{rat(kv[i+1]), rat(kv[i+2])}
	}
	return out
}

func leavesOf(t *testing.T, res *Result) []certificates.PavingLeaf {
	t.Helper()
	if res.Region == nil || res.Region.Paving == nil {
		t.Fatalf("no paving (verdict %s: %s; %s)", res.Verdict, res.Reason, res.PavingNote)
	}
	ls, err := certificates.Leaves(res.Region.Paving)
	if err != nil {
		t.Fatal(err)
	}
	return ls
}

// Strogatz §9.2: the Lorenz candidate works exactly for r < 1, whatever b.
func TestPavingLorenz(t *testing.T) {
	cases := []struct {
		box     map[string][2]*big.Rat
		product [][]claims.Interval // holding intervals of r, then b
		resol   string
		verdict string
	}{
		{ // Strogatz §9.2; r = 1 lies on a grid line of this box
			box: pavingBox("r", "0", "2", "b", "0", "4"),
			product: [][]claims.Interval{
				{{Lo: "0", Hi: "1", LoClosed: true}},
				{{Lo: "0", Hi: "4", HiClosed: true}}, // b > 0 keeps the lower end open
			},
			resol: "1/64", verdict: checker.VerdictOnRegion,
		},
		{ // Strogatz §9.2; r = 1 falls inside boxes of this one
			box: pavingBox("r", "1/2", "3", "b", "1", "5/2"),
			product: [][]claims.Interval{
				{{Lo: "1/2", Hi: "1", LoClosed: true}},
				{{Lo: "1", Hi: "5/2", LoClosed: true, HiClosed: true}},
			},
			resol: "1/32", verdict: checker.VerdictOnRegion,
		},
	}
	m := pavingModel(t, "lorenz.lya")
	for _, tc := range cases {
		res, err := CheckPaving(context.Background(), m, "lorenz.lya", PaveOptions{Box: tc.box, Resolution: rat(tc.resol)})
		if err != nil {
			t.Fatal(err)
		}
		if res.Verdict != tc.verdict {
			t.Errorf("box %v: verdict %s, want %s", tc.box, res.Verdict, tc.verdict)
		}
		pv := res.Region.Paving
		if strings.Join(pv.Params, ",") != "r,b" {
			t.Fatalf("paved %v, want r, b", pv.Params)
		}
		one := big.NewRat(1, 1)
		k := 0 // r is the first paved parameter
		for _, lf := range leavesOf(t, res) {
			switch {
			case lf.Class == claims.PaveOutside && lf.Lo[k].Cmp(one) < 0:
				t.Errorf("outside box with r from %s < 1", lf.Lo[k].RatString())
			case lf.Class == claims.PaveInside && lf.Hi[k].Cmp(one) >= 0:
				t.Errorf("inside box reaching r = %s ≥ 1", lf.Hi[k].RatString())
			}
		}
		sum := summary(t, pv)
		if sum.Inside == 0 || sum.Outside == 0 {
			t.Errorf("box %v: %d inside, %d outside boxes", tc.box, sum.Inside, sum.Outside)
		}
		if len(res.Region.Paving.Product) != 2 {
			t.Fatalf("product %v", res.Region.Paving.Product)
		}
		for i, f := range res.Region.Paving.Product {
			got, _ := json.Marshal(f.Intervals)
			want, _ := json.Marshal(tc.product[i])
			if string(got) != string(want) {
				t.Errorf("box %v: factor %s holds on %s, want %s", tc.box, f.Param, got, want)
			}
		}
	}
}

// The ellipse model (by hand): −V̇ has the Gram matrix
// [[1, −a/2, −b], [−a/2, 1, 0], [−b, 0, 1]], with leading minors 1,
// 1 − a²/4 and 1 − a²/4 − b²; the region is the open ellipse a²/4 + b² < 1
// with semi-axes 2 and 1, area 2π, inside the box [−3, 3] × [−2, 2] of area
// 24: the exact inside fraction is π/12. The inside boxes lie in the
// ellipse and the outside boxes outside it, so
// inside ≤ π/12 ≤ inside + undecided, and the undecided share shrinks with
// the resolution.
func TestPavingEllipseArea(t *testing.T) {
	m := pavingModel(t, "ellipse.lya")
	exact := math.Pi / 12
	prev := 1.0
	for _, res := range []string{"1/8", "1/32", "1/128", "1/512"} {
		r, err := CheckPaving(context.Background(), m, "ellipse.lya", PaveOptions{Resolution: rat(res)})
		if err != nil {
			t.Fatal(err)
		}
		sum := summary(t, r.Region.Paving)
		in, _ := rat(sum.InsideFraction).Float64()
		und, _ := rat(sum.UndecidedFraction).Float64()
		if in > exact+1e-12 || in+und < exact-1e-12 {
			t.Errorf("resolution %s: inside %.6f, undecided %.6f do not bracket π/12 = %.6f", res, in, und, exact)
		}
		if und >= prev {
			t.Errorf("resolution %s: undecided share %.6f did not shrink (was %.6f)", res, und, prev)
		}
		prev = und
		if r.Verdict != checker.VerdictOnRegion {
			t.Errorf("resolution %s: verdict %s", res, r.Verdict)
		}
	}
	if prev > 0.01 {
		t.Errorf("undecided share %.4f at 1/512, want < 1%%", prev)
	}
}

// gonum: at random points of inside boxes the Gram matrices of V and of
// −V̇ are positive definite by mat.EigenSym; at random points of outside
// boxes one of them is not.
func TestPavingAgainstEigenSym(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	for _, file := range []string{"ellipse.lya", "crossgain.lya", "twogains.lya"} {
		m := pavingModel(t, file)
		res, err := CheckPaving(context.Background(), m, file, PaveOptions{Resolution: big.NewRat(1, 64)})
		if err != nil {
			t.Fatal(err)
		}
		pv := res.Region.Paving
		checked := map[byte]int{}
		for _, lf := range leavesOf(t, res) {
			if lf.Class == claims.PaveUndecided || rng.IntN(4) != 0 {
				continue
			}
			x := make([]*big.Rat, m.Ring.NumVars())
			for i := range x {
				x[i] = new(big.Rat)
			}
			for i, name := range pv.Params {
				j, _ := m.Ring.Index(name)
				w := new(big.Rat).Sub(lf.Hi[i], lf.Lo[i])
				s := big.NewRat(int64(rng.IntN(1001)), 1000)
				x[j] = s.Mul(s, w).Add(s, lf.Lo[i])
			}
			minEig := math.Inf(1)
			for _, f := range res.Forms {
				minEig = math.Min(minEig, smallestEigenvalue(t, f, x))
			}
			switch lf.Class {
			case claims.PaveInside:
				if !(minEig > 0) {
					t.Errorf("%s: inside at %v, but the smallest eigenvalue is %g", file, x, minEig)
				}
			case claims.PaveOutside:
				if minEig > 1e-9 {
					t.Errorf("%s: outside at %v, but both forms are positive definite (smallest eigenvalue %g)", file, x, minEig)
				}
			}
			checked[lf.Class]++
		}
		if checked[claims.PaveInside] == 0 || (checked[claims.PaveOutside] == 0 && summary(t, pv).Outside > 0) {
			t.Errorf("%s: checked %v", file, checked)
		}
	}
}

func smallestEigenvalue(t *testing.T, f Form, x []*big.Rat) float64 {
	t.Helper()
	n := len(f.Gram)
	g := mat.NewSymDense(n, nil)
	for i := range n {
		for j := i; j < n; j++ {
			v, err := f.Gram[i][j].Eval(x)
			if err != nil {
				t.Fatal(err)
			}
			fv, _ := v.Float64()
			g.SetSym(i, j, fv)
		}
	}
	var es mat.EigenSym
	if !es.Factorize(g, false) {
		t.Fatal("EigenSym failed")
	}
	return es.Values(nil)[0]
}

// The paving does not depend on the number of workers.
func TestPavingDeterministic(t *testing.T) {
	m := pavingModel(t, "crossgain.lya")
	var first []byte
	for _, w := range []int{1, 2, 5} {
		res, err := CheckPaving(context.Background(), m, "crossgain.lya", PaveOptions{Workers: w, Resolution: big.NewRat(1, 128)})
		if err != nil {
			t.Fatal(err)
		}
		b, _ := json.Marshal(res.Region)
		if first == nil {
			first = b
		} else if string(b) != string(first) {
			t.Errorf("%d workers give a different region", w)
		}
	}
}

func TestPavingErrors(t *testing.T) {
	m := pavingModel(t, "lorenz.lya")
	cancelled, cancel := context.WithCancel(context.Background())
	cancel()
	cases := []struct {
		ctx  context.Context
		opts PaveOptions
		want error
	}{
		{context.Background(), PaveOptions{Box: pavingBox("q", "0", "1")}, ErrPaveOptions},                // unknown parameter
		{context.Background(), PaveOptions{Box: pavingBox("r", "1", "1")}, ErrPaveOptions},                // a point
		{context.Background(), PaveOptions{Box: pavingBox("r", "-2", "-1")}, ErrPaveOptions},              // misses r ≥ 0
		{context.Background(), PaveOptions{Resolution: big.NewRat(0, 1)}, ErrPaveOptions},                 // not > 0
		{context.Background(), PaveOptions{Resolution: new(big.Rat).SetFrac64(1, 1<<60)}, ErrPaveOptions}, // too fine
		{cancelled, PaveOptions{Box: pavingBox("r", "0", "2", "b", "0", "4")}, context.Canceled},
		{context.Background(), PaveOptions{Box: pavingBox("r", "0", "2", "b", "0", "4"), MaxBoxes: 50}, pave.ErrTooManyBoxes},
	}
	for i, tc := range cases {
		_, err := CheckPaving(tc.ctx, m, "lorenz.lya", tc.opts)
		if !errors.Is(err, tc.want) {
			t.Errorf("case %d: err = %v, want %v", i, err, tc.want)
		}
	}
}

// A parameter with an unbounded range is not paved: the exact conditions
// and witness points remain, and the note says why.
func TestPavingUnboundedNote(t *testing.T) {
	src := "# invented\nstate x, y\nparameter a > 0\nparameter b in [0, 2]\nx' = -x + a*y\ny' = -b*x - y\nV = x^2 + y^2\n"
	m, err := model.Parse("gains.lya", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	res, err := Check(m, "gains.lya")
	if err != nil {
		t.Fatal(err)
	}
	if res.Region != nil || len(res.Witnesses) == 0 || !strings.Contains(res.PavingNote, "a has the unbounded range (0, +inf)") {
		t.Errorf("region %v, witnesses %v, note %q", res.Region, res.Witnesses, res.PavingNote)
	}
	res, err = CheckPaving(context.Background(), m, "gains.lya", PaveOptions{Box: pavingBox("a", "0", "3")})
	if err != nil {
		t.Fatal(err)
	}
	if res.Region == nil || res.Region.Paving == nil || res.Region.Paving.Box[0].LoClosed {
		t.Errorf("with a box: region %+v", res.Region)
	}
}

// Every change to a paving's tree or numbers is rejected by the checker,
// also after re-sealing: the tree's letters are not numbers, so the
// shared mutation test cannot reach them.
func TestPavingTamper(t *testing.T) {
	m := pavingModel(t, "ellipse.lya")
	res, err := CheckPaving(context.Background(), m, "ellipse.lya", PaveOptions{Resolution: big.NewRat(1, 16)})
	if err != nil {
		t.Fatal(err)
	}
	raw, err := certificates.Marshal(res.Doc)
	if err != nil {
		t.Fatal(err)
	}
	pv, _ := certificates.First[*claims.Paving](res.Doc)
	volume := summary(t, pv).Volume
	// A changed box may still be paved correctly: then the certificate is
	// valid but about another box, which its volume shows; anything else
	// must be rejected.
	reject := func(what string, change func(p *claims.Paving)) {
		t.Helper()
		doc, err := claims.Read(strings.NewReader(string(raw)))
		if err != nil {
			t.Fatal(err)
		}
		p, _ := certificates.First[*claims.Paving](doc)
		change(p)
		if err := certificates.Seal(doc); err != nil {
			t.Fatal(err)
		}
		if checker.Verify(doc).Valid {
			if s, err := certificates.Summarize(p); err == nil && s.Volume != volume && strings.HasPrefix(what, "box") {
				return
			}
			t.Errorf("%s: the changed certificate is accepted", what)
		}
	}
	for i := range len(pv.Tree) {
		for _, c := range "SIOU" {
			if byte(c) == pv.Tree[i] {
				continue
			}
			reject("tree", func(p *claims.Paving) { p.Tree = p.Tree[:i] + string(c) + p.Tree[i+1:] })
		}
	}
	reject("tree end", func(p *claims.Paving) { p.Tree += "I" })
	reject("tree cut", func(p *claims.Paving) { p.Tree = p.Tree[:len(p.Tree)-1] })
	bump := func(s string) string {
		q := rat(s)
		return q.Add(q, big.NewRat(1, 64)).RatString()
	}
	for i := range pv.Box {
		reject("box lo", func(p *claims.Paving) { p.Box[i].Lo = bump(p.Box[i].Lo) })
		reject("box hi", func(p *claims.Paving) { p.Box[i].Hi = bump(p.Box[i].Hi) })
		reject("box lo closed", func(p *claims.Paving) { p.Box[i].LoClosed = !p.Box[i].LoClosed })
		reject("box hi closed", func(p *claims.Paving) { p.Box[i].HiClosed = !p.Box[i].HiClosed })
	}
	reject("params", func(p *claims.Paving) { p.Params[0], p.Params[1] = p.Params[1], p.Params[0] })
	reject("resolution", func(p *claims.Paving) { p.Resolution = "1/8" })
	reject("resolution", func(p *claims.Paving) { p.Resolution = "1/32" })
	reject("resolution", func(p *claims.Paving) { p.Resolution = "2/32" })
}

func summary(t *testing.T, pv *claims.Paving) certificates.PavingSummary {
	t.Helper()
	s, err := certificates.Summarize(pv)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// BenchmarkPave: a two-parameter model with three conditions of degree
// ≤ 4 (crossgain.lya), resolution 1/1024, the checker's exact re-check of
// every box included (CheckPaving runs checker.Verify).
func BenchmarkPave(b *testing.B) {
	m := pavingModel(b, "crossgain.lya")
	boxes := 0
	for b.Loop() {
		res, err := CheckPaving(context.Background(), m, "crossgain.lya", PaveOptions{Resolution: big.NewRat(1, 1024)})
		if err != nil {
			b.Fatal(err)
		}
		boxes = res.Paving.Boxes
	}
	b.ReportMetric(float64(boxes), "boxes")
	b.ReportMetric(float64(boxes)*float64(b.N)/b.Elapsed().Seconds(), "boxes/s")
}
