package direct

import (
	"math/big"
	"testing"

	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
)

func checkText(t *testing.T, src string) *Result {
	t.Helper()
	m, err := model.Parse("case.lya", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	res, err := Check(m, "case.lya")
	if err != nil {
		t.Fatal(err)
	}
	return res
}

// The sum-of-squares fallback: when the canonical Gram matrix of V or −V̇
// in a monomial basis is not positive definite, an SDP finds one that is,
// and the kernel re-checks it under the monomial-gram-ldl rule.
func TestSOSGramFallback(t *testing.T) {
	cases := []struct {
		name, src string
		verdict   string
		kind      string
		methods   []string // V's, then −V̇'s
	}{
		// Strogatz, Nonlinear Dynamics and Chaos, §7.2 (Example 7.2.1):
		// x' = −x + 4y, y' = −x − y³ with V = x² + 4y² gives
		// V̇ = −2x² − 8y⁴, so the origin is globally asymptotically stable.
		// The canonical Gram matrix of −V̇ in the basis (x, y²) is
		// already diagonal: no SDP.
		{"strogatz-7.2", "state x, y\nx' = -x + 4*y\ny' = -x - y^3\nV = x^2 + 4*y^2\n",
			checker.VerdictHolds, checker.KindGlobal, []string{MethodQuadratic, MethodCanonical}},
		// Constructed (hand-checked): with V = x² + y²,
		// V̇ = 2x(−x³ + xy²) + 2y(−y³) = −(2x⁴ − 2x²y² + 2y⁴), and
		// 2x⁴ − 2x²y² + 2y⁴ = (x² − y²)² + x⁴ + y⁴ > 0 away from 0. The
		// canonical Gram matrix puts −2 on the diagonal entry of xy, so
		// only the SDP over the Gram family certifies it.
		{"constructed-sos-vdot", "state x, y\nx' = -x^3 + x*y^2\ny' = -y^3\nV = x^2 + y^2\n",
			checker.VerdictHolds, checker.KindGlobal, []string{MethodQuadratic, MethodSOS}},
		// Constructed (hand-checked): V = x⁴ − 2x²y² + 2y⁴ = (x² − y²)² + y⁴
		// and, for x' = −x³, y' = −y³, −V̇ = 4x⁶ − 4x⁴y² − 4x²y⁴ + 8y⁶,
		// which has the positive definite Gram matrix in (x³, x²y, xy², y³)
		// with G₁₁ = 4, G₂₂ = 4.4, G₃₃ = 5.6, G₄₄ = 8, G₁₃ = −4.2,
		// G₂₄ = −4.8 (2×2 minors 22.4 − 17.64 and 35.2 − 23.04). Both
		// canonical Gram matrices have a negative diagonal entry.
		{"constructed-sos-both", "state x, y\nx' = -x^3\ny' = -y^3\nV = x^4 - 2*x^2*y^2 + 2*y^4\n",
			checker.VerdictHolds, checker.KindGlobal, []string{MethodSOS, MethodSOS}},
		// Planted (hand-checked): with x' = −x³ + 3xy², V̇ = −2x⁴ + 6x²y² −
		// 2y⁴ is 2 > 0 at (1, 1): never a certificate, an exact refutation.
		{"planted-positive-vdot", "state x, y\nx' = -x^3 + 3*x*y^2\ny' = -y^3\nV = x^2 + y^2\n",
			checker.VerdictFails, checker.KindNone, nil},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			res := checkText(t, tc.src)
			if res.Verdict != tc.verdict || res.Claim != tc.kind {
				t.Fatalf("verdict %s (%s), want %s (%s); reason %q, notes %q", res.Verdict, res.Claim, tc.verdict, tc.kind, res.Reason, res.Notes)
			}
			if !res.Check.Valid || res.Check.Verdict != tc.verdict {
				t.Fatalf("kernel: valid %v verdict %s", res.Check.Valid, res.Check.Verdict)
			}
			if tc.methods != nil {
				if len(res.Methods) != len(tc.methods) {
					t.Fatalf("methods %v", res.Methods)
				}
				for i, m := range tc.methods {
					if res.Methods[i].Name != m {
						t.Errorf("form %d proven by %q, want %q", i, res.Methods[i].Name, m)
					}
					if m == MethodSOS && (res.Methods[i].Iterations == 0 || len(res.Methods[i].Blocks) == 0 || res.SDP == nil) {
						t.Errorf("SOS method without sizes: %+v", res.Methods[i])
					}
				}
			}
			if tc.verdict == checker.VerdictFails {
				if res.Refutation == nil {
					t.Fatal("no refutation")
				}
				// The refuting point is exact: re-evaluate V̇ there.
				x := make([]*big.Rat, res.Model.Ring.NumVars())
				for i, s := range res.Model.States {
					x[i], _ = new(big.Rat).SetString(res.Refutation.Point[s])
				}
				d, err := res.Vdot.Eval(x)
				if err != nil || d.Sign() <= 0 {
					t.Errorf("V̇ at %v is %v, want > 0", res.Refutation.Point, d)
				}
				for _, f := range res.Forms {
					if f.Basis != nil {
						t.Errorf("a Gram certificate of %s for a V̇ that takes positive values", f.Name)
					}
				}
			}
		})
	}
}
