package main

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strings"
	"time"

	"github.com/BurntSushi/toml"
	"github.com/ramify-tax/ramify/concept"
	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/export"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/project"
	"github.com/ramify-tax/ramify/review"
	"github.com/spf13/pflag"
)

func init() {
	register(&command{
		name:    "release",
		summary: "run every gate, write the release manifest and exports, optionally tag",
		usage:   "VERSION",
		help: `Releases the committed taxonomy as VERSION after these gates, each of
which says what to do when it fails (exit status 1):

  1. check passes: the inputs are valid, the constraints agree, the
     outline honours every one and is what "ramify solve" writes now;
  2. no review packet is waiting in reviews/open/;
  3. at least release.min_audits random audits were answered on this very
     tree (its structure hash), and the upper end of the exact two-sided
     95% Clopper-Pearson interval of their reject rate is at most
     release.max_reject_rate;
  4. the files that define the release are committed in git;
  5. VERSION is new (no releases/VERSION.toml, no git tag VERSION).

Then it writes releases/VERSION.toml (version, date, structure hash, the
sha256 of every input, counts, cost, constraint counts, the audit tally
and interval, and what changed since the previous release) and the
exports in releases/VERSION/ (taxonomy.outline, SKOS Turtle, Newick, JSON,
CSV). Since the previous release, the manifest's [concepts] table lists
the concept identifiers added and retired — each retired one with the
identifiers that took over its items — and the categories split or
merged, so that systems linking to concept IRIs know what to update. With --tag it commits those files and makes an annotated git tag
VERSION whose message summarises the manifest. --dry-run runs the gates
and writes nothing.`,
		flags: func(fs *pflag.FlagSet, o *options) {
			o.extra["tag"] = fs.Bool("tag", false, "commit the release files and make an annotated git tag VERSION")
			o.extra["dry-run"] = fs.Bool("dry-run", false, "run the gates and report, writing nothing")
			o.extra["date"] = fs.String("date", "", "the release date, YYYY-MM-DD (default: today, UTC)")
		},
		run: runRelease,
	})
}

// versionPattern is what a release version may look like: it becomes a
// file name and a git tag, so nothing that a shell or git could read as
// something else.
var versionPattern = regexp.MustCompile(`^[A-Za-z0-9][A-Za-z0-9._-]{0,63}$`)

// releaseManifest is releases/VERSION.toml.
type releaseManifest struct {
	Version     string            `toml:"version"`
	Date        string            `toml:"date"`
	Structure   string            `toml:"structure"`
	Items       int               `toml:"items"`
	Categories  int               `toml:"categories"`
	Depth       int               `toml:"depth"`
	Cost        float64           `toml:"cost"`
	Constraints manifestRecords   `toml:"constraints"`
	Audits      manifestAudits    `toml:"audits"`
	Change      *manifestChange   `toml:"change,omitempty"`
	Concepts    *concept.Changes  `toml:"concepts,omitempty"`
	Inputs      map[string]string `toml:"inputs"`
	Exports     map[string]string `toml:"exports"`
}

type manifestRecords struct {
	Records  int `toml:"records"`
	Triplets int `toml:"triplets"`
	Groups   int `toml:"groups"`
	Shapes   int `toml:"shapes"`
}

type manifestAudits struct {
	Audits        int     `toml:"audits"`
	Rejected      int     `toml:"rejected"`
	Rate          float64 `toml:"rate"`
	Lower         float64 `toml:"lower_95"`
	Upper         float64 `toml:"upper_95"`
	MaxRejectRate float64 `toml:"max_reject_rate"`
}

type manifestChange struct {
	Since            string  `toml:"since"`
	Added            int     `toml:"added"`
	Removed          int     `toml:"removed"`
	Moved            int     `toml:"moved"`
	TripletAgreement float64 `toml:"triplet_agreement"`
}

