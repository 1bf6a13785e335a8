package report

import (
	"fmt"
	"io"
	"math"
	"math/big"
	"strconv"
	"strings"

	"github.com/lyacert/lyacert/certify/equilibria"
	"github.com/lyacert/lyacert/certify/sossearch"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/sweep"
)

// FindVerdict is the verdict and claim of a search for equilibria as the
// text, the JSON and the exit code state it: the verdict of the model's
// own equilibrium when it is the only one certified; otherwise holds when
// every certified equilibrium holds (a global claim only when every claim
// is global), fails when one is proven unstable, else undecided.
func FindVerdict(res *equilibria.FindResult) (verdict, claim string) {
	if res.Target >= 0 && res.Certs[res.Target] != nil && countCerts(res) == 1 {
		ct := res.Certs[res.Target]
		return ct.Verdict, ct.Claim
	}
	all, fails := true, false
	claim = checker.KindGlobal
	for _, ct := range res.Certs {
		if ct == nil {
			continue
		}
		if ct.Verdict != checker.VerdictHolds {
			all = false
		}
		if ct.Verdict == checker.VerdictFails {
			fails = true
		}
		if ct.Claim != checker.KindGlobal {
			claim = checker.KindLocal
		}
	}
	switch {
	case all && countCerts(res) > 0:
		return checker.VerdictHolds, claim
	case fails:
		return checker.VerdictFails, checker.KindNone
	}
	return checker.VerdictUndecided, checker.KindNone
}

func countCerts(res *equilibria.FindResult) int {
	k := 0
	for _, ct := range res.Certs {
		if ct != nil {
			k++
		}
	}
	return k
}

// fileAt is written[i], "" when written is shorter.
func fileAt(written []string, i int) string {
	if i < len(written) {
		return written[i]
	}
	return ""
}

// qText writes the Q of the Lyapunov equation: I for nil, else diag(…).
func qText(q []*big.Rat) string {
	if q == nil {
		return "I"
	}
	parts := make([]string, len(q))
	for i, v := range q {
		parts[i] = v.RatString()
	}
	return "diag(" + strings.Join(parts, ", ") + ")"
}

// PSourceLabel names where a certificate's P came from, for text and JSON:
// the exact solution of the Lyapunov equation, or its float solution
// rounded to short rationals.
func PSourceLabel(source string) string {
	if source == equilibria.PExact {
		return "exact solution of the Lyapunov equation"
	}
	return "rounded P, short numbers"
}

// equilibriumText returns "x = 0, y = 1/2" (exact) or decimals.
func equilibriumText(m *model.Model, e *equilibria.Equilibrium) string {
	parts := make([]string, len(m.States))
	for i, s := range m.States {
		switch e.Status {
		case equilibria.EquilibriumExact:
			parts[i] = s + " = " + e.Point[i].RatString()
		case equilibria.EquilibriumEnclosed:
			parts[i] = s + " ≈ " + sweep.RatDecimal(e.Box[i].Mid(), 9)
		default:
			parts[i] = s + " ≈ " + strconv.FormatFloat(e.Approx[i], 'g', 9, 64) + " (?)"
		}
	}
	return strings.Join(parts, ", ")
}

// eigenText formats eigenvalues with 6 significant digits, conjugate pairs
// as a ± bi.
func eigenText(ev []complex128) []string {
	var out []string
	for i := 0; i < len(ev); i++ {
		l := ev[i]
		re := strconv.FormatFloat(roundSig(real(l)), 'g', 6, 64)
		if imag(l) == 0 {
			out = append(out, re)
			continue
		}
		im := strconv.FormatFloat(math.Abs(roundSig(imag(l))), 'g', 6, 64)
		if i+1 < len(ev) && ev[i+1] == complex(real(l), -imag(l)) {
			out = append(out, re+" ± "+im+"i")
			i++
			continue
		}
		sign := " + "
		if imag(l) < 0 {
			sign = " − "
		}
		out = append(out, re+sign+im+"i")
	}
	return out
}

