// Package ramify is the module's root. It holds no code of the tool: it
// embeds the data under testdata/ that the tests and benchmarks of
// several packages share, so that each reads the same files without
// anything outside the module (package internal/realdata reads the real
// dev taxonomies from here). The command is cmd/ramify.
package ramify

import "embed"

// DevTaxonomies is testdata/wordnet-dev: the eight WordNet 3.0 noun
// subtrees ramify is tuned on, with their provenance and licence in its
// README.md and LICENSE-WordNet.txt.
//
//go:embed testdata/wordnet-dev
var DevTaxonomies embed.FS
