package main

import (
	"bufio"
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"path/filepath"
	"runtime/debug"
	"slices"
	"strings"
	"syscall"
	"time"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/report"
	"github.com/lyacert/lyacert/sweep"
)

type sweepCmd struct {
	common
	File          string        `arg:"" help:"Model file (.lya), or - for standard input."`
	Grid          []string      `name:"grid" required:"" placeholder:"NAME=LO..HI" help:"Sweep a parameter from LO to HI inclusive, e.g. --grid r=0..30 (repeatable; the last one varies fastest)."`
	Points        []string      `name:"points" placeholder:"N|NAME=N" help:"Number of exact, evenly spaced values of every swept parameter (--points 61) or of one (--points r=61, repeatable)."`
	AllEquilibria bool          `name:"all-equilibria" help:"Exit 0 only if every equilibrium at every grid point is certified stable (default: the model's own, its at point or the origin)."`
	Set           []string      `name:"set" placeholder:"NAME=VALUE" help:"Fix a parameter to an exact value for the whole sweep (repeatable)."`
	Q             string        `name:"q" placeholder:"DIAG" default:"identity" help:"Q of the Lyapunov equation, as for find."`
	Out           string        `short:"o" name:"out" placeholder:"OUT.jsonl" help:"Write the lines to this file (through OUT.jsonl.partial, renamed when the sweep is complete); standard output when omitted."`
	Plot          string        `name:"plot" placeholder:"FILE" help:"Plot the verdicts over one or two swept parameters (.svg, .png or .pdf)."`
	Timeout       time.Duration `name:"timeout" placeholder:"DURATION" help:"Stop cleanly after this long (e.g. 30m); continue later with --resume."`
	Resume        bool          `name:"resume" help:"Continue the output file of an interrupted sweep without redoing finished grid points."`
	Shard         string        `name:"shard" placeholder:"i/N" default:"0/1" help:"Run the i-th of N slices of the grid (the points with index mod N = i); merge the outputs with lyacert merge."`
	Jobs          int           `name:"jobs" placeholder:"N" help:"Number of workers (default: every core)."`
	MaxPoints     int           `name:"max-points" placeholder:"N" help:"Stop cleanly after N grid points of this run (continue with --resume)."`
	Certificates  string        `name:"certificates" placeholder:"DIR" help:"Write the certificate behind every line into DIR as INDEX-EQ.json."`
	Full          bool          `name:"full" help:"At rational stable equilibria run the full nonlinear check of V (can give a global claim; slower)."`
	limitFlags
}

func init() {
	register("sweep", "Find and certify the equilibria at every point of a parameter grid, in parallel and resumably.", func() any { return &sweepCmd{} })
}

// Run sweeps a parameter grid.
func (c *sweepCmd) Run(e *env) error {
	// A sweep allocates many short-lived exact numbers; collecting garbage
	// less often buys throughput for a modest amount of memory. GOGC, when
	// set, still wins.
	if os.Getenv("GOGC") == "" {
		debug.SetGCPercent(400)
	}
	return exit(c.run(e))
}

