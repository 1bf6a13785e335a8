package main

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"math/big"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/certify"
	"github.com/lyacert/lyacert/certify/branches"
	"github.com/lyacert/lyacert/certify/direct"
	"github.com/lyacert/lyacert/certify/equilibria"
	"github.com/lyacert/lyacert/certify/vertex"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/report"
)

type findCmd struct {
	common
	File          string   `arg:"" help:"Model file (.lya), or - for standard input."`
	Set           []string `name:"set" placeholder:"NAME=VALUE" help:"Fix a parameter to an exact value (repeatable). With every parameter fixed find certifies an equilibrium; with some left free it analyses the equilibrium branches as exact functions of them (no certificate)."`
	Q             string   `name:"q" placeholder:"DIAG" default:"identity" help:"Q of AᵀP + PA = −Q (AᵀPA − P = −Q in discrete time): identity, one positive number (a multiple of I), or one per state, comma-separated (a diagonal)."`
	All           bool     `help:"Certify every equilibrium found, not only the model's own (its at point, or the origin)."`
	Out           string   `short:"o" name:"out" placeholder:"CERT" help:"Write the certificate to this file (atomically); with --all one file per certified equilibrium, CERT with -1, -2, … before its extension."`
	Plot          string   `name:"plot" placeholder:"FILE.svg|FILE.png|FILE.pdf" help:"With one free parameter: draw the bifurcation diagram (each branch against the parameter, solid where stable, dashed where not, bifurcations marked) to this file."`
	CertifyLinear bool     `name:"certify-linear" help:"With one free parameter: for each rational branch, certify its linearisation with V = D(p)²·ξᵀP(p)ξ from the exact solution P(p) of the Lyapunov equation, re-checked by the checker, over the exact region where it holds (-o writes the certificates, CERT-k for branch k)."`
	BoxLyapunov   bool     `name:"box-lyapunov" help:"With free parameters in closed bounded ranges (continuous time, linearization affine in them): look for one P ≻ 0 with AᵀP + PA ≺ 0 at every vertex of the parameter box, which makes the equilibrium locally asymptotically stable for every value in the box (globally for a model linear in the states); prints P, the vertices and their margins, -o writes the certificate."`
	Exact         bool     `name:"exact" help:"At fixed parameters: certify with the exact rational solution P of the Lyapunov equation instead of the short rounded one (rational equilibria only; elsewhere the rounded P is used, with a note)."`
	Points        int      `name:"points" placeholder:"N" default:"41" help:"With one free parameter and no closed form for the branches: sample the parameter's range at N evenly spaced values (at least 2) and find the equilibria at each (sampled, not exact between them)."`
	Report        string   `name:"report" placeholder:"FILE.md|FILE.tex|FILE.html" help:"With free parameters: write a report of the analysis (branches, classification, bifurcations and the bifurcation diagram): Markdown or a LaTeX document with the diagram as a PNG beside it (FILE-diagram.png), or one HTML page with it inline."`
	Box           []string `name:"box" placeholder:"NAME=LO..HI" help:"With two or more free parameters: classify over this range of a parameter instead of its allowed range (repeatable); every free parameter needs a bounded range or a box."`
	Resolution    string   `name:"resolution" default:"1/64" placeholder:"P/Q" help:"With two or more free parameters: halve boxes while a label is undecided, until each side is at most this share of the box's side."`
	PlotState     string   `name:"plot-state" placeholder:"STATE" help:"Draw only this state's coordinate in --plot (default: one panel per state)."`
	sosFlags
	limitFlags
	timeoutFlag
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

func (c *findCmd) run(e *env) int {
	if !c.limitFlags.apply(e) {
		return exitInput
	}
	ctx, cancel := c.timeoutFlag.budget()
	defer cancel()
	return within(ctx, e, func(ctx context.Context, e *env) int { return c.find(ctx, e) })
}

func (c *findCmd) find(ctx context.Context, e *env) int {
	format := ""
	if c.Plot != "" {
		f, err := plotFormat(c.Plot)
		if err != nil {
			return e.fail(exitInput, err)
		}
		format = f
	}
	name, src, err := readInput(c.File, e.stdin)
	if err != nil {
		return e.fail(exitInput, err)
	}
	settings, err := parseSettings(c.Set)
	if err != nil {
		return e.fail(exitInput, err)
	}
	m, err := model.Parse(name, src, settings...)
	if err != nil {
		return e.fail(exitInput, err)
	}
	if c.BoxSOS {
		return c.findBox(ctx, e, m)
	}
	if c.BoxLyapunov {
		return c.boxLyapunov(ctx, e, m)
	}
	if free := m.FreeParams(); len(free) > 0 && c.Degree == 0 {
		return c.symbolic(ctx, e, m, format)
	}
	if c.Report != "" {
		return e.failf(exitInput, "--report %s writes the report of an analysis with free parameters, and %s has none; write the certificate with -o and its report with lyacert report CERT", c.Report, name)
	}
	if c.Plot != "" || c.PlotState != "" {
		return e.failf(exitInput, "--plot draws a bifurcation diagram along one free parameter; %s has none (leave one parameter without --set)", name)
	}
	if c.Degree != 0 {
		return c.findDegree(m, name, e)
	}
	q, err := parseQ(c.Q, len(m.States))
	if err != nil {
		return e.fail(exitInput, err)
	}
	res, err := equilibria.Find(ctx, m, equilibria.FindOptions{Q: q, All: c.All, Source: name, Exact: c.Exact})
	if err != nil {
		if errors.Is(err, certify.ErrUnverified) {
			return e.fail(exitRejected, err)
		}
		if errors.Is(err, equilibria.ErrNonIsolated) {
			return e.failf(exitFails, "%s: %w", name, err)
		}
		return e.fail(exitInput, err)
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
				return e.failf(exitInput, "writing the certificate: %w", err)
			}
			written[i] = path
		}
	}
	if c.JSON {
		writeJSON(e.stdout, report.FindJSON(res, written))
	} else {
		report.FindText(e.stdout, res, q, written)
	}
	if verdict, _ := report.FindVerdict(res); verdict == checker.VerdictHolds {
		return exitHolds
	}
	return exitFails
}

