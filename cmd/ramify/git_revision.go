package main

import (
	"errors"
	"fmt"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
)

// errNoSuchRevision says that git does not know a revision.
var errNoSuchRevision = errors.New("no such revision")

// errNotAtRevision says that a revision has no file at a path.
var errNotAtRevision = errors.New("no such file at that revision")

// revisionExists reports whether rev names a commit or tree in dir's
// repository. rev must have passed checkRevision.
func revisionExists(dir, rev string) bool {
	_, err := runGit(dir, gitOutputLimit, "rev-parse", "--verify", "--quiet", rev+"^{tree}")
	return err == nil
}

// readAtRevision returns the bytes of the file rel (relative to dir, and
// checked by format.CheckRepoPath) as it is at rev; rev "" means the
// staged version (the index). The path is given to git as "./rel" so that
// git reads it relative to dir, which may be a subfolder of the work tree.
// Errors wrap errNoSuchRevision or errNotAtRevision where that is the cause.
func readAtRevision(dir, rev, rel string, limit int64) ([]byte, error) {
	if rev != "" {
		if msg := checkRevision(rev); msg != "" {
			return nil, errors.New(msg)
		}
	}
	if msg := format.CheckRepoPath(rel); msg != "" {
		return nil, errors.New(msg)
	}
	spec := rev + ":./" + rel
	data, err := runGit(dir, limit, "cat-file", "blob", spec)
	if err == nil {
		return data, nil
	}
	var ge *gitError
	if !errors.As(err, &ge) {
		return nil, err
	}
	if rev != "" && !revisionExists(dir, rev) {
		return nil, fmt.Errorf("%w: git knows no revision %q", errNoSuchRevision, rev)
	}
	where := "revision " + rev
	if rev == "" {
		where = "the index (nothing staged)"
	}
	return nil, fmt.Errorf("%w: %s has no file %s", errNotAtRevision, where, rel)
}

// outlineFileAt is the taxonomy file that the repository at dir names at
// rev: the taxonomy.file of that revision's ramify.toml, or the default
// when the revision has no ramify.toml. A ramify.toml that does not parse
// is bad input, reported under the name "REV:ramify.toml".
func outlineFileAt(dir, rev string) (string, error) {
	data, err := readAtRevision(dir, rev, repo.SettingsFile, format.MaxSmallFileBytes)
	if errors.Is(err, errNotAtRevision) {
		return format.DefaultSettings().Taxonomy.File, nil
	}
	if err != nil {
		return "", err
	}
	settings, err := format.ParseSettings(rev+":"+repo.SettingsFile, data)
	if err != nil {
		return "", format.AsDiags(err, rev+":"+repo.SettingsFile)
	}
	return settings.Taxonomy.File, nil
}