func (c *sweepCmd) run(e *env) int {
	// A sweep allocates many short-lived values per point and keeps little
	// alive: the garbage collector's target sweep.GCPercent costs a few
	// megabytes and lets two workers scale. A GOGC set by the user wins.
	if os.Getenv("GOGC") == "" {
		defer debug.SetGCPercent(debug.SetGCPercent(sweep.GCPercent))
	}
	fail := func(format string, args ...any) int {
		return e.failf(exitInput, format, args...)
	}
	if !c.limitFlags.apply(e) {
		return exitInput
	}
	name, src, err := readInput(c.File, e.stdin)
	if err != nil {
		return fail("%v", err)
	}
	settings, err := parseSettings(c.Set)
	if err != nil {
		return fail("%v", err)
	}
	grid, err := sweep.ParseGrid(c.Grid, c.Points)
	if err != nil {
		return e.fail(exitInput, err)
	}
	shard, err := sweep.ParseShard(c.Shard)
	if err != nil {
		return fail("%v", err)
	}
	if err := sweep.CheckSweep(name, src, settings, grid); err != nil {
		return e.fail(exitInput, err)
	}
	m, _ := model.Parse(name, src, settings...)
	q, err := parseQ(c.Q, len(m.States))
	if err != nil {
		return fail("%v", err)
	}
	if c.Plot != "" && len(grid) > 2 {
		return fail("--plot draws one or two swept parameters, not %d", len(grid))
	}
	if c.Plot != "" && !slices.Contains([]string{".svg", ".png", ".pdf"}, strings.ToLower(filepath.Ext(c.Plot))) {
		return fail("--plot %s: the file must end in .svg, .png or .pdf", c.Plot)
	}
	if c.Resume && c.Out == "" {
		return fail("--resume continues an output file: give it with -o")
	}
	if c.MaxPoints < 0 || c.Jobs < 0 {
		return fail("--max-points and --jobs must not be negative")
	}
	if c.Jobs > sweep.MaxJobs() {
		return fail("--jobs %d: at most %d workers (four per CPU, at least 256)", c.Jobs, sweep.MaxJobs())
	}
	size, _ := grid.Size()
	opts := sweep.SweepOptions{
		File: name, Src: src, Settings: settings, Grid: grid, Shard: shard, Q: q, Full: c.Full,
		Jobs: c.Jobs, MaxPoints: c.MaxPoints,
	}
	id, err := opts.Identity()
	if err != nil {
		return fail("%v", err)
	}

	// Output: a file written through OUT.partial, or standard output.
	var previous []sweep.Block
	var out io.Writer = e.stdout
	var file *os.File
	partial := c.Out + ".partial"
	if c.Out != "" {
		lock, err := sweep.LockOutput(c.Out)
		if err != nil {
			return fail("%v", err)
		}
		defer lock.Unlock()
		previous, file, err = openSweepOutput(c.Out, partial, c.Resume, id, grid, shard)
		if err != nil {
			return fail("%v", err)
		}
		defer file.Close()
		out = file
	}
	opts.Resume = len(previous)
	if c.Certificates != "" {
		if err := os.MkdirAll(c.Certificates, 0o755); err != nil {
			return fail("%v", err)
		}
	}

	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	if c.Timeout > 0 {
		var cancel context.CancelFunc
		ctx, cancel = context.WithTimeout(ctx, c.Timeout)
		defer cancel()
	}
	todo := shard.Points(size) - opts.Resume
	if c.MaxPoints > 0 {
		todo = min(todo, c.MaxPoints)
	}
	var progress sweep.Progress
	var bar *bar
	if todo > 0 {
		bar = newBar(e.stderr, "sweep", "points", todo)
	}
	if bar != nil {
		progress = bar
	}
	if bar != nil && file == nil {
		// Lines on the terminal never share a line with the bar.
		out = lineWriter{out, bar}
	}
	defer bar.stop()

	w := bufio.NewWriterSize(out, 1<<16)
	points := []gridPoint{}
	for _, b := range previous {
		points = append(points, gridPointOf(b.Index, b.Lines()))
	}
	lastSync := time.Now()
	flush := func() error {
		if err := w.Flush(); err != nil {
			return err
		}
		if file != nil {
			return file.Sync()
		}
		return nil
	}
	start := time.Now()
	opts.Progress = progress
	sum, err := sweep.Sweep(ctx, opts, func(sp sweep.SweepPoint) error {
		// One grid point's lines are written together and complete.
		for i := range sp.Lines {
			if _, err := w.Write(sp.Lines[i].Marshal()); err != nil {
				return err
			}
			if d := sp.Docs[i]; d != nil && c.Certificates != "" {
				path := filepath.Join(c.Certificates, fmt.Sprintf("%d-%d.json", sp.Index, sp.Lines[i].Eq))
				if err := certificates.WriteFile(d, path); err != nil {
					return err
				}
			}
		}
		points = append(points, gridPointOf(sp.Index, sp.Lines))
		if file == nil || time.Since(lastSync) > time.Second {
			lastSync = time.Now()
			return flush()
		}
		return nil
	})
	elapsed := time.Since(start)
	if ferr := flush(); err == nil {
		err = ferr
	}
	bar.stop() // before the summary and any message
	if err != nil {
		return e.failf(exitInput, "sweep: %w", err)
	}
	complete := sum.Remaining == 0
	if file != nil && complete {
		if err := file.Close(); err != nil {
			return fail("%v", err)
		}
		if err := os.Rename(partial, c.Out); err != nil {
			return fail("%v", err)
		}
	}
	plotted := ""
	if c.Plot != "" && len(points) > 0 {
		if err := plotSweep(c.Plot, name, points); err != nil {
			return fail("plot: %v", err)
		}
		plotted = c.Plot
	}
	verdicts := map[string]int{}
	allHold := len(points) > 0
	for _, b := range previous {
		for _, r := range b.Records {
			verdicts[r.Line.Verdict]++
		}
	}
	for k, v := range sum.Verdicts {
		verdicts[k] += v
	}
	for _, p := range points {
		if !p.holds(c.AllEquilibria) {
			allHold = false
		}
	}
	summary := e.stdout
	if c.Out == "" {
		summary = e.stderr
	}
	s := report.SweepSummary{
		Model: name, Params: axisNames(grid), GridPoints: size, Shard: c.Shard, ShardPoints: len(points) + sum.Remaining,
		Done: len(points), ThisRun: sum.Points, Remaining: sum.Remaining, Verdicts: verdicts, Complete: complete,
		Output: c.Out, Plot: plotted, Certificates: c.Certificates, Boundaries: boundaries(points),
		Seconds: elapsed.Seconds(),
	}
	if !complete {
		s.Output = partial
	}
	if c.JSON {
		writeJSON(summary, s)
	} else {
		report.SweepText(summary, s, ctx.Err())
	}
	switch {
	case !complete:
		return exitStopped
	case !allHold:
		return exitFails
	}
	return exitHolds
}

