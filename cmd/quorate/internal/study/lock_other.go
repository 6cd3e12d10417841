//go:build !unix

package study

import (
	"errors"
	"os"
)

// tryLock creates path exclusively (O_EXCL) where flock(2) is not available. Unlike an
// flock, the file outlives a process that is killed; the holder's description then names
// a process that has ended, and the file must be removed by hand.
func tryLock(path, holder string) (unlock func(), held string, err error) {
	f, err := os.OpenFile(path+".held", os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o600)
	if errors.Is(err, os.ErrExist) {
		b, _ := os.ReadFile(path + ".held")
		return nil, holderOf(b), nil
	}
	if err != nil {
		return nil, "", err
	}
	f.WriteString(holder + "\n")
	f.Close()
	return func() { os.Remove(path + ".held") }, "", nil
}
