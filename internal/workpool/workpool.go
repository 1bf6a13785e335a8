package workpool

import (
	"context"
	"iter"
	"runtime"
	"sync"
)

// Result is what a worker returned for one item: Seq is the position of
// the item in the sequence (0, 1, 2, …), Item the item itself.
type Result[T any] struct {
	Seq, Item int
	Value     T
}

// Run starts workers goroutines (runtime.GOMAXPROCS(0) when workers ≤ 0),
// each with its own function from newWorker (so that a worker can keep
// scratch space of its own), and hands them the items of the sequence in
// order. It returns the channel of results in completion order, closed
// when every handed-out item has its result. When ctx is done no further
// item is handed out (the ones already running finish); the caller must
// drain the channel in any case.
func Run[T any](ctx context.Context, items iter.Seq[int], workers int, newWorker func() func(item int) T) <-chan Result[T] {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	type job struct{ seq, item int }
	jobs := make(chan job)
	results := make(chan Result[T], 2*workers)
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			do := newWorker()
			for j := range jobs {
				results <- Result[T]{Seq: j.seq, Item: j.item, Value: do(j.item)}
			}
		}()
	}
	go func() {
		defer close(jobs)
		seq := 0
		for item := range items {
			// A done context wins over a ready worker.
			if ctx.Err() != nil {
				return
			}
			select {
			case jobs <- job{seq, item}:
				seq++
			case <-ctx.Done():
				return
			}
		}
	}()
	go func() {
		wg.Wait()
		close(results)
	}()
	return results
}

// Count is the sequence 0, 1, …, n−1.
func Count(n int) iter.Seq[int] {
	return func(yield func(int) bool) {
		for i := range n {
			if !yield(i) {
				return
			}
		}
	}
}
