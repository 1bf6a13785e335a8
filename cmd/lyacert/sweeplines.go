package main

// The presentation of sweep lines for summaries and plots: the verdicts at
// a grid point summed up, and where they change. Reading, checking, resuming
// and merging the lines is package sweep's.

import (
	"fmt"
	"slices"
	"strconv"
	"strings"

	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/sweep"
)

// pointCategory sums up the verdicts at one grid point for plots and
// summaries.
type pointCategory int

const (
	catUndecided pointCategory = iota // nothing certified either way, or no equilibrium
	catUnstable                       // every equilibrium certified unstable
	catMixed                          // some certified stable, not all
	catStable                         // every equilibrium certified stable
)

var categoryNames = [...]string{
	catUndecided: "not decided",
	catUnstable:  "every equilibrium certified unstable",
	catMixed:     "some equilibria certified stable",
	catStable:    "every equilibrium certified stable",
}

func (c pointCategory) String() string { return categoryNames[c] }

func categoryOf(lines []sweep.SweepLine) pointCategory {
	holds, fails, other := 0, 0, 0
	for _, l := range lines {
		switch {
		case l.Eqs == 0:
			other++
		case l.Verdict == checker.VerdictHolds:
			holds++
		case l.Verdict == checker.VerdictFails:
			fails++
		default:
			other++
		}
	}
	switch {
	case holds > 0 && fails+other == 0:
		return catStable
	case holds > 0:
		return catMixed
	case fails > 0 && other == 0:
		return catUnstable
	}
	return catUndecided
}

// gridPoint is a grid point for plots and summaries: its parameter values
// (as read from the lines) and category.
type gridPoint struct {
	index  int
	names  []string
	values []float64
	exact  []string
	cat    pointCategory
	// own is the verdict of the model's own equilibrium ("" when it is not
	// among the point's equilibria).
	own string
}

// holds reports whether the point counts as holding for an exit status:
// its own equilibrium certified stable, or every equilibrium with all.
func (p gridPoint) holds(all bool) bool {
	if all {
		return p.cat == catStable
	}
	return p.own == checker.VerdictHolds
}

func gridPointOf(index int, lines []sweep.SweepLine) gridPoint {
	p := lines[0].Params
	gp := gridPoint{index: index, names: p.Keys, exact: p.Values, cat: categoryOf(lines)}
	for _, l := range lines {
		if l.Own {
			gp.own = l.Verdict
		}
	}
	for _, s := range p.Values {
		gp.values = append(gp.values, ratFloat(s))
	}
	return gp
}

func ratFloat(s string) float64 {
	if v, err := strconv.ParseFloat(s, 64); err == nil {
		return v
	}
	num, den, ok := strings.Cut(s, "/")
	a, err1 := strconv.ParseFloat(num, 64)
	b, err2 := strconv.ParseFloat(den, 64)
	if !ok || err1 != nil || err2 != nil {
		return 0
	}
	return a / b
}

// boundaries lists, for a one-parameter sweep, where the category changes
// between consecutive grid points.
func boundaries(points []gridPoint) []string {
	if len(points) == 0 || len(points[0].names) != 1 {
		return nil
	}
	ps := slices.Clone(points)
	slices.SortFunc(ps, func(a, b gridPoint) int { return a.index - b.index })
	var out []string
	for i := 1; i < len(ps); i++ {
		if ps[i].cat != ps[i-1].cat {
			out = append(out, fmt.Sprintf("between %s = %s and %s: %s → %s", ps[i].names[0], ps[i-1].exact[0], ps[i].exact[0], ps[i-1].cat, ps[i].cat))
		}
	}
	return out
}
