package main

import (
	"errors"
	"fmt"
	"io"
	"lyacert/certificates"
	"lyacert/certify/equilibria"
	"lyacert/sweep"
	"math"
	"math/big"
	"path/filepath"
	"strconv"
	"strings"

	"lyacert/certify"
	"lyacert/checker"
	"lyacert/model"
)

type findCmd struct {
	common
	File string   `arg:"" help:"Model file (.lya), or - for standard input."`
	Set  []string `name:"set" placeholder:"NAME=VALUE" help:"Fix a parameter to an exact value (repeatable); find needs every parameter fixed."`
	Q    string   `name:"q" placeholder:"DIAG" default:"identity" help:"Q of AᵀP + PA = −Q (AᵀPA − P = −Q in discrete time): identity, one positive number (a multiple of I), or one per state, comma-separated (a diagonal)."`
	All  bool     `help:"Certify every equilibrium found, not only the model's own (its at point, or the origin)."`
	Out  string   `short:"o" name:"out" placeholder:"CERT" help:"Write the certificate to this file (atomically); with --all one file per certified equilibrium, CERT with -1, -2, … before its extension."`
}

func init() {
	register("find", "Find the equilibria, classify them and certify one (or --all) from the linearization.", func() any { return &findCmd{} })
}

// Run finds and certifies equilibria.
func (c *findCmd) Run(e *env) error { return exit(c.run(e)) }

func parseSettings(set []string) ([]model.Setting, error) {
	var out []model.Setting
	for _, s := range set {
		st, err := model.ParseSetting(s)
		if err != nil {
			return nil, err
		}
		out = append(out, st)
	}
	return out, nil
}

// parseQ reads --q: "identity" (nil), one positive number, or n of them.
func parseQ(s string, n int) ([]*big.Rat, error) {
	s = strings.TrimSpace(s)
	if s == "" || s == "identity" || s == "I" {
		return nil, nil
	}
	parts := strings.Split(s, ",")
	if len(parts) != 1 && len(parts) != n {
		return nil, fmt.Errorf("--q %q: give one number or one per state (%d)", s, n)
	}
	var q []*big.Rat
	for _, p := range parts {
		st, err := model.ParseSetting("q=" + p)
		if err != nil {
			return nil, fmt.Errorf("--q: %w", err)
		}
		if st.Value.Sign() <= 0 {
			return nil, fmt.Errorf("--q: %s is not positive; Q must be positive definite", st.Value.RatString())
		}
		q = append(q, st.Value)
	}
	for len(q) < n {
		q = append(q, q[0])
	}
	return q, nil
}

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

func (c *findCmd) run(e *env) int {
	name, src, err := readInput(c.File, e.stdin)
	if err != nil {
		fmt.Fprintln(e.stderr, "lyacert:", err)
		return exitInput
	}
	settings, err := parseSettings(c.Set)
	if err != nil {
		fmt.Fprintln(e.stderr, "lyacert:", err)
		return exitInput
	}
	m, err := model.Parse(name, src, settings...)
	if err != nil {
		printInputError(e.stderr, err)
		return exitInput
	}
	q, err := parseQ(c.Q, len(m.States))
	if err != nil {
		fmt.Fprintln(e.stderr, "lyacert:", err)
		return exitInput
	}
	res, err := equilibria.Find(m, equilibria.FindOptions{Q: q, All: c.All, Source: name})
	if err != nil {
		if errors.Is(err, certify.ErrUnverified) {
			fmt.Fprintln(e.stderr, "lyacert:", err)
			return exitFails
		}
		printInputError(e.stderr, err)
		return exitInput
	}
	written := make([]string, len(res.Certs))
	if c.Out != "" {
		k := 0
		for i, ct := range res.Certs {
			if ct == nil || ct.Doc == nil {
				continue
			}
			k++
			path := c.Out
			if c.All {
				ext := filepath.Ext(path)
				path = strings.TrimSuffix(path, ext) + "-" + strconv.Itoa(k) + ext
			}
			if err := certificates.WriteFile(ct.Doc, path); err != nil {
				fmt.Fprintln(e.stderr, "lyacert: writing the certificate:", err)
				return exitInput
			}
			written[i] = path
		}
	}
	verdict, claim := findVerdict(res)
	if c.JSON {
		writeJSON(e.stdout, findJSON(res, q, written, verdict, claim))
	} else {
		renderFind(e.stdout, res, q, written, verdict)
	}
	if verdict == checker.VerdictHolds {
		return exitHolds
	}
	return exitFails
}

