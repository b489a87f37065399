package main

import (
	"net/url"
	"path/filepath"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/rdf"
	"github.com/ramify-tax/ramify/skos"
	"github.com/spf13/pflag"
)

// skosFlags adds the options of a SKOS import.
func skosFlags(fs *pflag.FlagSet, o *options) {
	o.extra["lang"] = fs.String("lang", "", "SKOS import: take labels and definitions in language `TAG` (default: the language most prefLabels have)")
	o.extra["items-are"] = fs.String("items-are", "", "SKOS import: which concepts are items: `RULE` is leaves (concepts with no narrower concept, the default), notation (concepts with a skos:notation), or the IRI of an rdf:type")
	o.extra["first-broader"] = fs.Bool("first-broader", false, "SKOS import: where a concept has several broader concepts, keep the first in the file and report the others (default: refuse, naming both statements)")
	o.extra["scheme"] = fs.String("scheme", "", "SKOS import: import the concept scheme `IRI` only (needed when the file holds several)")
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

func skosOptions(e *env) skos.Options {
	str := func(k string) string {
		if v, ok := e.opt.extra[k].(*string); ok && v != nil {
			return *v
		}
		return ""
	}
	first, _ := e.opt.extra["first-broader"].(*bool)
	return skos.Options{Lang: str("lang"), ItemsAre: str("items-are"), FirstBroader: first != nil && *first, Scheme: str("scheme")}
}

// checkSKOSFlags refuses SKOS options on other imports.
func checkSKOSFlags(e *env, ext string) error {
	if skosSyntax(ext) != "" {
		if o := skosOptions(e); o.Lang != "" {
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
func readSKOSImport(e *env, from, ext string, data []byte) (*format.Category, []format.Item, error) {
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
		return nil, nil, format.AsDiags(err, from)
	}
	res, err := skos.Read(from, triples, skosOptions(e))
	if err != nil {
		return nil, nil, format.AsDiags(err, from)
	}
	for _, n := range res.Notices {
		e.notice("%s", n)
	}
	lang := res.Lang
	if lang == "" {
		lang = "(none)"
	}
	e.report["skos"] = map[string]any{"lang": res.Lang, "notices": nonNil(res.Notices)}
	e.say("read %s with labels in language %s", plural(len(triples), "statement", "statements"), lang)
	for i := range res.Items {
		res.Items[i].Pos = format.Pos{File: from}
	}
	return res.Root, res.Items, nil
}
