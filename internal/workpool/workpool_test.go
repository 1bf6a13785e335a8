package workpool

import (
	"context"
	"slices"
	"sync/atomic"
	"testing"
)

func TestRunEveryItemOnce(t *testing.T) {
	// Every item is handed out exactly once and Seq numbers the sequence
	// (common practice for a work queue).
	for _, workers := range []int{0, 1, 3, 50} {
		var got []int
		items := func(yield func(int) bool) {
			for i := 10; i < 110; i += 2 {
				if !yield(i) {
					return
				}
			}
		}
		for r := range Run(context.Background(), items, workers, func() func(int) int {
			return func(i int) int { return i * i }
		}) {
			if r.Value != r.Item*r.Item || r.Item != 10+2*r.Seq {
				t.Errorf("workers %d: result %+v", workers, r)
			}
			got = append(got, r.Item)
		}
		slices.Sort(got)
		if len(got) != 50 || got[0] != 10 || got[49] != 108 || len(slices.Compact(slices.Clone(got))) != 50 {
			t.Errorf("workers %d: items %v", workers, got)
		}
	}
}

func TestRunStopsWhenCancelled(t *testing.T) {
	// After cancellation no new item starts; the channel is still closed.
	ctx, cancel := context.WithCancel(context.Background())
	var started atomic.Int64
	n := 0
	for range Run(ctx, Count(1_000_000), 2, func() func(int) struct{} {
		return func(int) struct{} {
			if started.Add(1) == 5 {
				cancel()
			}
			return struct{}{}
		}
	}) {
		n++
	}
	if s := started.Load(); s > 5+2 || int64(n) != s {
		t.Errorf("%d items started after cancelling at the 5th, %d results", s, n)
	}
}

func TestNewWorkerPerGoroutine(t *testing.T) {
	var made atomic.Int64
	for range Run(context.Background(), Count(100), 4, func() func(int) int {
		made.Add(1)
		return func(i int) int { return i }
	}) {
	}
	if m := made.Load(); m != 4 {
		t.Errorf("%d workers made, want 4", m)
	}
}
