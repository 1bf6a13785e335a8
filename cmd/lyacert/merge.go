package main

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"lyacert/certificates"
	"lyacert/checker"
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
	byIndex := map[int]sweepBlock{}
	of := -1
	for _, name := range c.Files {
		data, err := os.ReadFile(name)
		if err != nil {
			return fail(exitInput, "%v", err)
		}
		blocks, good, err := parseSweepLines(name, data)
		if err != nil {
			return fail(exitInput, "%v", err)
		}
		if good < len(data) {
			return fail(exitFails, "%s ends in an interrupted grid point; finish that shard with --resume first", name)
		}
		for _, b := range blocks {
			l := b.records[0].line
			if of >= 0 && l.Of != of {
				return fail(exitInput, "%s: grid point %d belongs to a grid of %d points, the others to one of %d: not shards of one sweep", name, b.index, l.Of, of)
			}
			of = l.Of
			if prev, ok := byIndex[b.index]; ok {
				if !sameBlock(prev, b) {
					return fail(exitInput, "%s: grid point %d appears twice with different lines", name, b.index)
				}
				continue
			}
			byIndex[b.index] = b
		}
	}
	if of < 0 {
		return fail(exitInput, "no sweep lines in %s", strings.Join(c.Files, ", "))
	}
	var missing []int
	for k := 0; k < of; k++ {
		if _, ok := byIndex[k]; !ok {
			missing = append(missing, k)
		}
	}
	if len(missing) > 0 {
		return fail(exitFails, "incomplete: %d of %d grid points missing (the first is %d); run the shard that owns them, or finish it with --resume", len(missing), of, missing[0])
	}
	var buf bytes.Buffer
	var points []gridPoint
	allHold := true
	for k := 0; k < of; k++ {
		b := byIndex[k]
		for _, r := range b.records {
			buf.Write(r.raw)
			if r.line.Verdict != checker.VerdictHolds {
				allHold = false
			}
		}
		points = append(points, gridPointOf(b))
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
		fmt.Fprintf(e.stdout, "Merged %d grid points from %d files into %s\n", of, len(c.Files), c.Out)
	}
	if allHold {
		return exitHolds
	}
	return exitFails
}

func sameBlock(a, b sweepBlock) bool {
	return slices.EqualFunc(a.records, b.records, func(x, y sweepRecord) bool { return bytes.Equal(x.raw, y.raw) })
}
