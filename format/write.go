package format

import (
	"os"
	"path/filepath"
)

// WriteFileAtomic replaces path with data so that a reader (or a crash)
// sees either the old file or the new one, never a half-written file: the
// bytes go to a temporary file in the same folder, are synced, and the
// temporary file is renamed over the target. Every command that writes uses
// this helper. A crash can leave the temporary file behind; its name
// carries the writer's process id so that CleanStaleTemps can tell it from
// one another ramify is still writing.
func WriteFileAtomic(path string, data []byte, perm os.FileMode) error {
	tmp, err := StageFile(path, data, perm)
	if err != nil {
		return err
	}
	if err := os.Rename(tmp, path); err != nil {
		os.Remove(tmp)
		return err
	}
	SyncDir(filepath.Dir(path))
	return nil
}

// StageFile writes data to a new temporary file beside path (synced, with
// perm) and returns its name, for a caller that renames it over path
// later, together with other files.
func StageFile(path string, data []byte, perm os.FileMode) (_ string, err error) {
	tmp, err := os.CreateTemp(filepath.Dir(path), tempPattern(path))
	if err != nil {
		return "", err
	}
	defer func() {
		if err != nil {
			tmp.Close()
			os.Remove(tmp.Name())
		}
	}()
	if _, err = tmp.Write(data); err != nil {
		return "", err
	}
	if err = tmp.Sync(); err != nil {
		return "", err
	}
	if err = tmp.Chmod(perm); err != nil {
		return "", err
	}
	if err = tmp.Close(); err != nil {
		return "", err
	}
	return tmp.Name(), nil
}

// SyncDir syncs a folder so that renames in it survive a crash. Some file
// systems refuse to sync a directory; the renames have happened anyway.
func SyncDir(dir string) {
	if d, err := os.Open(dir); err == nil {
		d.Sync()
		d.Close()
	}
}
