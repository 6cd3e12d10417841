//go:build !unix

package study

// tryLock uses an exclusively created file where flock(2) is not available.
func tryLock(path, holder string) (unlock func(), held string, err error) {
	return tryExclusive(path, holder)
}
