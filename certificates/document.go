package certificates

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"os"
	"path/filepath"

	"lyacert/checker"
)

// Seal sets d's digest: the SHA-256 of its canonical serialization, as
// checker.Document.ComputeDigest computes it, by a faster path (the tests
// hold the two equal byte for byte).
func Seal(d *checker.Document) error {
	c := *d
	c.Digest = ""
	c.Signature = nil
	raw, err := marshalNoEscape(c)
	if err != nil {
		return err
	}
	b, err := canonicalJSON(raw)
	if err != nil {
		return err
	}
	sum := sha256.Sum256(b)
	d.Digest = "sha256:" + hex.EncodeToString(sum[:])
	return nil
}

// Marshal returns the document as a certificate file (checker.Document.File).
func Marshal(d *checker.Document) ([]byte, error) { return d.File() }

// ReadFile reads a certificate file strictly (see checker.Read).
func ReadFile(path string) (*checker.Document, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	d, err := checker.Read(f)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return d, nil
}

// WriteFile writes the document to path atomically: to a temporary file in
// the same directory, then renamed over path, so that a reader never sees a
// half-written certificate and an existing file is never truncated.
func WriteFile(d *checker.Document, path string) error {
	b, err := Marshal(d)
	if err != nil {
		return err
	}
	return WriteFileAtomic(path, b, 0o644)
}

// WriteFileAtomic writes data to path through a temporary file and a rename.
func WriteFileAtomic(path string, data []byte, perm os.FileMode) error {
	dir := filepath.Dir(path)
	f, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp*")
	if err != nil {
		return err
	}
	tmp := f.Name()
	_, werr := f.Write(data)
	if werr == nil {
		werr = f.Sync()
	}
	cerr := f.Close()
	if werr == nil {
		werr = cerr
	}
	if werr == nil {
		werr = os.Chmod(tmp, perm)
	}
	if werr == nil {
		werr = os.Rename(tmp, path)
	}
	if werr != nil {
		os.Remove(tmp)
		return werr
	}
	return nil
}
