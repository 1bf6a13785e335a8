package report_test

import (
	"bytes"
	"context"
	"encoding/json"
	"html"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/report"
)

// tool finds an external program for a test. Without it the test is
// skipped on a developer's machine, but fails under CI (CI set), where
// .ci/run installs it.
func tool(t *testing.T, names ...string) string {
	t.Helper()
	for _, n := range names {
		if p, err := exec.LookPath(n); err == nil {
			return p
		}
	}
	if os.Getenv("CI") != "" {
		t.Fatalf("%s not found; .ci/run installs it", names[0])
	}
	t.Skipf("%s not found (CI installs it)", names[0])
	return ""
}

func runTool(t *testing.T, dir string, timeout time.Duration, name string, args ...string) []byte {
	t.Helper()
	ctx, cancel := context.WithTimeout(context.Background(), timeout)
	defer cancel()
	cmd := exec.CommandContext(ctx, name, args...)
	cmd.Dir = dir
	cmd.Stdin = nil
	var out bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &out
	if err := cmd.Run(); err != nil {
		t.Fatalf("%s %s: %v\n%s", filepath.Base(name), strings.Join(args, " "), err, tail(out.String(), 40))
	}
	return out.Bytes()
}

func tail(s string, n int) string {
	ls := strings.Split(s, "\n")
	if len(ls) > n {
		ls = ls[len(ls)-n:]
	}
	return strings.Join(ls, "\n")
}

