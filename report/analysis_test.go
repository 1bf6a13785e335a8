package report_test

import (
	"bytes"
	"context"
	"encoding/xml"
	"errors"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/lyacert/lyacert/certify/branches"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/report"
)

// lorenzAnalysis analyses the Lorenz equations with σ = 10, b = 8/3 and r
// free (testdata/models/lorenz.lya).
func lorenzAnalysis(t *testing.T) (*model.Model, *branches.Analysis) {
	t.Helper()
	src, err := os.ReadFile(filepath.Join("..", "testdata", "models", "lorenz.lya"))
	if err != nil {
		t.Fatal(err)
	}
	var set []model.Setting
	for _, s := range []string{"sigma=10", "b=8/3"} {
		st, err := model.ParseSetting(s)
		if err != nil {
			t.Fatal(err)
		}
		set = append(set, st)
	}
	m, err := model.Parse("lorenz.lya", src, set...)
	if err != nil {
		t.Fatal(err)
	}
	an, err := branches.Analyze(context.Background(), m, branches.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return m, an
}

// renderAnalysis renders the Lorenz analysis in format f into dir, the
// diagram written beside it; it returns the report.
func renderAnalysis(t *testing.T, dir string, f report.Format) string {
	t.Helper()
	m, an := lorenzAnalysis(t)
	var figures []string
	opts := report.AnalysisOptions{Format: f, WholeDocument: true, Tool: "lyacert test", Figure: func(name string, data []byte) (string, error) {
		ref := "lorenz-" + name
		figures = append(figures, ref)
		return ref, os.WriteFile(filepath.Join(dir, ref), data, 0o644)
	}}
	var buf bytes.Buffer
	if err := report.RenderAnalysis(&buf, m, an, nil, opts); err != nil {
		t.Fatal(err)
	}
	if f != report.HTML && (len(figures) != 1 || !strings.HasSuffix(figures[0], ".png")) {
		t.Errorf("%s: diagram files %v, want one PNG", f, figures)
	}
	return buf.String()
}

// TestAnalysisLorenzBifurcations: every format states the bifurcations of
// the Lorenz equations with σ = 10, b = 8/3 (Lorenz 1963; Strogatz,
// Nonlinear Dynamics and Chaos, §9.2): a pitchfork at r = 1 and the Hopf
// bifurcation of C± at r = σ(σ + b + 3)/(σ − b − 1) = 470/19.
func TestAnalysisLorenzBifurcations(t *testing.T) {
	dir := t.TempDir()
	cases := []struct {
		f          report.Format
		pitchfork  string
		hopf       string
		figureMark string
	}{
		{report.Markdown, `$r = 1$: pitchfork`, `$r = \frac{470}{19} \approx 24.7368$: hopf`, "![Bifurcation diagram](lorenz-diagram.png)"},
		{report.LaTeX, `$r = 1$: pitchfork`, `$r = \frac{470}{19} \approx 24.7368$: hopf`, `{lorenz-diagram.png}`},
		{report.HTML, `<mi>r</mi><mo>=</mo><mn>1</mn></mrow></math>: pitchfork`, `<mfrac><mn>470</mn><mn>19</mn></mfrac>`, `<svg class="plot"`},
	}
	for _, c := range cases {
		t.Run(string(c.f), func(t *testing.T) {
			out := renderAnalysis(t, dir, c.f)
			for _, want := range []string{c.pitchfork, c.hopf, c.figureMark} {
				if !strings.Contains(out, want) {
					t.Errorf("report lacks %q", want)
				}
			}
		})
	}
}

// TestAnalysisLaTeXFits compiles the LaTeX analysis report with pdflatex
// (as TestGoldenLaTeXFits does for certificates) and fails on any line
// that runs into the margin or glyph that is missing (The TeXbook, ch. 6).
func TestAnalysisLaTeXFits(t *testing.T) {
	pdflatex := tool(t, "pdflatex")
	dir := t.TempDir()
	out := renderAnalysis(t, dir, report.LaTeX)
	if !strings.Contains(out, `\usepackage{graphicx}`) || !strings.Contains(out, `\includegraphics`) {
		t.Fatal("the diagram is not included with graphicx")
	}
	if err := os.WriteFile(filepath.Join(dir, "lorenz.tex"), []byte(out), 0o644); err != nil {
		t.Fatal(err)
	}
	runTool(t, dir, 2*time.Minute, pdflatex, "-interaction=nonstopmode", "-halt-on-error", "-no-shell-escape", "lorenz.tex")
	log, err := os.ReadFile(filepath.Join(dir, "lorenz.log"))
	if err != nil {
		t.Fatal(err)
	}
	for _, what := range []string{"Overfull \\hbox", "Missing character", "Overfull \\vbox"} {
		if bytes.Contains(log, []byte(what)) {
			t.Errorf("%s:\n%s", what, grepContext(string(log), what, 3))
		}
	}
	if !bytes.Contains(log, []byte("lorenz-diagram.png")) {
		t.Error("the log does not show the diagram included")
	}
}

// TestAnalysisHTMLWellFormed: every <math> of the HTML analysis report is
// MathML Core (checkMathML) and the inline diagram is well-formed XML
// (W3C SVG is an XML language).
func TestAnalysisHTMLWellFormed(t *testing.T) {
	out := renderAnalysis(t, t.TempDir(), report.HTML)
	frags := mathFragment.FindAllString(out, -1)
	if len(frags) < 10 {
		t.Fatalf("%d math fragments", len(frags))
	}
	for _, f := range frags {
		if err := checkMathML(f); err != nil {
			t.Errorf("%v in %s", err, f)
		}
	}
	i, j := strings.Index(out, "<svg"), strings.LastIndex(out, "</svg>")
	if i < 0 || j < i {
		t.Fatal("no inline SVG")
	}
	d := xml.NewDecoder(strings.NewReader(out[i : j+len("</svg>")]))
	d.Strict = true
	for {
		_, err := d.Token()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			t.Fatalf("the inline SVG is not well-formed: %v", err)
		}
	}
}
