package main

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"path/filepath"
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/solve/regen"
	"github.com/spf13/pflag"
)

// PinBy is the author of the records `init --from --pin` writes.
const PinBy = "import"

func pinFlag(fs *pflag.FlagSet, pin *bool) {
	fs.BoolVar(pin, "pin", false, "record the imported tree as decisions (one named group per category, by = \"import\") in constraints/, so the first solve keeps it")
}

// pinRecords are one group per category of root with at least two items
// — exactly these items form one category — named as imported unless the
// name is provisional. A category with the same items as its only
// subcategory gives one group. The file's name is made from its content,
// so two imports never collide and the same import gives the same file.
func pinRecords(root *format.Category, source, date string) (rel string, text []byte, groups int) {
	cf := &format.ConstraintFile{}
	seen := map[string]bool{}
	var rec func(c *format.Category) []string
	rec = func(c *format.Category) []string {
		members := slices.Clone(c.Items)
		for _, ch := range c.Children {
			sub := rec(ch)
			members = append(members, sub...)
			slices.Sort(sub)
			key := strings.Join(sub, "\x00")
			if len(sub) < 2 || seen[key] {
				continue
			}
			seen[key] = true
			g := format.Group{Items: sub, Provenance: format.Provenance{By: PinBy, Date: date,
				Note: fmt.Sprintf("imported from %s: %s as it was", source, ch.DisplayName())}}
			if !ch.Provisional {
				g.Name = ch.Name
			}
			cf.Groups = append(cf.Groups, g)
		}
		return members
	}
	rec(root)
	// Outer categories first, as an editor would read them.
	slices.Reverse(cf.Groups)
	text = append([]byte(fmt.Sprintf("# The tree imported from %s, recorded by `ramify init --from --pin`:\n# one group per category, so that solving keeps it.\n\n", source)), format.FormatConstraints(cf)...)
	sum := sha256.Sum256(text)
	return "constraints/import-" + hex.EncodeToString(sum[:6]) + ".toml", text, len(cf.Groups)
}

// firstSolvePreview solves the new repository in memory and says how far
// the first `ramify solve` would move from the imported tree.
func firstSolvePreview(dir string, imported *format.Category) (moved, kept, total, created int, err error) {
	p, ds := repo.Load(dir)
	if len(ds) > 0 {
		return 0, 0, 0, 0, ds
	}
	sol, err := regen.Regenerate(p, regen.MethodConstrained, nil)
	if err != nil {
		return 0, 0, 0, 0, err
	}
	rep := diff.Compare(imported, sol.Root)
	total = imported.CountCategories()
	gone := len(rep.Dissolved) + len(rep.Split)
	for _, m := range rep.Merged {
		gone += len(m.From)
	}
	return len(rep.Moved), max(total-gone, 0), total, len(rep.Created), nil
}

// pinPath is the pin file's path on disk.
func pinPath(dir, rel string) (string, error) {
	full, err := repo.Resolve(dir, rel)
	if err != nil {
		return "", err
	}
	return filepath.Clean(full), nil
}
