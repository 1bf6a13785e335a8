package main

import (
	"bytes"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/schollz/progressbar/v3"
)

// No bar is drawn where standard error is not a terminal (common practice:
// control characters in a log file or a pipe are noise).
func TestNoBarOffTerminal(t *testing.T) {
	f, err := os.Create(filepath.Join(t.TempDir(), "stderr"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	for _, w := range []io.Writer{&bytes.Buffer{}, f} {
		if b := newBar(w, "paving", "", 10); b != nil {
			t.Errorf("%T: a bar was made for a non-terminal", w)
		}
	}
	// A nil bar is a no-op everywhere.
	var b *bar
	b.Add(1)
	b.set(1, 2)
	b.describe("x")
	b.clear()
	b.stop()
	paveProgress{b}.Tasks(1, 2)
}

// Every output line starts on a line of its own: the bar is erased (a
// carriage return) before the line is written, and a stopped bar draws
// nothing more.
func TestLineWriterClearsTheBar(t *testing.T) {
	var term bytes.Buffer
	b := &bar{b: progressbar.NewOptions(10, progressbar.OptionSetWriter(&term), progressbar.OptionSetDescription("sweep"))}
	b.Add(3)
	if !strings.Contains(term.String(), "sweep") {
		t.Fatalf("the bar was not drawn: %q", term.String())
	}
	w := lineWriter{&term, b}
	w.Write([]byte(`{"point":1}` + "\n"))
	s := term.String()
	i := strings.Index(s, `{"point":1}`)
	if i < 0 || !strings.HasSuffix(s[:i], "\r") {
		t.Errorf("the line was not written on a cleared line: %q", s)
	}
	b.stop()
	n := term.Len()
	b.Add(5)
	b.clear()
	if term.Len() != n {
		t.Errorf("a stopped bar drew %q", term.String()[n:])
	}
}