// findVerdict is the target's verdict, or with --all: holds when every
// equilibrium holds, fails when one is proven unstable, else undecided.
func findVerdict(res *equilibria.FindResult) (string, string) {
	if res.Target >= 0 && res.Certs[res.Target] != nil && countCerts(res) == 1 {
		ct := res.Certs[res.Target]
		return ct.Verdict, ct.Claim
	}
	all, fails := true, false
	claim := checker.KindGlobal
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

func renderFind(w io.Writer, res *equilibria.FindResult, q []*big.Rat, written []string, verdict string) {
	m := res.Model
	for _, d := range m.Description {
		if d != "" {
			fmt.Fprintf(w, "# %s\n", d)
		}
	}
	if len(m.Description) > 0 {
		fmt.Fprintln(w)
	}
	kind := "continuous time"
	if m.Discrete {
		kind = "discrete time"
	}
	fmt.Fprintf(w, "Model %s (%s)\n", m.File, kind)
	if len(m.Params) > 0 {
		fmt.Fprintf(w, "  parameters  %s\n", paramLine(m))
	}
	for i, s := range m.States {
		if m.Discrete {
			fmt.Fprintf(w, "  %s+ = %s\n", s, m.F[i])
		} else {
			fmt.Fprintf(w, "  %s' = %s\n", s, m.F[i])
		}
	}
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
			fmt.Fprintf(w, "  Verdict: undecided. %s.\n", upper(ct.Reason))
			continue
		}
		tol := "the float itself"
		if ct.Tolerance > 0 {
			tol = fmt.Sprintf("relative tolerance %g", ct.Tolerance)
		}
		fmt.Fprintf(w, "  Lyapunov equation %s with Q = %s, solved in floating point and rounded to rationals (continued fractions, %s):\n", eq, qText(q), tol)
		fmt.Fprintf(w, "    P = %s\n", ratRows(ct.P))
		name := "−(AᵀP + PA)"
		if m.Discrete {
			name = "P − AᵀPA"
		}
		if e.Status == equilibria.EquilibriumEnclosed {
			name += " over the whole box"
		}
		pd := "P ≻ 0"
		if ct.Verdict == checker.VerdictFails {
			pd = "P has a negative pivot"
		}
		fmt.Fprintf(w, "  exact LDLᵀ: %s ≻ 0 and %s\n", name, pd)
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
			if written[i] != "" {
				fmt.Fprintf(w, "; written to %s", written[i])
			}
			fmt.Fprintf(w, "\n    digest %s\n", ct.Doc.Digest)
		}
	}
	fmt.Fprintf(w, "\n%s\n", caution)
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

type findOutput struct {
	Time        string              `json:"time"`
	Params      map[string]string   `json:"params"`
	Complete    bool                `json:"complete"`
	NonIsolated bool                `json:"non_isolated"`
	Equilibria  []equilibriumOutput `json:"equilibria"`
	Target      *int                `json:"target"` // 1-based; null when the origin is not an equilibrium
	V           string              `json:"V,omitempty"`
	Verdict     string              `json:"verdict"`
	Claim       string              `json:"claim"`
	Reason      string              `json:"reason,omitempty"`
	Digest      string              `json:"digest,omitempty"`
	Certificate string              `json:"certificate,omitempty"`
}

