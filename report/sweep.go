package report

import (
	"context"
	"errors"
	"fmt"
	"io"
	"strings"

	"github.com/lyacert/lyacert/checker"
)

// SweepSummary is the summary of a sweep (its --json keys are a contract).
type SweepSummary struct {
	Model        string         `json:"model"`
	Params       []string       `json:"params"`
	GridPoints   int            `json:"grid_points"`
	Shard        string         `json:"shard"`
	ShardPoints  int            `json:"shard_points"`
	Done         int            `json:"done"`
	ThisRun      int            `json:"this_run"`
	Remaining    int            `json:"remaining"`
	Verdicts     map[string]int `json:"verdicts"`
	Complete     bool           `json:"complete"`
	Output       string         `json:"output"`
	Plot         string         `json:"plot"`
	Certificates string         `json:"certificates"`
	Boundaries   []string       `json:"boundaries"`
	Seconds      float64        `json:"seconds"`
}

// SweepText writes the summary of a sweep for a terminal; stopped is why an
// incomplete sweep stopped (a context error), or nil.
func SweepText(w io.Writer, s SweepSummary, stopped error) {
	fmt.Fprintf(w, "Sweep of %s over %s: %d grid points", s.Model, strings.Join(s.Params, ", "), s.GridPoints)
	if s.Shard != "0/1" {
		fmt.Fprintf(w, ", shard %s with %d", s.Shard, s.ShardPoints)
	}
	fmt.Fprintln(w)
	rate := ""
	if s.ThisRun > 0 && s.Seconds > 0 {
		rate = fmt.Sprintf(", %.0f points/s", float64(s.ThisRun)/s.Seconds)
	}
	fmt.Fprintf(w, "  %d done (%d in this run, %.1f s%s), %d remaining\n", s.Done, s.ThisRun, s.Seconds, rate, s.Remaining)
	var parts []string
	for _, v := range []string{checker.VerdictHolds, checker.VerdictFails, checker.VerdictUndecided} {
		parts = append(parts, fmt.Sprintf("%s %d", v, s.Verdicts[v]))
	}
	fmt.Fprintf(w, "  lines by verdict: %s\n", strings.Join(parts, ", "))
	for _, b := range s.Boundaries {
		fmt.Fprintf(w, "  the verdict changes %s\n", b)
	}
	if s.Output != "" {
		fmt.Fprintf(w, "  lines in %s\n", s.Output)
	}
	if s.Plot != "" {
		fmt.Fprintf(w, "  plot in %s\n", s.Plot)
	}
	if s.Certificates != "" {
		fmt.Fprintf(w, "  certificates in %s\n", s.Certificates)
	}
	if !s.Complete {
		why := "stopped"
		switch {
		case errors.Is(stopped, context.DeadlineExceeded):
			why = "stopped at the timeout"
		case errors.Is(stopped, context.Canceled):
			why = "interrupted"
		}
		fmt.Fprintf(w, "  %s: continue with --resume\n", why)
	}
	fmt.Fprintln(w, "  every line with a certificate_digest is backed by a certificate the exact checker accepted")
	fmt.Fprintf(w, "\n%s\n", Caution)
}