func runRelease(e *env, args []string) error {
	if len(args) != 1 {
		return usagef("release takes one argument, the version (for example 2026.1)")
	}
	version := args[0]
	if !versionPattern.MatchString(version) {
		return usagef("version %q: use letters, digits, '.', '_' and '-', starting with a letter or digit", version)
	}
	tag := *e.opt.extra["tag"].(*bool)
	dryRun := *e.opt.extra["dry-run"].(*bool)
	date, err := releaseDate(*e.opt.extra["date"].(*string))
	if err != nil {
		return err
	}
	dir := e.dir()
	p, ds := project.Load(dir)
	if len(ds) > 0 {
		return ds
	}
	manifestRel := "releases/" + version + ".toml"
	manifestPath, err := project.Resolve(dir, manifestRel)
	if err != nil {
		return failf("%s: %v", manifestRel, err)
	}
	if _, err := os.Stat(manifestPath); err == nil {
		return failf("release %s exists already (%s); choose a new version", version, manifestRel)
	}

	// Gate 1: check.
	checked := &checkReport{}
	e.result = checked
	sol, err := checkRepository(e, p, checked)
	if err != nil {
		return withGate("check", err)
	}
	// Gate 2: nothing waiting for a verdict.
	open, err := listPackets(dir, review.OpenDir)
	if err != nil {
		return err
	}
	if len(open) > 0 {
		rels := make([]string, len(open))
		for i, f := range open {
			rels[i] = f.rel
		}
		return failf("gate open packets: %s in %s/ (%s); answer them and run `ramify absorb`",
			plural(len(open), "packet waits", "packets wait"), review.OpenDir, strings.Join(rels, ", "))
	}
	// Gate 3: enough audits on this tree, reject rate bounded.
	structure := format.StructureHash(p.Outline.Root)
	done, err := readDonePackets(dir)
	if err != nil {
		return err
	}
	sum := review.SummarizeAudits(done, p.Outline.Root)
	audits := manifestAudits{
		Audits: sum.Audits, Rejected: sum.Rejected,
		Rate: roundSig(sum.Rate, 6), Lower: roundSig(sum.Lo, 6), Upper: roundSig(sum.Hi, 6),
		MaxRejectRate: p.Settings.Release.MaxRejectRate,
	}
	e.report["audits"] = audits
	if sum.Audits < p.Settings.Release.MinAudits {
		return failf("gate audits: %s answer for this tree (structure %s), %d needed; run `ramify review draw`, answer the audit packets and `ramify absorb`",
			plural(sum.Audits, "audit", "audits"), structure, p.Settings.Release.MinAudits)
	}
	if sum.Hi > p.Settings.Release.MaxRejectRate {
		return failf("gate reject rate: %d of %d audits rejected; the 95%% upper bound %.4f exceeds release.max_reject_rate %.4f — %s",
			sum.Rejected, sum.Audits, sum.Hi, p.Settings.Release.MaxRejectRate, moreAuditsText(sum, p.Settings.Release))
	}
	// Gate 4: the defining files are committed.
	inputs, err := releaseInputs(p)
	if err != nil {
		return err
	}
	if err := gateCommitted(dir, inputs); err != nil {
		return err
	}
	// Gate 5: the tag is new.
	if tag {
		if _, err := runGit(dir, gitOutputLimit, "rev-parse", "-q", "--verify", "refs/tags/"+version); err == nil {
			return failf("gate version: git tag %s exists already; choose a new version", version)
		}
	}

	m := &releaseManifest{
		Version: version, Date: date, Structure: structure,
		Items: len(p.Items), Categories: p.Outline.Root.CountCategories(), Depth: p.Outline.Root.Depth(),
		Cost:   roundSig(sol.Cost, 10),
		Audits: audits,
		Inputs: map[string]string{}, Exports: map[string]string{},
	}
	c := countRecords(p.Constraints)
	m.Constraints = manifestRecords{Records: c.Records, Triplets: sol.Compiled.Triplets, Groups: sol.Compiled.Groups, Shapes: c.Shapes}
	for _, rel := range inputs {
		full, err := project.Resolve(dir, rel)
		if err != nil {
			return err
		}
		data, err := format.ReadFileLimited(full, rel, format.MaxDataFileBytes)
		if err != nil {
			return err
		}
		m.Inputs[rel] = sha256Hex(data)
	}
	if prev, prevRoot := previousRelease(dir); prevRoot != nil {
		rep := diff.Compare(prevRoot, p.Outline.Root)
		m.Change = &manifestChange{
			Since: prev, Added: len(rep.Added), Removed: len(rep.Removed), Moved: len(rep.AllMoved()),
			TripletAgreement: roundSig(rep.Metrics.TripletAgreement, 6),
		}
		// Concepts whose identifiers are gone since the previous release,
		// and who took over their items: what a system that links to
		// concept IRIs must update.
		ch := concept.Compare(prevRoot, p.Outline.Root)
		m.Concepts = &ch
	}
	exports, err := releaseExports(p, version)
	if err != nil {
		return err
	}
	names := make([]string, 0, len(exports))
	for name := range exports {
		names = append(names, name)
	}
	sort.Strings(names)
	for _, name := range names {
		m.Exports["releases/"+version+"/"+name] = sha256Hex(exports[name])
	}
	var buf bytes.Buffer
	buf.WriteString("# ramify release manifest\n")
	if err := toml.NewEncoder(&buf).Encode(m); err != nil {
		return err
	}
	e.report["version"] = version
	e.report["structure"] = structure
	e.report["manifest"] = manifestRel
	if dryRun {
		e.say("all gates pass for %s (dry run: nothing written)", version)
		e.say("  %s", summaryLine(m))
		return nil
	}
	// Every target is resolved before anything is written, so a release
	// folder that leads outside the repository writes nothing at all.
	targets := make([]string, len(names))
	for i, name := range names {
		if targets[i], err = project.Resolve(dir, "releases/"+version+"/"+name); err != nil {
			return failf("releases/%s/%s: %v", version, name, err)
		}
	}
	if err := os.MkdirAll(filepath.Dir(targets[0]), 0o755); err != nil {
		return err
	}
	written := []string{}
	for i, name := range names {
		if err := format.WriteFileAtomic(targets[i], exports[name], 0o644); err != nil {
			return err
		}
		written = append(written, "releases/"+version+"/"+name)
	}
	if err := format.WriteFileAtomic(manifestPath, buf.Bytes(), 0o644); err != nil {
		return err
	}
	written = append(written, manifestRel)
	e.report["written"] = written
	e.say("released %s: %s", version, summaryLine(m))
	for _, w := range written {
		e.say("  wrote %s", w)
	}
	if tag {
		if err := commitAndTag(dir, version, written, m); err != nil {
			return err
		}
		e.report["tag"] = version
		e.say("committed the release files and tagged %s", version)
	}
	return nil
}

