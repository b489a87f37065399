package format

import (
	"os"
	"path/filepath"
)

// WriteFileAtomic replaces path with data so that a reader (or a crash)
// sees either the old file or the new one, never a half-written file: the
// bytes go to a temporary file in the same folder, are synced, and the
// temporary file is renamed over the target. Every command that writes uses
// this helper.
func WriteFileAtomic(path string, data []byte, perm os.FileMode) (err error) {
	dir := filepath.Dir(path)
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
	if _, err = tmp.Write(data); err != nil {
		return err
	}
	if err = tmp.Sync(); err != nil {
		return err
	}
	if err = tmp.Chmod(perm); err != nil {
		return err
	}
	if err = tmp.Close(); err != nil {
		return err
	}
	if err = os.Rename(tmp.Name(), path); err != nil {
		return err
	}
	// Sync the folder so the rename itself survives a crash. Some file
	// systems refuse to sync a directory; the rename has happened anyway.
	if d, derr := os.Open(dir); derr == nil {
		d.Sync()
		d.Close()
	}
	return nil
}
