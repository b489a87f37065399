package main

import (
	"bytes"
	"errors"
	"io/fs"
	"os"
	"path/filepath"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
)

// beforeOutlineRename runs between staging the new outline and checking
// the file once more; tests set it to edit the file at that moment.
var beforeOutlineRename func()

// writeOutlineGuarded writes the regenerated outline over the committed
// one unless the file changed since solve read it — an editor saved a
// hand edit while solve ran, which the new outline would silently
// overwrite. The file is read again after the new outline is staged,
// just before the rename, so the window left is the rename itself.
func writeOutlineGuarded(p *repo.Repo, data []byte) error {
	target := p.OutlinePath()
	tmp, err := format.StageFile(target, data, 0o644)
	if err != nil {
		return err
	}
	if beforeOutlineRename != nil {
		beforeOutlineRename()
	}
	if err := outlineUnchanged(p, target); err != nil {
		os.Remove(tmp)
		return err
	}
	if err := os.Rename(tmp, target); err != nil {
		os.Remove(tmp)
		return err
	}
	format.SyncDir(filepath.Dir(target))
	return nil
}

// outlineUnchanged fails when the outline on disk is not the one the
// project was loaded with.
func outlineUnchanged(p *repo.Repo, target string) error {
	rel := p.Settings.Taxonomy.File
	now, err := os.ReadFile(target)
	existed := p.Outline != nil
	switch {
	case errors.Is(err, fs.ErrNotExist) && !existed:
		return nil
	case err != nil && !errors.Is(err, fs.ErrNotExist):
		return err
	case existed && err == nil && bytes.Equal(now, p.OutlineText):
		return nil
	}
	return failf("%s changed while solve ran (saved by hand?); nothing was written, so the change is kept. Run `ramify solve` again (after `ramify absorb` if lines were moved)", rel)
}
