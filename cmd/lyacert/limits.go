package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"strings"
	"sync"
	"time"

	"github.com/lyacert/lyacert/certify"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

// limitFlags are the --limit flags of every command that reads a model, an
// expression or a certificate.
type limitFlags struct {
	Limit []string `name:"limit" placeholder:"NAME=VALUE" help:"Set a limit on what reading the input may cost (repeatable), e.g. --limit degree=512. The limits: ${limits}."`
}

// timeoutFlag is the --timeout flag of the commands that may run long.
type timeoutFlag struct {
	Timeout time.Duration `name:"timeout" placeholder:"DURATION" help:"Stop after this long (e.g. 30s, 5m) with exit status 3 and no verdict."`
}

// limitNames is the list the help of --limit shows.
func limitNames() string { return strings.Join(poly.LimitNames(), ", ") }

// apply makes the --limit values the defaults of every reader of this run,
// the kernel's re-reading of a certificate's model included (it reads with
// the default limits, so the kernel does not change).
func (lf *limitFlags) apply(e *env) bool {
	if lf == nil || len(lf.Limit) == 0 {
		return true
	}
	l, err := poly.ParseLimits(lf.Limit)
	if err == nil {
		err = poly.SetDefaultLimits(l)
	}
	if err != nil {
		fmt.Fprintln(e.stderr, "lyacert:", err)
		return false
	}
	return true
}

// budget returns the context of a run: the limits in force and, with a
// timeout, its deadline (see certify.Budget).
func (tf *timeoutFlag) budget() (context.Context, context.CancelFunc) {
	var d time.Duration
	if tf != nil {
		d = tf.Timeout
	}
	return certify.WithBudget(context.Background(), certify.Budget{Limits: poly.DefaultLimits(), Timeout: d})
}

// within runs work and returns its exit code, or exitStopped with a message
// when ctx ends first (the deadline, or an interrupt). The work is left
// running then, its output cut off; the process exits right after.
func within(ctx context.Context, e *env, work func(ctx context.Context, e *env) int) int {
	out, errw := &gate{w: e.stdout}, &gate{w: e.stderr}
	done := make(chan int, 1)
	go func() { done <- work(ctx, &env{stdin: e.stdin, stdout: out, stderr: errw, json: e.json}) }()
	stop := func() int {
		out.close()
		errw.close()
		fmt.Fprintln(e.stderr, "lyacert:", stoppedMessage(ctx))
		return exitStopped
	}
	select {
	case code := <-done:
		if code == exitStopped {
			return stop()
		}
		return code
	case <-ctx.Done():
		// A result that arrived together with the deadline wins.
		select {
		case code := <-done:
			if code != exitStopped {
				return code
			}
		default:
		}
		return stop()
	}
}

// gate passes writes through until it is closed, and drops them after.
type gate struct {
	mu     sync.Mutex
	w      io.Writer
	closed bool
}

func (g *gate) Write(p []byte) (int, error) {
	g.mu.Lock()
	defer g.mu.Unlock()
	if g.closed {
		return len(p), nil
	}
	return g.w.Write(p)
}

func (g *gate) close() {
	g.mu.Lock()
	g.closed = true
	g.mu.Unlock()
}

// stoppedMessage says why a run stopped early.
func stoppedMessage(ctx context.Context) string {
	if errors.Is(ctx.Err(), context.DeadlineExceeded) {
		if b, ok := certify.BudgetOf(ctx); ok && b.Timeout > 0 {
			return fmt.Sprintf("stopped early: the time limit --timeout %s was reached before a verdict (raise it with --timeout)", b.Timeout)
		}
		return "stopped early: the time limit was reached before a verdict (raise it with --timeout)"
	}
	return "stopped early: interrupted before a verdict"
}

// readInput reads a model file, or standard input for "-": at most
// input-bytes (a limit) plus one byte, so that /dev/zero or a huge file
// costs no more than that.
func readInput(path string, stdin io.Reader) (string, []byte, error) {
	lim := poly.DefaultLimits().InputBytes
	name, b, err := readBounded(path, stdin, int64(lim))
	if err == nil && len(b) > lim {
		err = errors.New(poly.Exceeded("input-bytes", fmt.Sprintf("%s: input of more than %d bytes", name, lim), lim))
	}
	return name, b, err
}

// readCertificate reads a certificate file, or standard input for "-": at
// most claims.MaxDocumentBytes plus one byte (claims.Read refuses more).
func readCertificate(path string, stdin io.Reader) (string, []byte, error) {
	return readBounded(path, stdin, claims.MaxDocumentBytes)
}

func readBounded(path string, stdin io.Reader, max int64) (string, []byte, error) {
	name, r := "<stdin>", stdin
	if path != "-" {
		f, err := os.Open(path)
		if err != nil {
			return path, nil, err
		}
		defer f.Close()
		name, r = path, f
	}
	b, err := io.ReadAll(io.LimitReader(r, max+1))
	return name, b, err
}

// limitReached reports a re-check that failed because a limit was reached
// (the kernel re-reads the model text within the default limits).
func limitReached(res checker.Outcome) bool {
	for _, r := range res.Records {
		if !r.OK && poly.IsExceeded(r.Reason) {
			return true
		}
	}
	return false
}