// TestLaTeXCompiles compiles the LaTeX reports with pdflatex: every
// certificate's fragment included in one document, and whole documents for
// the demo and for the certificate whose comments carry LaTeX's special
// characters. The log must show no missing glyph.
func TestLaTeXCompiles(t *testing.T) {
	pdflatex := tool(t, "pdflatex")
	dir := t.TempDir()
	var doc strings.Builder
	doc.WriteString("\\documentclass{article}\n\\usepackage{amsmath}\n\\begin{document}\n")
	var standalone []string
	for _, c := range certs(t) {
		frag := c.name + "-fragment.tex"
		if err := os.WriteFile(filepath.Join(dir, frag), render(t, c, report.LaTeX, false), 0o644); err != nil {
			t.Fatal(err)
		}
		doc.WriteString("\\input{" + frag + "}\n\\clearpage\n")
		if c.name == "coolant" || c.name == "escape" {
			name := c.name + ".tex"
			if err := os.WriteFile(filepath.Join(dir, name), render(t, c, report.LaTeX, true), 0o644); err != nil {
				t.Fatal(err)
			}
			standalone = append(standalone, name)
		}
	}
	doc.WriteString("\\end{document}\n")
	if err := os.WriteFile(filepath.Join(dir, "all.tex"), []byte(doc.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, f := range append([]string{"all.tex"}, standalone...) {
		runTool(t, dir, 2*time.Minute, pdflatex, "-interaction=nonstopmode", "-halt-on-error", "-no-shell-escape", f)
		base := strings.TrimSuffix(f, ".tex")
		pdf, err := os.ReadFile(filepath.Join(dir, base+".pdf"))
		if err != nil || !bytes.HasPrefix(pdf, []byte("%PDF")) {
			t.Errorf("%s: no PDF: %v", f, err)
		}
		log, _ := os.ReadFile(filepath.Join(dir, base+".log"))
		if bytes.Contains(log, []byte("Missing character")) {
			t.Errorf("%s: a character has no glyph:\n%s", f, grepLines(string(log), "Missing character"))
		}
	}
}

func grepLines(s, what string) string {
	var out []string
	for _, l := range strings.Split(s, "\n") {
		if strings.Contains(l, what) {
			out = append(out, l)
		}
	}
	return strings.Join(out, "\n")
}

// probe is put before the report's own content (and so before its Content
// Security Policy): it records script errors and policy violations, and on
// load writes what the test needs to know into the DOM that --dump-dom
// prints.
const probe = `<script>
(function () {
  var errors = [];
  window.addEventListener("error", function (e) { errors.push("error: " + (e.message || e.type)); }, true);
  document.addEventListener("securitypolicyviolation", function (e) { errors.push("csp: " + e.violatedDirective + " " + e.blockedURI); });
  window.addEventListener("load", function () {
    setTimeout(function () {
      var q = function (s) { var e = document.querySelector(s); return e ? e.textContent : ""; };
      var out = {
        errors: errors,
        verdict: q("#verdict"),
        result: q("#result"),
        svgs: document.querySelectorAll("svg").length,
        scripts: document.querySelectorAll("script").length,
        injected: document.body.hasAttribute("data-injected"),
        description: q("header blockquote"),
        source: q("header .meta code"),
        title: document.title,
        overflow: []
      };
      // What runs past the page's column, or scrolls inside it.
      var right = document.body.getBoundingClientRect().right;
      document.querySelectorAll("math, p, li").forEach(function (e) {
        var r = e.getBoundingClientRect();
        if (r.right > right + 1) { out.overflow.push(e.tagName + " by " + Math.round(r.right - right) + "px: " + e.textContent.slice(0, 40)); }
        if (e.tagName.toLowerCase() === "math" && e.scrollWidth > e.clientWidth + 1) { out.overflow.push("math scrolls by " + (e.scrollWidth - e.clientWidth) + "px: " + e.textContent.slice(0, 40)); }
      });
      var pre = document.createElement("pre");
      pre.id = "probe";
      pre.textContent = JSON.stringify(out);
      document.body.appendChild(pre);
    }, 200);
  });
})();
</script>`

type probeResult struct {
	Errors      []string `json:"errors"`
	Verdict     string   `json:"verdict"`
	Result      string   `json:"result"`
	SVGs        int      `json:"svgs"`
	Scripts     int      `json:"scripts"`
	Injected    bool     `json:"injected"`
	Description string   `json:"description"`
	Source      string   `json:"source"`
	Title       string   `json:"title"`
	Overflow    []string `json:"overflow"`
}

// chromiumArgs are the flags that let headless Chromium run offline and
// without a sandbox as root, with a profile of its own.
func chromiumArgs(profile string) []string {
	return []string{
		"--headless", "--window-size=1280,900", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
		"--disable-background-networking", "--disable-component-update", "--disable-sync",
		"--disable-dev-shm-usage", "--user-data-dir=" + profile,
	}
}

var probeOut = regexp.MustCompile(`(?s)<pre id="probe">(.*?)</pre>`)

// TestHTMLInChromium renders HTML reports in headless Chromium and checks
// that the page shows its verdict and its plots, runs no script of its own
// or of the user's (the escaping certificate tries three ways), keeps its
// mathematics within the column (the wide certificate), and prints to PDF.
func TestHTMLInChromium(t *testing.T) {
	chromium := tool(t, "chromium", "chromium-browser")
	dir := t.TempDir()
	verdicts := map[string]string{
		checker.VerdictHolds:     "holds",
		checker.VerdictOnRegion:  "holds on part of the range",
		checker.VerdictFails:     "fails",
		checker.VerdictUndecided: "undecided",
	}
	for _, c := range certs(t) {
		switch c.name {
		case "coolant", "escape", "unstable", "twogains", "wide":
		default:
			continue
		}
		wantVerdict := verdicts[checker.Verify(c.doc).Verdict]
		wantSVGs := 0
		if rg := certificates.ContentsOf(c.doc).Region; rg != nil {
			if rg.Param != "" {
				wantSVGs++
			}
			if rg.Paving != nil {
				wantSVGs += 1 + len(rg.Paving.Product)
			}
		}
		t.Run(c.name, func(t *testing.T) {
			page := string(render(t, c, report.HTML, false))
			page = strings.Replace(page, "<head>", "<head>\n"+probe, 1)
			file := filepath.Join(dir, c.name+".html")
			if err := os.WriteFile(file, []byte(page), 0o644); err != nil {
				t.Fatal(err)
			}
			args := append(chromiumArgs(filepath.Join(dir, "profile-"+c.name)), "--virtual-time-budget=3000", "--dump-dom", "file://"+file)
			dom := runTool(t, dir, 2*time.Minute, chromium, args...)
			m := probeOut.FindSubmatch(dom)
			if m == nil {
				t.Fatalf("the probe wrote nothing; the page did not load:\n%s", tail(string(dom), 20))
			}
			var got probeResult
			if err := json.Unmarshal([]byte(html.UnescapeString(string(m[1]))), &got); err != nil {
				t.Fatal(err)
			}
			if len(got.Errors) > 0 {
				t.Errorf("script errors or policy violations: %v", got.Errors)
			}
			if !strings.Contains(strings.ToLower(got.Verdict), "verdict: "+wantVerdict+".") {
				t.Errorf("verdict %q, want %q", got.Verdict, wantVerdict)
			}
			if got.Result != "valid" {
				t.Errorf("verification result %q, want valid", got.Result)
			}
			if got.SVGs != wantSVGs {
				t.Errorf("%d plots, want %d", got.SVGs, wantSVGs)
			}
			if len(got.Overflow) > 0 {
				t.Errorf("wider than the page's column (a 1280 px window):\n%s", strings.Join(got.Overflow, "\n"))
			}
			if got.Scripts != 1 || got.Injected {
				t.Errorf("%d scripts in the page (only the probe expected), injected %v", got.Scripts, got.Injected)
			}
			if c.name == "escape" {
				if !strings.Contains(got.Description, "<script>document.body.setAttribute('data-injected','1')</script>") {
					t.Errorf("the comment's markup is not shown as text: %q", got.Description)
				}
				if got.Source != escapeSource || !strings.Contains(got.Title, escapeSource) {
					t.Errorf("the source is not shown as text: %q, title %q", got.Source, got.Title)
				}
			}
		})
	}
	t.Run("print to PDF", func(t *testing.T) {
		var c certFile
		for _, x := range certs(t) {
			if x.name == "coolant" {
				c = x
			}
		}
		if c.doc == nil {
			t.Skip("no coolant certificate")
		}
		file := filepath.Join(dir, "print.html")
		if err := os.WriteFile(file, render(t, c, report.HTML, false), 0o644); err != nil {
			t.Fatal(err)
		}
		pdf := filepath.Join(dir, "print.pdf")
		args := append(chromiumArgs(filepath.Join(dir, "profile-print")), "--no-pdf-header-footer", "--print-to-pdf="+pdf, "file://"+file)
		runTool(t, dir, 2*time.Minute, chromium, args...)
		b, err := os.ReadFile(pdf)
		if err != nil || !bytes.HasPrefix(b, []byte("%PDF")) || len(b) < 10000 {
			t.Errorf("no printed PDF (%d bytes): %v", len(b), err)
		}
	})
}

// TestGoldenLaTeXFits compiles every golden LaTeX report with pdflatex, in
// the page the whole-document report uses (article, 11pt, 25 mm margins),
// and fails on any "Overfull \hbox" in the log: TeX reports there every
// line that runs into the margin (The TeXbook, ch. 6).
func TestGoldenLaTeXFits(t *testing.T) {
	pdflatex := tool(t, "pdflatex")
	files, err := filepath.Glob("testdata/golden/*.tex")
	if err != nil || len(files) == 0 {
		t.Fatalf("no golden LaTeX reports: %v", err)
	}
	dir := t.TempDir()
	for _, f := range files {
		name := strings.TrimSuffix(filepath.Base(f), ".tex")
		t.Run(name, func(t *testing.T) {
			frag, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile(filepath.Join(dir, name+"-fragment.tex"), frag, 0o644); err != nil {
				t.Fatal(err)
			}
			doc := "\\documentclass[11pt]{article}\n\\usepackage{amsmath}\n\\usepackage[margin=25mm]{geometry}\n\\begin{document}\n\\input{" + name + "-fragment.tex}\n\\end{document}\n"
			if err := os.WriteFile(filepath.Join(dir, name+".tex"), []byte(doc), 0o644); err != nil {
				t.Fatal(err)
			}
			runTool(t, dir, 2*time.Minute, pdflatex, "-interaction=nonstopmode", "-halt-on-error", "-no-shell-escape", name+".tex")
			log, err := os.ReadFile(filepath.Join(dir, name+".log"))
			if err != nil {
				t.Fatal(err)
			}
			for _, what := range []string{"Overfull \\hbox", "Missing character"} {
				if bytes.Contains(log, []byte(what)) {
					t.Errorf("%s:\n%s", what, grepContext(string(log), what, 3))
				}
			}
		})
	}
}

// grepContext returns the lines containing what, each with the n lines
// after it (where TeX shows the offending material).
func grepContext(s, what string, n int) string {
	ls := strings.Split(s, "\n")
	var out []string
	for i, l := range ls {
		if strings.Contains(l, what) {
			out = append(out, ls[i:min(len(ls), i+n+1)]...)
		}
	}
	return strings.Join(out, "\n")
}
