package report_test

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/report"
)

// TestAttractionSection renders the region-of-attraction section of the
// reverse-time Van der Pol certificate (Khalil, Nonlinear Systems, §8.2)
// in every format and checks each picture by its file signature: PNG's
// eight-byte signature (PNG specification, ISO/IEC 15948, §5.2), the
// "%PDF-" header (ISO 32000-1, §7.5.2) and an inline <svg> element (SVG
// 1.1, §5.1).
func TestAttractionSection(t *testing.T) {
	doc, err := certificates.ReadFile("../testdata/certificates/basin-vanderpol.json")
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		format report.Format
		file   string // the figure's suggested name, "" when inline
		magic  string // the figure's first bytes
		shows  []string
	}{
		{report.Markdown, "attraction.png", "\x89PNG\r\n\x1a\n", []string{"## Region of attraction", "c = \\frac{218\\,959}{100\\,000}", "![The certified sublevel set of V](fig-attraction.png)", "not a proof", "property of the model"}},
		{report.LaTeX, "attraction.pdf", "%PDF-", []string{`\subsection*{Region of attraction}`, `\includegraphics[width=0.7\linewidth]{fig-attraction.pdf}`, "not a proof", "property of the model"}},
		{report.HTML, "", "", []string{"<h2>Region of attraction</h2>", `<figure class="basin-plot"><svg`, "not a proof", "property of the model"}},
	}
	for _, tc := range tests {
		t.Run(string(tc.format), func(t *testing.T) {
			got := map[string][]byte{}
			opts := report.Options{Format: tc.format, CertName: "basin-vanderpol.json", Figure: func(name string, data []byte) (string, error) {
				got[name] = data
				return "fig-" + name, nil
			}}
			var buf bytes.Buffer
			if err := report.Render(&buf, doc, opts); err != nil {
				t.Fatal(err)
			}
			for _, s := range tc.shows {
				if !strings.Contains(buf.String(), s) {
					t.Errorf("the report lacks %q", s)
				}
			}
			if tc.file == "" {
				if len(got) != 0 {
					t.Errorf("an inline picture was also written as a file: %v", len(got))
				}
				return
			}
			if data, ok := got[tc.file]; !ok || !bytes.HasPrefix(data, []byte(tc.magic)) {
				t.Errorf("figure %s: written %v, starts with %q", tc.file, ok, data[:min(len(data), 8)])
			}
		})
	}
}

// TestAttractionLaTeXCompiles compiles the whole-document LaTeX report of
// the reverse-time Van der Pol certificate with its picture beside it, and
// fails on an error, an "Overfull \hbox" or a missing file in the log
// (The TeXbook, ch. 6; a picture that cannot be read is logged as
// "File ... not found", common practice).
func TestAttractionLaTeXCompiles(t *testing.T) {
	pdflatex := tool(t, "pdflatex")
	doc, err := certificates.ReadFile("../testdata/certificates/basin-vanderpol.json")
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	opts := report.Options{Format: report.LaTeX, WholeDocument: true, CertName: "basin.json", Figure: func(name string, data []byte) (string, error) {
		return "basin-" + name, os.WriteFile(filepath.Join(dir, "basin-"+name), data, 0o644)
	}}
	var buf bytes.Buffer
	if err := report.Render(&buf, doc, opts); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "basin.tex"), buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	runTool(t, dir, 2*time.Minute, pdflatex, "-interaction=nonstopmode", "-halt-on-error", "-no-shell-escape", "basin.tex")
	log, err := os.ReadFile(filepath.Join(dir, "basin.log"))
	if err != nil {
		t.Fatal(err)
	}
	for _, what := range []string{"Overfull \\hbox", "Missing character", "not found"} {
		if bytes.Contains(log, []byte(what)) {
			t.Errorf("%s:\n%s", what, grepContext(string(log), what, 3))
		}
	}
	if !bytes.Contains(log, []byte("basin-attraction.pdf")) {
		t.Error("the log does not show the picture being read")
	}
}
