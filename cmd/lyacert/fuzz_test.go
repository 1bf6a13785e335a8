package main

import (
	"strings"
	"testing"
)

// FuzzParseBox: --box NAME=LO..HI never panics, and what it reads has a
// name and two ends that read back as the same box (common practice: a
// parser's output round-trips); the ends are then constants or an error,
// never a panic or a hang.
func FuzzParseBox(f *testing.F) {
	for _, s := range []string{"r=0..2", "b=-1/2..3", "k=0:5", "=1..2", "a=1..2..3", "a=..", "r=1e308..1e400",
		"x=((((3^64)^64)^64)^64)..1", "a=" + strings.Repeat("(", 300) + "1" + strings.Repeat(")", 300) + "..2"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		name, lo, hi, err := parseBox(s)
		if err != nil {
			return
		}
		if name == "" || strings.Contains(hi, "..") {
			t.Fatalf("%q read as name %q, ends %q and %q", s, name, lo, hi)
		}
		n2, lo2, hi2, err := parseBox(name + "=" + lo + ".." + hi)
		if err != nil || n2 != name || lo2 != lo || hi2 != hi {
			t.Fatalf("%q does not read back: %q %q %q %v", s, n2, lo2, hi2, err)
		}
		constant(lo, "--box "+name)
		constant(hi, "--box "+name)
	})
}
