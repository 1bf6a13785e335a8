package checker_test

import (
	"testing"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
)

// boxDocument is a certificate written by hand for x' = −a·x + y,
// y' = −x − b·y, V = x² + y² (an invented scenario), a, b ∈ [1, 2] as the
// model states. −V̇ − (x² + y²) = (2a − 1)x² + (2b − 1)y², and
// 2a − 1 = 1 + 2(a − 1)² + 2(a − 1)(2 − a) (computed by hand: the last two
// terms are 2(a − 1)(a − 1 + 2 − a) = 2(a − 1)), so σ₀ = x² + 2(a·x − x)²
// + y² + 2(b·y − y)², with Gram blocks [[3, −2], [−2, 2]] = L·diag(3, 2/3)·Lᵀ,
// L₂₁ = −2/3, and σ_a = 2x², σ_b = 2y².
func boxDocument(t *testing.T, model string) *claims.Document {
	t.Helper()
	gram := [][]string{{"3", "-2", "0", "0"}, {"-2", "2", "0", "0"}, {"0", "0", "3", "-2"}, {"0", "0", "-2", "2"}}
	l := [][]string{{"1", "0", "0", "0"}, {"-2/3", "1", "0", "0"}, {"0", "0", "1", "0"}, {"0", "0", "-2/3", "1"}}
	d := &claims.Document{
		Format: claims.Format, Tool: "lyacert", Issued: "2026-12-01T00:00:00Z", Description: []string{},
		Model:      model,
		Parameters: []claims.Parameter{{Name: "a", Range: "in [1, 2]"}, {Name: "b", Range: "in [1, 2]"}},
		Claims: []claims.Claim{
			&claims.OrbitalDerivative{V: "x^2 + y^2", Vdot: "-2*a*x^2 - 2*b*y^2"},
			&claims.QuadraticPart{LDLForm: claims.LDLForm{Of: "V", Gram: [][]string{{"1", "0"}, {"0", "1"}},
				L: [][]string{{"1", "0"}, {"0", "1"}}, D: []string{"1", "1"}, Minors: []string{"1", "1"}}},
			&claims.BoxMultiplier{Margin: "x^2 + y^2", Terms: []claims.Multiplied{
				{SquareSum: claims.SquareSum{Basis: []string{"x", "a*x", "y", "b*y"}, Gram: gram, L: l, D: []string{"3", "2/3", "3", "2/3"}}},
				{Parameter: "a", SquareSum: claims.SquareSum{Basis: []string{"x"}, Gram: [][]string{{"2"}}, L: [][]string{{"1"}}, D: []string{"2"}}},
				{Parameter: "b", SquareSum: claims.SquareSum{Basis: []string{"y"}, Gram: [][]string{{"2"}}, L: [][]string{{"1"}}, D: []string{"2"}}},
			}},
			&claims.MinorCondition{Form: "V", Index: 1, Minor: "1", Constant: "1", Factors: []claims.Factor{}, Condition: "1"},
			&claims.MinorCondition{Form: "V", Index: 2, Minor: "1", Constant: "1", Factors: []claims.Factor{}, Condition: "1"},
		},
	}
	if err := certificates.Seal(d); err != nil {
		t.Fatal(err)
	}
	return d
}

// TestBoxMultiplierByHand: the hand-written identity holds on a, b ∈ [1, 2]
// and proves global asymptotic stability (Lyapunov's direct method with a
// radially unbounded quadratic V, common practice); on a box whose
// multipliers differ, a ∈ [1/2, 2], the same σ's no longer sum to −V̇
// (and V̇ = −2a·x² − 2b·y² would still be definite there: only the
// identity, not the truth, is at stake).
func TestBoxMultiplierByHand(t *testing.T) {
	const model = "state x, y\nparameter a in [1, 2]\nparameter b in [1, 2]\nx' = -a*x + y\ny' = -x - b*y\nV = x^2 + y^2\n"
	for _, c := range []struct {
		name, from, to string
		valid          bool
	}{
		{"as computed", "", "", true},
		{"other box", "a in [1, 2]", "a in [1/2, 2]", false},
	} {
		t.Run(c.name, func(t *testing.T) {
			m := model
			d := boxDocument(t, m)
			if c.from != "" {
				d.Model = replaceOnce(t, m, c.from, c.to)
				d.Parameters[0].Range = replaceOnce(t, d.Parameters[0].Range, c.from[2:], c.to[2:])
				if err := certificates.Seal(d); err != nil {
					t.Fatal(err)
				}
			}
			out := checker.Verify(d)
			if !out.Valid && !c.valid {
				last := out.Records[len(out.Records)-1]
				if last.Name != "box -Vdot" {
					t.Errorf("rejected by %s: %s, want the identity", last.Name, last.Reason)
				}
			}
			if out.Valid != c.valid {
				for _, r := range out.Records {
					if !r.OK {
						t.Logf("%s: %s", r.Name, r.Reason)
					}
				}
				t.Fatalf("valid %v, want %v", out.Valid, c.valid)
			}
			if c.valid && (out.Verdict != checker.VerdictHolds || out.Kind != checker.KindGlobal) {
				t.Errorf("verdict %s (%s), want holds (global-asymptotic)", out.Verdict, out.Kind)
			}
		})
	}
}

func replaceOnce(t *testing.T, s, old, new string) string {
	t.Helper()
	for i := 0; i+len(old) <= len(s); i++ {
		if s[i:i+len(old)] == old {
			return s[:i] + new + s[i+len(old):]
		}
	}
	t.Fatalf("%q has no %q", s, old)
	return ""
}
