package solve

import (
	"encoding/csv"
	"encoding/json"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"runtime"
	"slices"
	"sort"
	"strconv"
	"testing"

	"gonum.org/v1/gonum/stat"

	"github.com/ramify-tax/ramify/solve/graph"
)

// dgRefDir holds the copied reference files (see its README.md).
const dgRefDir = "testdata/reference"

// dgReadCSV returns the numeric columns of a data file in testdata.
func dgReadCSV(tb testing.TB, name string, cols []int) [][]float64 {
	tb.Helper()
	return readCSVColumns(tb, filepath.Join(dgRefDir, name), cols)
}

// readCSVColumns returns, for every row of the CSV file at path after its
// header, the numbers in the columns cols, failing the test on a file it
// cannot read or a cell that is not a number.
func readCSVColumns(tb testing.TB, path string, cols []int) [][]float64 {
	tb.Helper()
	f, err := os.Open(path)
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		tb.Fatal(err)
	}
	var out [][]float64
	for _, rec := range recs[1:] {
		row := make([]float64, len(cols))
		for k, c := range cols {
			if row[k], err = strconv.ParseFloat(rec[c], 64); err != nil {
				tb.Fatal(err)
			}
		}
		out = append(out, row)
	}
	return out
}

// dgZScore standardises columns with the population sd (numpy ddof=0),
// via gonum stat.PopMeanStdDev.
func dgZScore(x [][]float64) [][]float64 {
	out := make([][]float64, len(x))
	for i := range out {
		out[i] = make([]float64, len(x[0]))
	}
	col := make([]float64, len(x))
	for k := range x[0] {
		for i := range x {
			col[i] = x[i][k]
		}
		mean, sd := stat.PopMeanStdDev(col, nil)
		for i := range x {
			out[i][k] = (x[i][k] - mean) / sd
		}
	}
	return out
}

// dgEuclid is scipy pdist's 'euclidean': the square root of the squared
// differences summed in coordinate order.
func dgEuclid(x [][]float64) func(i, j int) float64 {
	return func(i, j int) float64 {
		s := 0.0
		for k := range x[i] {
			d := x[i][k] - x[j][k]
			s += float64(d * d)
		}
		return math.Sqrt(s)
	}
}

// dgScipyRow is one row of a reference linkage CSV.
type dgScipyRow struct {
	left, right int
	height      float64
	size        int
}

func dgReadLinkage(tb testing.TB, name string) []dgScipyRow {
	tb.Helper()
	var rows []dgScipyRow
	for _, r := range dgReadCSV(tb, name, []int{2, 3, 4, 5}) {
		rows = append(rows, dgScipyRow{int(r[0]), int(r[1]), r[2], int(r[3])})
	}
	return rows
}

// dgTreeFromLinkage builds the Tree of a scipy linkage matrix: row k
// creates node n+k over left and right.
func dgTreeFromLinkage(n int, rows []dgScipyRow) *Tree {
	t := NewTree(n)
	t.Height = make([]float64, n, 2*n-1)
	for _, r := range rows {
		t.Add(int32(r.left), int32(r.right))
		t.Height = append(t.Height, r.height)
	}
	return t
}

// dgLeafKeys names every node by its sorted leaf set.
func dgLeafKeys(t *Tree) []string {
	keys := make([]string, t.NumNodes())
	for v := range keys {
		l := t.Leaves(int32(v))
		slices.Sort(l)
		b := make([]byte, 0, 4*len(l))
		for _, x := range l {
			b = strconv.AppendInt(b, int64(x), 10)
			b = append(b, ',')
		}
		keys[v] = string(b)
	}
	return keys
}

// dgPairKey is an unordered pair of leaf sets.
func dgPairKey(a, b string) [2]string {
	if a > b {
		a, b = b, a
	}
	return [2]string{a, b}
}

