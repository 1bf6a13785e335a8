package report_test

import (
	"bytes"
	"crypto/ed25519"
	"errors"
	"flag"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/certify/direct"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/report"
)

var update = flag.Bool("update", false, "rewrite the golden files and the certificates generated for these tests")

// checker is the checker name written into golden reports, fixed so that a
// version change does not touch them.
const checkerName = "lyacert (golden)"

// escapeSource is the certificate's source field in the escaping test: it is
// free text in a certificate, unlike a variable name.
const escapeSource = `"><script>document.body.setAttribute('data-injected','3')</script>.lya`

// signingKey is a fixed test key (ed25519 signatures are deterministic).
func signingKey() ed25519.PrivateKey {
	seed := make([]byte, ed25519.SeedSize)
	for i := range seed {
		seed[i] = byte(i + 1)
	}
	return ed25519.NewKeyFromSeed(seed)
}

// generated are the certificates this package's tests make for themselves
// (with -update): the escaping model, the wide model, and the demo
// certificate signed.
func generate(t *testing.T) {
	t.Helper()
	issue := func(file, source string) *claims.Document {
		src, err := os.ReadFile(file)
		if err != nil {
			t.Fatal(err)
		}
		m, err := model.Parse(filepath.Base(file), src)
		if err != nil {
			t.Fatal(err)
		}
		res, err := direct.Check(m, source)
		if err != nil {
			t.Fatal(err)
		}
		d := res.Doc
		d.Issued = "2026-12-01T00:00:00Z"
		if err := certificates.Seal(d); err != nil {
			t.Fatal(err)
		}
		return d
	}
	esc := issue("testdata/models/escape.lya", escapeSource)
	if err := certificates.WriteFile(esc, "testdata/certificates/escape.json"); err != nil {
		t.Fatal(err)
	}
	// A certificate too wide for a page unless the reports break its
	// sums, matrices and numbers (TestGoldenLaTeXFits).
	wide := issue("testdata/models/wide.lya", "wide.lya")
	if err := certificates.WriteFile(wide, "testdata/certificates/wide.json"); err != nil {
		t.Fatal(err)
	}
	signed, err := certificates.ReadFile("../testdata/certificates/coolant.json")
	if err != nil {
		t.Fatal(err)
	}
	if err := certificates.Sign(signed, signingKey()); err != nil {
		t.Fatal(err)
	}
	if err := certificates.WriteFile(signed, "testdata/certificates/signed-coolant.json"); err != nil {
		t.Fatal(err)
	}
}

type certFile struct {
	name string // base name without .json
	doc  *claims.Document
}

// certs returns every certificate of the shared test data and of this
// package's own.
func certs(t *testing.T) []certFile {
	t.Helper()
	var out []certFile
	for _, pattern := range []string{"../testdata/certificates/*.json", "testdata/certificates/*.json"} {
		files, err := filepath.Glob(pattern)
		if err != nil {
			t.Fatal(err)
		}
		for _, f := range files {
			d, err := certificates.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			out = append(out, certFile{strings.TrimSuffix(filepath.Base(f), ".json"), d})
		}
	}
	if len(out) == 0 {
		t.Fatal("no certificates to report on")
	}
	return out
}

func render(t *testing.T, c certFile, f report.Format, standalone bool) []byte {
	t.Helper()
	var buf bytes.Buffer
	err := report.Render(&buf, c.doc, report.Options{Format: f, WholeDocument: standalone, Checker: checkerName, CertName: c.name + ".json"})
	if err != nil {
		t.Fatalf("%s (%s): %v", c.name, f, err)
	}
	return buf.Bytes()
}

func TestMain(m *testing.M) {
	flag.Parse()
	os.Exit(m.Run())
}

// TestGolden compares the Markdown and LaTeX reports of every test
// certificate with the files under testdata/golden; go test ./report
// -update rewrites them (and the certificates this package generates).
func TestGolden(t *testing.T) {
	if *update {
		generate(t)
	}
	for _, c := range certs(t) {
		for _, f := range []report.Format{report.Markdown, report.LaTeX} {
			t.Run(c.name+"."+string(f), func(t *testing.T) {
				got := render(t, c, f, false)
				path := filepath.Join("testdata/golden", c.name+"."+string(f))
				if *update {
					if err := os.WriteFile(path, got, 0o644); err != nil {
						t.Fatal(err)
					}
					return
				}
				want, err := os.ReadFile(path)
				if err != nil {
					t.Fatalf("%v (run go test ./report -update to create it)", err)
				}
				if !bytes.Equal(got, want) {
					t.Errorf("%s differs from the golden file; run go test ./report -update and review the diff\n%s", path, firstDiff(got, want))
				}
			})
		}
	}
}

