package main

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/report"
	"github.com/lyacert/lyacert/sweep"
)

type mergeCmd struct {
	common
	Files         []string `arg:"" placeholder:"OUT.jsonl" help:"Outputs of the shards of one sweep (lyacert sweep --shard i/N -o ...)."`
	Out           string   `short:"o" name:"out" placeholder:"ALL.jsonl" help:"Write the merged lines to this file (atomically); standard output when omitted."`
	Plot          string   `name:"plot" placeholder:"FILE" help:"Plot the merged verdicts (.svg, .png or .pdf), as sweep --plot does."`
	AllEquilibria bool     `name:"all-equilibria" help:"Exit 0 only if every equilibrium at every grid point is certified stable (default: the model's own), as for sweep."`
}

func init() {
	register("merge", "Combine the outputs of the shards of a sweep into what one unsharded run gives.", func() any { return &mergeCmd{} })
}

// Run merges shard outputs.
func (c *mergeCmd) Run(e *env) error { return exit(c.run(e)) }

func (c *mergeCmd) run(e *env) int {
	fail := func(code int, format string, args ...any) int {
		return e.failf(code, "merge: "+format, args...)
	}
	if c.Plot != "" && !slices.Contains([]string{".svg", ".png", ".pdf"}, strings.ToLower(filepath.Ext(c.Plot))) {
		return fail(exitInput, "--plot %s: the file must end in .svg, .png or .pdf", c.Plot)
	}
	var files []*sweep.File
	for _, name := range c.Files {
		data, err := os.ReadFile(name)
		if err != nil {
			return fail(exitInput, "%v", err)
		}
		f, err := sweep.Read(name, data)
		if err != nil {
			return fail(exitInput, "%v", err)
		}
		files = append(files, f)
	}
	merged, err := sweep.Merge(files)
	if errors.Is(err, sweep.ErrIncomplete) {
		return fail(exitMissing, "%v", err)
	}
	if err != nil {
		return fail(exitInput, "%v", err)
	}
	var buf bytes.Buffer
	merged.WriteTo(&buf)
	var points []gridPoint
	allHold := true
	verdicts := map[string]int{}
	for _, b := range merged.Blocks {
		lines := b.Lines()
		for _, l := range lines {
			verdicts[l.Verdict]++
		}
		p := gridPointOf(b.Index, lines)
		allHold = allHold && p.holds(c.AllEquilibria)
		points = append(points, p)
	}
	if c.Out == "" {
		e.stdout.Write(buf.Bytes())
	} else if err := certificates.WriteFileAtomic(c.Out, buf.Bytes(), 0o644); err != nil {
		return fail(exitInput, "%v", err)
	}
	if c.Plot != "" {
		if len(points[0].names) > 2 {
			return fail(exitInput, "--plot draws one or two swept parameters, not %d", len(points[0].names))
		}
		if err := plotSweep(c.Plot, strings.Join(c.Files, ", "), points); err != nil {
			return fail(exitInput, "plot: %v", err)
		}
	}
	sum := report.MergeSummary{Files: c.Files, GridPoints: merged.Of, Verdicts: verdicts, Holds: allHold}
	if c.Out != "" {
		sum.Output = &c.Out
	}
	if c.Plot != "" {
		sum.Plot = &c.Plot
	}
	w := e.stdout
	if c.Out == "" {
		w = e.stderr // standard output holds the lines
	}
	if c.JSON {
		writeJSON(w, report.MergeJSON(sum))
	} else if c.Out != "" {
		report.MergeText(w, sum)
	}
	if allHold {
		return exitHolds
	}
	return exitFails
}
