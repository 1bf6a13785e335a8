package checker_test

import (
	"bytes"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
	"time"
	"unicode/utf8"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/internal/bounded"

	"github.com/rogpeppe/go-internal/txtar"

	"github.com/lyacert/lyacert/checker"
)

var (
	updateHostile  = flag.Bool("hostile.update", false, "rewrite testdata/hostile/certificates.golden with the outcomes found")
	hostileTimeout = flag.Duration("hostile.timeout", 10*time.Second, "time allowed to reading and verifying each hostile certificate (a hang guard against minutes-long runs, not a speed target)")
)

// hostileMemory bounds the heap growth while one hostile certificate is read
// and verified (common practice: a generous bound, far above an honest
// certificate's needs, far below the machine's memory).
const hostileMemory = 512 << 20

const (
	hostileDir    = "../testdata/hostile/certificates"
	hostileGolden = "../testdata/hostile/certificates.golden"
)

// hostileInput is one hostile certificate: a file of hostileDir, or one
// generated here because it is too big to keep (or is a device).
type hostileInput struct {
	name string
	open func() (io.Reader, func(), error)
}

// repeatReader yields s n times without building the whole text.
type repeatReader struct {
	s   string
	n   int
	off int
}

func (r *repeatReader) Read(p []byte) (int, error) {
	w := 0
	for w < len(p) && r.n > 0 {
		k := copy(p[w:], r.s[r.off:])
		w += k
		r.off += k
		if r.off == len(r.s) {
			r.off = 0
			r.n--
		}
	}
	if w == 0 && r.n == 0 {
		return 0, io.EOF
	}
	return w, nil
}

// stream is a reader of prefix, then pattern n times, then suffix.
func stream(prefix, pattern string, n int, suffix string) func() (io.Reader, func(), error) {
	return func() (io.Reader, func(), error) {
		return io.MultiReader(strings.NewReader(prefix), &repeatReader{s: pattern, n: n}, strings.NewReader(suffix)), func() {}, nil
	}
}

func device(path string) func() (io.Reader, func(), error) {
	return func() (io.Reader, func(), error) {
		f, err := os.Open(path)
		if err != nil {
			return nil, nil, err
		}
		return f, func() { f.Close() }, nil
	}
}

func inMemory(b []byte) func() (io.Reader, func(), error) {
	return func() (io.Reader, func(), error) { return bytes.NewReader(b), func() {}, nil }
}

// outcome reads and verifies one certificate: "read error: …" when Read
// refuses it, "rejected: <check>: <reason>" with the first failing check of
// Verify, or "valid: <verdict>".
func outcome(r io.Reader) string {
	d, err := claims.Read(r)
	if err != nil {
		return "read error: " + err.Error()
	}
	o := checker.Verify(d)
	if o.Valid {
		return "valid: " + o.Verdict
	}
	for _, rec := range o.Records {
		if !rec.OK {
			return "rejected: " + rec.Name + ": " + rec.Reason
		}
	}
	return "rejected: no check recorded"
}

// clip keeps a message to one line of at most 200 bytes (whole runes), so
// that the golden file holds readable substrings.
func clip(s string) string {
	s = strings.Join(strings.Fields(strings.ToValidUTF8(s, "?")), " ")
	if len(s) <= 200 {
		return s
	}
	cut := 200
	for cut > 0 && !utf8.RuneStart(s[cut]) {
		cut--
	}
	return s[:cut]
}

// TestHostileCertificates reads and verifies every hostile certificate,
// each under the time limit and the memory bound, without a panic, and
// checks its outcome against the golden file: each golden entry is
// "read error: S", "rejected: S" or "valid: S", and the outcome must be of
// that kind and contain S.
func TestHostileCertificates(t *testing.T) {
	files, err := filepath.Glob(filepath.Join(hostileDir, "*.json"))
	if err != nil {
		t.Fatal(err)
	}
	if len(files) < 60 {
		t.Errorf("only %d hostile certificate files", len(files))
	}
	var cases []hostileInput
	for _, f := range files {
		cases = append(cases, hostileInput{filepath.Base(f), device(f)})
	}
	cases = append(cases, generatedCertificates(t)...)

	want := map[string]string{}
	if !*updateHostile {
		a, err := txtar.ParseFile(hostileGolden)
		if err != nil {
			t.Fatal(err)
		}
		for _, f := range a.Files {
			want[f.Name] = strings.TrimSpace(string(f.Data))
		}
	}
	got := map[string]string{}
	for _, c := range cases {
		out, ok := runHostileCertificate(t, c)
		if !ok {
			continue
		}
		got[c.name] = out
		if *updateHostile {
			continue
		}
		w, found := want[c.name]
		kind, sub, _ := strings.Cut(w, ": ")
		switch {
		case !found:
			t.Errorf("%s: no golden outcome (run with -hostile.update); got %s", c.name, out)
		case !strings.HasPrefix(out, kind+": ") || !strings.Contains(out, sub):
			t.Errorf("%s:\ngot  %s\nwant %s", c.name, out, w)
		}
	}
	for name := range want {
		if _, ok := got[name]; !ok && !*updateHostile {
			t.Errorf("%s: in the golden file but not among the cases", name)
		}
	}
	if *updateHostile {
		names := make([]string, 0, len(got))
		for n := range got {
			names = append(names, n)
		}
		sort.Strings(names)
		a := &txtar.Archive{Comment: []byte("Expected outcome of reading and verifying each hostile certificate\n(checker.TestHostileCertificates; rewrite with -hostile.update). Each is\n\"read error: S\", \"rejected: S\" or \"valid: S\": the outcome is of that kind\nand contains S.\n")}
		for _, n := range names {
			a.Files = append(a.Files, txtar.File{Name: n, Data: []byte(clip(got[n]) + "\n")})
		}
		if err := os.WriteFile(hostileGolden, txtar.Format(a), 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

// runHostileCertificate runs one case in a goroutine under the time limit,
// sampling the heap; false when it failed already (panic, time, memory).
func runHostileCertificate(t *testing.T, c hostileInput) (string, bool) {
	t.Helper()
	r, closeFn, err := c.open()
	if err != nil {
		t.Logf("%s: skipped: %v", c.name, err)
		return "", false
	}
	defer closeFn()
	out, err := bounded.Run(func() string { return outcome(r) }, *hostileTimeout, hostileMemory)
	if err != nil {
		t.Errorf("%s: %v", c.name, err)
		return "", false
	}
	return out, true
}

func init() { _ = fmt.Sprint }
