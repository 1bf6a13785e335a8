// Package bounded runs a piece of work under a time limit while sampling the
// heap's growth: the harness of the hostile-input tests, which require every
// case to end, within bounds, without a panic.
package bounded

import (
	"fmt"
	"runtime"
	"time"
)

// Run runs work in a goroutine and returns what it returns, or an error when
// it panics, runs past timeout, or grows the heap by more than maxHeap bytes
// (sampled every 2 ms, so an approximation of the peak). Work that runs past
// the timeout is left running.
func Run(work func() string, timeout time.Duration, maxHeap uint64) (string, error) {
	runtime.GC()
	var base runtime.MemStats
	runtime.ReadMemStats(&base)
	type result struct {
		out   string
		panic any
	}
	done := make(chan result, 1)
	go func() {
		defer func() {
			if p := recover(); p != nil {
				done <- result{panic: p}
			}
		}()
		done <- result{out: work()}
	}()
	var peak uint64
	sample := func() {
		var ms runtime.MemStats
		runtime.ReadMemStats(&ms)
		if ms.HeapInuse > base.HeapInuse {
			peak = max(peak, ms.HeapInuse-base.HeapInuse)
		}
	}
	tick := time.NewTicker(2 * time.Millisecond)
	defer tick.Stop()
	deadline := time.After(timeout)
	for {
		select {
		case r := <-done:
			sample()
			switch {
			case r.panic != nil:
				return "", fmt.Errorf("panic: %v", r.panic)
			case peak > maxHeap:
				return "", fmt.Errorf("heap grew by %d MiB, above %d MiB", peak>>20, maxHeap>>20)
			}
			return r.out, nil
		case <-tick.C:
			sample()
		case <-deadline:
			return "", fmt.Errorf("not done within %v", timeout)
		}
	}
}
