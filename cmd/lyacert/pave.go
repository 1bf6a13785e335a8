package main

import (
	"context"
	"fmt"
	"maps"
	"math/big"
	"os"
	"os/signal"
	"path/filepath"
	"slices"
	"strings"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/certify/direct"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
	"github.com/lyacert/lyacert/report"
)

// paveFlags are the options of check for regions in several parameters.
type paveFlags struct {
	Box        []string `name:"box" placeholder:"NAME=LO..HI" help:"Pave this range of a parameter instead of its allowed range (repeatable), e.g. --box r=0..2."`
	Resolution string   `name:"resolution" default:"1/256" placeholder:"P/Q" help:"Halve boxes until each side is at most this share of the box's side."`
	Plot       string   `name:"plot" placeholder:"FILE.svg|FILE.png|FILE.pdf" help:"Draw the region to this file: a strip for one parameter, the paving for two (or a 2-D slice of more, with --slice)."`
	Slice      []string `name:"slice" placeholder:"NAME=VALUE" help:"For more than two paved parameters: fix all but two for the plot (repeatable)."`
	Workers    int      `name:"workers" default:"0" help:"Goroutines for the paving (0: one per core); the result does not depend on it."`
	sdpOut     string   // check --sdp-out, carried to runCheck
	boxSOS     bool     // check --box-sos, carried to runCheck
}

// requested reports whether the user asked for a paving explicitly.
func (pf *paveFlags) requested() bool {
	return pf != nil && (len(pf.Box) > 0 || pf.Plot != "" || len(pf.Slice) > 0 || pf.Resolution != "1/256")
}

// options reads the flags into certify's paving options. A plot that
// cannot be drawn is refused here or, once the paved parameters are known,
// by the Plan hook: before the paving, never after it.
func (pf *paveFlags) options(m *model.Model, e *env) (direct.PaveOptions, *bar, error) {
	var o direct.PaveOptions
	if pf == nil {
		return o, nil, nil
	}
	res, err := constant(pf.Resolution, "--resolution")
	if err != nil {
		return o, nil, err
	}
	o.Resolution = res
	o.Workers = pf.Workers
	o.Box = map[string][2]*big.Rat{}
	for _, s := range pf.Box {
		name, lo, hi, err := parseBox(s)
		if err != nil {
			return o, nil, err
		}
		if _, dup := o.Box[name]; dup {
			return o, nil, fmt.Errorf("--box %s: given twice", name)
		}
		l, err := constant(lo, "--box "+name+" (lower end)")
		if err != nil {
			return o, nil, err
		}
		h, err := constant(hi, "--box "+name+" (upper end)")
		if err != nil {
			return o, nil, err
		}
		o.Box[name] = [2]*big.Rat{l, h}
	}
	if pf.Plot != "" {
		if _, err := plotFormat(pf.Plot); err != nil {
			return o, nil, err
		}
		if len(m.FreeParams()) == 0 {
			return o, nil, fmt.Errorf("--plot %s: the model has no free parameter, so there is no region to draw", pf.Plot)
		}
		slice, err := pf.slice(m)
		if err != nil {
			return o, nil, err
		}
		o.Plan = func(params []string) error { return planPlot(params, slice) }
	}
	b := newBar(e.stderr, "paving", "", 1)
	if b != nil {
		o.Progress = paveProgress{b}
	}
	return o, b, nil
}

// plotFormat is the picture format a --plot file's extension asks for.
func plotFormat(path string) (string, error) {
	format := strings.ToLower(strings.TrimPrefix(filepath.Ext(path), "."))
	if !slices.Contains(report.PlotFormats, format) {
		return "", fmt.Errorf("--plot %s: the file must end in .svg, .png or .pdf", path)
	}
	return format, nil
}

// slice reads the --slice flags: each names a free parameter of the model
// and gives it an exact value.
func (pf *paveFlags) slice(m *model.Model) (map[string]*big.Rat, error) {
	fixed := map[string]*big.Rat{}
	for _, s := range pf.Slice {
		name, val, ok := strings.Cut(s, "=")
		name = strings.TrimSpace(name)
		if !ok || name == "" {
			return nil, fmt.Errorf("--slice %q: expected NAME=VALUE", s)
		}
		if p, ok := m.Param(name); !ok || p.Fixed != nil {
			return nil, fmt.Errorf("--slice %s: not a free parameter of the model", name)
		}
		if _, dup := fixed[name]; dup {
			return nil, fmt.Errorf("--slice %s: given twice", name)
		}
		v, err := constant(val, "--slice "+name)
		if err != nil {
			return nil, err
		}
		fixed[name] = v
	}
	return fixed, nil
}

// planPlot refuses, before the paving starts, a plot of the paved
// parameters that cannot be drawn: every paved parameter but two must be
// fixed by --slice, and only paved parameters can be.
func planPlot(params []string, slice map[string]*big.Rat) error {
	for _, name := range slices.Sorted(maps.Keys(slice)) {
		if !slices.Contains(params, name) {
			return fmt.Errorf("--slice %s: not a paved parameter (paved: %s)", name, strings.Join(params, ", "))
		}
	}
	if free := len(params) - len(slice); free != 2 {
		return fmt.Errorf("the plot needs exactly two free axes: %d parameters are paved (%s), so give --slice for all but two", len(params), strings.Join(params, ", "))
	}
	return nil
}