// dgCompareToScipy checks, row by row, that our k-th merge joins the same
// two leaf sets as scipy's and that the heights agree to rel.
func dgCompareToScipy(t *testing.T, name string, ours *Tree, rows []dgScipyRow, rel float64) {
	t.Helper()
	n := ours.N
	ref := dgTreeFromLinkage(n, rows)
	ok, rk := dgLeafKeys(ours), dgLeafKeys(ref)
	if ours.NumNodes() != 2*n-1 {
		t.Fatalf("%s: %d nodes, want %d", name, ours.NumNodes(), 2*n-1)
	}
	for k, r := range rows {
		v := n + k
		kids := ours.Kids[v]
		got := dgPairKey(ok[kids[0]], ok[kids[1]])
		want := dgPairKey(rk[r.left], rk[r.right])
		if got != want {
			t.Fatalf("%s: row %d merges %v, scipy %v", name, k, got, want)
		}
		if h := ours.Height[v]; !dgClose(h, r.height, rel) {
			t.Fatalf("%s: row %d height %v, scipy %v", name, k, h, r.height)
		}
	}
}

// dgSummary reads the tree summaries of hierarchy_summary.json.
type dgSummary struct {
	Trees map[string]struct {
		Cophenetic float64 `json:"cophenetic_correlation"`
		RootHeight float64 `json:"root_height"`
	} `json:"trees"`
}

func dgReadSummary(tb testing.TB) dgSummary {
	var s dgSummary
	readJSONFile(tb, filepath.Join(dgRefDir, "hierarchy_summary.json"), &s)
	return s
}

// readJSONFile decodes the reference file at path into v, failing the test
// when it cannot be read or decoded.
func readJSONFile(tb testing.TB, path string, v any) {
	tb.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		tb.Fatal(err)
	}
	if err := json.Unmarshal(b, v); err != nil {
		tb.Fatalf("%s: %v", path, err)
	}
}

func TestAverageLinkageUPGMAExample(t *testing.T) {
	// The classic UPGMA worked example on 5S ribosomal RNA distances of five
	// bacteria (published in the English Wikipedia article "UPGMA"):
	// merges and heights as published there; a..e = 0..4.
	d := map[[2]int]float64{
		{0, 1}: 17, {0, 2}: 21, {0, 3}: 31, {0, 4}: 23, {1, 2}: 30,
		{1, 3}: 34, {1, 4}: 21, {2, 3}: 28, {2, 4}: 39, {3, 4}: 43,
	}
	dist := func(i, j int) float64 { return d[[2]int{min(i, j), max(i, j)}] }
	tr := AverageLinkageDist(5, dist)
	// Merges at 17, 22, 28, 33; UPGMA node heights are half: 8.5, 11, 14,
	// 16.5. The rows are what scipy's conventions give for this tree
	// (derived by hand from scipy's linkage documentation).
	want := [][4]float64{{0, 1, 17, 2}, {4, 5, 22, 3}, {2, 3, 28, 2}, {6, 7, 33, 5}}
	if got := LinkageMatrix(tr); !slices.Equal(got, want) {
		t.Errorf("linkage matrix %v, want %v", got, want)
	}
	for k, h := range []float64{8.5, 11, 14, 16.5} {
		if got := tr.Height[5+k] / 2; got != h {
			t.Errorf("merge %d: UPGMA height %v, want %v", k, got, h)
		}
	}
	if !dgSameClusters(tr, dgNested(t, 5, "(((0,1),4),(2,3))")) {
		t.Errorf("tree is not (((a,b),e),(c,d))")
	}
	// Cophenetic correlation (Sokal & Rohlf, Taxon 11, 1962) 0.730203, 6
	// decimals: computed by hand from the published tree, not published.
	if c := CopheneticCorrelation(tr, dist); math.Abs(c-0.730203) > 5e-7 {
		t.Errorf("cophenetic correlation %v, want 0.730203", c)
	}
}