func firstDiff(got, want []byte) string {
	g, w := strings.Split(string(got), "\n"), strings.Split(string(want), "\n")
	for i := 0; i < len(g) || i < len(w); i++ {
		var a, b string
		if i < len(g) {
			a = g[i]
		}
		if i < len(w) {
			b = w[i]
		}
		if a != b {
			return "line " + strconv.Itoa(i+1) + ":\n got  " + a + "\n want " + b
		}
	}
	return ""
}

// TestEverySection checks that each report says what the specification
// asks of it, in every format: the verdict, the model, V and its
// derivative, the verification record with every check, how to re-check,
// and the cautions.
func TestEverySection(t *testing.T) {
	for _, c := range certs(t) {
		res := checker.Verify(c.doc)
		cs := certificates.ContentsOf(c.doc)
		for _, f := range report.Formats {
			out := string(render(t, c, f, f == report.LaTeX))
			out = strings.ReplaceAll(out, `\allowbreak{}`, "")
			for _, want := range []string{
				"Verdict:", "Model and assumptions", "Equilibrium", "Verification record", "How to re-check",
				"lyacert verify " + c.name + ".json", "Cautions", "licensed engineering judgement",
				"not a statement about the physical system", "saturation, delay and sampling", c.doc.Digest, checkerName,
			} {
				if !strings.Contains(out, want) {
					t.Errorf("%s (%s): missing %q", c.name, f, want)
				}
			}
			if n := strings.Count(out, "ok"); n < len(res.Records) {
				t.Errorf("%s (%s): %d checks listed as ok, want %d", c.name, f, n, len(res.Records))
			}
			hasRegion := cs.Region != nil && cs.Region.Param != ""
			if got := strings.Contains(out, "Parameter region"); got != hasRegion {
				t.Errorf("%s (%s): region section present %v, want %v", c.name, f, got, hasRegion)
			}
			if got := strings.Contains(out, "Refutation"); got != (cs.Refutation != nil) {
				t.Errorf("%s (%s): refutation section present %v", c.name, f, got)
			}
			if got := strings.Contains(out, "Completed squares"); got != (len(cs.Forms) > 0) {
				t.Errorf("%s (%s): squares section present %v", c.name, f, got)
			}
			if c.doc.Signature != nil && !strings.Contains(out, "fingerprint") {
				t.Errorf("%s (%s): the signer is not named", c.name, f)
			}
			if f == report.HTML {
				if hasRegion && !strings.Contains(out, "<svg") {
					t.Errorf("%s: no inline plot", c.name)
				}
				if strings.Contains(out, "<script") || strings.Contains(out, "src=\"http") {
					t.Errorf("%s: the page loads or runs something", c.name)
				}
			}
		}
	}
}

// TestHTMLEscaping renders a certificate whose model comments and source
// carry markup, quotes and LaTeX commands: every format must show them as
// text (html/template escaping for HTML).
func TestHTMLEscaping(t *testing.T) {
	var esc certFile
	for _, c := range certs(t) {
		if c.name == "escape" {
			esc = c
		}
	}
	if esc.doc == nil {
		t.Fatal("testdata/certificates/escape.json is missing (go test ./report -update)")
	}
	if esc.doc.Source != escapeSource || !strings.Contains(strings.Join(esc.doc.Description, "\n"), "<script>") {
		t.Fatal("the escaping certificate does not carry the markup it should")
	}
	html := string(render(t, esc, report.HTML, false))
	// common practice, no source (OWASP XSS prevention): no tag or
	// attribute from the user survives as markup.
	for _, bad := range []string{"<script", "<img", "<b>", `onerror="`, "javascript:alert(1)\">"} {
		if strings.Contains(html, bad) {
			t.Errorf("HTML contains %q unescaped", bad)
		}
	}
	for _, want := range []string{"&lt;script&gt;", "&#34;Quotes&#34; &amp; &#39;apostrophes&#39;", "&lt;img src=x onerror="} {
		if !strings.Contains(html, want) {
			t.Errorf("HTML lacks the escaped text %q", want)
		}
	}
	md := string(render(t, esc, report.Markdown, false))
	for _, bad := range []string{"<script", "<img", "<b>", "*not bold*", "[not a link](", "`no code`"} {
		if strings.Contains(md, bad) {
			t.Errorf("Markdown contains %q unescaped", bad)
		}
	}
	tex := string(render(t, esc, report.LaTeX, true))
	// The LaTeX special characters and commands of the comment are inert:
	// only our own \end{document} closes the document, no \input survives.
	if strings.Count(tex, `\end{document}`) != 1 || strings.Contains(tex, `\input{`) {
		t.Error("LaTeX lets a comment's command through")
	}
	for _, want := range []string{`\$ \% \& \_ \# \{ \} \textbackslash{} \^{} \~{}`, `\textbackslash{}end\{document\}`, `$\sigma$ $\le$ 1 --- fine [U+2713]`} {
		if !strings.Contains(tex, want) {
			t.Errorf("LaTeX lacks the escaped text %q", want)
		}
	}
}

