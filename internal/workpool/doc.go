// Package workpool hands a sequence of work items to a fixed number of
// goroutines and collects what they return. It is the one feeder behind the
// parallel parts of the engine (the grid points of a sweep, the subtrees of
// a paving): items are handed out in the order of the sequence, and the
// caller, not the pool, decides how the results are ordered.
package workpool
