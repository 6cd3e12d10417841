package export

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
)

// prepareDir makes dir ready to receive an export. A folder that holds anything is
// refused unless replace is set; then it is renamed to the first free "dir.old-N" and
// never deleted, so an export cannot destroy earlier work.
func prepareDir(dir string, replace bool) (movedAside string, err error) {
	entries, err := os.ReadDir(dir)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return "", os.MkdirAll(dir, 0o755)
	case err != nil:
		return "", err
	case len(entries) == 0:
		return "", nil
	case !replace:
		return "", &NotEmptyError{Dir: dir}
	}
	for n := 1; ; n++ {
		aside := fmt.Sprintf("%s.old-%d", dir, n)
		if _, err := os.Lstat(aside); errors.Is(err, fs.ErrNotExist) {
			if err := os.Rename(dir, aside); err != nil {
				return "", err
			}
			return aside, os.MkdirAll(dir, 0o755)
		}
	}
}
