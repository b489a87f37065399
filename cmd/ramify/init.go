package main

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
)

func init() {
	register(&command{
		name:    "init",
		summary: "start a taxonomy repository: settings, an items template, folders",
		help: `Writes ramify.toml (every setting, commented), items.toml (a template
to fill in), the constraints/ and reviews/ folders, and .gitattributes.
An existing file is never overwritten: it is left as it is and reported.

In a git repository it also runs "ramify git-setup", so that git diff
and git merge of the outline go through ramify.

--from FILE starts the repository from a taxonomy you already have: a CSV
with id and path columns (optional label, tags, text, concepts; the path's category
names joined by " > ", or by "/" when no path uses " > "), or an .outline
file, or a SKOS concept scheme as Turtle (.ttl), N-Triples (.nt) or
JSON-LD (.jsonld, .json). It writes items.toml and taxonomy.outline with
your category names, kept as the previous version: the first "ramify
solve" stays close to it and keeps its names where the members stay
together. Every category gets its concept identifier then. init says
what the first solve would do to the imported tree (categories kept,
added, items moved); --pin records the tree as decisions, one named group
per category by "import" in constraints/import-HASH.toml, so that the
first solve keeps every imported category (it may still add subcategories
inside them).

From SKOS: concepts with no narrower concept become items (--items-are
notation or --items-are TYPE-IRI chooses otherwise), the others
categories; skos:broader and skos:narrower give the tree, prefLabel the
names and labels (in --lang, default the file's most common language),
definition and altLabel the items' text, notation the item ids. A concept
with two broader concepts is an error naming both statements, unless
--first-broader keeps the first. Concept IRIs that ramify exported keep
their identifiers; others get identifiers made from their IRIs. JSON-LD
contexts must be inline: nothing is fetched.

Next steps: add your items to items.toml, then run "ramify solve".`,
		bind: withOptions(importFlags, runInit),
	})
}

// initOptions are init's flags: all of them are about init --from.
type initOptions struct {
	from string // the taxonomy file to start from, "" for none
	pin  bool   // record the imported tree as decisions
	skos skosImportOptions
}

// initReport is init's --json report, once every file is written.
type initReport struct {
	FirstSolve *firstSolveJSON `json:"first_solve,omitempty"` // init --from
	Imported   *importedJSON   `json:"imported,omitempty"`    // init --from
	Kept       []string        `json:"kept"`
	Skos       *skosJSON       `json:"skos,omitempty"` // init --from a SKOS file
	Wrote      []string        `json:"wrote"`
}

// itemsTemplate is the items file a new repository starts with.
// gitignoreTemplate keeps the generated report out of commits: it is
// rebuilt from the repository at any time with ramify report.
const gitignoreTemplate = "# written by ramify report; rebuilt at any time from the repository\n/" + defaultReportFile + "\n"

const itemsTemplate = `# The items of this taxonomy, one [[item]] table each.
#
#   id     required: letters, digits and . _ : - (starting with a letter or digit)
#   label  what people call the item
#   tags   short words that describe it; items that share tags end up together
#   text   a one-line description; its words count too
#
# Remove the "# " in front of the lines below to start from this example.
#
# [[item]]
# id = "claw-hammer"
# label = "Claw hammer, 16 oz"
# tags = ["hand", "fastening", "wood"]
# text = "Drives and pulls nails; the everyday hammer."
`

// gitattributesTemplate keeps outlines in LF so git diffs stay exact.
const gitattributesTemplate = `# Taxonomy files are plain text with LF line endings.
*.outline text eol=lf
*.toml text eol=lf
*.tsv text eol=lf
`

type scaffoldFile struct {
	path    string
	content string
}

func runInit(e *env, o *initOptions, args []string) error {
	if err := noArguments("init", args, "use --dir to choose the folder"); err != nil {
		return err
	}
	dir := e.dir()
	if o.from != "" {
		return importTaxonomy(e, o, dir)
	}
	wrote, kept, err := writeScaffold(dir)
	if err != nil {
		return err
	}
	for _, p := range wrote {
		e.say("wrote %s", p)
	}
	for _, p := range kept {
		e.say("kept  %s (already there)", p)
	}
	changes, err := gitSetupForInit(e, dir)
	for _, c := range changes {
		e.say("%s", c)
	}
	if err != nil {
		return err
	}
	if len(wrote) > 0 {
		e.say("next: add your items to items.toml, then run `ramify solve`")
	}
	e.result = &initReport{Wrote: nonNil(wrote), Kept: nonNil(kept)}
	return nil
}

// writeScaffold writes the files and folders of a new repository in dir
// that are not there yet, and says which it wrote and which it kept.
func writeScaffold(dir string) (wrote, kept []string, err error) {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, nil, err
	}
	files := []scaffoldFile{
		{"ramify.toml", format.SettingsTemplate},
		{"items.toml", itemsTemplate},
		{".gitattributes", gitattributesTemplate},
		{".gitignore", gitignoreTemplate},
		{"constraints/.keep", ""},
		{"reviews/open/.keep", ""},
		{"reviews/done/.keep", ""},
	}
	// Resolve every target first: a linked folder that leads outside
	// stops init before it writes anything.
	fulls := make([]string, len(files))
	for i, f := range files {
		full, err := repo.Resolve(dir, f.path)
		if err != nil {
			return nil, nil, failf("%s: %v; nothing was written", f.path, err)
		}
		fulls[i] = full
	}
	for i, f := range files {
		full := fulls[i]
		if _, err := os.Lstat(full); err == nil {
			kept = append(kept, f.path)
			continue
		} else if !errors.Is(err, fs.ErrNotExist) {
			return wrote, kept, err
		}
		if err := os.MkdirAll(filepath.Dir(full), 0o755); err != nil {
			return wrote, kept, err
		}
		if err := format.WriteFileAtomic(full, []byte(f.content), 0o644); err != nil {
			return wrote, kept, err
		}
		wrote = append(wrote, f.path)
	}
	return wrote, kept, nil
}

func nonNil(s []string) []string {
	if s == nil {
		return []string{}
	}
	return s
}
