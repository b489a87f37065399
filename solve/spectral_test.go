package solve

import (
	"errors"
	"math"
	"math/rand/v2"
	"path/filepath"
	"sort"
	"strconv"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/ramify-tax/ramify/solve/graph"
)

func sortedCopy(x []float64) []float64 {
	y := append([]float64(nil), x...)
	sort.Float64s(y)
	return y
}

func closeSlices(t *testing.T, name string, got, want []float64, tol float64) {
	t.Helper()
	if len(got) != len(want) {
		t.Fatalf("%s: %d values, want %d", name, len(got), len(want))
	}
	for i := range got {
		if math.Abs(got[i]-want[i]) > tol {
			t.Errorf("%s[%d] = %.15g, want %.15g", name, i, got[i], want[i])
		}
	}
}

func TestLaplacianClosedForms(t *testing.T) {
	// The standard closed forms of the combinatorial L and normalised N
	// spectra of paths, cycles, stars and complete graphs (for N see F.
	// Chung, Spectral Graph Theory, AMS 1997, ch. 1), each re-derived here;
	// P_n's L spectrum is 2 − 2cos(πk/n), its N spectrum 1 − cos(πk/(n−1)).
	type tc struct {
		name       string
		g          *graph.CSR
		comb, norm func(k int) float64
	}
	var cases []tc
	for _, n := range []int{5, 10, 17} {
		n := n
		cases = append(cases, tc{"P" + strconv.Itoa(n), dgPath(t, n),
			func(k int) float64 { return 2 - 2*math.Cos(math.Pi*float64(k)/float64(n)) },
			func(k int) float64 { return 1 - math.Cos(math.Pi*float64(k)/float64(n-1)) }})
		cases = append(cases, tc{"C" + strconv.Itoa(n), dgCycle(t, n),
			func(k int) float64 { return 2 - 2*math.Cos(2*math.Pi*float64(k)/float64(n)) },
			func(k int) float64 { return 1 - math.Cos(2*math.Pi*float64(k)/float64(n)) }})
		cases = append(cases, tc{"K" + strconv.Itoa(n), dgClique(t, n),
			func(k int) float64 { return map[bool]float64{true: 0, false: float64(n)}[k == 0] },
			func(k int) float64 { return map[bool]float64{true: 0, false: float64(n) / float64(n-1)}[k == 0] }})
		cases = append(cases, tc{"S" + strconv.Itoa(n), dgStar(t, n),
			func(k int) float64 {
				switch k {
				case 0:
					return 0
				case n - 1:
					return float64(n)
				}
				return 1
			},
			func(k int) float64 {
				switch k {
				case 0:
					return 0
				case n - 1:
					return 2
				}
				return 1
			}})
	}
	for _, c := range cases {
		n := c.g.N
		var comb, norm []float64
		for k := 0; k < n; k++ {
			comb = append(comb, c.comb(k))
			norm = append(norm, c.norm(k))
		}
		closeSlices(t, c.name+" L", LaplacianEigenvalues(c.g, false), sortedCopy(comb), 1e-9)
		closeSlices(t, c.name+" N", LaplacianEigenvalues(c.g, true), sortedCopy(norm), 1e-9)
	}
	// Two triangles and a bridge, L = 0, (5−√17)/2, 3, 3, 3, (5+√17)/2:
	// the roots of its characteristic polynomial, worked by hand.
	closeSlices(t, "two triangles L", LaplacianEigenvalues(dgTwoTriangles(t), false),
		[]float64{0, (5 - math.Sqrt(17)) / 2, 3, 3, 3, (5 + math.Sqrt(17)) / 2}, 1e-9)
}

// referenceSpectra is testdata/spectral/laplacian_spectra.json (numpy
// 1.24.2, numpy.linalg.eigvalsh(D - A); see its README).
type referenceSpectra struct {
	Graphs map[string]struct {
		N           int       `json:"n_nodes"`
		Eigenvalues []float64 `json:"eigenvalues_numpy"`
	} `json:"graphs"`
	Fiedler struct {
		Eigenvalue float64   `json:"eigenvalue"`
		Vector     []float64 `json:"vector_numpy"`
	} `json:"fiedler_P10"`
}

func loadReference(t *testing.T) referenceSpectra {
	t.Helper()
	var ref referenceSpectra
	readJSONFile(t, filepath.Join("testdata", "spectral", "laplacian_spectra.json"), &ref)
	return ref
}

