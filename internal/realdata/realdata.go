// Package realdata bundles the real taxonomies that ramify is developed and
// tuned on (eight WordNet 3.0 noun subtrees in the module's
// testdata/wordnet-dev, whose README.md gives their provenance and
// licence), so that benchmarks and tests run without anything outside the
// module.
package realdata

import (
	"fmt"
	"io/fs"
	"path"
	"slices"

	"github.com/ramify-tax/ramify"
	"github.com/ramify-tax/ramify/format"
)

// files is the module root's embedded testdata/wordnet-dev.
var files = func() fs.FS {
	sub, err := fs.Sub(ramify.DevTaxonomies, "testdata")
	if err != nil {
		panic(err) // the embedded folder is part of the build
	}
	return sub
}()

// Set is one real taxonomy: its items and the reference tree over them.
type Set struct {
	Name string
	// Items are the set's items in file order (sorted by id), each with a
	// label (synonyms joined with ", ") and a short description as text.
	Items []format.Item
	// ItemsTSV is the items file as shipped, for tests that build a
	// repository from it.
	ItemsTSV []byte
	// Reference is the reference tree; ReferenceOutline its file.
	Reference        *format.Category
	ReferenceOutline []byte
}

// Names lists the bundled sets in byte order.
func Names() []string {
	entries, err := fs.ReadDir(files, "wordnet-dev")
	if err != nil {
		panic(err) // the embedded folder is part of the build
	}
	var names []string
	for _, e := range entries {
		if e.IsDir() {
			names = append(names, e.Name())
		}
	}
	slices.Sort(names)
	return names
}

// Load reads one bundled set by name.
func Load(name string) (*Set, error) {
	dir := path.Join("wordnet-dev", name)
	items, err := fs.ReadFile(files, path.Join(dir, "items.tsv"))
	if err != nil {
		return nil, fmt.Errorf("realdata: no set %q", name)
	}
	ref, err := fs.ReadFile(files, path.Join(dir, "reference.outline"))
	if err != nil {
		return nil, fmt.Errorf("realdata: set %q has no reference: %v", name, err)
	}
	s := &Set{Name: name, ItemsTSV: items, ReferenceOutline: ref}
	if s.Items, err = format.ParseItems(name+"/items.tsv", items); err != nil {
		return nil, err
	}
	o, err := format.ParseOutline(name+"/reference.outline", ref)
	if err != nil {
		return nil, err
	}
	s.Reference = o.Root
	return s, nil
}

// All loads every bundled set, in the order of Names.
func All() ([]*Set, error) {
	var sets []*Set
	for _, n := range Names() {
		s, err := Load(n)
		if err != nil {
			return nil, err
		}
		sets = append(sets, s)
	}
	return sets, nil
}
