// Package importgraph states the layers of ramify's packages and checks
// an import graph against them: a package may import only packages of a
// lower layer, so shared structures live low (the leaf packages) and no
// import runs uphill. The table is the one DEVELOPERS.md draws; its test
// reads the module's real graph with `go list` and fails on a package
// that imports one it must not, or that the table does not place.
//
// Only the imports of the built packages count: a test may import a
// package above its own (solve's benchmarks use solve/planted).
package importgraph

import (
	"fmt"
	"slices"
	"strings"
)

// Module is the import path every package of ramify starts with.
const Module = "github.com/ramify-tax/ramify"

// Layers lists ramify's packages (paths below Module) from the bottom up.
// A package may import those of the layers below its own, never one of
// its own layer or above.
var Layers = [][]string{
	// 0, leaf packages: nothing of ramify below them ("." is the module's
	// root, which only embeds the shared testdata).
	{".", "solve/hier", "diff/match", "review/bounds", "internal/disjoint", "internal/splitmix", "internal/brackets", "internal/naivelca", "internal/browsertest", "internal/importgraph", "internal/round", "internal/sorted"},
	// 1, the document model and its codecs.
	{"format"},
	// 2, what reads documents without solving: the graph, comparison,
	// names, writers, shape records over item indices.
	{"solve/graph", "diff", "solve/naming", "format/export", "format/binding", "format/shape", "internal/realdata", "internal/taxgen"},
	// 3, the solver, what builds on comparison and names, and the
	// repository loader.
	{"solve", "diff/concept", "format/rdf", "format/repo", "cmd/bench/stability/stable"},
	// 4, what runs the solver: review, and the regeneration of a loaded
	// repository.
	{"review", "solve/planted", "format/skos", "solve/regen"},
	// 5, views of a loaded repository, its releases and its review
	// committee.
	{"review/committee", "review/explain", "review/report", "review/release"},
	// 6, the review loop the benchmark plays.
	{"cmd/bench/reviewloop/loop"},
	// 7, programs.
	{"cmd/ramify", "cmd/bench/genrepo", "cmd/bench/quality", "cmd/bench/reviewloop", "cmd/bench/solvebench", "cmd/bench/stability", "cmd/bench/vectorload"},
}

// Apart names, for a top-level folder, the folders whose packages none
// of its packages may import, whatever their layers: the document model,
// its formats and the repository loader know nothing of solving or
// review, so they stay usable (and testable) without them.
var Apart = map[string][]string{
	"format": {"solve", "review"},
}

// under reports whether the package path p (below Module) is folder or
// lies below it.
func under(p, folder string) bool {
	return p == folder || strings.HasPrefix(p, folder+"/")
}

// layerOf maps each package path (below Module) to its layer.
func layerOf() map[string]int {
	m := map[string]int{}
	for i, layer := range Layers {
		for _, p := range layer {
			m[p] = i
		}
	}
	return m
}

// Violations lists, sorted, what is wrong with graph (full import path →
// its imports): packages of the module the table does not place,
// imports of ramify packages that are not of a lower layer, and imports
// that Apart forbids. Imports from outside the module are not judged.
func Violations(graph map[string][]string) []string {
	layer := layerOf()
	rel := func(p string) (string, bool) {
		if p == Module {
			return ".", true
		}
		r, ok := strings.CutPrefix(p, Module+"/")
		return r, ok
	}
	var out []string
	for pkg, imports := range graph {
		from, ok := rel(pkg)
		if !ok {
			continue
		}
		lf, placed := layer[from]
		if !placed {
			out = append(out, fmt.Sprintf("%s is in no layer; add it to importgraph.Layers and DEVELOPERS.md", from))
			continue
		}
		for _, imp := range imports {
			to, ok := rel(imp)
			if !ok {
				continue
			}
			for folder, apart := range Apart {
				for _, other := range apart {
					if under(from, folder) && under(to, other) {
						out = append(out, fmt.Sprintf("%s imports %s: nothing under %s/ may import a package under %s/", from, to, folder, other))
					}
				}
			}
			lt, placed := layer[to]
			if !placed {
				continue // reported as a package of its own
			}
			if lt >= lf {
				out = append(out, fmt.Sprintf("%s (layer %d) imports %s (layer %d)", from, lf, to, lt))
			}
		}
	}
	slices.Sort(out)
	return out
}
