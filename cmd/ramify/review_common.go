package main

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"time"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/review"
	"github.com/ramify-tax/ramify/review/committee"
	"github.com/spf13/pflag"
)

// reviewDateEnv overrides today's date for commands that stamp one, so
// tests and scripted runs are reproducible.
const reviewDateEnv = "RAMIFY_DATE"

// addDateFlag adds --date to a command that stamps files with a date.
func addDateFlag(fs *pflag.FlagSet, date *string, what string) {
	fs.StringVar(date, "date", "", what+" (YYYY-MM-DD; default today, UTC, or $"+reviewDateEnv+")")
}

// reviewDate is the --date flag's value d, else $RAMIFY_DATE, else today
// in UTC.
func reviewDate(d string) (string, error) {
	source := "--date"
	if d == "" {
		d = os.Getenv(reviewDateEnv)
		source = "$" + reviewDateEnv
	}
	if d == "" {
		return time.Now().UTC().Format(time.DateOnly), nil
	}
	if _, err := time.Parse(time.DateOnly, d); err != nil {
		return "", usagef("%s %q is not a date written YYYY-MM-DD", source, d)
	}
	return d, nil
}

// packetFile is one packet file of reviews/open or reviews/done.
type packetFile struct {
	rel  string // repository path
	full string
	id   string // file name without .outline
}

// listPackets lists the .outline files of a review folder in name order.
// A missing folder holds no packets; links and other odd entries are
// skipped, so nothing outside the repository is read through them.
func listPackets(dir, rel string) ([]packetFile, error) {
	full, err := repo.Resolve(dir, rel)
	if err != nil {
		return nil, err
	}
	entries, err := os.ReadDir(full)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, nil
	}
	if err != nil {
		return nil, err
	}
	var out []packetFile
	for _, en := range entries {
		name := en.Name()
		if !en.Type().IsRegular() || strings.HasPrefix(name, ".") || !strings.HasSuffix(name, ".outline") {
			continue
		}
		out = append(out, packetFile{
			rel:  rel + "/" + name,
			full: filepath.Join(full, name),
			id:   strings.TrimSuffix(name, ".outline"),
		})
	}
	sort.Slice(out, func(i, j int) bool { return out[i].rel < out[j].rel })
	return out, nil
}

// readPackets parses every packet of a review folder, reporting every
// problem of every file.
func readPackets(dir, rel string) ([]*review.Answer, format.Diags) {
	files, err := listPackets(dir, rel)
	if err != nil {
		return nil, format.Diags{{Pos: format.Pos{File: rel}, Msg: err.Error()}}
	}
	return parsePackets(files)
}

// parsePackets reads and parses packet files, reporting every problem of
// every file.
func parsePackets(files []packetFile) ([]*review.Answer, format.Diags) {
	var out []*review.Answer
	var ds format.Diags
	for _, f := range files {
		data, err := format.ReadFileLimited(f.full, f.rel, format.MaxSmallFileBytes)
		if err != nil {
			ds = append(ds, format.AsDiags(err, f.rel)...)
			continue
		}
		p, err := format.ParsePacket(f.rel, data)
		if err != nil {
			ds = append(ds, format.AsDiags(err, f.rel)...)
			continue
		}
		out = append(out, &review.Answer{File: f.rel, ID: f.id, Data: data, Packet: p})
	}
	return out, ds
}

// currentTaxonomy checks that the committed outline can be reviewed: it
// exists, places exactly the repository's items, and was not reshaped by
// hand. It returns the outline's structure hash.
func currentTaxonomy(p *repo.Repo, what string) (string, error) {
	rel := p.Settings.Taxonomy.File
	if p.Outline == nil {
		return "", failf("%s does not exist yet; run `ramify solve` first, then %s", rel, what)
	}
	if ms := p.OutlineMembership(); len(ms) > 0 {
		return "", outlineMembershipError(ms, fmt.Sprintf("%s is out of date with the items; run `ramify solve` first, then %s", rel, what))
	}
	if p.Outline.Edited() {
		return "", failf("%s was reshaped by hand; run `ramify absorb` to record the edit and `ramify solve`, then %s", rel, what)
	}
	return format.StructureHash(p.Outline.Root), nil
}

// reviewCommittee solves the committee for the current taxonomy. The seed
// comes from the structure hash, so the same taxonomy always gets the same
// committee.
func reviewCommittee(e *env, p *repo.Repo, structure string) (*review.Committee, error) {
	c, compiled, err := committee.Solve(p, structure, e.progressFunc())
	e.endProgress()
	if err != nil {
		if compiled == nil {
			return nil, err
		}
		return nil, solveError(e, compiled.NameConflict(err))
	}
	return c, nil
}

// sortedStrings returns s sorted (s itself is sorted in place).
func sortedStrings(s []string) []string {
	sort.Strings(s)
	return s
}
