package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"slices"
	"strconv"
	"strings"

	"lyacert/checker"
	"lyacert/sweep"
)

// sweepRecord is one line of a sweep's output as read back: its bytes,
// verbatim, and the fields that resume, merge and the plot need.
type sweepRecord struct {
	raw     []byte // with the final newline
	line    sweep.SweepLine
	lineNum int
}

// sweepBlock is the lines of one grid point.
type sweepBlock struct {
	index   int
	records []sweepRecord
}

// parseSweepLines reads the lines of a sweep output. It returns the
// complete blocks (every line of a grid point present, in order) and the
// byte length they occupy. A trailing line without its newline, or a
// trailing block with lines missing, is an interrupted write and is left
// out of the blocks (its bytes are after the returned length). Anything
// else that is not a well-formed sequence of sweep lines is an error.
func parseSweepLines(name string, data []byte) ([]sweepBlock, int, error) {
	var blocks []sweepBlock
	var cur *sweepBlock
	good, off := 0, 0
	for n := 1; off < len(data); n++ {
		end := bytes.IndexByte(data[off:], '\n')
		if end < 0 {
			break // a partial last line: an interrupted write
		}
		raw := data[off : off+end+1]
		var l sweep.SweepLine
		if err := json.Unmarshal(raw, &l); err != nil {
			return nil, 0, fmt.Errorf("%s:%d: not a sweep line: %v", name, n, err)
		}
		valid := l.Of > 0 && l.Index >= 0 && l.Index < l.Of && l.Eq >= 0 && l.Eq <= l.Eqs && (l.Eq > 0 || l.Eqs == 0)
		if !valid {
			return nil, 0, fmt.Errorf("%s:%d: not a sweep line (index %d of %d, equilibrium %d of %d)", name, n, l.Index, l.Of, l.Eq, l.Eqs)
		}
		want := 1
		if cur != nil && len(cur.records) > 0 {
			last := cur.records[len(cur.records)-1].line
			if last.Eq < last.Eqs {
				// The block continues: the next equilibrium of the same point.
				if l.Index != last.Index || l.Eq != last.Eq+1 || l.Eqs != last.Eqs {
					return nil, 0, fmt.Errorf("%s:%d: expected equilibrium %d of %d at grid point %d", name, n, last.Eq+1, last.Eqs, last.Index)
				}
				want = 0
			}
		}
		if want == 1 {
			if l.Eq > 1 {
				return nil, 0, fmt.Errorf("%s:%d: a grid point starts with equilibrium %d", name, n, l.Eq)
			}
			blocks = append(blocks, sweepBlock{index: l.Index})
			cur = &blocks[len(blocks)-1]
		}
		cur.records = append(cur.records, sweepRecord{raw: raw, line: l, lineNum: n})
		off += end + 1
		if l.Eq == l.Eqs {
			good = off
		}
	}
	if len(blocks) > 0 {
		last := blocks[len(blocks)-1]
		if l := last.records[len(last.records)-1].line; l.Eq < l.Eqs {
			blocks = blocks[:len(blocks)-1] // incomplete: written in part
		}
	}
	return blocks, good, nil
}

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
}

func gridPointOf(b sweepBlock) gridPoint {
	var lines []sweep.SweepLine
	for _, r := range b.records {
		lines = append(lines, r.line)
	}
	p := lines[0].Params
	gp := gridPoint{index: b.index, names: p.Keys, exact: p.Values, cat: categoryOf(lines)}
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