type equilibriumOutput struct {
	Index         int                   `json:"index"`
	Point         sweep.OrderedStrings  `json:"point"` // decimals
	Exact         *sweep.OrderedStrings `json:"exact,omitempty"`
	Box           [][2]string           `json:"box,omitempty"`
	Status        string                `json:"status"`
	Class         string                `json:"class"`
	Eigenvalues   []string              `json:"eigenvalues"`
	MaxRealEig    float64               `json:"max_real_eig"`
	Certification *certOutput           `json:"certification,omitempty"`
}

type certOutput struct {
	Method      string     `json:"method"`
	V           string     `json:"V,omitempty"`
	P           [][]string `json:"P,omitempty"`
	Verdict     string     `json:"verdict"`
	Claim       string     `json:"claim"`
	Reason      string     `json:"reason"`
	Digest      string     `json:"digest,omitempty"`
	Checks      int        `json:"checks_passed,omitempty"`
	Certificate string     `json:"certificate,omitempty"`
}

func findJSON(res *equilibria.FindResult, q []*big.Rat, written []string, verdict, claim string) findOutput {
	m := res.Model
	out := findOutput{Time: "continuous", Params: map[string]string{}, Complete: res.Search.Complete,
		NonIsolated: res.Search.NonIsolated, Equilibria: []equilibriumOutput{}, Verdict: verdict, Claim: claim}
	if m.Discrete {
		out.Time = "discrete"
	}
	for _, p := range m.Params {
		out.Params[p.Name] = p.Fixed.RatString()
	}
	for i := range res.Search.Equilibria {
		e := &res.Search.Equilibria[i]
		eo := equilibriumOutput{Index: i + 1, Status: e.Status, Class: e.Class, Eigenvalues: eigenText(e.Eigenvalues),
			MaxRealEig: roundSig(equilibria.MaxRealPart(e.Eigenvalues))}
		eo.Point.Keys = m.States
		for j := range m.States {
			switch e.Status {
			case equilibria.EquilibriumExact:
				eo.Point.Values = append(eo.Point.Values, sweep.RatDecimal(e.Point[j], sweep.EquilibriumDigits))
			case equilibria.EquilibriumEnclosed:
				eo.Point.Values = append(eo.Point.Values, sweep.RatDecimal(e.Box[j].Mid(), 9))
			default:
				eo.Point.Values = append(eo.Point.Values, strconv.FormatFloat(e.Approx[j], 'g', 9, 64))
			}
		}
		if e.Status == equilibria.EquilibriumExact {
			ex := &sweep.OrderedStrings{Keys: m.States}
			for _, v := range e.Point {
				ex.Values = append(ex.Values, v.RatString())
			}
			eo.Exact = ex
		}
		for _, iv := range e.Box {
			eo.Box = append(eo.Box, checker.IntervalText(iv))
		}
		if ct := res.Certs[i]; ct != nil {
			co := &certOutput{Method: ct.Method, Verdict: ct.Verdict, Claim: ct.Claim, Reason: ct.Reason, Certificate: written[i]}
			if ct.V != nil {
				co.V = ct.V.String()
			}
			for _, row := range ct.P {
				var r []string
				for _, v := range row {
					r = append(r, v.RatString())
				}
				co.P = append(co.P, r)
			}
			if ct.Doc != nil {
				co.Digest = ct.Doc.Digest
				co.Checks = len(ct.Verified.Records)
			}
			eo.Certification = co
		}
		out.Equilibria = append(out.Equilibria, eo)
	}
	if res.Target >= 0 {
		t := res.Target + 1
		out.Target = &t
		if ct := res.Certs[res.Target]; ct != nil && countCerts(res) == 1 {
			if ct.V != nil {
				out.V = ct.V.String()
			}
			out.Reason = ct.Reason
			if ct.Doc != nil {
				out.Digest = ct.Doc.Digest
			}
			out.Certificate = written[res.Target]
		}
	}
	return out
}
