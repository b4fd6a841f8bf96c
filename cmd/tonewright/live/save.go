package live

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
)

// BackupSuffix is added to the design file's name for the version a save
// replaces.
const BackupSuffix = ".bak"

// beforeRename, when set (by tests), runs after the new version is written
// to its temporary file and before it replaces the old one; an error stops
// the save there, as an interruption would.
var beforeRename func(tmp string) error

// saveFile writes data to path, keeping the file it replaces as
// path.bak. Both are written to a temporary file in the same directory and
// renamed into place, so that an interrupted save leaves the old file
// whole. A symbolic link is followed (the file it points to is replaced).
// It returns the backup's path, empty when path did not exist.
func saveFile(path string, data []byte) (backup string, err error) {
	if real, err := filepath.EvalSymlinks(path); err == nil {
		path = real
	}
	old, err := os.ReadFile(path)
	switch {
	case err == nil:
		backup = path + BackupSuffix
		if err := writeAtomic(backup, old, nil); err != nil {
			return "", fmt.Errorf("keeping the previous version: %w", err)
		}
	case errors.Is(err, fs.ErrNotExist):
	default:
		return "", fmt.Errorf("reading the previous version: %w", err)
	}
	if err := writeAtomic(path, data, beforeRename); err != nil {
		return "", err
	}
	return backup, nil
}

// writeAtomic writes data to a temporary file beside path and renames it
// to path.
func writeAtomic(path string, data []byte, hook func(string) error) error {
	tmp, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return fmt.Errorf("writing %s: %w", filepath.Base(path), err)
	}
	name := tmp.Name()
	fail := func(err error) error {
		tmp.Close()
		os.Remove(name)
		return fmt.Errorf("writing %s: %w", filepath.Base(path), err)
	}
	if _, err := tmp.Write(data); err != nil {
		return fail(err)
	}
	if err := tmp.Sync(); err != nil {
		return fail(err)
	}
	if err := tmp.Chmod(0o644); err != nil {
		return fail(err)
	}
	if err := tmp.Close(); err != nil {
		return fail(err)
	}
	if hook != nil {
		if err := hook(name); err != nil {
			os.Remove(name)
			return fmt.Errorf("writing %s: %w", filepath.Base(path), err)
		}
	}
	if err := os.Rename(name, path); err != nil {
		os.Remove(name)
		return fmt.Errorf("writing %s: %w", filepath.Base(path), err)
	}
	return nil
}