func withGate(name string, err error) error {
	var f *failure
	// A gate that finds file problems fails (exit 1, a gate), naming them.
	var ad *adviceDiags
	if errors.As(err, &ad) {
		f = &failure{}
		for _, d := range ad.ds {
			f.lines = append(f.lines, d.String())
		}
		f.lines = append(f.lines, ad.advice...)
	}
	if f != nil || errors.As(err, &f) {
		lines := append([]string{"gate " + name + ": " + f.lines[0]}, f.lines[1:]...)
		return &failure{lines: lines, detail: f.detail}
	}
	return err
}

func releaseDate(given string) (string, error) {
	if given == "" {
		given = os.Getenv("RAMIFY_DATE")
	}
	if given == "" {
		return time.Now().UTC().Format("2006-01-02"), nil
	}
	if _, err := time.Parse("2006-01-02", given); err != nil {
		return "", usagef("--date %q is not YYYY-MM-DD", given)
	}
	return given, nil
}

func summaryLine(m *releaseManifest) string {
	s := fmt.Sprintf("%d items, %d categories, %d constraint records, %d audits (%d rejected, 95%% upper bound %.4f)",
		m.Items, m.Categories, m.Constraints.Records, m.Audits.Audits, m.Audits.Rejected, m.Audits.Upper)
	if m.Change != nil {
		s += fmt.Sprintf("; since %s: %d added, %d removed, %d moved", m.Change.Since, m.Change.Added, m.Change.Removed, m.Change.Moved)
	}
	if m.Concepts != nil {
		s += fmt.Sprintf("; %s", plural(len(m.Concepts.Retired), "concept retired", "concepts retired"))
	}
	return s
}

func sha256Hex(b []byte) string {
	s := sha256.Sum256(b)
	return hex.EncodeToString(s[:])
}