func TestLaplacianMatchesNumpy(t *testing.T) {
	// numpy 1.24.2 numpy.linalg.eigvalsh(D - A) on P10, C10, S10 (centre 0),
	// K6 (testdata/spectral/laplacian_spectra.json).
	ref := loadReference(t)
	graphs := map[string]*graph.CSR{
		"P10": dgPath(t, 10), "C10": dgCycle(t, 10),
		"S10": dgStar(t, 10), "K6": dgClique(t, 6),
	}
	for name, g := range graphs {
		want, ok := ref.Graphs[name]
		if !ok || want.N != g.N {
			t.Fatalf("reference lacks %s", name)
		}
		closeSlices(t, name, LaplacianEigenvalues(g, false), want.Eigenvalues, 1e-12)
	}
}

func TestFiedlerP10MatchesNumpy(t *testing.T) {
	// With unit masses the generalised problem is L x = λ x, so Fiedler
	// must return numpy's eigh(L)[1][:,1] up to sign (fiedler_P10.csv,
	// numpy 1.24.2) and its eigenvalue 2 − 2cos(π/10).
	ref := loadReference(t)
	var want []float64
	for _, r := range readCSVColumns(t, filepath.Join("testdata", "spectral", "fiedler_P10.csv"), []int{1}) {
		want = append(want, r[0])
	}
	closeSlices(t, "csv vs json", want, ref.Fiedler.Vector, 0)
	ones := make([]float64, 10)
	for i := range ones {
		ones[i] = 1
	}
	lambda, x := Fiedler(dgPath(t, 10), ones, 1)
	if math.Abs(lambda-ref.Fiedler.Eigenvalue) > 1e-12 {
		t.Errorf("λ₂ = %.15g, want %.15g", lambda, ref.Fiedler.Eigenvalue)
	}
	// Our canonical sign makes entry 0 positive; numpy's is negative.
	for i := range want {
		want[i] = -want[i]
	}
	closeSlices(t, "Fiedler P10", x, want, 1e-9)
}

func TestFiedlerNormalisedValues(t *testing.T) {
	// λ₂ of N = I − D^{-1/2}WD^{-1/2} (mass nil), the closed forms above,
	// 1 − cos(π/(n−1)) for P_n, 1 − cos(2π/n) for C_n, n/(n−1) for K_n,
	// 1 for a star; 0.204666 for two triangles, from a dense symmetric
	// eigensolver (not a published value). The sizes
	// above denseEigenLimit exercise Lanczos.
	cases := []struct {
		name string
		g    *graph.CSR
		want float64
		tol  float64
	}{
		{"P5", dgPath(t, 5), 0.292893, 1e-6},
		{"C6", dgCycle(t, 6), 0.5, 1e-12},
		{"K5", dgClique(t, 5), 1.25, 1e-12},
		{"S6", dgStar(t, 6), 1, 1e-12},
		{"two triangles", dgTwoTriangles(t), 0.204666, 1e-6},
		{"P60", dgPath(t, 60), 1 - math.Cos(math.Pi/59), 1e-9},
		{"C40", dgCycle(t, 40), 1 - math.Cos(2*math.Pi/40), 1e-9},
		{"K50", dgClique(t, 50), 50.0 / 49, 1e-9},
		{"S40", dgStar(t, 40), 1, 1e-9},
		{"P200", dgPath(t, 200), 1 - math.Cos(math.Pi/199), 1e-9},
	}
	for _, c := range cases {
		lambda, x := Fiedler(c.g, nil, 7)
		if math.Abs(lambda-c.want) > c.tol {
			t.Errorf("%s: λ₂ = %.12g, want %.12g", c.name, lambda, c.want)
		}
		// x is B-normalised and B-orthogonal to 1 (B = degrees).
		var xb1, xbx float64
		for v := range x {
			d := c.g.Degree(v)
			xb1 += x[v] * d
			xbx += x[v] * x[v] * d
		}
		if math.Abs(xb1) > 1e-8 || math.Abs(xbx-1) > 1e-8 {
			t.Errorf("%s: xᵀB1 = %g, xᵀBx = %g", c.name, xb1, xbx)
		}
	}
}

