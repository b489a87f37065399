package main

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"github.com/ramify-tax/ramify/diff/concept"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/spf13/pflag"
)

// The files `init --from` writes. The settings template points at both,
// so a fresh repository reads them; an existing ramify.toml must too.
const (
	importItemsFile   = "items.toml"
	importOutlineFile = "taxonomy.outline"
)

// importFlags adds init's flags: --from and the options of an import.
func importFlags(fs *pflag.FlagSet, o *initOptions) {
	fs.StringVar(&o.from, "from", "", "start from an existing taxonomy in `FILE` (relative to the current folder): an .outline file; a CSV file with the columns id and path (and optionally label, tags, text, concepts), path being the category names from the top down joined by \" > \" (or by \"/\" when no path in the file holds \" > \"); or a SKOS concept scheme as Turtle (.ttl), N-Triples (.nt) or JSON-LD (.jsonld, .json)")
	skosFlags(fs, &o.skos)
	pinFlag(fs, &o.pin)
}

// importedJSON is what init --from read, in its report.
type importedJSON struct {
	Categories int    `json:"categories"`
	From       string `json:"from"`
	Items      int    `json:"items"`
}

// firstSolveJSON is what the first solve would do to the imported tree.
type firstSolveJSON struct {
	Categories        int  `json:"categories"`
	CategoriesCreated int  `json:"categories_created"`
	CategoriesKept    int  `json:"categories_kept"`
	Moved             int  `json:"moved"`
	Pinned            bool `json:"pinned"`
}

// importTaxonomy starts a repository in dir from an existing taxonomy in
// the file from (relative to the current folder): items.toml gets one
// [[item]] per id and taxonomy.outline the imported tree without a
// structure line, so the first solve takes it as the previous version —
// its names and its shape pull the new tree, as a hand-made outline would
// — rather than as a hand edit to absorb. Then everything plain init
// writes. A problem in from is reported with its place and nothing is
// written; existing items or outline files are never replaced.
func importTaxonomy(e *env, o *initOptions, dir string) error {
	from := o.from
	root, items, skosRead, err := readImport(e, o)
	if err != nil {
		return err
	}
	if skosRead != nil {
		// A later failure still reports what the SKOS file held.
		e.result = struct {
			Skos *skosJSON `json:"skos"`
		}{skosRead}
	}
	if err := checkImportTargets(dir); err != nil {
		return err
	}
	source := filepath.Base(from)
	if err := writeImported(dir, source, root, items); err != nil {
		return err
	}
	var pinned []string
	pinGroups := 0
	if o.pin {
		rel, n, err := writePinRecords(dir, root, source)
		if err != nil {
			return err
		}
		pinned, pinGroups = []string{rel}, n
	}
	// The rest is plain init's, which keeps the files just written.
	wrote, kept, err := scaffoldRest(e, dir)
	if err != nil {
		return err
	}
	wrote = append(append([]string{importItemsFile, importOutlineFile}, pinned...), wrote...)
	e.say("imported %s in %s from %s", plural(len(items), "item", "items"), plural(root.CountCategories(), "category", "categories"), source)
	for _, p := range wrote {
		e.say("wrote %s", p)
	}
	for _, p := range kept {
		e.say("kept  %s (already there)", p)
	}
	// What the first solve will do with the imported tree, so that a team
	// sees before solving whether it keeps what they had.
	rep := &initReport{Skos: skosRead}
	moved, keptCats, total, created, perr := firstSolvePreview(dir, root)
	if perr == nil {
		rep.FirstSolve = &firstSolveJSON{Moved: moved, CategoriesKept: keptCats, Categories: total, CategoriesCreated: created, Pinned: len(pinned) > 0}
		if len(pinned) > 0 {
			e.say("pinned: %s records the imported tree as %s (by = %q)", pinned[0], plural(pinGroups, "group", "groups"), PinBy)
			e.say("the first solve keeps %d of the %d imported categories; it adds %s and moves %s",
				keptCats, total, plural(created, "new category", "new categories"), plural(moved, "item", "items"))
		} else {
			e.say("the first solve, as things stand, keeps %d of the %d imported categories, adds %s and moves %s; `init --from %s --pin` records the imported tree as decisions so that every category is kept",
				keptCats, total, plural(created, "new category", "new categories"), plural(moved, "item", "items"), source)
		}
	}
	sayImportNext(e, items)
	rep.Imported = &importedJSON{From: source, Items: len(items), Categories: root.CountCategories()}
	rep.Wrote, rep.Kept = nonNil(wrote), nonNil(kept)
	e.result = rep
	return nil
}

