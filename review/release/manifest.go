// Package release makes a release of a committed taxonomy: it judges the
// review gates on the audit log, builds the manifest (releases/VERSION.toml)
// and the exports, and writes them. It returns what it found and built;
// the command prints it, and runs git.
package release

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"maps"
	"os"
	"path/filepath"
	"regexp"
	"slices"

	"github.com/BurntSushi/toml"
	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/diff/concept"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/export"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/internal/round"
	"github.com/ramify-tax/ramify/review"
	"github.com/ramify-tax/ramify/solve/regen"
)

// Dir is the repository folder of the releases.
const Dir = "releases"

// versionPattern is what a release version may look like: it becomes a
// file name and a git tag, so nothing that a shell or git could read as
// something else.
var versionPattern = regexp.MustCompile(`^[A-Za-z0-9][A-Za-z0-9._-]{0,63}$`)

// ValidVersion reports whether version can name a release.
func ValidVersion(version string) bool { return versionPattern.MatchString(version) }

// ManifestPath is the repository path of the manifest of version.
func ManifestPath(version string) string { return Dir + "/" + version + ".toml" }

// Manifest is releases/VERSION.toml.
type Manifest struct {
	Version     string            `toml:"version"`
	Date        string            `toml:"date"`
	Structure   string            `toml:"structure"`
	Items       int               `toml:"items"`
	Categories  int               `toml:"categories"`
	Depth       int               `toml:"depth"`
	Cost        float64           `toml:"cost"`
	Constraints Records           `toml:"constraints"`
	Audits      Audits            `toml:"audits"`
	Change      *Change           `toml:"change,omitempty"`
	Concepts    *concept.Changes  `toml:"concepts,omitempty"`
	Inputs      map[string]string `toml:"inputs"`
	Exports     map[string]string `toml:"exports"`
}

// Records counts the constraint records a release was solved under.
type Records struct {
	Records  int `toml:"records"`
	Triplets int `toml:"triplets"`
	Groups   int `toml:"groups"`
	Shapes   int `toml:"shapes"`
}

// Audits is the audit tally of the released tree and the gate it met.
// Its fields have no json names: the --json report of release has always
// shown them under their Go names.
type Audits struct {
	Audits        int     `toml:"audits"`
	Rejected      int     `toml:"rejected"`
	Rate          float64 `toml:"rate"`
	Lower         float64 `toml:"lower_95"`
	Upper         float64 `toml:"upper_95"`
	MaxRejectRate float64 `toml:"max_reject_rate"`
}

// AuditsOf is the tally of an audit summary, rounded as the manifest
// keeps it.
func AuditsOf(sum review.AuditSummary, s format.ReleaseSettings) Audits {
	return Audits{
		Audits: sum.Audits, Rejected: sum.Rejected,
		Rate: round.Sig(sum.Rate, 6), Lower: round.Sig(sum.Lo, 6), Upper: round.Sig(sum.Hi, 6),
		MaxRejectRate: s.MaxRejectRate,
	}
}

// Change is what changed since the previous release.
type Change struct {
	Since            string  `toml:"since"`
	Added            int     `toml:"added"`
	Removed          int     `toml:"removed"`
	Moved            int     `toml:"moved"`
	TripletAgreement float64 `toml:"triplet_agreement"`
}

// Release is a release ready to write: its manifest, the manifest's text,
// and the exports by repository path, in path order.
type Release struct {
	Manifest *Manifest
	Text     []byte
	Exports  []File
}

// File is one file of a release.
type File struct {
	Path string // repository path
	Data []byte
}

