package report_test

import (
	"bytes"
	"fmt"
	"log"
	"strings"

	"github.com/lyacert/lyacert/certify/direct"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/report"
)

// gain is an invented scenario: two coupled first-order lags whose second
// state decays at a rate a. With V = x² + y², V̇ = −2x² + 2xy − 2a·y²,
// negative definite exactly when 4a − 1 > 0 (Sylvester's criterion on
// the 2×2 Gram matrix [[2, −1], [−1, 2a]] of −V̇, common practice); at
// a = 1/4, V̇ = −2(x − y/2)² and the invariance principle applies (on
// x ≡ y/2, x' = −x + y = y/2 must equal (y/2)' = −y/8, so y = 0).
const gain = `# An invented pair of coupled lags.
state x, y
parameter a in (0, 1)
x' = -x + y
y' = -a*y
V = x^2 + y^2
`

// The library path from a model file to a report: parse the model, let
// the direct method propose and self-check a certificate, re-check it with
// the exact kernel, and write a report of the certificate alone.
func ExampleRender() {
	m, err := model.Parse("gain.lya", []byte(gain))
	if err != nil {
		log.Fatal(err)
	}
	res, err := direct.Check(m, "gain.lya")
	if err != nil {
		log.Fatal(err)
	}
	out := checker.Verify(res.Doc) // the verdict is derived, never read
	fmt.Println("valid:", out.Valid)
	fmt.Println("verdict:", out.Verdict)

	var md bytes.Buffer
	if err := report.Render(&md, res.Doc, report.Options{Format: report.Markdown, Checker: "lyacert", CertName: "gain.json"}); err != nil {
		log.Fatal(err)
	}
	for _, line := range strings.Split(md.String(), "\n") {
		if strings.HasPrefix(line, "# ") || strings.HasPrefix(line, "**Verdict") {
			fmt.Println(line)
		}
	}
	// Output:
	// valid: true
	// verdict: holds-on-region
	// # Lyapunov certificate: gain.lya
	// **Verdict: holds on part of the range.** Holds on part of the range: the equilibrium is globally asymptotically stable for $a \in [\frac{1}{4}, 1)$; the candidate is refuted everywhere else.
}

// The terminal text of a check; here only its conditions and verdict
// (the rest names the model, the squares and the certificate's digest).
func ExampleCheckText() {
	m, err := model.Parse("gain.lya", []byte(gain))
	if err != nil {
		log.Fatal(err)
	}
	res, err := direct.Check(m, "gain.lya")
	if err != nil {
		log.Fatal(err)
	}
	var text bytes.Buffer
	if err := report.CheckText(&text, res, ""); err != nil {
		log.Fatal(err)
	}
	show := false
	for _, line := range strings.Split(text.String(), "\n") {
		show = show || strings.HasPrefix(line, "Conditions")
		if strings.HasPrefix(line, "Certificate") {
			break
		}
		if show {
			fmt.Println(line)
		}
	}
	// Output:
	// Conditions
	//   −V̇ Δ2 > 0 requires a > 1/4
	//
	// Region of a (exact)
	//   fails     a ∈ (0, 1/4)
	//   holds     a ∈ {1/4}
	//   holds     a ∈ (1/4, 1)
	//
	// Verdict: holds on part of the range: the equilibrium is globally asymptotically stable for a in [1/4, 1), and the candidate is refuted everywhere else.
	// Refutation (exact) with a = 1/8: at x = 1/2, y = 1, V = 5/4 and V̇ = 1/4.
	// Note: at a = 1/4, where the quadratic test is inconclusive, the model with a fixed proves the claim (global-asymptotic, by the invariance principle); its certificate is part of this one.
	// Method: V: quadratic part, exact LDLᵀ, basis 2; −V̇: quadratic part, exact LDLᵀ, basis 2.
}

// The --json shape of a check is a plain value: encode it as you like.
func ExampleCheckJSON() {
	m, err := model.Parse("gain.lya", []byte(gain))
	if err != nil {
		log.Fatal(err)
	}
	res, err := direct.Check(m, "gain.lya")
	if err != nil {
		log.Fatal(err)
	}
	out := report.CheckJSON(res, "")
	fmt.Println(out.Verdict, out.Claim)
	fmt.Println(out.Conditions)
	fmt.Println(out.Minors)
	// Output:
	// holds-on-region global-asymptotic
	// [a > 1/4]
	// [1 1 2 4*a - 1]
}
