package sweep

import (
	"errors"
	"fmt"
	"os"
)

// ErrLocked is returned by LockOutput when another process writes the
// output.
var ErrLocked = errors.New("locked by another process")

// OutputLock is the exclusive right to write one sweep output: an
// operating-system lock on OUT.lock beside it, held until Unlock or the
// end of the process (the system releases it even after a crash, so a
// stale lock never blocks a later run).
type OutputLock struct {
	f    *os.File
	path string
}

// LockOutput takes the lock of the output file out, or fails at once with
// an error wrapping ErrLocked when another process (or another LockOutput
// in this one) holds it. Two runs writing one output — two --resume of the
// same shard, say — would interleave their lines; the lock makes the second
// one stop before it reads or writes anything.
func LockOutput(out string) (*OutputLock, error) {
	path := out + ".lock"
	for range 10 {
		f, err := os.OpenFile(path, os.O_RDWR|os.O_CREATE, 0o644)
		if err != nil {
			return nil, err
		}
		if err := tryLock(f); err != nil {
			f.Close()
			if errors.Is(err, ErrLocked) {
				return nil, fmt.Errorf("%s is being written by another lyacert sweep (it holds %s); wait for it to finish or stop it: %w", out, path, ErrLocked)
			}
			return nil, fmt.Errorf("lock %s: %w", path, err)
		}
		// The holder before us may have removed the file after we opened
		// it; a lock on a removed file excludes no one, so take the lock
		// again on the file now at the path.
		st, err1 := f.Stat()
		cur, err2 := os.Stat(path)
		if err1 == nil && err2 == nil && os.SameFile(st, cur) {
			return &OutputLock{f: f, path: path}, nil
		}
		f.Close()
	}
	return nil, fmt.Errorf("lock %s: the lock file keeps being replaced", path)
}

// Unlock removes the lock file and releases the lock (in that order, so
// that no one can lock the file just before it is removed).
func (l *OutputLock) Unlock() error {
	if l == nil || l.f == nil {
		return nil
	}
	err := os.Remove(l.path)
	if cerr := l.f.Close(); err == nil {
		err = cerr
	}
	l.f = nil
	return err
}
