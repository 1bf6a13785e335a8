package main

import (
	"bytes"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"lyacert/certificates"
	"lyacert/checker"
	"lyacert/sweep"
)

type mergeCmd struct {
	Files []string `arg:"" placeholder:"OUT.jsonl" help:"Outputs of the shards of one sweep (lyacert sweep --shard i/N -o ...)."`
	Out   string   `short:"o" name:"out" placeholder:"ALL.jsonl" help:"Write the merged lines to this file (atomically); standard output when omitted."`
	Plot  string   `name:"plot" placeholder:"FILE" help:"Plot the merged verdicts (.svg, .png or .pdf), as sweep --plot does."`
}

func init() {
	register("merge", "Combine the outputs of the shards of a sweep into what one unsharded run gives.", func() any { return &mergeCmd{} })
}

// Run merges shard outputs.
func (c *mergeCmd) Run(e *env) error { return exit(c.run(e)) }

func (c *mergeCmd) run(e *env) int {
	fail := func(code int, format string, args ...any) int {
		fmt.Fprintf(e.stderr, "lyacert: merge: "+format+"\n", args...)
		return code
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
		return fail(exitFails, "%v", err)
	}
	if err != nil {
		return fail(exitInput, "%v", err)
	}
	var buf bytes.Buffer
	merged.WriteTo(&buf)
	var points []gridPoint
	allHold := true
	for _, b := range merged.Blocks {
		lines := b.Lines()
		for _, l := range lines {
			if l.Verdict != checker.VerdictHolds {
				allHold = false
			}
		}
		points = append(points, gridPointOf(b.Index, lines))
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
	if c.Out != "" {
		fmt.Fprintf(e.stdout, "Merged %d grid points from %d files into %s\n", merged.Of, len(c.Files), c.Out)
	}
	if allHold {
		return exitHolds
	}
	return exitFails
}