func TestAverageLinkageTieRule(t *testing.T) {
	// All distances equal: every candidate ties. The chain's tie rule (the
	// element below the top wins a tie, then the smallest id; a merged
	// cluster lives in the larger slot, as in scipy's nn_chain) gives the
	// caterpillar ((((0,1),2),3),4), traced by hand.
	tr := AverageLinkageDist(5, func(i, j int) float64 { return 1 })
	want := [][4]float64{{0, 1, 1, 2}, {2, 5, 1, 3}, {3, 6, 1, 4}, {4, 7, 1, 5}}
	if got := LinkageMatrix(tr); !slices.Equal(got, want) {
		t.Errorf("dense ties: %v, want %v", got, want)
	}
	// The graph version numbers merged clusters afresh (5, 6, ...), so on
	// the unit K5 the same rule gives (((0,1),4),(2,3)), traced by hand:
	// 0-1, then 2-3 (cluster 5 = {0,1} is not the smallest id left), then
	// 5-4, then the rest.
	gt := AverageLinkageGraph(dgClique(t, 5))
	if !dgSameClusters(gt, dgNested(t, 5, "(((0,1),4),(2,3))")) {
		t.Errorf("graph ties: %v", LinkageMatrix(gt))
	}
}

func TestAverageLinkageMatchesScipy(t *testing.T) {
	// Reference: scipy 1.10.1 linkage(X, 'average', 'euclidean') on
	// Debian 12 (testdata/reference/README.md). These data have no ties,
	// so merges must agree row by row and heights to 1e-9 relative; the
	// cophenetic correlations are scipy's cophenet(Z, pdist(X))[0].
	sum := dgReadSummary(t)
	usa := dgReadCSV(t, "USArrests.csv", []int{1, 2, 3, 4})
	wine := dgReadCSV(t, "wine.csv", []int{0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12})
	cases := []struct {
		name, csv, summary string
		x                  [][]float64
	}{
		{"wine z", "linkage_wine_average_z.csv", "wine_average_zscore_ddof0", dgZScore(wine)},
		{"USArrests z", "linkage_USArrests_average_z.csv", "USArrests_average_zscore_ddof0", dgZScore(usa)},
		{"USArrests raw", "linkage_USArrests_average.csv", "USArrests_average_raw", usa},
	}
	for _, c := range cases {
		dist := dgEuclid(c.x)
		tr := AverageLinkageDist(len(c.x), dist)
		dgCompareToScipy(t, c.name, tr, dgReadLinkage(t, c.csv), 1e-9)
		ref := sum.Trees[c.summary]
		if got := CopheneticCorrelation(tr, dist); !dgClose(got, ref.Cophenetic, 1e-9) {
			t.Errorf("%s: cophenetic correlation %v, scipy %v", c.name, got, ref.Cophenetic)
		}
		if got := tr.Height[tr.Root]; !dgClose(got, ref.RootHeight, 1e-9) {
			t.Errorf("%s: root height %v, scipy %v", c.name, got, ref.RootHeight)
		}
	}
}

// dgIrisGraph is the all-pairs Gaussian graph of dasgupta_iris.json:
// sigma = median of the 11175 pairwise distances, w = exp(−d²/(2σ²)) with
// d² = d·d.
func dgIrisGraph(tb testing.TB, x [][]float64) *graph.CSR {
	dist := dgEuclid(x)
	n := len(x)
	var ds []float64
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			ds = append(ds, dist(i, j))
		}
	}
	sorted := slices.Clone(ds)
	sort.Float64s(sorted)
	sigma := sorted[len(sorted)/2] // odd count: the middle element
	var e []graph.Edge
	k := 0
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			d := ds[k]
			k++
			e = append(e, graph.Edge{A: int32(i), B: int32(j), W: math.Exp(-float64(d*d) / float64(2*sigma*sigma))})
		}
	}
	return MustGraph(tb, n, e)
}