// roundSig rounds to 6 significant digits, and −0 to 0.
func roundSig(v float64) float64 {
	r, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'g', 6, 64), 64)
	if r == 0 {
		return 0
	}
	return r
}

func paramLine(m *model.Model) string {
	var parts []string
	for _, p := range m.Params {
		parts = append(parts, p.Name+" = "+p.Fixed.RatString())
	}
	return strings.Join(parts, ", ")
}

func ratRows(a [][]*big.Rat) string {
	rows := make([]string, len(a))
	for i := range a {
		parts := make([]string, len(a[i]))
		for j, v := range a[i] {
			parts[j] = v.RatString()
		}
		rows[i] = "[" + strings.Join(parts, ", ") + "]"
	}
	return "[" + strings.Join(rows, ", ") + "]"
}

func statusText(s string) string {
	switch s {
	case equilibria.EquilibriumExact:
		return "exact (rational)"
	case equilibria.EquilibriumEnclosed:
		return "enclosed (irrational; Krawczyk box)"
	}
	return "approximate (Newton; not proven)"
}

// FindText writes a search for equilibria for a terminal: the model, the
// equilibria found with their class and (floating-point) eigenvalues, and
// for each certified one its Krawczyk box, Jacobian, Lyapunov matrix P,
// verdict and the checker's re-check. q is the Q of the Lyapunov equation
// (nil for the identity); written[i] is the file equilibrium i's
// certificate was written to, "" for none. It returns the first write
// error.
func FindText(w io.Writer, res *equilibria.FindResult, q []*big.Rat, written []string) error {
	ew := &errWriter{w: w}
	findText(ew, res, q, written)
	return ew.err
}