// symbolic analyses the equilibrium branches of a model with free
// parameters (certify/branches) and prints them; it writes no certificate.
// It exits 0 when the branches have a closed form, 1 when they have none.
func (c *findCmd) symbolic(ctx context.Context, e *env, m *model.Model, format string) int {
	free := m.FreeParams()
	switch {
	case c.Out != "" && !c.CertifyLinear:
		return e.failf(exitInput, "-o %s: the analysis with free parameters (%s) writes no certificate; add --certify-linear, or fix them with --set to certify an equilibrium", c.Out, paramNames(free))
	case c.CertifyLinear && len(free) != 1:
		return e.failf(exitInput, "--certify-linear works along one free parameter, and %s are free; fix all but one with --set", paramNames(free))
	case c.All:
		return e.failf(exitInput, "--all certifies equilibria at one parameter point; fix the free parameters (%s) with --set", paramNames(free))
	case c.Exact:
		return e.failf(exitInput, "--exact chooses the P of a certificate at one parameter point; fix the free parameters (%s) with --set", paramNames(free))
	case c.Q != "identity":
		return e.failf(exitInput, "--q sets the Lyapunov equation of a certificate; fix the free parameters (%s) with --set", paramNames(free))
	case c.Plot != "" && len(free) > 2:
		return e.failf(exitInput, "--plot %s draws a bifurcation diagram along one free parameter or a map over two, and %s are free; fix all but two with --set", c.Plot, paramNames(free))
	case c.PlotState != "" && len(free) != 1:
		return e.failf(exitInput, "--plot-state chooses the panels of a bifurcation diagram along one free parameter, and %s are free", paramNames(free))
	case (len(c.Box) > 0 || c.Resolution != "1/64") && len(free) < 2:
		return e.failf(exitInput, "--box and --resolution set the map over two or more free parameters, and %s is free", paramNames(free))
	case c.Points < 2 || c.Points > 10001:
		return e.failf(exitInput, "--points %d: give between 2 and 10001 grid values", c.Points)
	case c.PlotState != "" && c.Plot == "" && c.Report == "":
		return e.failf(exitInput, "--plot-state chooses what --plot draws; give --plot FILE too")
	}
	var reportFormat report.Format
	if c.Report != "" {
		f, err := report.ParseFormat(strings.TrimPrefix(filepath.Ext(c.Report), "."))
		if err != nil {
			return e.failf(exitInput, "--report %s: %w", c.Report, err)
		}
		reportFormat = f
	}
	var states []int
	if c.Plot != "" || c.PlotState != "" {
		s, err := report.DiagramStates(m, c.PlotState)
		if err != nil {
			return e.failf(exitInput, "--plot-state: %w", err)
		}
		states = s
	}
	opts, err := c.mapOptions()
	if err != nil {
		return e.fail(exitInput, err)
	}
	an, err := branches.Analyze(ctx, m, opts)
	if err != nil {
		if ctx.Err() != nil {
			return exitStopped
		}
		return e.fail(exitInput, err)
	}
	if c.Plot != "" && len(free) == 2 && an.ClosedForm && an.Map == nil {
		return e.failf(exitInput, "--plot %s: no map to draw (%s)", c.Plot, strings.Join(an.Notes, "; "))
	}
	var certs []report.LinearCert
	if c.CertifyLinear && an.ClosedForm {
		if certs, err = c.linearCerts(ctx, m, an); err != nil {
			return e.fail(exitInput, err)
		}
	}
	var sampled *equilibria.Sampling
	if !an.ClosedForm && len(free) == 1 {
		// No closed form: fall back to the equilibria on a grid of the
		// parameter, each grid value as find --set would do it.
		sampled, err = equilibria.Sample(ctx, m, equilibria.SampleOptions{Points: c.Points})
		if err != nil {
			return e.fail(exitInput, err)
		}
	}
	if c.JSON {
		out := report.BranchesJSON(m, an, certs)
		if sampled != nil {
			out.Samples = report.SamplesJSON(m, sampled)
		}
		writeJSON(e.stdout, out)
	} else if err := report.BranchesSampledText(e.stdout, m, an, certs, sampled); err != nil {
		return e.fail(exitInput, err)
	}
	if c.Report != "" {
		var buf bytes.Buffer
		opts := report.AnalysisOptions{Format: reportFormat, WholeDocument: true, Tool: checkerName(), Figure: figureBeside(c.Report), States: states}
		if err := report.RenderAnalysis(&buf, m, an, sampled, opts); err != nil {
			return e.failf(exitFails, "--report %s: %w", c.Report, err)
		}
		if err := certificates.WriteFileAtomic(c.Report, buf.Bytes(), 0o644); err != nil {
			return e.failf(exitInput, "writing the report: %w", err)
		}
	}
	if !an.ClosedForm {
		if c.Plot != "" {
			fmt.Fprintf(e.stderr, "lyacert: --plot %s: no closed form for the branches, nothing drawn\n", c.Plot)
		}
		return exitFails
	}
	if c.Plot != "" && an.Map != nil {
		data, err := report.BranchMap(m, an, format)
		if err != nil {
			return e.failf(exitFails, "--plot %s: %w", c.Plot, err)
		}
		if err := certificates.WriteFileAtomic(c.Plot, data, 0o644); err != nil {
			return e.failf(exitInput, "writing the plot: %w", err)
		}
	} else if c.Plot != "" {
		data, err := report.BifurcationDiagram(m, an, states, format)
		if err != nil {
			return e.failf(exitFails, "--plot %s: %w", c.Plot, err)
		}
		if err := certificates.WriteFileAtomic(c.Plot, data, 0o644); err != nil {
			return e.failf(exitInput, "writing the plot: %w", err)
		}
	}
	return exitHolds
}