func dgIrisRef(tb testing.TB) (sigma, sumW, cost float64) {
	var ref struct {
		Sigma float64 `json:"sigma"`
		SumW  float64 `json:"sum_w_all_pairs"`
		Trees map[string]struct {
			Cost float64 `json:"cost"`
		} `json:"trees"`
	}
	readJSONFile(tb, filepath.Join(dgRefDir, "dasgupta_iris.json"), &ref)
	return ref.Sigma, ref.SumW, ref.Trees["average"].Cost
}

func TestCostIrisScipyTree(t *testing.T) {
	// Reference: dasgupta_iris.json (scipy 1.10.1 average tree, cost by
	// numpy 1.24.2 + math.fsum): 486167.70444274787, checked to 1e-9.
	x := dgReadCSV(t, "iris.csv", []int{0, 1, 2, 3})
	g := dgIrisGraph(t, x)
	_, sumW, want := dgIrisRef(t)
	total := 0.0
	for _, w := range g.Weights {
		total += w
	}
	if !dgClose(total/2, sumW, 1e-12) {
		t.Fatalf("sum of weights %v, reference %v: graph differs", total/2, sumW)
	}
	tr := dgTreeFromLinkage(150, dgReadLinkage(t, "linkage_iris_average.csv"))
	if got := Cost(g, tr); !dgClose(got, want, 1e-9) {
		t.Errorf("cost %.17g, reference %.17g", got, want)
	}
	// Same file's sanity check: with unit weights every tree costs
	// (n³−n)/3 = 1124950.
	if got := Cost(dgClique(t, 150), tr); got != 1124950 {
		t.Errorf("unit-weight cost %v, want 1124950", got)
	}
}

func TestAverageLinkageIris(t *testing.T) {
	// Iris has near-ties; testdata/reference/README.md gives what an
	// independent implementation must reproduce: the 50/100 top split,
	// the setosa clade (rows 0-49), the cophenetic correlation within
	// 1e-5 of 0.8769561465 and the Dasgupta cost within ~2e-7 relative.
	x := dgReadCSV(t, "iris.csv", []int{0, 1, 2, 3})
	dist := dgEuclid(x)
	tr := AverageLinkageDist(150, dist)
	keys := dgLeafKeys(tr)
	setosa := ""
	for i := 0; i < 50; i++ {
		setosa += strconv.Itoa(i) + ","
	}
	top := tr.Kids[tr.Root]
	sizes := []int{len(tr.Leaves(top[0])), len(tr.Leaves(top[1]))}
	slices.Sort(sizes)
	if sizes[0] != 50 || sizes[1] != 100 || (keys[top[0]] != setosa && keys[top[1]] != setosa) {
		t.Errorf("top split %v, want the 50 setosa against the rest", sizes)
	}
	if c := CopheneticCorrelation(tr, dist); math.Abs(c-0.8769561465) > 1e-5 {
		t.Errorf("cophenetic correlation %v, scipy 0.8769561465", c)
	}
	_, _, want := dgIrisRef(t)
	if got := Cost(dgIrisGraph(t, x), tr); !dgClose(got, want, 2e-7) {
		t.Errorf("cost %.17g, scipy tree %.17g", got, want)
	}
}

// dgRandomPoints gives n points in the unit cube of dim dimensions.
func dgRandomPoints(seed uint64, n, dim int) [][]float64 {
	r := rand.New(rand.NewPCG(seed, 77))
	x := make([][]float64, n)
	for i := range x {
		x[i] = make([]float64, dim)
		for k := range x[i] {
			x[i][k] = r.Float64()
		}
	}
	return x
}

// dgComplementGraph is the complete graph with w_ij = c − d_ij.
func dgComplementGraph(tb testing.TB, n int, dist func(i, j int) float64, c float64) *graph.CSR {
	var e []graph.Edge
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			e = append(e, graph.Edge{A: int32(i), B: int32(j), W: c - dist(i, j)})
		}
	}
	return MustGraph(tb, n, e)
}