func findText(w io.Writer, res *equilibria.FindResult, q []*big.Rat, written []string) {
	m := res.Model
	modelHeader(w, m)
	kind := "continuous time"
	if m.Discrete {
		kind = "discrete time"
	}
	fmt.Fprintf(w, "Model %s (%s)\n", m.File, kind)
	if len(m.Params) > 0 {
		fmt.Fprintf(w, "  parameters  %s\n", paramLine(m))
	}
	equationsText(w, m)
	fmt.Fprintln(w)
	eqs := res.Search.Equilibria
	how := "the list is complete by exact elimination; completeness is not part of any certificate"
	if !res.Search.Complete {
		how = "exact elimination did not finish; Newton's method from many starting points may have missed some"
	}
	fmt.Fprintf(w, "Equilibria: %d found (%s)\n", len(eqs), how)
	if res.Search.NonIsolated {
		fmt.Fprintln(w, "  there is also a curve or surface of equilibria, not listed")
	}
	for i := range eqs {
		e := &eqs[i]
		mark := ""
		if i == res.Target {
			mark = "  (the model's)"
		}
		fmt.Fprintf(w, "  %d  %s%s\n", i+1, equilibriumText(m, e), mark)
		fmt.Fprintf(w, "     %s; %s\n", statusText(e.Status), e.Class)
		fmt.Fprintf(w, "     eigenvalues %s (floating point: the class is a guide, the certificate below decides)\n", strings.Join(eigenText(e.Eigenvalues), ", "))
	}
	for i, ct := range res.Certs {
		if ct == nil {
			continue
		}
		e := &eqs[i]
		fmt.Fprintf(w, "\nEquilibrium %d: %s\n", i+1, equilibriumText(m, e))
		if e.Status == equilibria.EquilibriumEnclosed {
			var ivs []string
			for j, iv := range e.Box {
				lo, _ := iv.Lo.Value.Float64()
				hi, _ := iv.Hi.Value.Float64()
				ivs = append(ivs, fmt.Sprintf("%s ∈ [%.12g, %.12g]", m.States[j], lo, hi))
			}
			fmt.Fprintf(w, "  Krawczyk test: K(X) ⊂ int X for the box X: %s\n", strings.Join(ivs, ", "))
			fmt.Fprintln(w, "    (ends shown as decimals; exact in the certificate), so X holds exactly one equilibrium")
		}
		if e.ExactJacobian != nil {
			fmt.Fprintf(w, "  Jacobian A = %s (exact)\n", ratRows(e.ExactJacobian))
		}
		eq := "AᵀP + PA = −Q"
		if m.Discrete {
			eq = "AᵀPA − P = −Q"
		}
		if ct.P == nil {
			if ct.ExactNote != "" {
				fmt.Fprintf(w, "  note: %s\n", ct.ExactNote)
			}
			fmt.Fprintf(w, "  Verdict: undecided. %s.\n", upper(ct.Reason))
			continue
		}
		if ct.PSource == equilibria.PExact {
			fmt.Fprintf(w, "  Lyapunov equation %s with Q = %s; P: %s (exact elimination over the rationals):\n", eq, qText(q), PSourceLabel(ct.PSource))
		} else {
			tol := "the float itself"
			if ct.Tolerance > 0 {
				tol = fmt.Sprintf("relative tolerance %g", ct.Tolerance)
			}
			fmt.Fprintf(w, "  Lyapunov equation %s with Q = %s; P: %s (the float solution rounded over one decimal denominator, %s):\n", eq, qText(q), PSourceLabel(ct.PSource), tol)
		}
		if ct.ExactNote != "" {
			fmt.Fprintf(w, "    note: %s\n", ct.ExactNote)
		}
		fmt.Fprintf(w, "    P = %s\n", ratRows(ct.P))
		decrease := "−(AᵀP + PA)"
		if m.Discrete {
			decrease = "P − AᵀPA"
		}
		if e.Status == equilibria.EquilibriumEnclosed {
			decrease += " over the whole box"
		}
		pd := "P ≻ 0"
		if ct.Verdict == checker.VerdictFails {
			pd = "P has a negative pivot"
		}
		fmt.Fprintf(w, "  exact fraction-free elimination: %s ≻ 0 and %s\n", decrease, pd)
		if ct.V != nil && ct.Verdict == checker.VerdictHolds {
			fmt.Fprintf(w, "  V = %s\n", ct.V)
		}
		if ct.Method == equilibria.MethodFull {
			fmt.Fprintf(w, "  full check of V along the model (Lyapunov's direct method): claim %s\n", ct.Claim)
		}
		switch ct.Verdict {
		case checker.VerdictHolds:
			fmt.Fprintf(w, "  Verdict: holds. %s.\n", upper(ct.Reason))
		case checker.VerdictFails:
			fmt.Fprintf(w, "  Verdict: fails. %s.\n", upper(ct.Reason))
		default:
			fmt.Fprintf(w, "  Verdict: undecided. %s.\n", upper(ct.Reason))
		}
		if ct.Doc != nil {
			fmt.Fprintf(w, "  Certificate (%s) re-checked by the exact checker: %d checks passed", ct.Method, len(ct.Verified.Records))
			if f := fileAt(written, i); f != "" {
				fmt.Fprintf(w, "; written to %s", f)
			}
			fmt.Fprintf(w, "\n    digest %s\n", ct.Doc.Digest)
		}
	}
	fmt.Fprintf(w, "\n%s\n", Caution)
}

// DegreeSearchText writes what a search for V of the given degree did: the
// sizes of its semidefinite program, and why no V was found when none was.
func DegreeSearchText(w io.Writer, degree int, res *sossearch.Result) error {
	ew := &errWriter{w: w}
	s := res.Sizes
	fmt.Fprintf(ew, "Search for V of degree %d by a semidefinite program (sums of squares)\n", degree)
	fmt.Fprintf(ew, "  V = z₁ᵀG₁z₁, basis %d; −V̇ = z₂ᵀG₂z₂, basis %d; %d equations; SDP blocks %v, %d iterations, margin %.3g; %v solving, %v rounding and exact checks\n\n",
		s.BasisV, s.BasisVdot, s.Constraints, s.Blocks, s.Iterations, s.Margin, s.Solve.Round(1e3), s.Round.Round(1e3))
	if res.Check == nil {
		fmt.Fprintln(ew, "No V found: "+res.Reason+".")
	}
	return ew.err
}
