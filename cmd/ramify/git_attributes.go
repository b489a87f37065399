package main

import (
	"strings"
)

// outlinePattern is the .gitattributes pattern the drivers are wired to.
// Without a slash it matches outline files in every folder below the
// .gitattributes file: the taxonomy and the review packets.
const outlinePattern = "*.outline"

// driverAttributes are the attributes that route outlines to ramify's
// drivers (git's gitattributes documentation: "diff=<name>" picks
// diff.<name>.*, "merge=<name>" picks merge.<name>.*).
var driverAttributes = []string{"diff=" + gitDriverName, "merge=" + gitDriverName}

// withDriverAttributes returns the .gitattributes text with every line
// for *.outline carrying diff=ramify and merge=ramify, and whether that
// changed anything. A line's other attributes (text, eol, ...) are kept,
// and any other setting of diff or merge on it is replaced; every other
// line is kept byte for byte. When no line names *.outline, one is added
// at the end.
func withDriverAttributes(text string) (string, bool) {
	lines := strings.SplitAfter(text, "\n")
	if lines[len(lines)-1] == "" {
		lines = lines[:len(lines)-1]
	}
	found, changed := false, false
	for i, line := range lines {
		body, eol := splitEOL(line)
		fields := strings.Fields(body)
		if len(fields) == 0 || strings.HasPrefix(fields[0], "#") || fields[0] != outlinePattern {
			continue
		}
		found = true
		kept := []string{fields[0]}
		for _, attr := range fields[1:] {
			if name := attributeName(attr); name != "diff" && name != "merge" {
				kept = append(kept, attr)
			}
		}
		next := append(kept, driverAttributes...)
		// Only a line whose attributes differ is rewritten: spacing and
		// order alone are not worth a change.
		if !sameFields(fields, next) {
			lines[i] = strings.Join(next, " ") + eol
			changed = true
		}
	}
	out := strings.Join(lines, "")
	if !found {
		if out != "" && !strings.HasSuffix(out, "\n") {
			out += "\n"
		}
		out += "# Taxonomy outlines: semantic diff and regenerating merge (ramify git-setup).\n"
		out += outlinePattern + " " + strings.Join(driverAttributes, " ") + "\n"
		changed = true
	}
	return out, changed
}

// splitEOL splits a line into its text and its line ending ("\n",
// "\r\n" or "" for a last line without one).
func splitEOL(line string) (string, string) {
	if strings.HasSuffix(line, "\r\n") {
		return line[:len(line)-2], "\r\n"
	}
	if strings.HasSuffix(line, "\n") {
		return line[:len(line)-1], "\n"
	}
	return line, ""
}

// attributeName is the name an attribute token sets: "diff" for "diff",
// "-diff", "!diff" and "diff=x".
func attributeName(attr string) string {
	attr = strings.TrimLeft(attr, "-!")
	name, _, _ := strings.Cut(attr, "=")
	return name
}

// sameFields reports whether two attribute lines say the same thing:
// the same pattern and the same set of attribute tokens.
func sameFields(a, b []string) bool {
	if len(a) != len(b) || len(a) == 0 || a[0] != b[0] {
		return false
	}
	seen := map[string]int{}
	for _, f := range a[1:] {
		seen[f]++
	}
	for _, f := range b[1:] {
		seen[f]--
	}
	for _, n := range seen {
		if n != 0 {
			return false
		}
	}
	return true
}
