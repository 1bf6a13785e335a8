package main

import (
	"context"
	"fmt"
	"io"
	"lyacert/certify/direct"
	"lyacert/checker"
	"lyacert/report"
	"math/big"
	"os"
	"os/signal"
	"path/filepath"
	"slices"
	"strings"

	"github.com/schollz/progressbar/v3"

	"lyacert/certificates"
	"lyacert/model"
	"lyacert/poly"
)

// paveFlags are the options of check for regions in several parameters.
type paveFlags struct {
	Box        []string `name:"box" placeholder:"NAME=LO:HI" help:"Pave this range of a parameter instead of its allowed range (repeatable), e.g. --box r=0:2."`
	Resolution string   `name:"resolution" default:"1/256" placeholder:"P/Q" help:"Halve boxes until each side is at most this share of the box's side."`
	Plot       string   `name:"plot" placeholder:"FILE.svg|FILE.png" help:"Draw the paving (two parameters, or a 2-D slice) to this file."`
	Slice      []string `name:"slice" placeholder:"NAME=VALUE" help:"For more than two paved parameters: fix all but two for the plot (repeatable)."`
	Workers    int      `name:"workers" default:"0" help:"Goroutines for the paving (0: one per core); the result does not depend on it."`
}

// requested reports whether the user asked for a paving explicitly.
func (pf *paveFlags) requested() bool {
	return pf != nil && (len(pf.Box) > 0 || pf.Plot != "" || len(pf.Slice) > 0 || pf.Resolution != "1/256")
}

// options reads the flags into certify's paving options.
func (pf *paveFlags) options(e *env) (direct.PaveOptions, error) {
	var o direct.PaveOptions
	if pf == nil {
		return o, nil
	}
	res, err := constant(pf.Resolution, "--resolution")
	if err != nil {
		return o, err
	}
	o.Resolution = res
	o.Workers = pf.Workers
	o.Box = map[string][2]*big.Rat{}
	for _, s := range pf.Box {
		name, rng, ok := strings.Cut(s, "=")
		lo, hi, ok2 := strings.Cut(rng, ":")
		name = strings.TrimSpace(name)
		if !ok || !ok2 || name == "" {
			return o, fmt.Errorf("--box %q: expected NAME=LO:HI, e.g. r=0:2", s)
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
	if f, ok := e.stderr.(*os.File); ok {
		if st, err := f.Stat(); err == nil && st.Mode()&os.ModeCharDevice != 0 {
			o.Progress = newBar(f)
		}
	}
	return o, nil
}

// constant reads an exact number or constant expression such as 1/256, -2, 0.35.
func constant(s, what string) (*big.Rat, error) {
	r := poly.NewRing(nil, nil)
	f, err := poly.ParseExpr(r, func(string) (poly.RatFunc, bool) { return poly.RatFunc{}, false }, strings.TrimSpace(s), poly.Pos{File: what, Line: 1, Col: 1})
	if err != nil {
		return nil, err
	}
	return f.Num.ConstTerm(), nil
}

// bar draws the paving's progress on a terminal.
type bar struct{ b *progressbar.ProgressBar }

func newBar(w io.Writer) *bar {
	return &bar{progressbar.NewOptions(1000,
		progressbar.OptionSetWriter(w),
		progressbar.OptionSetDescription("paving"),
		progressbar.OptionClearOnFinish(),
		progressbar.OptionSetWidth(30),
	)}
}

func (b *bar) Paved(share float64) {
	b.b.Set(int(share * 1000))
	if share >= 1 {
		b.b.Finish()
	}
}

// check runs the engine with the paving flags (defaults when pf is nil).
func (pf *paveFlags) check(ctx context.Context, m *model.Model, name string, e *env) (*direct.Result, error) {
	o, err := pf.options(e)
	if err != nil {
		return nil, fmt.Errorf("%w: %w", direct.ErrPaveOptions, err)
	}
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
	if !paved && pf.requested() {
		why := res.PavingNote
		if why == "" {
			why = "no paving: the conditions that remain involve fewer than two parameters"
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
		fmt.Fprintln(e.stderr, "lyacert: --plot:", err)
		return exitInput
	}
	return 0
}

// writePlot reads the --slice flags (every paved parameter but two fixed
// to a value within its side) and writes report.PavingPlot's drawing, SVG
// or PNG by the file's extension, atomically.
func writePlot(path string, pv *checker.Paving, slice []string) error {
	format := strings.ToLower(strings.TrimPrefix(filepath.Ext(path), "."))
	if format != "svg" && format != "png" {
		return fmt.Errorf("%s: the file must end in .svg or .png", path)
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
