//go:build unix

package study

import (
	"errors"
	"io"
	"os"
	"syscall"
)

// tryLock takes an flock(2) on path without blocking. The kernel drops the lock when the
// process ends, however it ends (kill -9 included), so a lock is never left stale. On
// success it returns the release function; when another process holds it, the holder's
// description.
func tryLock(path, holder string) (unlock func(), held string, err error) {
	f, err := os.OpenFile(path, os.O_RDWR|os.O_CREATE, 0o600)
	if err != nil {
		return nil, "", err
	}
	if err := syscall.Flock(int(f.Fd()), syscall.LOCK_EX|syscall.LOCK_NB); err != nil {
		b, _ := io.ReadAll(f)
		f.Close()
		if errors.Is(err, syscall.EWOULDBLOCK) {
			return nil, holderOf(b), nil
		}
		if errors.Is(err, syscall.ENOLCK) || errors.Is(err, syscall.EOPNOTSUPP) || errors.Is(err, syscall.ENOSYS) {
			// A file system without flock (some network shares).
			return tryExclusive(path, holder)
		}
		return nil, "", err
	}
	f.Truncate(0)
	f.WriteAt([]byte(holder+"\n"), 0)
	return func() {
		f.Truncate(0)
		syscall.Flock(int(f.Fd()), syscall.LOCK_UN)
		f.Close()
	}, "", nil
}