func TestInvalidCertificateIsRefused(t *testing.T) {
	c := certs(t)[0]
	tests := []struct {
		name  string
		alter func(d *claims.Document)
	}{
		// common practice, no source: a report never presents a
		// certificate the checker rejects.
		{"changed candidate", func(d *claims.Document) {
			d.Claims = append([]claims.Claim{&claims.OrbitalDerivative{V: "x^2", Vdot: "0"}}, d.Claims[1:]...)
		}},
		{"claim deleted", func(d *claims.Document) { d.Claims = d.Claims[1:] }},
		{"stale digest", func(d *claims.Document) { d.Digest = "sha256:00" }},
		{"bad signature", func(d *claims.Document) {
			if err := certificates.Sign(d, signingKey()); err != nil {
				t.Fatal(err)
			}
			d.Signature.Value = d.Signature.Value[:10]
		}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			d := *c.doc
			tt.alter(&d)
			for _, f := range report.Formats {
				var buf bytes.Buffer
				err := report.Render(&buf, &d, report.Options{Format: f})
				if !errors.Is(err, report.ErrInvalid) {
					t.Errorf("%s: error %v, want ErrInvalid", f, err)
				}
				if buf.Len() != 0 {
					t.Errorf("%s: %d bytes written for an invalid certificate", f, buf.Len())
				}
			}
		})
	}
}

func TestFigureFiles(t *testing.T) {
	var coolant certFile
	for _, c := range certs(t) {
		if c.name == "coolant" {
			coolant = c
		}
	}
	if coolant.doc == nil {
		t.Skip("no coolant certificate")
	}
	files := map[string][]byte{}
	var buf bytes.Buffer
	err := report.Render(&buf, coolant.doc, report.Options{Format: report.Markdown, Figure: func(name string, data []byte) (string, error) {
		files[name] = data
		return "out-" + name, nil
	}})
	if err != nil {
		t.Fatal(err)
	}
	svg, ok := files["region-k.svg"]
	if !ok || !bytes.HasPrefix(svg, []byte("<?xml")) || !bytes.Contains(svg, []byte("<svg")) {
		t.Fatalf("no SVG plot handed out: %v", files)
	}
	if !strings.Contains(buf.String(), "](out-region-k.svg)") {
		t.Error("the Markdown does not reference the plot")
	}
	if regexp.MustCompile(`<script`).Match(svg) {
		t.Error("the plot carries a script")
	}

	// A paving's picture is handed out too, and referenced.
	for _, c := range certs(t) {
		if c.name != "twogains" {
			continue
		}
		files := map[string][]byte{}
		var buf bytes.Buffer
		err := report.Render(&buf, c.doc, report.Options{Format: report.Markdown, Figure: func(name string, data []byte) (string, error) {
			files[name] = data
			return "out-" + name, nil
		}})
		if err != nil {
			t.Fatal(err)
		}
		if svg := files["paving.svg"]; !bytes.Contains(svg, []byte("<svg")) {
			t.Errorf("no paving picture handed out: %v", files)
		}
		if !strings.Contains(buf.String(), "](out-paving.svg)") {
			t.Error("the Markdown does not reference the paving picture")
		}
	}
}

func TestParseFormat(t *testing.T) {
	tests := []struct {
		in   string
		want report.Format
		ok   bool
	}{
		// common practice, no source.
		{"md", report.Markdown, true}, {"markdown", report.Markdown, true}, {"TEX", report.LaTeX, true},
		{"latex", report.LaTeX, true}, {"html", report.HTML, true}, {"pdf", "", false},
	}
	for _, tt := range tests {
		got, err := report.ParseFormat(tt.in)
		if got != tt.want || (err == nil) != tt.ok {
			t.Errorf("ParseFormat(%q) = %q, %v", tt.in, got, err)
		}
	}
}

func BenchmarkRender(b *testing.B) {
	d, err := certificates.ReadFile("../testdata/certificates/coolant.json")
	if err != nil {
		b.Fatal(err)
	}
	for _, f := range report.Formats {
		b.Run(string(f), func(b *testing.B) {
			var buf bytes.Buffer
			for b.Loop() {
				buf.Reset()
				if err := report.Render(&buf, d, report.Options{Format: f}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// TestVerificationRecordIsStable: a report shows the checker's record, so
// the record must be the same on every run (no map order in it).
func TestVerificationRecordIsStable(t *testing.T) {
	for _, c := range certs(t) {
		first := checker.Verify(c.doc).Records
		for range 30 {
			again := checker.Verify(c.doc).Records
			if len(again) != len(first) {
				t.Fatalf("%s: %d checks, then %d", c.name, len(first), len(again))
			}
			for i := range first {
				if first[i] != again[i] {
					t.Fatalf("%s: check %d is %q, then %q", c.name, i+1, first[i].Reason, again[i].Reason)
				}
			}
		}
	}
}