// denseGeneralised solves L x = λ B x densely with gonum's mat.EigenSym on
// B^{-1/2} L B^{-1/2}: the reference for the Lanczos path.
func denseGeneralised(g *graph.CSR, b []float64) (float64, []float64) {
	n := g.N
	a := mat.NewSymDense(n, nil)
	for i := 0; i < n; i++ {
		a.SetSym(i, i, g.Degree(i)/b[i])
		ts, ws := g.Neighbors(i)
		for k, t := range ts {
			a.SetSym(i, int(t), -ws[k]/math.Sqrt(b[i]*b[t]))
		}
	}
	var es mat.EigenSym
	es.Factorize(a, true)
	var v mat.Dense
	es.VectorsTo(&v)
	x := make([]float64, n)
	for i := range x {
		x[i] = v.At(i, 1) / math.Sqrt(b[i])
	}
	return es.Values(nil)[1], x
}

func TestLanczosMatchesDenseWithMasses(t *testing.T) {
	// Lanczos (n > denseEigenLimit) against gonum mat.EigenSym (v0.17.0) on
	// the same generalised problem, with random masses and with degrees.
	for seed := uint64(1); seed <= 6; seed++ {
		n := 80 + int(seed)*30
		g := RandomGraph(t, seed, 11, n, 2*n)
		r := rand.New(rand.NewPCG(seed, 5))
		masses := make([]float64, n)
		for i := range masses {
			masses[i] = 1 + float64(r.IntN(5))
		}
		deg := make([]float64, n)
		for i := range deg {
			deg[i] = g.Degree(i)
		}
		for _, m := range [][]float64{masses, nil} {
			b := m
			if b == nil {
				b = deg
			}
			want, wx := denseGeneralised(g, b)
			got, x := Fiedler(g, m, seed)
			if math.Abs(got-want) > 1e-9*math.Max(1, want) {
				t.Errorf("seed %d n %d: λ₂ = %.12g, dense %.12g", seed, n, got, want)
			}
			var ip float64
			for i := range x {
				ip += x[i] * wx[i] * b[i]
			}
			if math.Abs(math.Abs(ip)-1) > 1e-6 {
				t.Errorf("seed %d n %d: |⟨x, x_dense⟩_B| = %.9f, want 1", seed, n, math.Abs(ip))
			}
		}
	}
}

func TestFiedlerDisconnectedHasNoNaN(t *testing.T) {
	// Two components and an isolated vertex: λ₂ = 0 (multiplicity of 0 =
	// number of components; Chung 1997, ch. 1) and a finite vector.
	g := MustGraph(t, 6, []graph.Edge{{A: 0, B: 1, W: 1}, {A: 1, B: 2, W: 2}, {A: 3, B: 4, W: 1}})
	for _, m := range [][]float64{nil, {1, 1, 1, 1, 1, 1}} {
		lambda, x := Fiedler(g, m, 1)
		if lambda != 0 {
			t.Errorf("λ₂ = %g, want 0", lambda)
		}
		for _, v := range x {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("vector %v", x)
			}
		}
		if x[0] == x[3] {
			t.Errorf("vector %v does not separate the components", x)
		}
	}
	vals := LaplacianEigenvalues(g, true)
	zeros := 0
	for _, v := range vals {
		if math.IsNaN(v) {
			t.Fatalf("NaN eigenvalue: %v", vals)
		}
		if math.Abs(v) < 1e-12 {
			zeros++
		}
	}
	if zeros != 3 {
		t.Errorf("normalised spectrum %v: %d zeros, want 3 (three components)", vals, zeros)
	}
}

