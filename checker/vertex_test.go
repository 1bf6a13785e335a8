package checker

import (
	"math/big"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// vertexDecay computes the decay matrices the claim restates, by the same
// formulas (nil where they do not apply: the kernel refuses those models
// before it compares).
func vertexDecay(m *model.Model, p [][]string) [][][]string {
	n := len(m.States)
	pr := make([][]*big.Rat, n)
	for i := range n {
		if len(p) != n || len(p[i]) != n {
			return nil
		}
		for _, s := range p[i] {
			q, _ := new(big.Rat).SetString(s)
			pr[i] = append(pr[i], q)
		}
	}
	var out [][][]string
	free := m.FreeParams()
	for v := range 1 << len(free) {
		x := make([]*big.Rat, m.Ring.NumVars())
		for i := range x {
			x[i] = new(big.Rat)
		}
		for j, fp := range free {
			end := fp.Range.Lo.Value
			if v>>j&1 == 1 {
				end = fp.Range.Hi.Value
			}
			if end == nil {
				return nil
			}
			k, _ := m.Ring.Index(fp.Name)
			x[k] = end
		}
		a := make([][]*big.Rat, n)
		for i, f := range m.F {
			for k := range n {
				a[i] = append(a[i], new(poly.Poly).Derivative(f.Num, k).Eval(x))
			}
		}
		var mv [][]string
		for _, row := range poly.DecayAt(a, false, pr) {
			var cells []string
			for _, q := range row {
				cells = append(cells, poly.RatString(q))
			}
			mv = append(mv, cells)
		}
		out = append(out, mv)
	}
	return out
}

// vertexDoc is a sealed certificate of the model text with one
// vertex-lyapunov claim (and any further claims).
func vertexDoc(t *testing.T, text string, p [][]string, more ...claims.Claim) *claims.Document {
	t.Helper()
	m, err := model.Parse("test.lya", []byte(text))
	if err != nil {
		t.Fatal(err)
	}
	d := &claims.Document{Format: claims.Format, Model: text, Parameters: []claims.Parameter{}, Claims: append([]claims.Claim{&claims.VertexLyapunov{P: p, Decay: vertexDecay(m, p)}}, more...)}
	for _, q := range m.Params {
		d.Parameters = append(d.Parameters, claims.Parameter{Name: q.Name, Range: model.RangeText(q)})
	}
	if d.Digest, err = d.ComputeDigest(); err != nil {
		t.Fatal(err)
	}
	return d
}

// TestVertexLyapunov: x' = y, y' = −k·x − c·y with P = [[2, 1/2], [1/2, 1]].
// By hand, −(AᵀP + PA) = [[k, k + c/2 − 2], [k + c/2 − 2, 2c − 1]]; its
// leading minors (Sylvester's criterion) at the vertices (k, c) of [1, 2]²
// are 1, 3/4 at (1, 1); 2, 7/4 at (2, 1); 1, 3 at (1, 2); 2, 5 at (2, 2), all
// positive, and at the vertex (4, 1) of k ∈ [1, 4] they are 4, 4 − 25/4 < 0.
// Every second-order vertex with c < 0 is unstable (Routh–Hurwitz for
// s² + c·s + k; common practice), so no P can pass there. The rule applies
// to continuous time, closed bounded ranges, parameter-free equilibria and
// affine linearizations only.
func TestVertexLyapunov(t *testing.T) {
	const osc = "state x, y\nparameter k in [1, 2]\nparameter c in [1, 2]\nx' = y\ny' = -k*x - c*y\n"
	hand := [][]string{{"2", "1/2"}, {"1/2", "1"}}
	tests := []struct {
		name, text string
		p          [][]string
		kind       string // "" when the certificate must be rejected
		record     string // the failing check's reason contains this
	}{
		{"box [1, 2]², linear: global", osc, hand, KindGlobal, ""},
		{"box [1, 2]², cubic term: local", strings.Replace(osc, "- c*y", "- c*y - x^2*y", 1), hand, KindLocal, ""},
		{"a fixed parameter beside a free one", strings.Replace(osc, "parameter c in [1, 2]", "parameter c = 3/2", 1), hand, KindGlobal, ""},
		{"vertex (4, 1) fails", strings.Replace(osc, "[1, 2]", "[1, 4]", 1), hand, "", "at vertex"},
		{"an unstable vertex", strings.Replace(osc, "c in [1, 2]", "c in [-1, 2]", 1), hand, "", "at vertex"},
		{"P indefinite", osc, [][]string{{"1", "2"}, {"2", "1"}}, "", "P is positive definite"},
		{"P asymmetric", osc, [][]string{{"2", "1/2"}, {"1/3", "1"}}, "", "(symmetric if P)"},
		{"P not canonical", osc, [][]string{{"2", "2/4"}, {"1/2", "1"}}, "", "canonical"},
		{"P of the wrong size", osc, [][]string{{"2"}}, "", "2×2"},
		{"decay matrices forged", osc, nil, "", "equals the recomputed"},
		{"square of a parameter", strings.Replace(osc, "-k*x", "-k^2*x", 1), hand, "", "affine in the parameters"},
		{"product of parameters", strings.Replace(osc, "-k*x", "-k*c*x", 1), hand, "", "affine in the parameters"},
		{"unbounded range", strings.Replace(osc, "k in [1, 2]", "k >= 1", 1), hand, "", "closed bounded"},
		{"half-open range", strings.Replace(osc, "k in [1, 2]", "k in (1, 2]", 1), hand, "", "closed bounded"},
		{"map", "state x\nparameter k in [0, 1/2]\nx+ = k*x\n", [][]string{{"1"}}, "", "continuous time"},
		{"no free parameter", "state x\nx' = -x\n", [][]string{{"1"}}, "", "free parameters"},
		{"candidate V stated", osc + "V = x^2 + y^2\n", hand, "", "no candidate"},
		{"equilibrium moving with k", "state x\nparameter k in [1, 2]\nx' = -x + k\nat x = k\n", [][]string{{"1"}}, "", "free of the parameters"},
		{"not an equilibrium", "state x\nparameter k in [1, 2]\nx' = -x + k\n", [][]string{{"1"}}, "", "f(x*) = 0"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			d := vertexDoc(t, tt.text, tt.p)
			if tt.p == nil { // a valid P with a forged M at the last vertex
				vl := d.Claims[0].(*claims.VertexLyapunov)
				vl.P = hand
				m, _ := model.Parse("test.lya", []byte(tt.text))
				vl.Decay = vertexDecay(m, hand)
				vl.Decay[3][0][0] = "7"
				d.Digest, _ = d.ComputeDigest()
			}
			out := Verify(d)
			if tt.kind != "" {
				if !out.Valid || out.Verdict != VerdictHolds || out.Kind != tt.kind {
					t.Fatalf("valid %v, %s (%s), want holds (%s): %v", out.Valid, out.Verdict, out.Kind, tt.kind, out.Records)
				}
				return
			}
			if out.Valid {
				t.Fatalf("accepted: %s (%s)", out.Verdict, out.Kind)
			}
			last := out.Records[len(out.Records)-1]
			if last.OK || !strings.Contains(last.Reason, tt.record) {
				t.Fatalf("last check %+v, want a failure about %q", last, tt.record)
			}
		})
	}
	// The claim is stated once, and claims nothing beside itself.
	if out := Verify(vertexDoc(t, osc, hand, &claims.VertexLyapunov{P: hand})); out.Valid {
		t.Errorf("two vertex claims accepted")
	}
}