// mapOptions reads --box and --resolution for the map over several free
// parameters.
func (c *findCmd) mapOptions() (branches.Options, error) {
	var o branches.Options
	res, err := constant(c.Resolution, "--resolution")
	if err != nil {
		return o, err
	}
	if res.Sign() <= 0 || res.Cmp(big.NewRat(1, 1)) > 0 {
		return o, fmt.Errorf("--resolution %s: give a share in (0, 1]", c.Resolution)
	}
	o.Resolution = res
	o.Box = map[string][2]*big.Rat{}
	for _, s := range c.Box {
		name, lo, hi, err := parseBox(s)
		if err != nil {
			return o, err
		}
		if _, dup := o.Box[name]; dup {
			return o, fmt.Errorf("--box %s: given twice", name)
		}
		l, err := constant(lo, "--box "+name+" (lower end)")
		if err != nil {
			return o, err
		}
		h, err := constant(hi, "--box "+name+" (upper end)")
		if err != nil {
			return o, err
		}
		o.Box[name] = [2]*big.Rat{l, h}
	}
	return o, nil
}

// boxLyapunov runs the vertex test (certify/vertex) on the box of the free
// parameters and writes its certificate with -o. It exits 0 with a
// certificate, 1 without one.
func (c *findCmd) boxLyapunov(ctx context.Context, e *env, m *model.Model) int {
	switch {
	case c.All || c.CertifyLinear || c.Plot != "" || c.PlotState != "" || c.Degree != 0:
		return e.failf(exitInput, "--box-lyapunov stands alone: drop --all, --certify-linear, --plot, --plot-state and --degree")
	case c.Q != "identity":
		return e.failf(exitInput, "--box-lyapunov chooses P itself; drop --q")
	}
	res, err := vertex.Find(ctx, m, vertex.Options{Source: m.File})
	if err != nil {
		switch {
		case ctx.Err() != nil:
			return e.fail(exitInput, ctx.Err())
		case errors.Is(err, certify.ErrUnverified):
			return e.fail(exitRejected, err)
		}
		return e.fail(exitInput, err)
	}
	written := ""
	if c.Out != "" && res.Doc != nil {
		if err := certificates.WriteFile(res.Doc, c.Out); err != nil {
			return e.failf(exitInput, "writing the certificate: %w", err)
		}
		written = c.Out
	}
	if c.JSON {
		writeJSON(e.stdout, report.VertexJSON(res, written))
	} else {
		report.VertexText(e.stdout, res, written)
	}
	if res.P == nil {
		return exitFails
	}
	return exitHolds
}