// writeImported writes the imported tree as taxonomy.outline, its
// categories sorted and each given its concept identifier, and its items
// as items.toml, once both read back as what was imported.
func writeImported(dir, source string, root *format.Category, items []format.Item) error {
	itemsText := formatImportedItems(source, items)
	root.Sort()
	// Every category gets its concept identifier now, when it first
	// appears in the repository (an imported file may bring its own).
	concept.Carry(root)
	outlineText := append([]byte(format.OutlineHeader+"\n"), format.FormatTree(root)...)
	outlineText = append(outlineText, format.ConceptBlock(root)...)
	// Both files must read back as what was imported; anything else is a
	// bug here, and is caught before a byte is written.
	if back, err := format.ParseItemsTOML(importItemsFile, itemsText); err != nil || len(back) != len(items) {
		return fmt.Errorf("the items file made from %s does not read back (%v); please report this", source, err)
	}
	if o, err := format.ParseOutline(importOutlineFile, outlineText); err != nil || o.Structure != "" || o.Root.Size() != len(items) {
		return fmt.Errorf("the outline made from %s does not read back (%v); please report this", source, err)
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	for _, f := range []scaffoldFile{{importOutlineFile, string(outlineText)}, {importItemsFile, string(itemsText)}} {
		full, err := repo.Resolve(dir, f.path)
		if err != nil {
			return failf("%s: %v", f.path, err)
		}
		if err := format.WriteFileAtomic(full, []byte(f.content), 0o644); err != nil {
			return err
		}
	}
	return nil
}

// writePinRecords writes the imported tree as decisions (init --pin) and
// returns the file's repository path and how many groups it holds.
func writePinRecords(dir string, root *format.Category, source string) (rel string, groups int, err error) {
	date, err := releaseDate("")
	if err != nil {
		return "", 0, err
	}
	rel, text, groups := pinRecords(root, source, date)
	full, err := pinPath(dir, rel)
	if err != nil {
		return "", 0, failf("%s: %v", rel, err)
	}
	if err := os.MkdirAll(filepath.Dir(full), 0o755); err != nil {
		return "", 0, err
	}
	if err := format.WriteFileAtomic(full, text, 0o644); err != nil {
		return "", 0, err
	}
	return rel, groups, nil
}

// sayImportNext says what to do after an import: describe the items that
// have no tags or text, then solve.
func sayImportNext(e *env, items []format.Item) {
	described := 0
	for _, it := range items {
		if len(it.Tags) > 0 || it.Text != "" {
			described++
		}
	}
	if described < len(items) {
		// Similarity comes from tags and words: items without them give the
		// first solve little to go on beyond their labels.
		e.say("next: %s no tags or text yet; add them to items.toml, then run `ramify solve` (it keeps the imported names where a category keeps its members)",
			plural(len(items)-described, "item has", "items have"))
	} else {
		e.say("next: run `ramify solve`; it keeps the imported names where a category keeps its members")
	}
}

// readImport reads the tree and items of an import file, by extension;
// for SKOS also what it read.
func readImport(e *env, o *initOptions) (*format.Category, []format.Item, *skosJSON, error) {
	from := o.from
	ext := strings.ToLower(filepath.Ext(from))
	if ext != ".csv" && ext != ".outline" && skosSyntax(ext) == "" {
		return nil, nil, nil, usagef("--from takes a .csv file (columns id and path), an .outline file, or SKOS as Turtle (.ttl), N-Triples (.nt) or JSON-LD (.jsonld, .json), not %q", from)
	}
	if err := checkSKOSFlags(e, o.skos, ext); err != nil {
		return nil, nil, nil, err
	}
	data, err := format.ReadFileLimited(from, from, format.MaxDataFileBytes)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, nil, nil, format.Diags{{Pos: format.Pos{File: from}, Msg: "no such file"}}
	}
	if err != nil {
		return nil, nil, nil, err
	}
	if skosSyntax(ext) != "" {
		return readSKOSImport(e, o.skos, from, ext, data)
	}
	if ext == ".csv" {
		root, items, ds := parseImportCSV(from, data)
		if len(ds) > 0 {
			return nil, nil, nil, ds
		}
		return root, items, nil, nil
	}
	ol, err := format.ParseOutline(from, data)
	if err != nil {
		return nil, nil, nil, format.AsDiags(err, from)
	}
	var items []format.Item
	ol.Root.Walk(func(c *format.Category, _ int) bool {
		for i, id := range c.Items {
			items = append(items, format.Item{ID: id, Pos: format.Pos{File: from, Line: c.ItemLines[i], Col: 1}})
		}
		return true
	})
	if len(items) == 0 {
		return nil, nil, nil, format.Diags{{Pos: format.Pos{File: from, Line: 1, Col: 1}, Msg: "the outline places no items; there is nothing to import"}}
	}
	return ol.Root, items, nil, nil
}

// checkImportTargets refuses to replace an items file or an outline, and
// a ramify.toml that reads other files than the two the import writes.
func checkImportTargets(dir string) error {
	for _, name := range []string{importItemsFile, importOutlineFile} {
		if _, err := os.Lstat(filepath.Join(dir, name)); err == nil {
			return fmt.Errorf("%s already exists in %s; init --from never replaces a file: import into a new folder, or move it away first", name, dir)
		} else if !errors.Is(err, fs.ErrNotExist) {
			return err
		}
	}
	data, err := repo.ReadSettingsFile(dir)
	if errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	if err != nil {
		return format.AsDiags(err, repo.SettingsFile)
	}
	s, err := format.ParseSettings(repo.SettingsFile, data)
	if err != nil {
		return format.AsDiags(err, repo.SettingsFile)
	}
	if len(s.Items.Files) != 1 || s.Items.Files[0] != importItemsFile || s.Taxonomy.File != importOutlineFile {
		return fmt.Errorf("the existing %s reads items from %s and the taxonomy from %s, but init --from writes %s and %s; import into a new folder",
			repo.SettingsFile, strings.Join(s.Items.Files, ", "), s.Taxonomy.File, importItemsFile, importOutlineFile)
	}
	return nil
}

// scaffoldRest writes plain init's files that an import does not write,
// and wires git as plain init does, quietly; it returns what it wrote and
// kept (the imported files left out of kept: they were just written).
func scaffoldRest(e *env, dir string) (wrote, kept []string, err error) {
	wrote, all, err := writeScaffold(dir)
	if err != nil {
		return nil, nil, err
	}
	if _, err := gitSetupForInit(e, dir); err != nil {
		return nil, nil, err
	}
	for _, p := range all {
		if p != importItemsFile && p != importOutlineFile {
			kept = append(kept, p)
		}
	}
	return wrote, kept, nil
}
