package graph

// Functions that only the tests call, kept out of the built package.

// Recall is the share of exact's edges that approx also has: the edge
// recall of an approximate kNN graph against the exact one on the same
// items. Where several items tie for the last neighbour slot the two graphs
// may keep different but equally good ones, which counts as a miss here, so
// this is a lower bound on the usual (tie-aware) neighbour recall. A graph
// without edges is fully recalled by anything. Only vertices present in both
// graphs are compared.
func Recall(approx, exact *CSR) float64 {
	found, total := 0, 0
	for u := 0; u < min(approx.N, exact.N); u++ {
		et, _ := exact.Neighbors(u)
		at, _ := approx.Neighbors(u)
		p := 0
		for _, t := range et {
			if int(t) <= u {
				continue
			}
			total++
			for p < len(at) && at[p] < t {
				p++
			}
			if p < len(at) && at[p] == t {
				found++
			}
		}
	}
	if total == 0 {
		return 1
	}
	return float64(found) / float64(total)
}

// listRecall is the tie-aware neighbour recall of approximate lists against
// exact ones (rows best first, scores from the same function): for each row
// with exact neighbours, the approximate entries scoring at least as well as
// the exact list's last entry, at most as many as the exact list holds,
// over the exact list's length. approxRow maps a row of exact to the row of
// approx for the same item (exact may cover a sample of the items).
func listRecall(approx, exact *neighborLists, approxRow func(r int) int) float64 {
	hits, total := 0, 0
	for r := 0; r < exact.n; r++ {
		_, es := exact.row(r)
		if len(es) == 0 {
			continue
		}
		tau := es[len(es)-1]
		_, as := approx.row(approxRow(r))
		h := 0
		for _, s := range as {
			if s >= tau {
				h++
			}
		}
		hits += min(h, len(es))
		total += len(es)
	}
	if total == 0 {
		return 1
	}
	return float64(hits) / float64(total)
}

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

// Cosine is the dot product of two L2-normalised vectors, summed in
// increasing term order. An empty (zero) vector has cosine 0 with
// everything, never NaN.
func (a SparseVector) Cosine(b SparseVector) float64 {
	return sparseDot(a.Index, a.Value, b.Index, b.Value)
}

// TFIDF weighs tokenised documents under w and L2-normalises each row.
// terms is the sorted vocabulary; term id t is terms[t]. Terms of weight 0
// (textbook idf of a term in every document) are left out of the vectors,
// so a document made only of such terms is the zero vector.
func TFIDF(docs [][]string, w Weighting) (terms []string, vecs []SparseVector) {
	terms, rows := weighDocs(docs, w, 0)
	vecs = make([]SparseVector, rows.n)
	for i := range vecs {
		idx, val := rows.row(i)
		vecs[i] = SparseVector{Index: idx, Value: val}
	}
	return terms, vecs
}
