package graph

// Text builds the kNN graph of TF-IDF cosine similarity between free-text
// descriptions: Tokens, then light plural stemming (PluralStem), then raw
// tf × textbook idf ln(N/df) with L2-normalised rows (Salton & Buckley,
// "Term-weighting approaches in automatic text retrieval", 1988). A
// description whose every word is in all descriptions (or that has no
// words) is the zero vector, similar to nothing. With 1000 items or more, a
// word in more than half of them is dropped as too common (see
// commonTermCap).
func Text(texts []string, k int) (*CSR, error) {
	return Builder{K: k, Seed: DefaultSeed}.Text(texts)
}

// Text is the package function Text with b's settings, including its
// TextWeighting and KeepPlurals.
func (b Builder) Text(texts []string) (*CSR, error) {
	return b.sparseGraph(b.textRows(texts))
}

// textRows tokenises and weighs descriptions into normalised sparse rows.
func (b Builder) textRows(texts []string) *sparseRows {
	docs := make([][]string, len(texts))
	for i, t := range texts {
		toks := Tokens(t)
		if !b.KeepPlurals {
			for p, w := range toks {
				toks[p] = PluralStem(w)
			}
		}
		docs[i] = toks
	}
	_, rows := weighDocs(docs, b.TextWeighting, commonTermCap(len(texts)))
	return rows
}
