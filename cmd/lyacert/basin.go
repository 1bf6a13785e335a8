package main

import (
	"context"
	"errors"
	"slices"
	"strings"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/certify"
	"github.com/lyacert/lyacert/certify/basin"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/report"
)

type basinCmd struct {
	common
	File     string   `arg:"" help:"Model file (.lya) with V, continuous time, or - for standard input."`
	Out      string   `short:"o" name:"out" placeholder:"CERT" help:"Write the certificate (the direct method's claims and the sublevel basin) to this file (atomically)."`
	Set      []string `name:"set" placeholder:"NAME=VALUE" help:"Fix a parameter to an exact value (repeatable); a parameter left free needs a closed bounded range (parameter a in [1, 2]), and the level then holds for every parameter value in the box."`
	Plot     string   `name:"plot" placeholder:"FILE" help:"Draw the certified set, V̇ = 0, the counterexample and trajectories to FILE (.svg, .png or .pdf): in the plane of two states, the others at the equilibrium."`
	Plane    []string `name:"plane" placeholder:"STATE,STATE" help:"The two states of the plot's plane (default: the first two); the other states are fixed at the equilibrium."`
	Gap      float64  `name:"gap" default:"0.01" help:"Stop refining when (c_hi − c_lo)/c_hi is at most this."`
	MaxBoxes int      `name:"max-boxes" default:"300000" help:"At most this many boxes in the bisection tree."`
	Method   string   `name:"method" default:"auto" enum:"auto,bb,sos" help:"How c_lo is certified: bb (interval branch and bound), sos (the S-procedure: sums of squares with a multiplier of c − V; every parameter fixed, V radially unbounded), auto (the S-procedure where it applies, the branch and bound unless it closed the gap; the larger level)."`
	Improve  bool     `name:"improve" help:"Search quadratic V = yᵀPy with AᵀP + PA = −Q over many Q (A the linearization, Hurwitz) for the largest certified ball about the equilibrium; keep the best."`
	limitFlags
	timeoutFlag
}

func init() {
	register("basin", "Estimate the region of attraction by sublevel sets of V: a certified level and a counterexample level.", func() any { return &basinCmd{} })
}

// Run estimates the region of attraction.
func (c *basinCmd) Run(e *env) error { return exit(c.run(e)) }

func (c *basinCmd) run(e *env) int {
	if !c.limitFlags.apply(e) {
		return exitInput
	}
	name, src, err := readInput(c.File, e.stdin)
	if err != nil {
		return e.fail(exitInput, err)
	}
	settings, err := parseSettings(c.Set)
	if err != nil {
		return e.fail(exitInput, err)
	}
	format := ""
	if c.Plot != "" {
		if format, err = plotFormat(c.Plot); err != nil {
			return e.fail(exitInput, err)
		}
	}
	if len(c.Plane) > 0 && c.Plot == "" {
		return e.failf(exitInput, "--plane chooses the plane of --plot; give --plot FILE too")
	}
	if !(c.Gap > 0 && c.Gap < 1) || c.MaxBoxes < 1 {
		return e.failf(exitInput, "--gap must lie in (0, 1) and --max-boxes be positive")
	}
	ctx, cancel := c.timeoutFlag.budget()
	defer cancel()
	return within(ctx, e, func(ctx context.Context, e *env) int {
		m, err := model.Parse(name, src, settings...)
		if err != nil {
			return e.fail(exitInput, err)
		}
		for _, s := range c.Plane {
			if !slices.Contains(m.States, s) || len(c.Plane) != 2 || c.Plane[0] == c.Plane[1] {
				return e.failf(exitInput, "--plane names two different states of the model (states: %s), not %q", strings.Join(m.States, ", "), strings.Join(c.Plane, ","))
			}
		}
		var res *basin.Result
		var imp *basin.Improvement
		if c.Improve {
			imp, err = basin.Improve(ctx, m, name, basin.Options{Gap: c.Gap, MaxBoxes: c.MaxBoxes, Method: c.Method}, basin.ImproveOptions{})
			if err == nil {
				res = imp.Result
			}
		} else {
			res, err = basin.Find(ctx, m, name, basin.Options{Gap: c.Gap, MaxBoxes: c.MaxBoxes, Method: c.Method})
		}
		if err != nil {
			if errors.Is(err, certify.ErrUnverified) {
				return e.fail(exitRejected, err)
			}
			return e.fail(exitInput, err)
		}
		if c.Out != "" {
			if err := certificates.WriteFile(res.Doc, c.Out); err != nil {
				return e.failf(exitInput, "writing the certificate: %w", err)
			}
		}
		if c.Plot != "" {
			data, err := report.BasinPlot(res, format, c.Plane...)
			if err == nil {
				err = certificates.WriteFileAtomic(c.Plot, data, 0o644)
			}
			if err != nil {
				return e.failf(exitInput, "--plot: %w", err)
			}
		}
		switch {
		case c.JSON && imp != nil:
			writeJSON(e.stdout, report.ImproveJSON(imp, c.Out))
		case c.JSON:
			writeJSON(e.stdout, report.BasinJSON(res, c.Out))
		case imp != nil:
			report.ImproveText(e.stdout, imp, c.Out)
		default:
			report.BasinText(e.stdout, res, c.Out)
		}
		if res.Upper != nil && res.Gap() > c.Gap {
			return exitFails // certified, but the gap was not closed
		}
		return exitHolds
	})
}
