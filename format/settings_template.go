package format

// SettingsTemplate is the ramify.toml that `ramify init` writes. It spells
// out every setting with its default value and says what it does, so a
// newcomer can tune the project without other documentation. It parses to
// exactly DefaultSettings.
const SettingsTemplate = `# ramify.toml: settings of this taxonomy repository.
# Every path is relative to this folder. Every value below is the default;
# delete a line to keep the default, change it to tune the project.

[items]
# The files that list the items: .toml ([[item]] tables), .tsv or .csv (a
# header row with id and any of label, tags, text). Several files may be
# listed; an item id must be unique across all of them.
files = ["items.toml"]
# An optional tab-separated file of numeric features: a header "id" then
# one column per feature, one row per item. Uncomment to use it, and add a
# source of kind "vector" below.
# vectors = "vectors.tsv"
# Or a NumPy .npy matrix (float32 or float64, one row per item, as
# numpy.save writes embeddings) with a text file naming each row's item,
# one id a line, in row order:
# vectors = "embeddings.npy"
# vector_ids = "embeddings-ids.txt"
# Or a Parquet table with a string column "id" and a column holding each
# item's vector as a list of floats (vector_column names it when the table
# has more than one such column):
# vectors = "embeddings.parquet"
# vector_column = "embedding"

[similarity]
# How many nearest neighbours each item keeps in the similarity graph.
# More neighbours give a finer graph and a slower solve. 0 compares all
# pairs, which is only possible for up to 5000 items.
neighbors = 15

# The similarity graph is a weighted sum of sources. Each source is one
# [[similarity.source]] table; listing any replaces this default list.
#   kind   = "tags"   items that share rare tags are similar
#            "text"   items whose texts share distinctive words are similar
#            "vector" items whose feature vectors point the same way are
#                     similar (needs items.vectors)
#            "links"  similarities given explicitly in a file with the
#                     header "a<TAB>b<TAB>weight" (needs file)
#   weight = how much this source counts against the others (above 0)
[[similarity.source]]
kind = "tags"
weight = 1.0

[[similarity.source]]
kind = "text"
weight = 0.5

# The text source mixes three channels, each a TF-IDF cosine, before the
# nearest neighbours are found: the head words of the label (the last word
# of each comma-separated name: "hammer" in "claw hammer"), the label's
# character 3- to 5-grams (so "teaspoon" meets "spoon"), and the words of
# the description. The weights say how much each counts (0 leaves it out).
[similarity.text]
label_heads = 1.0
label_grams = 1.0
description = 2.0

# [[similarity.source]]
# kind = "links"
# file = "links.tsv"
# weight = 0.5

[taxonomy]
# The generated tree, rewritten by ramify solve. Editors may move lines and
# rename categories in it; ramify absorb records such edits as decisions.
file = "taxonomy.outline"
# The smallest category worth naming, in items.
min_size = 3
# At most this many subcategories directly under one category (the items
# placed in a category are not counted).
max_children = 12
# At most this many levels of categories.
max_depth = 6
# How strongly a new solve is pulled toward the previous tree, from 0 (not
# at all) to 1 (strongest). Keeps categories steady when a few items are
# added.
stability = 0.3

[review]
# Items in one review packet: few enough to judge at a glance.
size = 8
# The share of packets drawn at random rather than where the tree is least
# certain. Random packets are the audits that estimate the reject rate.
audit_share = 0.25
# How many alternative trees vote to find where the tree is uncertain.
committee = 20

[release]
# A release needs at least this many answered audit packets (36 is the
# fewest that can pass the rate below even when every one is clean)...
min_audits = 36
# ...and the upper end of the 95% interval of the audit reject rate must be
# at most this share.
max_reject_rate = 0.10
# The prefix of every concept address in the SKOS export.
base_iri = "https://example.org/taxonomy/"

[limits]
# What one repository may hold in all. A pull request that goes past one
# gets a problem naming it, before ramify reads on; the defaults keep a
# solve inside 8 GB of memory. Raise them for a larger taxonomy on a
# larger machine.
# Items over every items file.
items = 1000000
# Rows over every links file.
links = 10000000
# Constraint records over every constraint file (a shape counts as the
# triplets it stands for).
records = 1000000
# Bytes of every input file ramify reads whole (items, links, vectors as
# text, constraints, the outline).
bytes = 536870912
`
