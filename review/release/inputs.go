package release

import (
	"maps"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"strings"

	"github.com/BurntSushi/toml"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
)

// Inputs lists the files a release is made of, repository-relative and
// sorted: settings, items, vectors, links, constraints, the outline, and
// the audit log (done, the answered packets' paths).
func Inputs(p *repo.Repo, done []string) ([]string, error) {
	set := map[string]bool{repo.SettingsFile: true, p.Settings.Taxonomy.File: true}
	for _, f := range p.Settings.Items.Files {
		set[f] = true
	}
	if p.Settings.Items.Vectors != "" {
		set[p.Settings.Items.Vectors] = true
	}
	for _, s := range p.Settings.Similarity.Sources {
		if s.File != "" {
			set[s.File] = true
		}
	}
	files, err := repo.ConstraintFiles(p.Dir)
	if err != nil {
		return nil, err
	}
	for _, f := range files {
		set[f] = true
	}
	for _, f := range done {
		set[f] = true
	}
	return slices.Sorted(maps.Keys(set)), nil
}

// Previous finds the newest release of the repository at dir (by
// manifest date, then version) whose exported outline is readable, and
// returns its version and tree; "" and nil when there is none.
func Previous(dir string) (string, *format.Category) {
	releases, err := repo.Resolve(dir, Dir)
	if err != nil {
		return "", nil
	}
	entries, err := os.ReadDir(releases)
	if err != nil {
		return "", nil
	}
	type rel struct{ version, date string }
	var found []rel
	for _, en := range entries {
		name, ok := strings.CutSuffix(en.Name(), ".toml")
		if !ok || !en.Type().IsRegular() || !ValidVersion(name) {
			continue
		}
		var m Manifest
		if _, err := toml.DecodeFile(filepath.Join(releases, en.Name()), &m); err != nil {
			continue
		}
		found = append(found, rel{name, m.Date})
	}
	sort.Slice(found, func(i, j int) bool {
		if found[i].date != found[j].date {
			return found[i].date > found[j].date
		}
		return found[i].version > found[j].version
	})
	for _, r := range found {
		path, err := repo.Resolve(dir, Dir+"/"+r.version+"/taxonomy.outline")
		if err != nil {
			continue
		}
		data, err := format.ReadFileLimited(path, path, format.MaxOutlineBytes)
		if err != nil {
			continue
		}
		o, err := format.ParseOutline(path, data)
		if err != nil {
			continue
		}
		return r.version, o.Root
	}
	return "", nil
}
