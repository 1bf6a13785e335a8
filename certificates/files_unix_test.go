//go:build unix

package certificates

import (
	"errors"
	"os"
	"os/signal"
	"path/filepath"
	"syscall"
	"testing"
	"time"
)

// An interrupt during a write removes the temporary file, the write fails,
// and the interrupt is delivered again afterwards (here to the test's own
// handler, which keeps the test process alive).
func TestWriteInterrupted(t *testing.T) {
	mine := make(chan os.Signal, 4)
	signal.Notify(mine, syscall.SIGINT)
	defer signal.Stop(mine)
	dir := t.TempDir()
	f, err := os.CreateTemp(dir, ".out.json.tmp*")
	if err != nil {
		t.Fatal(err)
	}
	f.Close()
	g := guardTemp(f.Name())
	if err := syscall.Kill(os.Getpid(), syscall.SIGINT); err != nil {
		t.Skip("cannot signal this process:", err)
	}
	<-mine // the first delivery
	deadline := time.Now().Add(5 * time.Second)
	for {
		if _, err := os.Stat(f.Name()); errors.Is(err, os.ErrNotExist) {
			break
		}
		if time.Now().After(deadline) {
			t.Fatal("the temporary file was not removed after the interrupt")
		}
		time.Sleep(5 * time.Millisecond)
	}
	if err := g.commit(filepath.Join(dir, "out.json")); !errors.Is(err, errInterrupted) {
		t.Errorf("commit after the interrupt: %v, want errInterrupted", err)
	}
	g.release()
	select {
	case <-mine:
	case <-time.After(5 * time.Second):
		t.Error("the interrupt was not delivered again")
	}
	noTemps(t, dir)
	if _, err := os.Stat(filepath.Join(dir, "out.json")); err == nil {
		t.Error("the output was written")
	}
}
