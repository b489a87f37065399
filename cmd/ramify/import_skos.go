package main

import (
	"net/url"
	"path/filepath"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/rdf"
	"github.com/ramify-tax/ramify/format/skos"
	"github.com/spf13/pflag"
)

// skosImportOptions are init's options for a SKOS import.
type skosImportOptions struct {
	lang, itemsAre, scheme string
	firstBroader           bool
}

// skosJSON is what a SKOS import read, in init's report.
type skosJSON struct {
	Lang    string   `json:"lang"`
	Notices []string `json:"notices"`
}

// skosFlags adds the options of a SKOS import.
func skosFlags(fs *pflag.FlagSet, o *skosImportOptions) {
	fs.StringVar(&o.lang, "lang", "", "SKOS import: take labels and definitions in language `TAG` (default: the language most prefLabels have)")
	fs.StringVar(&o.itemsAre, "items-are", "", "SKOS import: which concepts are items: `RULE` is leaves (concepts with no narrower concept, the default), notation (concepts with a skos:notation), or the IRI of an rdf:type")
	fs.BoolVar(&o.firstBroader, "first-broader", false, "SKOS import: where a concept has several broader concepts, keep the first in the file and report the others (default: refuse, naming both statements)")
	fs.StringVar(&o.scheme, "scheme", "", "SKOS import: import the concept scheme `IRI` only (needed when the file holds several)")
}

// skosSyntax names the RDF syntax of an import file by its extension,
// "" when it is not one.
func skosSyntax(ext string) string {
	switch ext {
	case ".ttl":
		return "turtle"
	case ".nt":
		return "ntriples"
	case ".jsonld", ".json":
		return "jsonld"
	}
	return ""
}

func (o skosImportOptions) options() skos.Options {
	return skos.Options{Lang: o.lang, ItemsAre: o.itemsAre, FirstBroader: o.firstBroader, Scheme: o.scheme}
}

// checkSKOSFlags refuses SKOS options on other imports.
func checkSKOSFlags(e *env, so skosImportOptions, ext string) error {
	if skosSyntax(ext) != "" {
		if o := so.options(); o.Lang != "" {
			if err := checkLangTag(o.Lang); err != nil {
				return err
			}
		}
		return nil
	}
	for _, name := range []string{"lang", "items-are", "first-broader", "scheme"} {
		if e.flags != nil && e.flags.Changed(name) {
			return usagef("--%s only applies to a SKOS import (--from a .ttl, .nt or .jsonld file)", name)
		}
	}
	return nil
}

func checkLangTag(tag string) error {
	for i, part := range strings.Split(tag, "-") {
		ok := len(part) >= 1 && len(part) <= 8
		for _, r := range part {
			letter := r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z'
			if !letter && !(i > 0 && r >= '0' && r <= '9') {
				ok = false
			}
		}
		if !ok {
			return usagef("--lang %q is not a language tag (such as en or fr-CA)", tag)
		}
	}
	return nil
}

// readSKOSImport reads a SKOS file in the syntax its extension names.
// Relative IRIs in Turtle resolve against a file: IRI made of the file's
// name alone, so the result does not depend on where the file sits.
func readSKOSImport(e *env, so skosImportOptions, from, ext string, data []byte) (*format.Category, []format.Item, *skosJSON, error) {
	var triples []rdf.Triple
	var err error
	switch skosSyntax(ext) {
	case "turtle":
		triples, err = rdf.ParseTurtle(from, data, "file:///"+url.PathEscape(filepath.Base(from)))
	case "ntriples":
		triples, err = rdf.ParseNTriples(from, data)
	default:
		triples, err = rdf.ParseJSONLD(from, data)
	}
	if err != nil {
		return nil, nil, nil, format.AsDiags(err, from)
	}
	res, err := skos.Read(from, triples, so.options())
	if err != nil {
		return nil, nil, nil, format.AsDiags(err, from)
	}
	for _, n := range res.Notices {
		e.notice("%s", n)
	}
	lang := res.Lang
	if lang == "" {
		lang = "(none)"
	}
	read := &skosJSON{Lang: res.Lang, Notices: nonNil(res.Notices)}
	e.say("read %s with labels in language %s", plural(len(triples), "statement", "statements"), lang)
	for i := range res.Items {
		res.Items[i].Pos = format.Pos{File: from}
	}
	return res.Root, res.Items, read, nil
}
