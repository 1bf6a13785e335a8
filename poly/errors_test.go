package poly

import (
	"errors"
	"testing"
)

// The errors list keeps the first Max, sorted by position, then one entry
// without a position: the exact count of the rest, or, once a reader
// stopped at a full list, a lower bound (common practice for compilers:
// report the first errors, summarize the rest).
func TestErrorsSummary(t *testing.T) {
	for _, c := range []struct {
		found, max int
		stop       bool
		last       string
		n          int
	}{
		{3, 5, false, "f:3:1: e3", 3},
		{6, 5, false, "and 1 more error", 6},
		{30, 3, false, "and 27 more errors", 4},
		{1500, 3, true, "and at least 1000 more errors (reading stopped there; see more with --limit errors=N)", 4},
	} {
		e := &Errors{Max: c.max}
		for i := 1; i <= c.found; i++ {
			if e.Full() {
				e.Stop()
				break
			}
			e.Add(Pos{File: "f", Line: i, Col: 1}, "e%d", i)
		}
		if e.Stopped != c.stop {
			t.Errorf("%d errors, max %d: stopped %v, want %v", c.found, c.max, e.Stopped, c.stop)
		}
		var l ErrorList
		if !errors.As(e.Err(), &l) || len(l) != c.n {
			t.Fatalf("%d errors, max %d: %v, want %d entries", c.found, c.max, e.Err(), c.n)
		}
		last := l[len(l)-1]
		if got := last.Error(); got != c.last {
			t.Errorf("%d errors, max %d: last entry %q, want %q", c.found, c.max, got, c.last)
		}
		if c.found > c.max && last.Pos != (Pos{}) {
			t.Errorf("%d errors: the summary has a position %v", c.found, last.Pos)
		}
		if l[0].Error() != "f:1:1: e1" {
			t.Errorf("first entry %q", l[0])
		}
	}
}
