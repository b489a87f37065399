package repo

import (
	"crypto/sha256"
	"encoding/hex"
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/format"
)

// RecordKeys lists every constraint record, in the order of the records
// solve/regen compiles, as its fingerprint and the items it names. The
// fingerprint hashes the record's kind and content (a triplet's pair and
// odd one out, a group's items, a shape's canonical outline) and leaves
// out who made it, when and why: rewording a note is not a new decision.
// The outline keeps these lines, so that the next solve can tell which
// decisions are new and which were removed.
func (p *Repo) RecordKeys() []format.OutlineRecord {
	return RecordKeysOf(p.Constraints...)
}

// RecordKeysOf is RecordKeys for the records of the given files, in order.
func RecordKeysOf(files ...*format.ConstraintFile) []format.OutlineRecord {
	var out []format.OutlineRecord
	for _, f := range files {
		if f == nil {
			continue
		}
		for _, t := range f.Triplets {
			pair := []string{t.Pair[0], t.Pair[1]}
			slices.Sort(pair)
			out = append(out, recordKey("triplet", pair[0]+" "+pair[1]+" | "+t.Out, append(pair, t.Out)))
		}
		for _, g := range f.Groups {
			items := slices.Clone(g.Items)
			slices.Sort(items)
			out = append(out, recordKey("group", strings.Join(items, " "), items))
		}
		for _, s := range f.Shapes {
			tree := s.Tree.Clone()
			out = append(out, recordKey("shape", string(format.FormatTree(tree)), tree.AllItems()))
		}
	}
	return out
}

func recordKey(kind, content string, items []string) format.OutlineRecord {
	sum := sha256.Sum256([]byte("ramify record\n" + kind + "\n" + content))
	items = slices.Clone(items)
	slices.Sort(items)
	return format.OutlineRecord{Key: hex.EncodeToString(sum[:6]), Items: slices.Compact(items)}
}
