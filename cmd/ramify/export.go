package main

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/export"
	"github.com/ramify-tax/ramify/format/repo"
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
		bind: withOptions(func(fs *pflag.FlagSet, o *exportOptions) {
			fs.StringVar(&o.format, "format", "", "`form` of the export: skos, newick, json or csv (required)")
			fs.StringVar(&o.out, "out", "", "write to `FILE` inside the repository instead of stdout")
			fs.StringVar(&o.version, "version", "", "skos: the scheme's owl:versionInfo (default: the tree's structure hash)")
			fs.StringVar(&o.title, "title", export.DefaultTitle, "skos: the scheme's title")
			fs.StringVar(&o.lang, "lang", export.DefaultLanguage, "skos: the language `tag` of labels and definitions")
		}, runExport),
	})
}

var exportFormats = []string{"skos", "newick", "json", "csv"}

type exportOptions struct {
	format, out          string
	version, title, lang string // skos only
}

// exportReport is export's --json report.
type exportReport struct {
	Bytes      int    `json:"bytes"`
	Categories int    `json:"categories"`
	Format     string `json:"format"`
	Items      int    `json:"items"`
	Out        string `json:"out,omitempty"`     // once written there
	Version    string `json:"version,omitempty"` // skos only
}

// checkExportFlags refuses a missing or unknown --format, SKOS options
// with another form, and --json without --out.
func checkExportFlags(e *env, o *exportOptions) error {
	form, out := o.format, o.out
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
	return nil
}

func runExport(e *env, o *exportOptions, args []string) error {
	if err := noArguments("export", args, "choose the form with --format"); err != nil {
		return err
	}
	form, out := o.format, o.out
	if err := checkExportFlags(e, o); err != nil {
		return err
	}
	p, ds := repo.Load(e.dir())
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
	version := ""
	switch form {
	case "skos":
		opt := export.SKOSOptions{
			BaseIRI:  p.Settings.Release.BaseIRI,
			Title:    o.title,
			Version:  o.version,
			Language: o.lang,
		}
		if opt.Version == "" {
			opt.Version = format.StructureHash(root)
		}
		version = opt.Version
		err = export.SKOS(&b, root, p.Items, opt)
	case "newick":
		err = export.Newick(&b, root, export.NewickOptions{})
	case "json":
		err = export.JSON(&b, root, p.Items)
	case "csv":
		err = export.CSV(&b, root, p.Items)
	}
	if err != nil {
		// The report names the version asked for, nothing of an export.
		e.result = struct {
			Version string `json:"version,omitempty"`
		}{version}
		return err
	}
	rep := &exportReport{Format: form, Items: root.Size(), Categories: root.CountCategories(), Bytes: b.Len(), Version: version}
	e.result = rep
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
	rep.Out = filepath.ToSlash(filepath.Clean(out))
	e.say("wrote %s (%s, %s in %s)", filepath.ToSlash(filepath.Clean(out)), form,
		plural(root.Size(), "item", "items"), plural(root.CountCategories(), "category", "categories"))
	return nil
}

// exportTarget resolves --out inside the repository and refuses the
// repository's own inputs: an export must never replace the outline, the
// items, the settings or a decision.
func exportTarget(p *repo.Repo, out string) (string, error) {
	full, err := repo.Resolve(p.Dir, filepath.ToSlash(out))
	if err != nil {
		return "", usagef("--out %s: %v", out, err)
	}
	clean := filepath.ToSlash(filepath.Clean(filepath.FromSlash(out)))
	s := p.Settings
	inputs := append([]string{repo.SettingsFile, s.Taxonomy.File, s.Items.Vectors}, s.Items.Files...)
	for _, src := range s.Similarity.Sources {
		inputs = append(inputs, src.File)
	}
	for _, in := range inputs {
		if in != "" && clean == filepath.ToSlash(filepath.Clean(filepath.FromSlash(in))) {
			return "", usagef("--out %s would overwrite one of the repository's inputs; choose another file", out)
		}
	}
	for _, dir := range []string{format.ConstraintsDir, "reviews"} {
		if clean == dir || strings.HasPrefix(clean, dir+"/") {
			return "", usagef("--out %s is inside %s/, which holds the repository's decisions; choose another place", out, dir)
		}
	}
	if info, err := os.Stat(full); err == nil && info.IsDir() {
		return "", usagef("--out %s is a folder; give a file name", out)
	}
	return full, nil
}
