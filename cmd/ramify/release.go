package main

import (
	"bytes"
	"errors"
	"fmt"
	"os"
	"strings"
	"time"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/review"
	"github.com/ramify-tax/ramify/review/release"
	"github.com/ramify-tax/ramify/solve/regen"
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
		bind: withOptions(func(fs *pflag.FlagSet, o *releaseOptions) {
			fs.BoolVar(&o.tag, "tag", false, "commit the release files and make an annotated git tag VERSION")
			fs.BoolVar(&o.dryRun, "dry-run", false, "run the gates and report, writing nothing")
			fs.StringVar(&o.date, "date", "", "the release date, YYYY-MM-DD (default: today, UTC)")
		}, runRelease),
	})
}

type releaseOptions struct {
	tag    bool
	dryRun bool
	date   string
}

// releaseReport is release's --json report: check's, then what each
// later step found, nil or "" until it is reached.
type releaseReport struct {
	checkReport
	Audits    *release.Audits `json:"audits,omitempty"`
	Manifest  string          `json:"manifest,omitempty"`
	Structure string          `json:"structure,omitempty"`
	Tag       string          `json:"tag,omitempty"`
	Version   string          `json:"version,omitempty"`
	Written   []string        `json:"written,omitempty"`
}

func runRelease(e *env, o *releaseOptions, args []string) error {
	if len(args) != 1 {
		return usagef("release takes one argument, the version (for example 2026.1)")
	}
	version := args[0]
	if !release.ValidVersion(version) {
		return usagef("version %q: use letters, digits, '.', '_' and '-', starting with a letter or digit", version)
	}
	date, err := releaseDate(o.date)
	if err != nil {
		return err
	}
	dir := e.dir()
	p, ds := repo.Load(dir)
	if len(ds) > 0 {
		return ds
	}
	manifestRel := release.ManifestPath(version)
	manifestPath, err := repo.Resolve(dir, manifestRel)
	if err != nil {
		return failf("%s: %v", manifestRel, err)
	}
	if _, err := os.Stat(manifestPath); err == nil {
		return failf("release %s exists already (%s); choose a new version", version, manifestRel)
	}
	rep := &releaseReport{}
	e.result = rep
	sol, inputs, err := releaseGates(e, o, rep, p, version)
	if err != nil {
		return err
	}
	r, err := release.Build(p, sol, version, date, *rep.Audits, inputs)
	if err != nil {
		return err
	}
	m := r.Manifest
	rep.Version, rep.Structure, rep.Manifest = version, m.Structure, manifestRel
	if o.dryRun {
		e.say("all gates pass for %s (dry run: nothing written)", version)
		e.say("  %s", summaryLine(m))
		return nil
	}
	written, err := r.Write(dir)
	var pe *release.PathError
	if errors.As(err, &pe) {
		return failf("%v", pe)
	}
	if err != nil {
		return err
	}
	rep.Written = written
	e.say("released %s: %s", version, summaryLine(m))
	for _, w := range written {
		e.say("  wrote %s", w)
	}
	if o.tag {
		if err := commitAndTag(dir, version, written, m); err != nil {
			return err
		}
		rep.Tag = version
		e.say("committed the release files and tagged %s", version)
	}
	return nil
}

// releaseGates runs every gate of a release, in order, and returns the
// checked solution and the release's input files.
func releaseGates(e *env, o *releaseOptions, rep *releaseReport, p *repo.Repo, version string) (*regen.Solution, []string, error) {
	dir := p.Dir
	// Gate 1: check.
	sol, err := checkRepository(e, p, &rep.checkReport)
	if err != nil {
		return nil, nil, withGate("check", err)
	}
	// Gate 2: nothing waiting for a verdict.
	open, err := listPackets(dir, review.OpenDir)
	if err != nil {
		return nil, nil, err
	}
	rels := make([]string, len(open))
	for i, f := range open {
		rels[i] = f.rel
	}
	if b := release.CheckOpen(rels); b != nil {
		return nil, nil, blockedError(b, p)
	}
	// Gate 3: enough audits on this tree, reject rate bounded.
	doneFiles, err := listPackets(dir, review.DoneDir)
	if err != nil {
		return nil, nil, err
	}
	done, err := readDonePackets(doneFiles)
	if err != nil {
		return nil, nil, err
	}
	sum := review.SummarizeAudits(done, p.Outline.Root)
	audits := release.AuditsOf(sum, p.Settings.Release)
	rep.Audits = &audits
	if b := release.CheckAudits(sum, p.Settings.Release); b != nil {
		return nil, nil, blockedError(b, p)
	}
	// Gate 4: the defining files are committed.
	doneRels := make([]string, len(doneFiles))
	for i, f := range doneFiles {
		doneRels[i] = f.rel
	}
	inputs, err := release.Inputs(p, doneRels)
	if err != nil {
		return nil, nil, err
	}
	if err := gateCommitted(dir, inputs); err != nil {
		return nil, nil, err
	}
	// Gate 5: the tag is new.
	if o.tag {
		if _, err := runGit(dir, gitOutputLimit, "rev-parse", "-q", "--verify", "refs/tags/"+version); err == nil {
			return nil, nil, failf("gate version: git tag %s exists already; choose a new version", version)
		}
	}
	return sol, inputs, nil
}

// blockedError says why a review gate stops the release, and what to do.
func blockedError(b *release.Blocked, p *repo.Repo) error {
	s, r := b.Audits, p.Settings.Release
	switch b.Gate {
	case release.GateOpenPackets:
		return failf("gate open packets: %s in %s/ (%s); answer them and run `ramify absorb`",
			plural(len(b.Open), "packet waits", "packets wait"), review.OpenDir, strings.Join(b.Open, ", "))
	case release.GateAudits:
		return failf("gate audits: %s answer for this tree (structure %s), %d needed; run `ramify review draw`, answer the audit packets and `ramify absorb`",
			plural(s.Audits, "audit", "audits"), format.StructureHash(p.Outline.Root), r.MinAudits)
	default:
		return failf("gate reject rate: %d of %d audits rejected; the 95%% upper bound %.4f exceeds release.max_reject_rate %.4f — %s",
			s.Rejected, s.Audits, s.Hi, r.MaxRejectRate, moreAuditsText(s, r))
	}
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

func summaryLine(m *release.Manifest) string {
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

// readDonePackets parses the audit log, reviews/done/*.outline.
func readDonePackets(files []packetFile) ([]*format.Packet, error) {
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

// commitAndTag commits the release files and tags the commit.
func commitAndTag(dir, version string, files []string, m *release.Manifest) error {
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
