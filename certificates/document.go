package certificates

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"os"
	"os/signal"
	"path/filepath"
	"sync"
	"syscall"

	"github.com/lyacert/lyacert/claims"
)

// Seal sets d's digest: the SHA-256 of its canonical serialization, as
// claims.Document.ComputeDigest computes it, by a faster path (the tests
// hold the two equal byte for byte).
func Seal(d *claims.Document) error {
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

// Marshal returns the document as a certificate file (claims.Document.File).
func Marshal(d *claims.Document) ([]byte, error) { return d.File() }

// ReadFile reads a certificate file strictly (see claims.Read).
func ReadFile(path string) (*claims.Document, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	d, err := claims.Read(f)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return d, nil
}

// WriteFile writes the document to path atomically: to a temporary file in
// the same directory, then renamed over path, so that a reader never sees a
// half-written certificate and an existing file is never truncated.
func WriteFile(d *claims.Document, path string) error {
	b, err := Marshal(d)
	if err != nil {
		return err
	}
	return WriteFileAtomic(path, b, 0o644)
}

// WriteFileAtomic writes data to path through a temporary file and a rename.
//
// A file that path replaces keeps its mode; a new file gets perm (0644 for
// a certificate, 0600 for a key). When path is a symbolic link the file it
// points to is replaced and the link stays. The temporary file is removed on
// every error, and on an interrupt (SIGINT, SIGTERM) during the write, after
// which the signal is delivered again as if it had not been caught.
func WriteFileAtomic(path string, data []byte, perm os.FileMode) error {
	target, err := followLinks(path)
	if err != nil {
		return err
	}
	if st, err := os.Stat(target); err == nil {
		if !st.Mode().IsRegular() {
			return fmt.Errorf("%s: not a regular file; not replaced", path)
		}
		perm = st.Mode().Perm()
	}
	f, err := os.CreateTemp(filepath.Dir(target), "."+filepath.Base(target)+".tmp*")
	if err != nil {
		return err
	}
	g := guardTemp(f.Name())
	defer g.release()
	_, werr := f.Write(data)
	if werr == nil {
		werr = f.Sync()
	}
	cerr := f.Close()
	if werr == nil {
		werr = cerr
	}
	if werr == nil {
		werr = os.Chmod(g.tmp, perm)
	}
	if werr == nil {
		werr = g.commit(target)
	}
	if werr != nil {
		g.remove()
		return werr
	}
	return nil
}

// followLinks returns the file that path names after following symbolic
// links (also a dangling one: the file it would create), at most 40 of them
// as the kernel allows.
func followLinks(path string) (string, error) {
	for range 40 {
		st, err := os.Lstat(path)
		if err != nil || st.Mode()&os.ModeSymlink == 0 {
			return path, nil // absent or not a link: path itself
		}
		dest, err := os.Readlink(path)
		if err != nil {
			return "", err
		}
		if !filepath.IsAbs(dest) {
			dest = filepath.Join(filepath.Dir(path), dest)
		}
		path = dest
	}
	return "", fmt.Errorf("%s: too many levels of symbolic links", path)
}

// errInterrupted is returned by a write that an interrupt stopped.
var errInterrupted = errors.New("interrupted; the file was not written")

// tempGuard removes a temporary file when the process is interrupted while
// the file exists, and keeps the rename and the removal from racing.
type tempGuard struct {
	mu   sync.Mutex
	tmp  string
	done bool      // renamed or removed
	sig  os.Signal // the interrupt that removed it
	ch   chan os.Signal
	quit chan struct{} // closed when the watching goroutine has ended
}

func guardTemp(tmp string) *tempGuard {
	g := &tempGuard{tmp: tmp, ch: make(chan os.Signal, 1), quit: make(chan struct{})}
	signal.Notify(g.ch, os.Interrupt, syscall.SIGTERM)
	go func() {
		defer close(g.quit)
		for s := range g.ch {
			g.mu.Lock()
			if !g.done {
				os.Remove(g.tmp)
				g.done, g.sig = true, s
			}
			g.mu.Unlock()
		}
	}()
	return g
}

// commit renames the temporary file to path unless an interrupt removed it.
func (g *tempGuard) commit(path string) error {
	g.mu.Lock()
	defer g.mu.Unlock()
	if g.done {
		return errInterrupted
	}
	if err := os.Rename(g.tmp, path); err != nil {
		return err
	}
	g.done = true
	return nil
}

// remove removes the temporary file unless it is gone already.
func (g *tempGuard) remove() {
	g.mu.Lock()
	defer g.mu.Unlock()
	if !g.done {
		os.Remove(g.tmp)
		g.done = true
	}
}

// release stops watching for interrupts and raises again the one that
// came, so that the process stops (or its own handler runs) as it would
// have without the guard.
func (g *tempGuard) release() {
	signal.Stop(g.ch)
	close(g.ch)
	<-g.quit // a signal already in the channel has been handled
	g.mu.Lock()
	sig := g.sig
	g.mu.Unlock()
	if sig != nil {
		if p, err := os.FindProcess(os.Getpid()); err == nil {
			p.Signal(sig)
		}
	}
}
