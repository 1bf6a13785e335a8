package main

import (
	"bytes"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/certify"
	"github.com/lyacert/lyacert/certify/direct"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/examples"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
	"github.com/lyacert/lyacert/report"
)

type reportCmd struct {
	common
	Cert          string `arg:"" placeholder:"CERT" help:"Certificate file (JSON), or - for standard input."`
	Format        string `name:"format" default:"md" enum:"md,tex,html" help:"Report format: md (GitHub Markdown), tex (LaTeX), html (one self-contained page)."`
	WholeDocument bool   `name:"whole-document" help:"With --format tex: a whole LaTeX document (preamble, \\begin{document} ... \\end{document}) instead of a fragment."`
	// OldWholeDocument is the flag's earlier name, kept to be answered
	// with the new one.
	OldWholeDocument bool   `name:"standalone" hidden:""`
	Out              string `short:"o" name:"out" placeholder:"FILE" help:"Write the report to this file (atomically) instead of standard output; the pictures of a Markdown or LaTeX report go beside it."`
	limitFlags
}

func init() {
	register("report", "Write a report of a certificate for reviews, safety cases and papers (md, tex, html).", func() any { return &reportCmd{} })
}

// Run writes a report.
func (c *reportCmd) Run(e *env) error { return exit(c.run(e)) }

func checkerName() string { return "lyacert " + certify.Version }

func (c *reportCmd) run(e *env) int {
	if !c.limitFlags.apply(e) {
		return exitInput
	}
	format, err := report.ParseFormat(c.Format)
	if err != nil {
		return e.fail(exitInput, err)
	}
	if c.OldWholeDocument {
		return e.failf(exitInput, "--standalone is now written --whole-document")
	}
	if c.WholeDocument && format != report.LaTeX {
		return e.failf(exitInput, "--whole-document applies to --format tex only")
	}
	name, src, err := readCertificate(c.Cert, e.stdin)
	if err != nil {
		return e.fail(exitInput, err)
	}
	doc, err := claims.Read(bytes.NewReader(src))
	if err != nil {
		return e.failf(exitInput, "%s: %w", name, err)
	}
	opts := report.Options{Format: format, WholeDocument: c.WholeDocument, Checker: checkerName(), CertName: name}
	ro := report.ReportOutput{Format: string(format), Figures: []string{}, Digest: doc.Digest}
	if c.Out != "" {
		fig := figureBeside(c.Out)
		opts.Figure = func(name string, data []byte) (string, error) {
			base, err := fig(name, data)
			if err == nil {
				ro.Figures = append(ro.Figures, filepath.Join(filepath.Dir(c.Out), base))
			}
			return base, err
		}
	}
	if !c.JSON {
		return writeReport(doc, opts, c.Out, e)
	}
	// With --json the report goes to -o, or into the JSON's "content".
	var buf bytes.Buffer
	code := writeReport(doc, opts, c.Out, &env{stdin: e.stdin, stdout: &buf, stderr: e.stderr, json: true})
	if code == exitInput || code == exitRejected {
		e.stdout.Write(buf.Bytes()) // the error's JSON
		return code
	}
	if c.Out != "" {
		ro.Output = &c.Out
	} else {
		content := buf.String()
		ro.Content = &content
	}
	out := checker.Verify(doc)
	ro.Verdict, ro.Claim = out.Verdict, out.Kind
	writeJSON(e.stdout, ro)
	return code
}

// figureBeside writes a report's plots next to the report file, named after
// it, and references them by their base name.
func figureBeside(out string) func(string, []byte) (string, error) {
	return func(name string, data []byte) (string, error) {
		base := strings.TrimSuffix(filepath.Base(out), filepath.Ext(out)) + "-" + name
		if err := certificates.WriteFileAtomic(filepath.Join(filepath.Dir(out), base), data, 0o644); err != nil {
			return "", fmt.Errorf("writing the plot: %w", err)
		}
		return base, nil
	}
}

// writeReport renders the report to out (standard output when empty) and
// returns the exit code of the certificate's verdict.
func writeReport(doc *claims.Document, opts report.Options, out string, e *env) int {
	var buf bytes.Buffer
	if err := report.Render(&buf, doc, opts); err != nil {
		if errors.Is(err, report.ErrInvalid) && !poly.IsExceeded(err.Error()) {
			return e.failf(exitRejected, "%s: %w", opts.CertName, err)
		}
		return e.failf(exitInput, "%s: %w", opts.CertName, err)
	}
	if out == "" {
		e.stdout.Write(buf.Bytes())
	} else if err := certificates.WriteFileAtomic(out, buf.Bytes(), 0o644); err != nil {
		return e.failf(exitInput, "writing the report: %w", err)
	}
	if checker.Verify(doc).Verdict == checker.VerdictHolds {
		return exitHolds
	}
	return exitFails
}

// writeDemoReports writes the demo's certificate and its report in every
// format into dir: coolant.json, coolant.md (with coolant-region.svg),
// coolant.tex (a whole document) and coolant.html.
func writeDemoReports(dir string, e *env) error {
	m, err := model.Parse(examples.CoolantName, examples.Coolant)
	if err != nil {
		return err
	}
	res, err := direct.Check(m, examples.CoolantName)
	if err != nil {
		return err
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	base := strings.TrimSuffix(examples.CoolantName, filepath.Ext(examples.CoolantName))
	cert := filepath.Join(dir, base+".json")
	if err := certificates.WriteFile(res.Doc, cert); err != nil {
		return err
	}
	var written []string
	for _, f := range report.Formats {
		out := filepath.Join(dir, base+"."+string(f))
		opts := report.Options{Format: f, WholeDocument: f == report.LaTeX, Checker: checkerName(), CertName: base + ".json", Figure: figureBeside(out)}
		var buf bytes.Buffer
		if err := report.Render(&buf, res.Doc, opts); err != nil {
			return err
		}
		if err := certificates.WriteFileAtomic(out, buf.Bytes(), 0o644); err != nil {
			return err
		}
		written = append(written, out)
	}
	fmt.Fprintf(e.stderr, "reports written: %s (certificate %s)\n", strings.Join(written, ", "), cert)
	return nil
}