// linearCerts checks each branch's linear model (branches.LinearModel)
// with the direct method and writes the certificates with -o, one per
// certified branch: CERT with -1, -2, … (the branch's number) before its
// extension.
func (c *findCmd) linearCerts(ctx context.Context, m *model.Model, an *branches.Analysis) ([]report.LinearCert, error) {
	var out []report.LinearCert
	for i := range an.Branches {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		text, err := branches.LinearModel(m, an, i)
		if errors.Is(err, branches.ErrNoLinearModel) && an.Branches[i].W != nil && an.Branches[i].Isolated() {
			lc, err := c.reparamCert(ctx, m, an, i, err)
			if err != nil {
				return nil, err
			}
			out = append(out, lc)
			continue
		}
		if errors.Is(err, branches.ErrNoLinearModel) {
			out = append(out, report.LinearCert{Branch: i, Skipped: err.Error()})
			continue
		}
		if err != nil {
			return nil, err
		}
		name := fmt.Sprintf("%s (branch %d, linearised)", m.File, i+1)
		lm, err := model.Parse(name, []byte(text))
		if err != nil {
			return nil, fmt.Errorf("the linear model of branch %d: %w", i+1, err)
		}
		res, err := direct.CheckPaving(ctx, lm, name, direct.PaveOptions{})
		if err != nil {
			if ctx.Err() != nil {
				return nil, ctx.Err()
			}
			out = append(out, report.LinearCert{Branch: i, Skipped: err.Error()})
			continue
		}
		lc := report.LinearCert{Branch: i, Model: text, Result: res}
		if c.Out != "" && res.Doc != nil {
			ext := filepath.Ext(c.Out)
			path := strings.TrimSuffix(c.Out, ext) + "-" + strconv.Itoa(i+1) + ext
			if err := certificates.WriteFile(res.Doc, path); err != nil {
				return nil, fmt.Errorf("writing the certificate: %w", err)
			}
			lc.Written = path
		}
		out = append(out, lc)
	}
	return out, nil
}

