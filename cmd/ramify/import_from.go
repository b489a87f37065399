package main

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"github.com/ramify-tax/ramify/concept"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/project"
	"github.com/spf13/pflag"
)

// The files `init --from` writes. The settings template points at both,
// so a fresh repository reads them; an existing ramify.toml must too.
const (
	importItemsFile   = "items.toml"
	importOutlineFile = "taxonomy.outline"
)

// importFlags adds init's --from flag.
func importFlags(fs *pflag.FlagSet, o *options) {
	o.extra["from"] = fs.String("from", "", "start from an existing taxonomy in `FILE` (relative to the current folder): an .outline file; a CSV file with the columns id and path (and optionally label, tags, text, concepts), path being the category names from the top down joined by \" > \" (or by \"/\" when no path in the file holds \" > \"); or a SKOS concept scheme as Turtle (.ttl), N-Triples (.nt) or JSON-LD (.jsonld, .json)")
	skosFlags(fs, o)
	pinFlag(fs, o)
}

// importSource is init's --from value, "" when it was not given.
func importSource(e *env) string {
	if from, ok := e.opt.extra["from"].(*string); ok && from != nil {
		return *from
	}
	return ""
}

// importTaxonomy starts a repository in dir from an existing taxonomy in
// the file from (relative to the current folder): items.toml gets one
// [[item]] per id and taxonomy.outline the imported tree without a
// structure line, so the first solve takes it as the previous version —
// its names and its shape pull the new tree, as a hand-made outline would
// — rather than as a hand edit to absorb. Then everything plain init
// writes. A problem in from is reported with its place and nothing is
// written; existing items or outline files are never replaced.
func importTaxonomy(e *env, dir, from string) error {
	root, items, err := readImport(e, from)
	if err != nil {
		return err
	}
	if err := checkImportTargets(dir); err != nil {
		return err
	}
	source := filepath.Base(from)
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
		full, err := project.Resolve(dir, f.path)
		if err != nil {
			return failf("%s: %v", f.path, err)
		}
		if err := format.WriteFileAtomic(full, []byte(f.content), 0o644); err != nil {
			return err
		}
	}
	var pinned []string
	pinGroups := 0
	if pinWanted(e) {
		date, err := releaseDate("")
		if err != nil {
			return err
		}
		rel, text, n := pinRecords(root, source, date)
		full, err := pinPath(dir, rel)
		if err != nil {
			return failf("%s: %v", rel, err)
		}
		if err := os.MkdirAll(filepath.Dir(full), 0o755); err != nil {
			return err
		}
		if err := format.WriteFileAtomic(full, text, 0o644); err != nil {
			return err
		}
		pinned, pinGroups = []string{rel}, n
	}
	// The rest is plain init's, which keeps the files just written.
	wrote, kept, err := scaffoldRest(e)
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
	moved, keptCats, total, created, perr := firstSolvePreview(dir, root)
	if perr == nil {
		e.report["first_solve"] = map[string]any{"moved": moved, "categories_kept": keptCats, "categories": total, "categories_created": created, "pinned": len(pinned) > 0}
		if len(pinned) > 0 {
			e.say("pinned: %s records the imported tree as %s (by = %q)", pinned[0], plural(pinGroups, "group", "groups"), PinBy)
			e.say("the first solve keeps %d of the %d imported categories; it adds %s and moves %s",
				keptCats, total, plural(created, "new category", "new categories"), plural(moved, "item", "items"))
		} else {
			e.say("the first solve, as things stand, keeps %d of the %d imported categories, adds %s and moves %s; `init --from %s --pin` records the imported tree as decisions so that every category is kept",
				keptCats, total, plural(created, "new category", "new categories"), plural(moved, "item", "items"), source)
		}
	}
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
	e.report["imported"] = map[string]any{"from": source, "items": len(items), "categories": root.CountCategories()}
	e.report["wrote"] = nonNil(wrote)
	e.report["kept"] = nonNil(kept)
	return nil
}

// readImport reads the tree and items of an import file, by extension.
func readImport(e *env, from string) (*format.Category, []format.Item, error) {
	ext := strings.ToLower(filepath.Ext(from))
	if ext != ".csv" && ext != ".outline" && skosSyntax(ext) == "" {
		return nil, nil, usagef("--from takes a .csv file (columns id and path), an .outline file, or SKOS as Turtle (.ttl), N-Triples (.nt) or JSON-LD (.jsonld, .json), not %q", from)
	}
	if err := checkSKOSFlags(e, ext); err != nil {
		return nil, nil, err
	}
	data, err := format.ReadFileLimited(from, from, format.MaxDataFileBytes)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, nil, format.Diags{{Pos: format.Pos{File: from}, Msg: "no such file"}}
	}
	if err != nil {
		return nil, nil, err
	}
	if skosSyntax(ext) != "" {
		return readSKOSImport(e, from, ext, data)
	}
	if ext == ".csv" {
		root, items, ds := parseImportCSV(from, data)
		if len(ds) > 0 {
			return nil, nil, ds
		}
		return root, items, nil
	}
	o, err := format.ParseOutline(from, data)
	if err != nil {
		return nil, nil, format.AsDiags(err, from)
	}
	var items []format.Item
	o.Root.Walk(func(c *format.Category, _ int) bool {
		for i, id := range c.Items {
			items = append(items, format.Item{ID: id, Pos: format.Pos{File: from, Line: c.ItemLines[i], Col: 1}})
		}
		return true
	})
	if len(items) == 0 {
		return nil, nil, format.Diags{{Pos: format.Pos{File: from, Line: 1, Col: 1}, Msg: "the outline places no items; there is nothing to import"}}
	}
	return o.Root, items, nil
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
	data, err := project.ReadSettingsFile(dir)
	if errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	if err != nil {
		return format.AsDiags(err, project.SettingsFile)
	}
	s, err := format.ParseSettings(project.SettingsFile, data)
	if err != nil {
		return format.AsDiags(err, project.SettingsFile)
	}
	if len(s.Items.Files) != 1 || s.Items.Files[0] != importItemsFile || s.Taxonomy.File != importOutlineFile {
		return fmt.Errorf("the existing %s reads items from %s and the taxonomy from %s, but init --from writes %s and %s; import into a new folder",
			project.SettingsFile, strings.Join(s.Items.Files, ", "), s.Taxonomy.File, importItemsFile, importOutlineFile)
	}
	return nil
}

// scaffoldRest runs plain init for the files an import does not write,
// quietly, and returns what it wrote and kept (the imported files left
// out of kept: they were just written).
func scaffoldRest(e *env) (wrote, kept []string, err error) {
	opt := *e.opt
	opt.extra = map[string]any{}
	for k, v := range e.opt.extra {
		opt.extra[k] = v
	}
	opt.extra["from"] = new(string)
	sub := &env{opt: &opt, flags: e.flags, stdout: io.Discard, stderr: e.stderr, report: map[string]any{}}
	if err := runInit(sub, nil); err != nil {
		return nil, nil, err
	}
	wrote, _ = sub.report["wrote"].([]string)
	all, _ := sub.report["kept"].([]string)
	for _, p := range all {
		if p != importItemsFile && p != importOutlineFile {
			kept = append(kept, p)
		}
	}
	return wrote, kept, nil
}
