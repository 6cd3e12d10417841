// Package atomicfile writes files so that a reader sees either the old content or the
// whole new content, never a half-written file: the bytes go to a temporary file in the
// same folder, are synced, and the temporary file is renamed over the target.
package atomicfile

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
)

// Write creates or replaces path with what fn writes. On any error the target is left
// as it was and the temporary file is removed.
func Write(path string, perm os.FileMode, fn func(w io.Writer) error) (err error) {
	dir := filepath.Dir(path)
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return err
	}
	defer func() {
		if err != nil {
			tmp.Close()
			os.Remove(tmp.Name())
		}
	}()
	if err = fn(tmp); err != nil {
		return fmt.Errorf("writing %s: %w", path, err)
	}
	if err = tmp.Chmod(perm); err != nil {
		return err
	}
	if err = tmp.Sync(); err != nil {
		return err
	}
	if err = tmp.Close(); err != nil {
		return err
	}
	return os.Rename(tmp.Name(), path)
}

// WriteBytes is Write for content already in memory.
func WriteBytes(path string, data []byte, perm os.FileMode) error {
	return Write(path, perm, func(w io.Writer) error {
		_, err := io.Copy(w, bytes.NewReader(data))
		return err
	})
}

// Create writes path only if it does not exist yet; it never replaces a file. Raw
// returns and other records that must never change are written this way.
func Create(path string, data []byte, perm os.FileMode) error {
	if _, err := os.Lstat(path); err == nil {
		return &os.PathError{Op: "create", Path: path, Err: os.ErrExist}
	}
	dir := filepath.Dir(path)
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return err
	}
	name := tmp.Name()
	if _, err := tmp.Write(data); err != nil {
		tmp.Close()
		os.Remove(name)
		return err
	}
	if err := tmp.Chmod(perm); err != nil {
		tmp.Close()
		os.Remove(name)
		return err
	}
	if err := tmp.Sync(); err != nil {
		tmp.Close()
		os.Remove(name)
		return err
	}
	tmp.Close()
	// A hard link fails if the target exists, so a concurrent writer cannot be
	// overwritten between the check above and here.
	if err := os.Link(name, path); err != nil {
		os.Remove(name)
		return err
	}
	return os.Remove(name)
}

// isLeftover reports whether name is a temporary file or folder of this package (or
// of WriteDir): ".NAME.tmp-DIGITS".
func isLeftover(name string) bool {
	i := strings.LastIndex(name, ".tmp-")
	if !strings.HasPrefix(name, ".") || i < 1 || i+5 == len(name) {
		return false
	}
	for _, c := range name[i+5:] {
		if c < '0' || c > '9' {
			return false
		}
	}
	return true
}

// asideTag marks the folder WriteDir moves the old folder to just before it renames
// the new one into place: ".NAME" + asideTag + "DIGITS".
const asideTag = ".aside.tmp-"

// Leftover is a temporary file or folder that a writer killed before its rename left
// under a root.
type Leftover struct {
	Path string
	// Restores is the folder this one is the earlier content of, when WriteDir had
	// moved that folder aside and was killed before the new one took its place:
	// RemoveLeftovers renames it back. Empty for a leftover RemoveLeftovers removes.
	Restores string
}

// Leftovers lists, changing nothing, what RemoveLeftovers would remove or put back
// under root, in walk order. A writer at work under root has temporary files too: list
// them under the study's lock to be sure that every one was left by a killed writer.
func Leftovers(root string) ([]Leftover, error) {
	var out []Leftover
	err := walkLeftovers(root, func(l Leftover, _ bool) error {
		out = append(out, l)
		return nil
	})
	return out, err
}

// walkLeftovers calls fn for each leftover under root (isDir tells a folder); the
// walk does not enter a leftover folder.
func walkLeftovers(root string, fn func(l Leftover, isDir bool) error) error {
	return filepath.WalkDir(root, func(p string, d os.DirEntry, err error) error {
		if err != nil {
			return nil // an unreadable folder holds nothing this package wrote
		}
		if p == root || !isLeftover(d.Name()) {
			return nil
		}
		l := Leftover{Path: p}
		if i := strings.LastIndex(d.Name(), asideTag); d.IsDir() && i > 1 {
			orig := filepath.Join(filepath.Dir(p), d.Name()[1:i])
			if _, err := os.Lstat(orig); errors.Is(err, fs.ErrNotExist) {
				l.Restores = orig
			}
		}
		if err := fn(l, d.IsDir()); err != nil {
			return err
		}
		if d.IsDir() {
			return filepath.SkipDir
		}
		return nil
	})
}

// RemoveLeftovers removes, under root, the temporary files and folders that a writer
// killed before its rename left behind, and returns their paths. A folder that
// WriteDir had moved aside when it was killed, before the new folder took its place,
// is renamed back instead, so that a kill at that instant leaves the old folder rather
// than none. Run it only while no other writer works under root (under the study's
// lock).
func RemoveLeftovers(root string) ([]string, error) {
	var gone []string
	err := walkLeftovers(root, func(l Leftover, _ bool) error {
		if l.Restores != "" {
			return os.Rename(l.Path, l.Restores)
		}
		if err := os.RemoveAll(l.Path); err != nil {
			return err
		}
		gone = append(gone, l.Path)
		return nil
	})
	return gone, err
}

// WriteDir replaces the folder dir with one that fn fills, so that a reader sees the
// old folder or the whole new one (or, for the instant between two renames, none: a
// run killed then leaves the old folder aside, and RemoveLeftovers puts it back),
// never a mix of old and new files. fn writes into the folder it is given. Files of the
// old folder that fn does not write are carried over.
func WriteDir(dir string, fn func(tmp string) error) (err error) {
	parent, base := filepath.Dir(dir), filepath.Base(dir)
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return err
	}
	tmp, err := os.MkdirTemp(parent, "."+base+".tmp-")
	if err != nil {
		return err
	}
	defer func() {
		if err != nil {
			os.RemoveAll(tmp)
		}
	}()
	if err := os.Chmod(tmp, 0o755); err != nil {
		return err
	}
	if err := fn(tmp); err != nil {
		return err
	}
	old, err := os.ReadDir(dir)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return os.Rename(tmp, dir)
	case err != nil:
		return err
	}
	for _, e := range old {
		if _, err := os.Lstat(filepath.Join(tmp, e.Name())); errors.Is(err, fs.ErrNotExist) && !isLeftover(e.Name()) {
			carry := os.Link
			if e.IsDir() {
				carry = os.Rename
			}
			if err := carry(filepath.Join(dir, e.Name()), filepath.Join(tmp, e.Name())); err != nil {
				return err
			}
		}
	}
	aside, err := os.MkdirTemp(parent, "."+base+asideTag)
	if err != nil {
		return err
	}
	if err := os.Remove(aside); err != nil {
		return err
	}
	if err := os.Rename(dir, aside); err != nil {
		return err
	}
	if err := os.Rename(tmp, dir); err != nil {
		os.Rename(aside, dir)
		return err
	}
	return os.RemoveAll(aside)
}
