// Package export writes a taxonomy in the formats other tools read: SKOS
// as Turtle, Newick, a nested JSON document and a flat CSV table.
//
// Every writer works on a sorted copy of the tree, so the same tree and
// items give the same bytes on every run, whatever order they came in.
//
// # Concept addresses in the SKOS export
//
// The concept scheme's IRI is the base IRI itself (release.base_iri in
// ramify.toml, ending in "/" or "#"). Below it:
//
//   - an item is BASE + "item/" + its id. Item ids only hold letters,
//     digits and . _ : -, which an IRI path takes as they are, so an
//     item keeps its address for as long as it keeps its id.
//   - a category with a concept identifier (every category of an
//     outline ramify wrote) is BASE + "concept/" + its identifier, which
//     stays the same across renames, moves and regenerations, so links
//     that other systems keep to a concept keep working (package concept).
//   - a category without one (a tree built in memory, or an outline from
//     before identifiers) is BASE + "category/" + its path: the names from the top
//     of the tree down to it, each percent-encoded and joined by "/". A
//     name keeps its ASCII letters, digits and "-", "." and "_"; every
//     other byte of its UTF-8 form is written as %XX (upper-case hex), so
//     "Hand tools" under "Fastening" is "category/Fastening/Hand%20tools"
//     and a "/" inside a name (%2F) never looks like a level. The
//     provisional marker is not part of the name: confirming a name keeps
//     the address, renaming or moving a category changes it.
//   - "~" is encoded too, because it is kept for one case: two categories
//     with the same path (which ramify's own outlines never hold, but an
//     in-memory tree may) are told apart by "~2", "~3", ... after the
//     later ones in canonical order.
package export