func TestAverageLinkageGraphEqualsDense(t *testing.T) {
	// On a complete graph with s = C − d, s(A,B) = C − mean d(A,B), so the
	// graph version must make the dense version's merges, with heights
	// C − h. Random points: no ties.
	for seed := uint64(1); seed <= 5; seed++ {
		n := 20 + 10*int(seed)
		x := dgRandomPoints(seed, n, 3)
		dist := dgEuclid(x)
		dense := AverageLinkageDist(n, dist)
		const c = 10.0
		sparse := AverageLinkageGraph(dgComplementGraph(t, n, dist, c))
		var rows []dgScipyRow
		for _, r := range LinkageMatrix(dense) {
			rows = append(rows, dgScipyRow{int(r[0]), int(r[1]), c - r[2], int(r[3])})
		}
		dgCompareToScipy(t, "random points", sparse, rows, 1e-12)
	}
	// The same on USArrests (z): the graph version reproduces scipy's
	// rows (reference as in TestAverageLinkageMatchesScipy).
	x := dgZScore(dgReadCSV(t, "USArrests.csv", []int{1, 2, 3, 4}))
	const c = 100.0
	sparse := AverageLinkageGraph(dgComplementGraph(t, 50, dgEuclid(x), c))
	var rows []dgScipyRow
	for _, r := range dgReadLinkage(t, "linkage_USArrests_average_z.csv") {
		r.height = c - r.height
		rows = append(rows, r)
	}
	dgCompareToScipy(t, "USArrests z graph", sparse, rows, 1e-12)
}

// dgGreedyAverage is average linkage straight from its definition: merge
// the pair of clusters with the largest w(A,B)/(|A||B|) among pairs with
// an edge, O(n³). It returns the merged leaf sets (as keys) and values in
// merge order.
func dgGreedyAverage(g *graph.CSR) ([][2]string, []float64) {
	n := g.N
	members := make([][]int32, n)
	for i := range members {
		members[i] = []int32{int32(i)}
	}
	alive := make([]bool, n)
	for i := range alive {
		alive[i] = true
	}
	key := func(m []int32) string {
		s := slices.Clone(m)
		slices.Sort(s)
		b := []byte{}
		for _, x := range s {
			b = strconv.AppendInt(b, int64(x), 10)
			b = append(b, ',')
		}
		return string(b)
	}
	var pairs [][2]string
	var vals []float64
	for {
		bi, bj, bs := -1, -1, 0.0
		for i := range members {
			for j := i + 1; j < len(members); j++ {
				if !alive[i] || !alive[j] {
					continue
				}
				w := 0.0
				for _, a := range members[i] {
					for _, b := range members[j] {
						w += g.Weight(int(a), int(b))
					}
				}
				s := w / float64(len(members[i])*len(members[j]))
				if w > 0 && s > bs {
					bi, bj, bs = i, j, s
				}
			}
		}
		if bi < 0 {
			return pairs, vals
		}
		pairs = append(pairs, dgPairKey(key(members[bi]), key(members[bj])))
		vals = append(vals, bs)
		alive[bi], alive[bj] = false, false
		members = append(members, append(slices.Clone(members[bi]), members[bj]...))
		alive = append(alive, true)
	}
}

func TestAverageLinkageGraphGreedyDefinition(t *testing.T) {
	// The chain on sparse graphs makes the same merges, in the same
	// order of similarity, as the greedy definition (average linkage on
	// graphs is reducible, so the NN-chain is exact; Müllner 2011).
	for seed := uint64(0); seed < 10; seed++ {
		n := 12 + int(seed)*3
		g := RandomWeightedGraph(t, 500+seed, dgStream, n, 0.25)
		wantPairs, wantVals := dgGreedyAverage(g)
		tr := AverageLinkageGraph(g)
		keys := dgLeafKeys(tr)
		for k := range wantPairs {
			kids := tr.Kids[n+k]
			if got := dgPairKey(keys[kids[0]], keys[kids[1]]); got != wantPairs[k] {
				t.Fatalf("seed %d: merge %d joins %v, greedy %v", seed, k, got, wantPairs[k])
			}
			if !dgClose(tr.Height[n+k], wantVals[k], 1e-12) {
				t.Fatalf("seed %d: merge %d at %v, greedy %v", seed, k, tr.Height[n+k], wantVals[k])
			}
		}
		// What is left are the components, joined at 0.
		for v := n + len(wantPairs); v < tr.NumNodes(); v++ {
			if tr.Height[v] != 0 {
				t.Fatalf("seed %d: component join at %v, want 0", seed, tr.Height[v])
			}
		}
	}
}

