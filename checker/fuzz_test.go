package checker_test

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"
	"time"

	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
)

// FuzzReadVerify feeds arbitrary bytes to the kernel's reader and, when they
// are read, to Verify: neither may panic, and the outcome must not depend on
// anything but the document (Verify twice gives the same outcome). The
// seeds are the certificates of testdata/certificates and the hostile ones
// of testdata/hostile/certificates.
func FuzzReadVerify(f *testing.F) {
	for _, dir := range []string{"certificates", filepath.Join("hostile", "certificates")} {
		files, _ := filepath.Glob(filepath.Join("..", "testdata", dir, "*.json"))
		for _, p := range files {
			if b, err := os.ReadFile(p); err == nil {
				f.Add(b)
			}
		}
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		// The fuzzing engine does not see a hang; a panic from the
		// timer makes one a crasher that it records.
		tm := time.AfterFunc(10*time.Second, func() { panic("Read and Verify took longer than 10 s") })
		defer tm.Stop()
		d, err := claims.Read(bytes.NewReader(data))
		if err != nil {
			if d != nil {
				t.Fatal("Read returned a document with an error")
			}
			return
		}
		a := checker.Verify(d)
		if a.Valid != (len(a.Records) > 0 && allOK(a.Records)) {
			t.Fatalf("valid = %v but the records say otherwise: %+v", a.Valid, a.Records)
		}
		if !a.Valid && (a.Verdict != "" || a.Kind != "" || a.Refuted) {
			t.Fatalf("an invalid certificate yields verdict %q, kind %q", a.Verdict, a.Kind)
		}
		b := checker.Verify(d)
		if a.Valid != b.Valid || a.Verdict != b.Verdict || a.Kind != b.Kind || len(a.Records) != len(b.Records) {
			t.Fatalf("Verify is not deterministic: %+v then %+v", a, b)
		}
	})
}

func allOK(rs []checker.Record) bool {
	for _, r := range rs {
		if !r.OK {
			return false
		}
	}
	return true
}