// Build makes the release of the committed outline of p as version on
// date: sol is the solution check found equal to it, inputs the files
// the release is made of (see Inputs).
func Build(p *repo.Repo, sol *regen.Solution, version, date string, audits Audits, inputs []string) (*Release, error) {
	root := p.Outline.Root
	m := &Manifest{
		Version: version, Date: date, Structure: format.StructureHash(root),
		Items: len(p.Items), Categories: root.CountCategories(), Depth: root.Depth(),
		Cost:   round.Sig(sol.Cost, 10),
		Audits: audits,
		Inputs: map[string]string{}, Exports: map[string]string{},
	}
	// Records and shapes as the files hold them; triplets and groups as
	// the solver counts them (a shape stands for many triplets).
	records, shapes := 0, 0
	for _, f := range p.Constraints {
		records += len(f.Triplets) + len(f.Groups) + len(f.Shapes)
		shapes += len(f.Shapes)
	}
	m.Constraints = Records{Records: records, Triplets: sol.Compiled.Triplets, Groups: sol.Compiled.Groups, Shapes: shapes}
	for _, rel := range inputs {
		full, err := repo.Resolve(p.Dir, rel)
		if err != nil {
			return nil, err
		}
		data, err := format.ReadFileLimited(full, rel, format.MaxDataFileBytes)
		if err != nil {
			return nil, err
		}
		m.Inputs[rel] = sha256Hex(data)
	}
	if prev, prevRoot := Previous(p.Dir); prevRoot != nil {
		rep := diff.Compare(prevRoot, root)
		m.Change = &Change{
			Since: prev, Added: len(rep.Added), Removed: len(rep.Removed), Moved: len(rep.AllMoved()),
			TripletAgreement: round.Sig(rep.Metrics.TripletAgreement, 6),
		}
		// Concepts whose identifiers are gone since the previous release,
		// and who took over their items: what a system that links to
		// concept IRIs must update.
		ch := concept.Compare(prevRoot, root)
		m.Concepts = &ch
	}
	files, err := exports(p, version)
	if err != nil {
		return nil, err
	}
	for _, f := range files {
		m.Exports[f.Path] = sha256Hex(f.Data)
	}
	var buf bytes.Buffer
	buf.WriteString("# ramify release manifest\n")
	if err := toml.NewEncoder(&buf).Encode(m); err != nil {
		return nil, err
	}
	return &Release{Manifest: m, Text: buf.Bytes(), Exports: files}, nil
}

// Write writes the exports, then the manifest, into the repository at
// dir and returns their paths in that order. Every target is resolved
// before anything is written, so a release folder that leads outside the
// repository writes nothing at all; such a path is a *PathError.
func (r *Release) Write(dir string) ([]string, error) {
	targets := make([]string, len(r.Exports))
	for i, f := range r.Exports {
		full, err := repo.Resolve(dir, f.Path)
		if err != nil {
			return nil, &PathError{Path: f.Path, Err: err}
		}
		targets[i] = full
	}
	manifest := ManifestPath(r.Manifest.Version)
	manifestFull, err := repo.Resolve(dir, manifest)
	if err != nil {
		return nil, &PathError{Path: manifest, Err: err}
	}
	if err := os.MkdirAll(filepath.Dir(targets[0]), 0o755); err != nil {
		return nil, err
	}
	written := []string{}
	for i, f := range r.Exports {
		if err := format.WriteFileAtomic(targets[i], f.Data, 0o644); err != nil {
			return written, err
		}
		written = append(written, f.Path)
	}
	if err := format.WriteFileAtomic(manifestFull, r.Text, 0o644); err != nil {
		return written, err
	}
	return append(written, manifest), nil
}

// PathError is a release file whose path cannot be written: it leads
// outside the repository.
type PathError struct {
	Path string
	Err  error
}

func (e *PathError) Error() string { return e.Path + ": " + e.Err.Error() }

func (e *PathError) Unwrap() error { return e.Err }

func sha256Hex(b []byte) string {
	s := sha256.Sum256(b)
	return hex.EncodeToString(s[:])
}

// exports renders the committed outline in every export form, as the
// files of releases/VERSION/ in name order.
func exports(p *repo.Repo, version string) ([]File, error) {
	root := p.Outline.Root
	out := map[string][]byte{"taxonomy.outline": p.OutlineText}
	render := []struct {
		name string
		fn   func(b *bytes.Buffer) error
	}{
		{"taxonomy.ttl", func(b *bytes.Buffer) error {
			return export.SKOS(b, root, p.Items, export.SKOSOptions{BaseIRI: p.Settings.Release.BaseIRI, Version: version})
		}},
		{"taxonomy.nwk", func(b *bytes.Buffer) error { return export.Newick(b, root, export.NewickOptions{}) }},
		{"taxonomy.json", func(b *bytes.Buffer) error { return export.JSON(b, root, p.Items) }},
		{"taxonomy.csv", func(b *bytes.Buffer) error { return export.CSV(b, root, p.Items) }},
	}
	for _, r := range render {
		var b bytes.Buffer
		if err := r.fn(&b); err != nil {
			return nil, err
		}
		out[r.name] = b.Bytes()
	}
	names := slices.Sorted(maps.Keys(out))
	files := make([]File, len(names))
	for i, name := range names {
		files[i] = File{Path: Dir + "/" + version + "/" + name, Data: out[name]}
	}
	return files, nil
}
