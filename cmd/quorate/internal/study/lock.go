package study

import (
	"errors"
	"fmt"
	"os"
	"strings"
	"time"
)

// LockFile is the study's advisory lock: held by every command that writes into the
// study, so that two writers never interleave (two merges at once once lost a return).
const LockFile = ".quorate/lock"

// LockWait is how long a second writer waits for the lock before it gives up.
var LockWait = 5 * time.Second

// LockedError reports a study held by another command.
type LockedError struct {
	Path   string
	Holder string // "pid 1234: quorate merge …, since …" as the holder wrote it
}

func (e *LockedError) Error() string {
	h := e.Holder
	if h == "" {
		h = "another command"
	}
	return fmt.Sprintf("the study is in use by %s (lock %s); try again when it has finished", h, e.Path)
}

// ErrLocked is matched by errors.Is on a LockedError.
var ErrLocked = errors.New("study in use")

func (e *LockedError) Is(target error) bool { return target == ErrLocked }

// Lock takes the study's lock for command (its argv, for the holder's description),
// waiting up to LockWait. The returned function releases it.
func (s *Study) Lock(argv []string) (unlock func(), err error) {
	p := s.Path(LockFile)
	if err := os.MkdirAll(s.Path(".quorate"), 0o700); err != nil {
		return nil, err
	}
	holder := fmt.Sprintf("pid %d: %s, since %s", os.Getpid(), strings.Join(argv, " "), time.Now().UTC().Format(time.RFC3339))
	deadline := time.Now().Add(LockWait)
	for {
		unlock, held, err := tryLock(p, holder)
		if err != nil {
			return nil, fmt.Errorf("study lock %s: %w", p, err)
		}
		if unlock != nil {
			return unlock, nil
		}
		if time.Now().After(deadline) {
			return nil, &LockedError{Path: p, Holder: held}
		}
		time.Sleep(100 * time.Millisecond)
	}
}

// holderOf reads the holder's description from a lock file's content.
func holderOf(b []byte) string { return strings.TrimSpace(string(b)) }

// tryExclusive creates path+".held" exclusively (O_EXCL): the lock of systems or file
// systems without flock(2). Unlike an flock, the file outlives a process that is
// killed; the holder's description then names a process that has ended, and the file
// must be removed by hand.
func tryExclusive(path, holder string) (unlock func(), held string, err error) {
	f, err := os.OpenFile(path+".held", os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o600)
	if errors.Is(err, os.ErrExist) {
		b, _ := os.ReadFile(path + ".held")
		return nil, holderOf(b) + " (if that process has ended, remove " + path + ".held)", nil
	}
	if err != nil {
		return nil, "", err
	}
	f.WriteString(holder + "\n")
	f.Close()
	return func() { os.Remove(path + ".held") }, "", nil
}