// parseBox reads a --box range "NAME=LO..HI". The colon form of earlier
// versions is refused with the new spelling (a colon reads start:step:stop
// to many engineers).
func parseBox(s string) (name, lo, hi string, err error) {
	name, rng, ok := strings.Cut(s, "=")
	name = strings.TrimSpace(name)
	if ok && name != "" && strings.Contains(rng, ":") {
		l, h, _ := strings.Cut(rng, ":")
		return "", "", "", fmt.Errorf("--box %q: ranges are now written with two dots: --box %s=%s..%s", s, name, strings.TrimSpace(l), strings.TrimSpace(h))
	}
	lo, hi, ok2 := strings.Cut(rng, "..")
	if !ok || !ok2 || name == "" || strings.Contains(hi, "..") || strings.HasPrefix(hi, ".") {
		return "", "", "", fmt.Errorf("--box %q: expected NAME=LO..HI, e.g. --box r=0..2", s)
	}
	return name, lo, hi, nil
}

// constant reads an exact number or constant expression such as 1/256, -2, 0.35.
func constant(s, what string) (*big.Rat, error) {
	return poly.ParseConstant(strings.TrimSpace(s), poly.Pos{File: what, Line: 1, Col: 1})
}

// check runs the engine with the paving flags (defaults when pf is nil).
func (pf *paveFlags) check(ctx context.Context, m *model.Model, name string, e *env) (*direct.Result, error) {
	o, b, err := pf.options(m, e)
	if err != nil {
		return nil, fmt.Errorf("%w: %w", direct.ErrPaveOptions, err)
	}
	// The bar is gone before the first line of output.
	defer b.stop()
	// An interrupt stops a long paving cleanly (nothing is written).
	ctx, stop := signal.NotifyContext(ctx, os.Interrupt)
	defer stop()
	return direct.CheckPaving(ctx, m, name, o)
}

// finish writes the plot and reports on standard error a paving that was
// asked for and could not be made; it returns an exit code: 0 when nothing
// went wrong, exitInput when the plot cannot be made.
func (pf *paveFlags) finish(res *direct.Result, e *env) int {
	if pf == nil {
		return 0
	}
	paved := res.Region != nil && res.Region.Paving != nil
	oneParam := res.Region != nil && res.Region.Param != ""
	if pf.Plot != "" && oneParam && !paved {
		if err := writeRegionPlot(pf.Plot, res.Doc); err != nil {
			fmt.Fprintln(e.stderr, "lyacert: --plot:", err)
			return exitInput
		}
		return 0
	}
	if !paved && pf.requested() {
		why := res.PavingNote
		if why == "" {
			why = "no paving: the conditions that remain involve fewer than two parameters"
			if pf.Plot != "" {
				why = "nothing to plot: the conditions that remain decide the verdict for every parameter value at once"
			}
		}
		fmt.Fprintln(e.stderr, "lyacert: "+why)
		if pf.Plot != "" {
			return exitInput // what was asked for cannot be drawn
		}
		return 0
	}
	if pf.Plot == "" {
		return 0
	}
	if err := writePlot(pf.Plot, res.Region.Paving, pf.Slice); err != nil {
		return e.failf(exitInput, "--plot: %w", err)
	}
	return 0
}

// writeRegionPlot writes report.RegionPlot's strip of a one-parameter
// region, atomically.
func writeRegionPlot(path string, doc *claims.Document) error {
	format, err := plotFormat(path)
	if err != nil {
		return err
	}
	data, err := report.RegionPlot(doc, format)
	if err != nil {
		return err
	}
	return certificates.WriteFileAtomic(path, data, 0o644)
}

// writePlot reads the --slice flags (every paved parameter but two fixed
// to a value within its side) and writes report.PavingPlot's drawing, in
// the format of the file's extension, atomically. The names and the number
// of slices were checked before the paving (planPlot); the values can only
// be checked against the sides now.
func writePlot(path string, pv *claims.Paving, slice []string) error {
	format, err := plotFormat(path)
	if err != nil {
		return err
	}
	fixed := map[int]*big.Rat{}
	for _, s := range slice {
		name, val, ok := strings.Cut(s, "=")
		name = strings.TrimSpace(name)
		if !ok {
			return fmt.Errorf("--slice %q: expected NAME=VALUE", s)
		}
		i := slices.Index(pv.Params, name)
		if i < 0 {
			return fmt.Errorf("--slice %s: not a paved parameter (paved: %s)", name, strings.Join(pv.Params, ", "))
		}
		v, err := constant(val, "--slice "+name)
		if err != nil {
			return err
		}
		lo, _ := new(big.Rat).SetString(pv.Box[i].Lo)
		hi, _ := new(big.Rat).SetString(pv.Box[i].Hi)
		if v.Cmp(lo) < 0 || v.Cmp(hi) > 0 {
			return fmt.Errorf("--slice %s=%s lies outside the paved side [%s, %s]", name, v.RatString(), pv.Box[i].Lo, pv.Box[i].Hi)
		}
		fixed[i] = v
	}
	if free := len(pv.Params) - len(fixed); free != 2 {
		return fmt.Errorf("the plot needs exactly two free axes: %d parameters are paved (%s), so give --slice for all but two", len(pv.Params), strings.Join(pv.Params, ", "))
	}
	data, err := report.PavingPlot(pv, fixed, format)
	if err != nil {
		return err
	}
	return certificates.WriteFileAtomic(path, data, 0o644)
}
