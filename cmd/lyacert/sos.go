package main

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"os"
	"os/signal"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/certify"
	"github.com/lyacert/lyacert/certify/boxsearch"
	"github.com/lyacert/lyacert/certify/sdp"
	"github.com/lyacert/lyacert/certify/sossearch"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/report"
)

// sosFlags are find's options for a V found by a semidefinite program.
type sosFlags struct {
	Degree int    `name:"degree" placeholder:"2D" help:"Search V of this even degree by a semidefinite program (sums of squares) instead of solving a Lyapunov equation; every parameter must be fixed (with --box-sos: free in closed bounded ranges)."`
	SDPOut string `name:"sdp-out" placeholder:"FILE" help:"With --degree: write the last semidefinite program solved to FILE in SDPA sparse format."`
	BoxSOS bool   `name:"box-sos" help:"With --degree and free parameters in closed bounded ranges: search one V of that degree, with constant coefficients, for every parameter value in the box; the SDP holds V and the sums of squares σ of −V̇ − margin = σ₀ + Σ σᵢ·(pᵢ − loᵢ)(hiᵢ − pᵢ) together; -o writes the certificate."`
}

// writeSDPOut writes p in SDPA sparse format; it returns an exit code.
func writeSDPOut(path string, p *sdp.Problem, e *env) int {
	if p == nil {
		fmt.Fprintln(e.stderr, "lyacert: --sdp-out: no semidefinite program was solved; nothing written")
		return 0
	}
	var b bytes.Buffer
	if err := sdp.WriteSDPA(&b, p); err != nil {
		return e.failf(exitInput, "--sdp-out: %w", err)
	}
	if err := certificates.WriteFileAtomic(path, b.Bytes(), 0o644); err != nil {
		return e.failf(exitInput, "--sdp-out: %w", err)
	}
	return 0
}

// findDegree searches V of degree --degree and proves it by the direct
// method; the kernel re-checks the certificate.
func (c *findCmd) findDegree(m *model.Model, name string, e *env) int {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	res, err := sossearch.Search(ctx, m, sossearch.Options{Degree: c.Degree, Source: name})
	if err != nil {
		if errors.Is(err, certify.ErrUnverified) {
			return e.fail(exitRejected, err)
		}
		return e.fail(exitInput, err)
	}
	if c.SDPOut != "" {
		if code := writeSDPOut(c.SDPOut, res.Problem, e); code != 0 {
			return code
		}
	}
	if !c.JSON {
		report.DegreeSearchText(e.stdout, c.Degree, res)
	}
	if res.Check == nil {
		return exitFails
	}
	written := ""
	if c.Out != "" {
		if err := certificates.WriteFile(res.Check.Doc, c.Out); err != nil {
			return e.failf(exitInput, "writing the certificate: %w", err)
		}
		written = c.Out
	}
	if c.JSON {
		writeJSON(e.stdout, report.CheckJSON(res.Check, written))
	} else {
		report.CheckText(e.stdout, res.Check, written)
	}
	if res.Check.Verdict == checker.VerdictHolds {
		return exitHolds
	}
	return exitFails
}

// findBox searches one V of degree --degree for the box of the free
// parameters (certify/boxsearch) and writes its certificate with -o. It
// exits 0 with a certificate, 1 without one.
func (c *findCmd) findBox(ctx context.Context, e *env, m *model.Model) int {
	switch {
	case c.Degree == 0:
		return e.failf(exitInput, "--box-sos searches V by a semidefinite program: give its degree with --degree 2D")
	case c.BoxLyapunov || c.All || c.CertifyLinear || c.Exact || c.Plot != "" || c.PlotState != "" || c.Report != "":
		return e.failf(exitInput, "--box-sos goes with --degree, -o, --sdp-out and --json only: drop --box-lyapunov, --all, --certify-linear, --exact, --plot, --plot-state and --report")
	case c.Q != "identity":
		return e.failf(exitInput, "--box-sos chooses V itself; drop --q")
	}
	res, err := boxsearch.Search(ctx, m, boxsearch.Options{Degree: c.Degree, Source: m.File})
	if err != nil {
		switch {
		case ctx.Err() != nil:
			return e.fail(exitInput, ctx.Err())
		case errors.Is(err, certify.ErrUnverified):
			return e.fail(exitRejected, err)
		}
		return e.fail(exitInput, err)
	}
	if c.SDPOut != "" {
		if code := writeSDPOut(c.SDPOut, res.Problem, e); code != 0 {
			return code
		}
	}
	written := ""
	if c.Out != "" && res.Doc != nil {
		if err := certificates.WriteFile(res.Doc, c.Out); err != nil {
			return e.failf(exitInput, "writing the certificate: %w", err)
		}
		written = c.Out
	}
	if c.JSON {
		writeJSON(e.stdout, report.BoxSearchJSON(m, c.Degree, res, written))
	} else if err := report.BoxSearchText(e.stdout, m, c.Degree, res, written); err != nil {
		return e.fail(exitInput, err)
	}
	if res.Doc == nil {
		return exitFails
	}
	return exitHolds
}
