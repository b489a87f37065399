package graph

import (
	"maps"
	"math"
	"slices"
	"sort"
)

// TFWeight says how a term's count in one document becomes its weight.
type TFWeight int

const (
	RawTF       TFWeight = iota // the count itself
	SublinearTF                 // 1 + ln(count), damping repeated words
	BinaryTF                    // 1 for a present term (tag sets)
)

// IDFWeight says how a term's document frequency becomes its weight.
type IDFWeight int

const (
	// TextbookIDF is ln(N/df): a term in every document weighs 0.
	TextbookIDF IDFWeight = iota
	// PlusOneIDF is ln(N/df) + 1, the unsmoothed scikit-learn variant.
	PlusOneIDF
	// SmoothIDF is ln((1+N)/(1+df)) + 1, scikit-learn's default, as if one
	// extra document held every term once.
	SmoothIDF
)

// Weighting is a TF-IDF scheme. The zero value, raw tf × textbook idf with
// L2-normalised rows, is the classical "term frequency × collection idf,
// cosine-normalised" document weighting and the one Text uses by default.
type Weighting struct {
	TF  TFWeight
	IDF IDFWeight
}

// TermWeight is the tf factor for a term seen count times (count ≥ 1).
func (w Weighting) TermWeight(count int) float64 {
	switch w.TF {
	case SublinearTF:
		return 1 + math.Log(float64(count))
	case BinaryTF:
		return 1
	}
	return float64(count)
}

// InverseDocFreq is the idf factor of a term found in df of n documents.
func (w Weighting) InverseDocFreq(n, df int) float64 {
	switch w.IDF {
	case PlusOneIDF:
		return math.Log(float64(n)/float64(df)) + 1
	case SmoothIDF:
		return math.Log(float64(1+n)/float64(1+df)) + 1
	}
	return math.Log(float64(n) / float64(df))
}

// SparseVector is one document's weight vector: term ids in increasing
// order in Index, their weights in Value.
type SparseVector struct {
	Index []int32
	Value []float64
}

// weighDocs is TFIDF on the internal row store. Terms found in more than
// maxDocFreq documents are treated as stopwords and left out entirely
// (maxDocFreq ≤ 0: no cap); see commonTermCap.
func weighDocs(docs [][]string, w Weighting, maxDocFreq int) ([]string, *sparseRows) {
	seen := map[string]bool{}
	for _, d := range docs {
		for _, t := range d {
			seen[t] = true
		}
	}
	terms := slices.Sorted(maps.Keys(seen))
	id := make(map[string]int32, len(terms))
	for i, t := range terms {
		id[t] = int32(i)
	}

	// Per document: sorted term ids with their counts.
	off := make([]int64, len(docs)+1)
	var ids []int32
	var counts []int32
	df := make([]int, len(terms))
	var scratch []int32
	for i, d := range docs {
		scratch = scratch[:0]
		for _, t := range d {
			scratch = append(scratch, id[t])
		}
		sort.Slice(scratch, func(a, b int) bool { return scratch[a] < scratch[b] })
		for a := 0; a < len(scratch); {
			b := a
			for b < len(scratch) && scratch[b] == scratch[a] {
				b++
			}
			ids = append(ids, scratch[a])
			counts = append(counts, int32(b-a))
			df[scratch[a]]++
			a = b
		}
		off[i+1] = int64(len(ids))
	}

	n := len(docs)
	idf := make([]float64, len(terms))
	for t := range idf {
		if maxDocFreq > 0 && df[t] > maxDocFreq {
			continue // capped: weight 0, left out below
		}
		if df[t] > 0 {
			idf[t] = w.InverseDocFreq(n, df[t])
		}
	}

	rows := &sparseRows{n: n, off: make([]int64, n+1)}
	rows.idx = make([]int32, 0, len(ids))
	rows.val = make([]float64, 0, len(ids))
	for i := 0; i < n; i++ {
		start := len(rows.idx)
		norm2 := 0.0
		for p := off[i]; p < off[i+1]; p++ {
			x := float64(w.TermWeight(int(counts[p])) * idf[ids[p]])
			if x == 0 {
				continue
			}
			rows.idx = append(rows.idx, ids[p])
			rows.val = append(rows.val, x)
			norm2 += float64(x * x)
		}
		norm := math.Sqrt(norm2)
		for p := start; p < len(rows.idx); p++ {
			rows.val[p] /= norm
		}
		rows.off[i+1] = int64(len(rows.idx))
	}
	rows.nTerms = len(terms)
	return terms, rows
}

// commonTermCap is the document-frequency ceiling for tags and words in
// collections of n items. Finding candidate pairs through the inverted
// index costs Σ_t df_t² pair updates; a term in more than half of the items
// costs over n²/4 on its own while its idf, below ln 2, says little. With
// the cap the cost is at most (n/2)·nnz, half the brute-force comparison,
// and usually far less. Below 1000 items the cost is small whatever the
// frequencies, so nothing is dropped there.
func commonTermCap(n int) int {
	if n < 1000 {
		return 0
	}
	return n / 2
}
