package graph

import (
	"math"
	"strings"
	"testing"
)

// countDocs turns a documents × terms count matrix into token lists over
// terms "t0", "t1", ... so TFIDF sees exactly those counts.
func countDocs(counts [][]int) [][]string {
	docs := make([][]string, len(counts))
	for i, row := range counts {
		for t, c := range row {
			for ; c > 0; c-- {
				docs[i] = append(docs[i], "t"+string(rune('0'+t)))
			}
		}
	}
	return docs
}

// denseRow expands a sparse vector to nTerms entries.
func denseRow(v SparseVector, nTerms int) []float64 {
	out := make([]float64, nTerms)
	for p, t := range v.Index {
		out[t] = v.Value[p]
	}
	return out
}

func TestTFIDFScikitLearnExample(t *testing.T) {
	// Published values: the scikit-learn user guide, section "Text feature
	// extraction", subsection "Tf–idf term weighting", works the 6×3
	// count matrix below; its idf vectors and L2-normalised rows, also
	// recomputed by hand.
	counts := [][]int{{3, 0, 1}, {2, 0, 0}, {3, 0, 0}, {4, 0, 0}, {3, 2, 0}, {3, 0, 2}}
	df := []int{6, 1, 2}
	tests := []struct {
		name string
		w    Weighting
		idf  []float64
		rows map[int][]float64
	}{
		{
			name: "smooth idf",
			w:    Weighting{TF: RawTF, IDF: SmoothIDF},
			idf:  []float64{1, 2.252763, 1.847298},
			rows: map[int][]float64{
				0: {0.85151335, 0, 0.52433293},
				1: {1, 0, 0}, 2: {1, 0, 0}, 3: {1, 0, 0},
				4: {0.55422893, 0.83236428, 0},
				5: {0.63035731, 0, 0.77630514},
			},
		},
		{
			name: "unsmoothed idf plus one",
			w:    Weighting{TF: RawTF, IDF: PlusOneIDF},
			idf:  []float64{1, 2.791759, 2.098612},
			rows: map[int][]float64{
				0: {0.81940995, 0, 0.57320793},
				4: {0.47330339, 0.88089948, 0},
				5: {0.58149261, 0, 0.81355169},
			},
		},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			for term, want := range tc.idf {
				if got := tc.w.InverseDocFreq(6, df[term]); math.Abs(got-want) > 1e-6 {
					t.Errorf("idf(t%d) = %.7f, want %.6f", term, got, want)
				}
			}
			terms, vecs := TFIDF(countDocs(counts), tc.w)
			if strings.Join(terms, ",") != "t0,t1,t2" {
				t.Fatalf("vocabulary %v", terms)
			}
			for doc, want := range tc.rows {
				got := denseRow(vecs[doc], 3)
				for term := range want {
					if math.Abs(got[term]-want[term]) > 1e-8 {
						t.Errorf("doc%d term %d = %.8f, want %.8f", doc+1, term, got[term], want[term])
					}
				}
			}
		})
	}
}

func TestTFIDFTextbookCosines(t *testing.T) {
	// Textbook idf ln(N/df), raw tf; computed for this test by hand, not a
	// published value.
	docs := [][]string{{"red", "apple", "fruit"}, {"green", "apple", "fruit"}, {"red", "car"}}
	w := Weighting{}
	for _, tc := range []struct {
		df   int
		want float64
	}{{2, 0.405465}, {1, 1.098612}} {
		if got := w.InverseDocFreq(3, tc.df); math.Abs(got-tc.want) > 1e-6 {
			t.Errorf("idf(df=%d) = %.7f, want %.6f", tc.df, got, tc.want)
		}
	}
	_, vecs := TFIDF(docs, w)
	for _, tc := range []struct {
		a, b int
		want float64
	}{{0, 1, 0.377800}, {0, 2, 0.199903}, {1, 2, 0}} {
		got := vecs[tc.a].Cosine(vecs[tc.b])
		if math.Abs(got-tc.want) > 1e-6 {
			t.Errorf("cos(d%d,d%d) = %.7f, want %.6f", tc.a+1, tc.b+1, got, tc.want)
		}
		if back := vecs[tc.b].Cosine(vecs[tc.a]); back != got {
			t.Errorf("cos(d%d,d%d) = %v one way, %v the other", tc.a+1, tc.b+1, got, back)
		}
	}

	// The same values through the whole Text pipeline (tokeniser, stemming
	// and the inverted index): all pairs, so every positive cosine is an
	// edge.
	g, err := Text([]string{"red apple fruit", "green apple fruit", "red car"}, 0)
	if err != nil {
		t.Fatal(err)
	}
	checkGraph(t, g)
	for _, tc := range []struct {
		a, b int
		want float64
	}{{0, 1, 0.377800}, {0, 2, 0.199903}, {1, 2, 0}} {
		if got := g.Weight(tc.a, tc.b); math.Abs(got-tc.want) > 1e-6 {
			t.Errorf("Text edge d%d-d%d = %.7f, want %.6f", tc.a+1, tc.b+1, got, tc.want)
		}
	}
}

func TestTermWeight(t *testing.T) {
	// Raw tf, sublinear 1 + ln tf, binary (Salton & Buckley 1988).
	tests := []struct {
		tf    TFWeight
		count int
		want  float64
	}{
		{RawTF, 3, 3},
		{SublinearTF, 1, 1},
		{SublinearTF, 3, 1 + math.Log(3)},
		{BinaryTF, 5, 1},
	}
	for _, tc := range tests {
		if got := (Weighting{TF: tc.tf}).TermWeight(tc.count); got != tc.want {
			t.Errorf("TermWeight(%v, %d) = %v, want %v", tc.tf, tc.count, got, tc.want)
		}
	}
}

func TestZeroVectorDocument(t *testing.T) {
	// With textbook idf a term in every document weighs
	// 0; a document made only of such terms is the zero vector and must
	// have similarity 0 with everything, never NaN. A document without
	// words (empty, or stopwords only) is the zero vector too.
	tests := []struct {
		name   string
		texts  []string
		zero   []int
		joined [2]int
	}{
		{"term in every document", []string{"apple pie crust", "apple pie", "apple", "apple, the of!"}, []int{2, 3}, [2]int{0, 1}},
		{"no words", []string{"", "the of and", "drill bit", "drill press"}, []int{0, 1}, [2]int{2, 3}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			docs := make([][]string, len(tc.texts))
			for i, s := range tc.texts {
				docs[i] = Tokens(s)
			}
			_, vecs := TFIDF(docs, Weighting{})
			for _, z := range tc.zero {
				if len(vecs[z].Index) != 0 {
					t.Errorf("doc %d: vector %v, want zero", z, vecs[z])
				}
				for other := range vecs {
					if c := vecs[z].Cosine(vecs[other]); c != 0 {
						t.Errorf("cos(doc %d, doc %d) = %v, want 0", z, other, c)
					}
				}
			}
			g, err := Text(tc.texts, 0)
			if err != nil {
				t.Fatal(err)
			}
			checkGraph(t, g)
			for _, z := range tc.zero {
				if ts, _ := g.Neighbors(z); len(ts) != 0 {
					t.Errorf("zero document %d has neighbours %v", z, ts)
				}
			}
			if g.Weight(tc.joined[0], tc.joined[1]) <= 0 {
				t.Errorf("documents %v sharing a word are not joined", tc.joined)
			}
		})
	}
}