// readDonePackets parses the audit log, reviews/done/*.outline.
func readDonePackets(dir string) ([]*format.Packet, error) {
	files, err := listPackets(dir, review.DoneDir)
	if err != nil {
		return nil, err
	}
	answers, ds := parsePackets(files)
	if len(ds) > 0 {
		return nil, ds
	}
	out := make([]*format.Packet, len(answers))
	for i, a := range answers {
		out[i] = a.Packet
	}
	return out, nil
}

// releaseInputs lists the files a release is made of, repository-relative
// and sorted: settings, items, vectors, links, constraints, the outline,
// and the audit log.
func releaseInputs(p *project.Project) ([]string, error) {
	set := map[string]bool{project.SettingsFile: true, p.Settings.Taxonomy.File: true}
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
	files, err := project.ConstraintFiles(p.Dir)
	if err != nil {
		return nil, err
	}
	for _, f := range files {
		set[f] = true
	}
	done, err := listPackets(p.Dir, review.DoneDir)
	if err != nil {
		return nil, err
	}
	for _, f := range done {
		set[f.rel] = true
	}
	out := make([]string, 0, len(set))
	for f := range set {
		out = append(out, f)
	}
	sort.Strings(out)
	return out, nil
}

// gateCommitted fails unless every input is tracked by git and unchanged
// against HEAD.
func gateCommitted(dir string, inputs []string) error {
	if _, err := gitTopLevel(dir); err != nil {
		return failf("gate committed: %s is not in a git repository; a release records committed files only (run `git init` and commit)", dir)
	}
	args := append([]string{"status", "--porcelain", "--untracked-files=all", "--"}, gitPaths(inputs)...)
	out, err := runGit(dir, gitOutputLimit, args...)
	if err != nil {
		return err
	}
	if len(bytes.TrimSpace(out)) > 0 {
		lines := []string{"gate committed: these files differ from the last commit; commit them first:"}
		for _, l := range strings.Split(strings.TrimRight(string(out), "\n"), "\n") {
			lines = append(lines, "  "+l)
		}
		return &failure{lines: lines}
	}
	return nil
}

// releaseExports renders the committed outline in every export form.
func releaseExports(p *project.Project, version string) (map[string][]byte, error) {
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
	return out, nil
}

// previousRelease finds the newest earlier release (by manifest date, then
// version) whose exported outline is readable.
func previousRelease(dir string) (string, *format.Category) {
	releases, err := project.Resolve(dir, "releases")
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
		if !ok || !en.Type().IsRegular() || !versionPattern.MatchString(name) {
			continue
		}
		var m releaseManifest
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
		path, err := project.Resolve(dir, "releases/"+r.version+"/taxonomy.outline")
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

// commitAndTag commits the release files and tags the commit.
func commitAndTag(dir, version string, files []string, m *releaseManifest) error {
	add := append([]string{"add", "--"}, gitPaths(files)...)
	if _, err := runGit(dir, gitOutputLimit, add...); err != nil {
		return err
	}
	msg := "Release " + version + "\n\n" + summaryLine(m) + "\nstructure " + m.Structure + "\n"
	commit := append([]string{"commit", "-q", "-m", msg, "--"}, gitPaths(files)...)
	if _, err := runGit(dir, gitOutputLimit, commit...); err != nil {
		return fmt.Errorf("committing the release files (they are written; commit and tag by hand): %s", gitMessage(err))
	}
	if _, err := runGit(dir, gitOutputLimit, "tag", "-a", version, "-m", msg); err != nil {
		return fmt.Errorf("tagging %s (the release commit is made): %s", version, gitMessage(err))
	}
	return nil
}

// gitMessage is what git said, without the command line.
func gitMessage(err error) string {
	var ge *gitError
	if errors.As(err, &ge) && strings.TrimSpace(ge.stderr) != "" {
		return firstLineOf(strings.TrimPrefix(strings.TrimSpace(ge.stderr), "fatal: "))
	}
	return err.Error()
}

// moreAuditsText says how many more clean audits would pass the gate.
func moreAuditsText(sum review.AuditSummary, r format.ReleaseSettings) string {
	switch more := sum.MoreCleanAudits(r.MaxRejectRate, r.MinAudits); {
	case more < 0:
		return "no number of clean audits can pass release.max_reject_rate after the rejections so far"
	case more == 0:
		return "the audits so far pass the gate"
	default:
		return plural(more, "more clean audit", "more clean audits") + " (answered ok) would pass the gate"
	}
}
