package main

import (
	"io"
	"os"
	"sync"
	"time"

	"github.com/schollz/progressbar/v3"
)

// isTerminal reports whether w is a terminal: progress bars are drawn only
// there, so that a redirected standard error gets no control characters.
func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	if !ok {
		return false
	}
	st, err := f.Stat()
	return err == nil && st.Mode()&os.ModeCharDevice != 0
}

// bar is a progress bar on standard error with an estimate of the time
// left. Every method is safe for concurrent use and does nothing on a nil
// bar, so that callers need not ask whether stderr is a terminal. Output
// lines go through clearing (see lineWriter), so that the bar and the
// results never share a line.
type bar struct {
	mu   sync.Mutex
	b    *progressbar.ProgressBar
	done bool
}

// newBar draws a bar of max steps on w when w is a terminal; otherwise it
// returns nil. unit names a step ("points"); empty for none.
func newBar(w io.Writer, description, unit string, max int) *bar {
	if !isTerminal(w) {
		return nil
	}
	opts := []progressbar.Option{
		progressbar.OptionSetWriter(w),
		progressbar.OptionSetDescription(description),
		progressbar.OptionSetWidth(30),
		progressbar.OptionShowCount(),
		progressbar.OptionSetPredictTime(true),
		progressbar.OptionShowElapsedTimeOnFinish(),
		progressbar.OptionThrottle(200 * time.Millisecond),
		progressbar.OptionSetRenderBlankState(true),
	}
	if unit != "" {
		opts = append(opts, progressbar.OptionShowIts(), progressbar.OptionSetItsString(unit))
	}
	return &bar{b: progressbar.NewOptions(max, opts...)}
}

// Add advances the bar by n steps.
func (b *bar) Add(n int) {
	if b == nil {
		return
	}
	b.mu.Lock()
	defer b.mu.Unlock()
	if !b.done {
		b.b.Add(n)
	}
}

// set moves the bar to done of max steps.
func (b *bar) set(done, max int) {
	if b == nil {
		return
	}
	b.mu.Lock()
	defer b.mu.Unlock()
	if b.done {
		return
	}
	if int64(max) != b.b.GetMax64() {
		b.b.ChangeMax(max)
	}
	b.b.Set(done)
}

// describe changes the words before the bar, for a new phase of the work.
func (b *bar) describe(s string) {
	if b == nil {
		return
	}
	b.mu.Lock()
	defer b.mu.Unlock()
	if !b.done {
		b.b.Describe(s)
	}
}

// clear erases the bar from its line; it is drawn again at the next step.
func (b *bar) clear() {
	if b == nil {
		return
	}
	b.mu.Lock()
	defer b.mu.Unlock()
	if !b.done {
		b.b.Clear()
	}
}

// stop erases the bar for good: nothing is drawn after it.
func (b *bar) stop() {
	if b == nil {
		return
	}
	b.mu.Lock()
	defer b.mu.Unlock()
	if !b.done {
		b.b.Clear()
		b.b.Exit()
		b.done = true
	}
}

// lineWriter clears the bar before every write to w, so that an output
// line (a sweep's JSON line on the terminal) starts on a clean line and is
// never interleaved with the bar; the bar is redrawn below it at its next
// step.
type lineWriter struct {
	w   io.Writer
	bar *bar
}

func (l lineWriter) Write(p []byte) (int, error) {
	l.bar.clear()
	return l.w.Write(p)
}

// paveProgress shows a paving's progress: the subtrees classified out of
// all (certify/pave's TaskProgress), which is the work done, and so gives an
// estimate of the time left that the share of the volume would not; then
// the exact re-check of the inside boxes, which follows the paving.
type paveProgress struct{ bar *bar }

// Paved is the share of the volume classified; the bar counts subtrees
// instead.
func (p paveProgress) Paved(float64) {}

// Tasks moves the bar to done of total subtrees.
func (p paveProgress) Tasks(done, total int) {
	if total == 0 {
		return
	}
	p.bar.set(done, total)
	if done == total {
		p.bar.describe("re-checking the inside boxes exactly")
	}
}