func TestSweepCuts(t *testing.T) {
	// By hand: on two triangles and a bridge the best cut is the bridge,
	// ψ = 1/(3·3) = 1/9; the Fiedler vector of P6, cos(π(i+½)/6), is
	// monotone, so the sweep splits the path in the middle (ψ = 1/9).
	cases := []struct {
		name string
		g    *graph.CSR
		want []int32
		psi  float64
	}{
		{"two triangles", dgTwoTriangles(t), []int32{0, 1, 2}, 1.0 / 9},
		{"P6", dgPath(t, 6), []int32{0, 1, 2}, 1.0 / 9},
	}
	for _, c := range cases {
		_, x := Fiedler(c.g, nil, 1)
		order, k, psi := SweepCut(c.g, x, nil)
		side := append([]int32(nil), order[:k]...)
		sort.Slice(side, func(i, j int) bool { return side[i] < side[j] })
		if side[0] != 0 { // the complement names the same cut
			side = append([]int32(nil), order[k:]...)
			sort.Slice(side, func(i, j int) bool { return side[i] < side[j] })
		}
		if !equalInt32(side, c.want) || math.Abs(psi-c.psi) > 1e-12 {
			t.Errorf("%s: cut %v ψ %.12g, want %v ψ %.12g", c.name, side, psi, c.want, c.psi)
		}
	}
	// With masses the sweep scores w(A,B)/(m(A)·m(B)): a path 0–1–2 with
	// mass 10 on vertex 0 and order x = (0, 1, 2) has prefix scores
	// 1/(10·2) and 1/(11·1); the first is smaller.
	g := dgPath(t, 3)
	_, k, psi := SweepCut(g, []float64{0, 1, 2}, []float64{10, 1, 1})
	if k != 1 || math.Abs(psi-1.0/20) > 1e-15 {
		t.Errorf("mass sweep: k = %d ψ = %g, want 1 and 1/20", k, psi)
	}
	// Ties go to the smallest k: on P4 with x = (0,1,2,3) prefixes score
	// 1/3, 1/4, 1/3 → k = 2; on a 4-cycle in order 0,1,2,3 they score
	// 2/3, 2/4, 2/3 → k = 2, and with equal x the order falls back on ids.
	_, k, _ = SweepCut(dgPath(t, 4), []float64{0, 1, 2, 3}, nil)
	if k != 2 {
		t.Errorf("P4 sweep k = %d, want 2", k)
	}
	order, _, _ := SweepCut(dgCycle(t, 4), []float64{1, 1, 1, 1}, nil)
	if !equalInt32(order, []int32{0, 1, 2, 3}) {
		t.Errorf("ties: order %v, want by id", order)
	}
}

func equalInt32(a, b []int32) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

func TestTridiagonalSolver(t *testing.T) {
	// The tridiagonal QL/QR step (Dsteqr on the tridiagonal itself)
	// against gonum mat.EigenSym (v0.17.0), which reduces the dense matrix
	// first (Dsytrd), on random symmetric tridiagonal matrices: the same
	// smallest eigenvalue and, up to sign, the same unit eigenvector.
	r := rand.New(rand.NewPCG(3, 3))
	for trial := 0; trial < 50; trial++ {
		k := 1 + r.IntN(40)
		a := make([]float64, k)
		e := make([]float64, max(k-1, 0))
		for i := range a {
			a[i] = r.NormFloat64()
		}
		for i := range e {
			e[i] = 0.1 + r.Float64()
		}
		var es mat.EigenSym
		es.Factorize(tridiag(a, e), true)
		vals := es.Values(nil)
		var vecs mat.Dense
		es.VectorsTo(&vecs)
		got, v, err := tridiagSmallest(a, e)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(got-vals[0]) > 1e-12*math.Max(1, math.Abs(vals[0])) {
			t.Fatalf("k=%d: smallest eigenvalue %.15g, gonum %.15g", k, got, vals[0])
		}
		ip := 0.0
		for i := range v {
			ip += v[i] * vecs.At(i, 0)
		}
		if math.Abs(math.Abs(ip)-1) > 1e-8 {
			t.Fatalf("k=%d: |⟨v, v_gonum⟩| = %.12f", k, math.Abs(ip))
		}
	}
}

func tridiag(a, e []float64) *mat.SymDense {
	k := len(a)
	m := mat.NewSymDense(k, nil)
	for i := 0; i < k; i++ {
		m.SetSym(i, i, a[i])
		if i+1 < k {
			m.SetSym(i, i+1, e[i])
		}
	}
	return m
}

// A dense eigensolve that does not converge is an error from Solve, not a
// panic: the construction stops and says what failed. Real inputs do not
// reach it, so the test makes the factorisation fail.
func TestDenseEigenFailureIsAnError(t *testing.T) {
	saved := factorizeSym
	t.Cleanup(func() { factorizeSym = saved })
	calls := 0
	factorizeSym = func(*mat.EigenSym, mat.Symmetric, bool) bool { calls++; return false }
	// 15 items: more than the exact DP takes, few enough for the dense
	// eigensolver.
	res, err := Solve(dgPath(t, 15), nil, Options{})
	if !errors.Is(err, errNoConvergence) || res != nil {
		t.Fatalf("Solve = %v, %v; want errNoConvergence", res, err)
	}
	if calls == 0 {
		t.Fatal("the dense eigensolver was not used")
	}
	if want := "solve: splitting a set of 15 super-nodes: the dense eigensolver did not converge"; err.Error() != want {
		t.Errorf("error %q, want %q", err, want)
	}
	factorizeSym = saved
	if _, err := Solve(dgPath(t, 15), nil, Options{}); err != nil {
		t.Fatalf("with the real eigensolver: %v", err)
	}
}