// reparamCert certifies the linearisation along a branch with a square
// root through its rational parametrization (branches.Reparametrize): the
// certificate is about the model in the new parameter, and its region is
// mapped back to the original one.
func (c *findCmd) reparamCert(ctx context.Context, m *model.Model, an *branches.Analysis, i int, why error) (report.LinearCert, error) {
	rp, err := branches.Reparametrize(ctx, m, an, i)
	if errors.Is(err, branches.ErrNoReparametrization) {
		return report.LinearCert{Branch: i, Skipped: fmt.Sprintf("%v; %v", why, err)}, nil
	}
	if err != nil {
		return report.LinearCert{}, err
	}
	text, err := branches.LinearModel(rp.Model, rp.Analysis, rp.Index)
	if errors.Is(err, branches.ErrNoLinearModel) {
		return report.LinearCert{Branch: i, Skipped: fmt.Sprintf("%v; in %s: %v", why, rp.NewParam, err)}, nil
	}
	if err != nil {
		return report.LinearCert{}, err
	}
	name := fmt.Sprintf("%s (branch %d in %s, linearised)", m.File, i+1, rp.NewParam)
	lm, err := model.Parse(name, []byte(text))
	if err != nil {
		return report.LinearCert{}, fmt.Errorf("the linear model of branch %d in %s: %w", i+1, rp.NewParam, err)
	}
	res, err := direct.CheckPaving(ctx, lm, name, direct.PaveOptions{})
	if err != nil {
		if ctx.Err() != nil {
			return report.LinearCert{}, ctx.Err()
		}
		return report.LinearCert{Branch: i, Skipped: err.Error()}, nil
	}
	var coords []string
	for k, s := range m.States {
		coords = append(coords, s+" = "+rp.Analysis.Branches[rp.Index].Coords[k].String())
	}
	pi, _ := an.Ring.Index(rp.Param)
	p, _ := m.Param(rp.Param)
	info := &report.Reparam{Param: rp.Param, NewParam: rp.NewParam, Radicand: an.Branches[i].W.String(), Relation: rp.Relation(),
		Model: rp.Text, Coordinates: strings.Join(coords, ", "), Ring: an.Ring, Index: pi}
	switch rg := res.Region; {
	case rg == nil:
		info.Region, err = rp.Region(nil, res.Verdict == checker.VerdictHolds, p.Range)
	case rg.Paving != nil:
		err = errors.New("the region in the new parameter is a paving")
	default:
		info.Region, err = rp.Region(rg.Pieces, false, p.Range)
	}
	if err != nil {
		info.Note = err.Error()
	}
	lc := report.LinearCert{Branch: i, Model: text, Result: res, Reparam: info}
	if c.Out != "" && res.Doc != nil {
		ext := filepath.Ext(c.Out)
		path := strings.TrimSuffix(c.Out, ext) + "-" + strconv.Itoa(i+1) + ext
		if err := certificates.WriteFile(res.Doc, path); err != nil {
			return report.LinearCert{}, fmt.Errorf("writing the certificate: %w", err)
		}
		lc.Written = path
	}
	return lc, nil
}

func paramNames(ps []model.Param) string {
	names := make([]string, len(ps))
	for i, p := range ps {
		names[i] = p.Name
	}
	return strings.Join(names, ", ")
}