func TestAverageLinkageGraphComponents(t *testing.T) {
	// Components {1,4}, {0,2,5}, {3} (isolated), {6,7}: by hand, 6-7 (3),
	// 0-2 (2), 1-4 (1), {0,2}-5 ((0.5+1)/2), then the components joined in
	// order of smallest leaf: ((({0,2,5},{1,4}),{3}),{6,7}).
	g := MustGraph(t, 8, []graph.Edge{
		{A: 1, B: 4, W: 1}, {A: 0, B: 2, W: 2}, {A: 2, B: 5, W: 1}, {A: 0, B: 5, W: 0.5}, {A: 6, B: 7, W: 3},
	})
	tr := AverageLinkageGraph(g)
	if !dgSameClusters(tr, dgNested(t, 8, "(((((0,2),5),(1,4)),3),(6,7))")) {
		t.Errorf("tree clusters differ from the expected component joins")
	}
	// Merge values fall to the root, components joined at 0.
	wantH := []float64{3, 2, 1, 0.75, 0, 0, 0} // 6-7, 0-2, 1-4, {0,2}-5 = (0.5+1)/2, joins
	for k, h := range wantH {
		if tr.Height[8+k] != h {
			t.Errorf("merge %d at %v, want %v", k, tr.Height[8+k], h)
		}
	}
	if c := Cost(g, tr); math.IsNaN(c) {
		t.Errorf("cost NaN")
	}
	if AverageLinkageGraph(nil) != nil {
		t.Errorf("nil graph gives a tree")
	}
	asym := &graph.CSR{N: 2, Offsets: []int64{0, 1, 1}, Targets: []int32{1}, Weights: []float64{1}}
	if AverageLinkageGraph(asym) != nil {
		t.Errorf("asymmetric graph gives a tree")
	}
	if tr := AverageLinkageGraph(MustGraph(t, 1, nil)); tr == nil || tr.NumNodes() != 1 {
		t.Errorf("one vertex: %v", tr)
	}
}

func TestAverageLinkageGraphDeterministic(t *testing.T) {
	// Same result under GOMAXPROCS 1 and 2, and on repeated runs.
	g := RandomWeightedGraph(t, 99, dgStream, 400, 0.02)
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(0))
	var trees []*Tree
	for _, p := range []int{1, 2, 1} {
		runtime.GOMAXPROCS(p)
		trees = append(trees, AverageLinkageGraph(g))
	}
	for _, tr := range trees[1:] {
		if !slices.Equal(LinkageMatrix(tr), LinkageMatrix(trees[0])) {
			t.Fatal("linkage differs between runs")
		}
	}
}

func TestLinkageMatrixRejects(t *testing.T) {
	if LinkageMatrix(dgNested(t, 3, "(0,1,2)")) != nil {
		t.Error("multiway tree accepted")
	}
	if LinkageMatrix(nil) != nil {
		t.Error("nil tree accepted")
	}
	// A tree built top-down (parent id below a child's) is rejected.
	tr := &Tree{N: 3, Kids: [][]int32{nil, nil, nil, {4, 0}, {1, 2}}, Root: 3}
	if LinkageMatrix(tr) != nil {
		t.Error("parent before child accepted")
	}
}
