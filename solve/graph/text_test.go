package graph

import (
	"math"
	"testing"
)

func TestTextOptions(t *testing.T) {
	// Sublinear tf (tf → 1 + ln tf), worked by hand: "saw",
	// "blade", "drill" are each in 2 of 3 documents (same idf, which cancels
	// in the cosine); d1 has saw three times, so over (saw, blade, drill)
	// d1 ∝ (1+ln 3, 1, 0) and d2 ∝ (1, 0, 1):
	// cos = (1+ln 3) / (sqrt((1+ln 3)² + 1) · sqrt 2).
	texts := []string{"saw saw saw blade", "saw drill", "blade drill bit"}
	g, err := Builder{TextWeighting: Weighting{TF: SublinearTF}}.Text(texts)
	if err != nil {
		t.Fatal(err)
	}
	checkGraph(t, g)
	a := 1 + math.Log(3)
	want := a / (math.Sqrt(a*a+1) * math.Sqrt2)
	if got := g.Weight(0, 1); math.Abs(got-want) > 1e-12 {
		t.Errorf("sublinear cos(d1,d2) = %v, want %v", got, want)
	}
	// With raw tf the same pair is 3 / (sqrt(10) · sqrt 2).
	g, err = Builder{}.Text(texts)
	if err != nil {
		t.Fatal(err)
	}
	if got, want := g.Weight(0, 1), 3/(math.Sqrt(10)*math.Sqrt2); math.Abs(got-want) > 1e-12 {
		t.Errorf("raw cos(d1,d2) = %v, want %v", got, want)
	}

	// Plural stemming joins "hammers" and "hammer"; KeepPlurals does not.
	texts = []string{"claw hammers", "hammer drill", "drill bits"}
	for _, keep := range []bool{false, true} {
		g, err := Builder{KeepPlurals: keep}.Text(texts)
		if err != nil {
			t.Fatal(err)
		}
		checkGraph(t, g)
		if joined := g.Weight(0, 1) > 0; joined == keep {
			t.Errorf("KeepPlurals=%v: hammers-hammer joined = %v", keep, joined)
		}
	}
}
