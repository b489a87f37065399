package graph

// Tags builds the kNN graph of IDF-weighted cosine similarity between tag
// sets: item i is the binary vector of its tags, tag t weighted
// u_t = ln(N/df_t), and cos(A,B) = Σ_{t∈A∩B} u_t² / (‖u_A‖·‖u_B‖)
// (the idf of Spärck Jones 1972, as in Salton & Buckley 1988). A tag on
// every item has idf 0 and contributes nothing; with 1000 items or more,
// a tag on more than half of them is dropped as too common (see
// commonTermCap). Tags are compared as given; repeated tags on one item
// count once, empty strings are ignored.
func Tags(tags [][]string, k int) (*CSR, error) {
	return Builder{K: k, Seed: DefaultSeed}.Tags(tags)
}

// Tags is the package function Tags with b's settings.
func (b Builder) Tags(tags [][]string) (*CSR, error) {
	return b.sparseGraph(tagRows(tags))
}

// tagRows weighs tag sets into normalised sparse rows.
func tagRows(tags [][]string) *sparseRows {
	docs := make([][]string, len(tags))
	for i, ts := range tags {
		for _, t := range ts {
			if t != "" {
				docs[i] = append(docs[i], t)
			}
		}
	}
	_, rows := weighDocs(docs, Weighting{TF: BinaryTF, IDF: TextbookIDF}, commonTermCap(len(tags)))
	return rows
}
