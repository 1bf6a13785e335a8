package bounded

import (
	"strings"
	"testing"
	"time"
)

// The harness reports each way a case can fail, and passes a quiet one
// through (common practice: a test harness must be able to fail).
func TestRun(t *testing.T) {
	if out, err := Run(func() string { return "ok" }, time.Second, 1<<30); out != "ok" || err != nil {
		t.Errorf("quiet work: %q, %v", out, err)
	}
	if _, err := Run(func() string { panic("boom") }, time.Second, 1<<30); err == nil || !strings.Contains(err.Error(), "panic: boom") {
		t.Errorf("a panic: %v", err)
	}
	stop := make(chan struct{})
	defer close(stop)
	if _, err := Run(func() string { <-stop; return "" }, 20*time.Millisecond, 1<<30); err == nil || !strings.Contains(err.Error(), "not done within") {
		t.Errorf("a hang: %v", err)
	}
	var keep [][]byte
	_, err := Run(func() string {
		for range 64 {
			keep = append(keep, make([]byte, 1<<20))
		}
		time.Sleep(10 * time.Millisecond)
		return "grew"
	}, time.Second, 8<<20)
	if err == nil || !strings.Contains(err.Error(), "heap grew") {
		t.Errorf("64 MiB against an 8 MiB bound: %v", err)
	}
	_ = keep
}
