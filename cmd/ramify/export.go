package main

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/export"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/project"
	"github.com/spf13/pflag"
)

func init() {
	register(&command{
		name:    "export",
		summary: "write the taxonomy as SKOS, Newick, JSON or CSV",
		help: `Writes the committed taxonomy (taxonomy.outline, with the labels and
texts of the items) in a form other tools read:

  skos    Turtle: one skos:ConceptScheme named by release.base_iri, a
          skos:Concept for every category and item, broader and narrower
          links both ways; items carry their id as skos:notation and their
          text as skos:definition; a provisional name has an editorial note.
          Items are BASE/item/ID, categories BASE/category/PATH (the names
          from the top down, percent-encoded, joined by "/").
  newick  one tree: items are the leaves (their ids), categories the
          internal nodes (their names); labels quoted when needed.
  json    nested: {name, provisional, categories, items: [{id, label}]}.
  csv     one row per item: id,label,path, the path being the category
          names from the top down joined by " > " (what init --from reads).

The export goes to stdout, or with --out to FILE, a path inside the
repository (relative to --dir), written atomically; the repository's own
input files are never overwritten.

Exports are of what is committed: export fails (exit status 1) when there
is no taxonomy.outline yet, or when it was reshaped by hand and the edits
are not yet absorbed. It does not run solve.`,
		flags: func(fs *pflag.FlagSet, o *options) {
			o.extra["format"] = fs.String("format", "", "`form` of the export: skos, newick, json or csv (required)")
			o.extra["out"] = fs.String("out", "", "write to `FILE` inside the repository instead of stdout")
			o.extra["version"] = fs.String("version", "", "skos: the scheme's owl:versionInfo (default: the tree's structure hash)")
			o.extra["title"] = fs.String("title", export.DefaultTitle, "skos: the scheme's title")
			o.extra["lang"] = fs.String("lang", export.DefaultLanguage, "skos: the language `tag` of labels and definitions")
		},
		run: runExport,
	})
}

var exportFormats = []string{"skos", "newick", "json", "csv"}

func runExport(e *env, args []string) error {
	if len(args) > 0 {
		return usagef("export takes no arguments (got %q); choose the form with --format", args[0])
	}
	form := *e.opt.extra["format"].(*string)
	out := *e.opt.extra["out"].(*string)
	if form == "" {
		return usagef("--format is required: one of %s", strings.Join(exportFormats, ", "))
	}
	if !slices.Contains(exportFormats, form) {
		hint := ""
		if s := format.Suggest(form, exportFormats); s != "" {
			hint = fmt.Sprintf("; did you mean %q?", s)
		}
		return usagef("--format must be one of %s, not %q%s", strings.Join(exportFormats, ", "), form, hint)
	}
	if form != "skos" {
		for _, name := range []string{"version", "title", "lang"} {
			if e.flags.Changed(name) {
				return usagef("--%s only applies to --format skos", name)
			}
		}
	}
	if e.opt.json && out == "" {
		return usagef("--json prints a report on stdout; give --out FILE so the export does not mix with it")
	}
	p, ds := project.Load(e.dir())
	if len(ds) > 0 {
		return ds
	}
	var target string
	if out != "" {
		t, err := exportTarget(p, out)
		if err != nil {
			return err
		}
		target = t
	}
	rel := p.Settings.Taxonomy.File
	if p.Outline == nil {
		return failf("%s does not exist yet; run `ramify solve` to write it, then export", rel)
	}
	if p.Outline.Edited() {
		return failf("%s was reshaped by hand since ramify wrote it; run `ramify absorb` to record the edits, then export", rel)
	}
	if ms := p.OutlineMembership(); len(ms) > 0 {
		e.notice("note: %s is out of date with the items (%s); exporting it as committed — run `ramify solve` to bring it up to date",
			rel, plural(len(ms), "problem", "problems"))
	}
	root := p.Outline.Root
	var b bytes.Buffer
	var err error
	switch form {
	case "skos":
		opt := export.SKOSOptions{
			BaseIRI:  p.Settings.Release.BaseIRI,
			Title:    *e.opt.extra["title"].(*string),
			Version:  *e.opt.extra["version"].(*string),
			Language: *e.opt.extra["lang"].(*string),
		}
		if opt.Version == "" {
			opt.Version = format.StructureHash(root)
		}
		e.report["version"] = opt.Version
		err = export.SKOS(&b, root, p.Items, opt)
	case "newick":
		err = export.Newick(&b, root, export.NewickOptions{})
	case "json":
		err = export.JSON(&b, root, p.Items)
	case "csv":
		err = export.CSV(&b, root, p.Items)
	}
	if err != nil {
		return err
	}
	e.report["format"] = form
	e.report["items"] = root.Size()
	e.report["categories"] = root.CountCategories()
	e.report["bytes"] = b.Len()
	if target == "" {
		_, err := e.stdout.Write(b.Bytes())
		return err
	}
	if err := os.MkdirAll(filepath.Dir(target), 0o755); err != nil {
		return err
	}
	if err := format.WriteFileAtomic(target, b.Bytes(), 0o644); err != nil {
		return err
	}
	e.report["out"] = filepath.ToSlash(filepath.Clean(out))
	e.say("wrote %s (%s, %s in %s)", filepath.ToSlash(filepath.Clean(out)), form,
		plural(root.Size(), "item", "items"), plural(root.CountCategories(), "category", "categories"))
	return nil
}

// exportTarget resolves --out inside the repository and refuses the
// repository's own inputs: an export must never replace the outline, the
// items, the settings or a decision.
func exportTarget(p *project.Project, out string) (string, error) {
	full, err := project.Resolve(p.Dir, filepath.ToSlash(out))
	if err != nil {
		return "", usagef("--out %s: %v", out, err)
	}
	clean := filepath.ToSlash(filepath.Clean(filepath.FromSlash(out)))
	s := p.Settings
	inputs := append([]string{project.SettingsFile, s.Taxonomy.File, s.Items.Vectors}, s.Items.Files...)
	for _, src := range s.Similarity.Sources {
		inputs = append(inputs, src.File)
	}
	for _, in := range inputs {
		if in != "" && clean == filepath.ToSlash(filepath.Clean(filepath.FromSlash(in))) {
			return "", usagef("--out %s would overwrite one of the repository's inputs; choose another file", out)
		}
	}
	for _, dir := range []string{project.ConstraintsDir, "reviews"} {
		if clean == dir || strings.HasPrefix(clean, dir+"/") {
			return "", usagef("--out %s is inside %s/, which holds the repository's decisions; choose another place", out, dir)
		}
	}
	if info, err := os.Stat(full); err == nil && info.IsDir() {
		return "", usagef("--out %s is a folder; give a file name", out)
	}
	return full, nil
}
