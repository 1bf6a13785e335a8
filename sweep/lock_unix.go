//go:build unix

package sweep

import (
	"errors"
	"os"
	"syscall"
)

// tryLock takes an exclusive flock(2) lock on f without waiting. flock
// locks belong to the open file, so two opens in one process exclude each
// other too.
func tryLock(f *os.File) error {
	for {
		err := syscall.Flock(int(f.Fd()), syscall.LOCK_EX|syscall.LOCK_NB)
		switch {
		case err == nil:
			return nil
		case errors.Is(err, syscall.EINTR):
			continue
		case errors.Is(err, syscall.EWOULDBLOCK):
			return ErrLocked
		}
		return err
	}
}