func axisNames(g sweep.Grid) []string {
	var out []string
	for _, a := range g {
		out = append(out, a.Name)
	}
	return out
}

// openSweepOutput opens OUT.partial for appending; the caller holds the
// output's lock. Without resume it must not exist (it would be the progress
// of an interrupted sweep). With resume the lines already there, or in a
// complete OUT, are read back and checked against this sweep
// (sweep.File.CheckResume); an interrupted last line or grid point is cut
// off, nothing else is touched.
func openSweepOutput(out, partial string, resume bool, id sweep.Identity, grid sweep.Grid, shard sweep.Shard) ([]sweep.Block, *os.File, error) {
	if !resume {
		f, err := os.OpenFile(partial, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
		if errors.Is(err, os.ErrExist) {
			return nil, nil, fmt.Errorf("%s exists: an interrupted sweep left it; continue it with --resume, or delete it to start over", partial)
		}
		return nil, f, err
	}
	src := partial
	data, err := os.ReadFile(partial)
	if errors.Is(err, os.ErrNotExist) {
		src = out
		data, err = os.ReadFile(out)
		if errors.Is(err, os.ErrNotExist) {
			data, err = nil, nil
		}
	}
	if err != nil {
		return nil, nil, err
	}
	f, err := sweep.Read(src, data)
	if err != nil {
		return nil, nil, fmt.Errorf("--resume: %w", err)
	}
	if err := f.CheckResume(id, grid, shard); err != nil {
		return nil, nil, fmt.Errorf("--resume: %w", err)
	}
	if src == out {
		// A complete file stays as it is; continue in a copy.
		if err := certificates.WriteFileAtomic(partial, data[:f.Good], 0o644); err != nil {
			return nil, nil, err
		}
	} else if !f.Complete() {
		// Cut off the interrupted tail: the last grid point is redone.
		if err := os.Truncate(partial, int64(f.Good)); err != nil {
			return nil, nil, err
		}
	}
	file, err := os.OpenFile(partial, os.O_WRONLY|os.O_APPEND, 0o644)
	return f.Blocks, file, err
}
