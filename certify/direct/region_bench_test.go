package direct

import (
	"fmt"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// cyclicChain is an invented benchmark model: n states coupled in a ring,
// xᵢ' = −xᵢ + k·xᵢ₋₁ (x₀ = xₙ), with V = Σ xᵢ² and one free gain k. The
// Gram matrix of −V̇ is 2I − k·(the ring's adjacency), whose leading minors
// are polynomials in k of degrees 1…n with irrational roots (eigenvalues
// 2 − 2k·cos(2πj/n) of the whole ring, common practice).
func cyclicChain(n int) string {
	var b strings.Builder
	names := make([]string, n)
	sq := make([]string, n)
	for i := range names {
		names[i] = fmt.Sprintf("x%d", i+1)
		sq[i] = names[i] + "^2"
	}
	fmt.Fprintf(&b, "state %s\nparameter k\n", strings.Join(names, ", "))
	for i, s := range names {
		fmt.Fprintf(&b, "%s' = -%s + k*%s\n", s, s, names[(i+n-1)%n])
	}
	fmt.Fprintf(&b, "V = %s\n", strings.Join(sq, " + "))
	return b.String()
}

// derive is the symbolic part of Check on a quadratic model: V̇, the Gram
// matrices, their LDLᵀ, minors, and the conditions after factoring.
func derive(m *model.Model) *Result {
	res := &Result{Model: m, V: *m.V}
	res.Vdot = m.Derivative(res.V)
	n := len(m.States)
	for _, f := range []struct {
		name string
		q    poly.RatFunc
	}{{"V", m.Shift(res.V).Homogeneous(2, m.Ring.StateMask())}, {"-Vdot", m.Shift(res.Vdot).Homogeneous(2, m.Ring.StateMask()).Neg()}} {
		g := poly.GramMatrix(f.q, n)
		var l LDL
		l.Factorize(g)
		res.Forms = append(res.Forms, Form{Name: f.name, Gram: g, LDL: l, Minors: l.Minors()})
	}
	res.conditions()
	return res
}

// BenchmarkCheckCyclic times `check` of the cyclic chain with one symbolic
// gain, whole and split into its parts: the derivation (V̇, LDLᵀ, minors,
// factored conditions), the region of k (OneParamRegion), the certificate
// (document and seal) and its re-check by the kernel (checker.Verify).
func BenchmarkCheckCyclic(b *testing.B) {
	for _, n := range []int{5, 10, 20, 40} {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) { benchCyclic(b, n) })
	}
}

func benchCyclic(b *testing.B, n int) {
	{
		m, err := model.Parse("cyclic.lya", []byte(cyclicChain(n)))
		if err != nil {
			b.Fatal(err)
		}
		res, err := Check(m, "cyclic.lya")
		if err != nil {
			b.Fatal(err)
		}
		if res.Region == nil || res.Verdict != checker.VerdictOnRegion {
			b.Fatalf("n=%d: verdict %s, region %v", n, res.Verdict, res.Region)
		}
		ki, _ := m.Ring.Index("k")
		kp, _ := m.Param("k")
		var conds []poly.Univariate
		for _, c := range res.Conds {
			u, _ := c.Q.Univariate(ki)
			conds = append(conds, u)
		}
		b.Run("check", func(b *testing.B) {
			for b.Loop() {
				if _, err := Check(m, "cyclic.lya"); err != nil {
					b.Fatal(err)
				}
			}
		})
		b.Run("derivation", func(b *testing.B) {
			for b.Loop() {
				derive(m)
			}
		})
		b.Run("region", func(b *testing.B) {
			for b.Loop() {
				OneParamRegion(m.Ring, ki, conds, kp.Range)
			}
		})
		b.Run("certificate", func(b *testing.B) {
			for b.Loop() {
				if err := certificates.Seal(res.document("cyclic.lya")); err != nil {
					b.Fatal(err)
				}
			}
		})
		b.Run("recheck", func(b *testing.B) {
			for b.Loop() {
				if !checker.Verify(res.Doc).Valid {
					b.Fatal("the kernel rejects the certificate")
				}
			}
		})
	}
}

// BenchmarkDeriveCyclic times the derivation alone on the cyclic chain (V̇,
// the Gram matrices, LDLᵀ, leading minors, factored conditions), for the
// side-by-side comparison in bench/side_by_side.py.
func BenchmarkDeriveCyclic(b *testing.B) {
	for _, n := range []int{5, 10, 20, 40, 80} {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			m, err := model.Parse("cyclic.lya", []byte(cyclicChain(n)))
			if err != nil {
				b.Fatal(err)
			}
			for b.Loop() {
				derive(m)
			}
		})
	}
}
