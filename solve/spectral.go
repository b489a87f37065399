package solve

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	gonumlapack "gonum.org/v1/gonum/lapack/gonum"
	"gonum.org/v1/gonum/lapack/lapack64"
	"gonum.org/v1/gonum/mat"

	"github.com/ramify-tax/ramify/internal/splitmix"
	"github.com/ramify-tax/ramify/solve/graph"
)

// The spectral step relaxes "cut S where it is sparsest" to an eigenvector
// problem. For a graph with adjacency W, degrees D and Laplacian L = D − W,
// and a positive vertex measure b, it solves the generalised problem
//
//	L x = λ B x,   B = diag(b),   xᵀ B 1 = 0,
//
// whose second-smallest eigenpair is the Fiedler pair. With b = degrees this
// is the normalised Laplacian N = I − D^{-1/2} W D^{-1/2} (x = D^{-1/2} v for
// an eigenvector v of N); with b = unit masses it is the combinatorial L;
// with b = super-node masses it is the relaxation of uniform sparsity with
// masses that the constrained construction needs (supernodes.go's
// super-nodes: minimising xᵀLx/xᵀBx relaxes w(A,B)/(m(A)·m(B))).
// Internally everything works on the symmetric matrix A = B^{-1/2} L B^{-1/2},
// whose bottom eigenvector B^{1/2} 1 is known and deflated.

const (
	// denseEigenLimit: up to this many vertices the eigenproblem is solved
	// densely with gonum; beyond it, by Lanczos on the sparse graph.
	denseEigenLimit = 24
	// cutMaxSteps bounds the Krylov dimension (and its n×steps basis) in
	// the construction; on planted benchmarks 80 steps gave the same costs
	// after improvement at 1.5 times the time. fiedlerMaxSteps does so for
	// the exported Fiedler, which converges the eigenpair instead.
	cutMaxSteps     = 40
	fiedlerMaxSteps = 400
	// cutFirstCheck and cutCheckEvery: when Lanczos first, and then how
	// often, looks at its smallest Ritz pair; cutStallTol is the relative
	// change of the Ritz value below which the construction stops.
	cutFirstCheck = 10
	cutCheckEvery = 5
	cutStallTol   = 1e-3
)

// spectralWork holds the buffers of the eigen-solver so that the
// construction can reuse them across recursion sets.
type spectralWork struct {
	// basis is the Krylov basis in row-major n×stride layout (vertex r's
	// coordinates are contiguous): column 0 is the deflated vector
	// B^{1/2}1/‖·‖, columns 1.. the Lanczos vectors. Gram–Schmidt then
	// streams it once per pass.
	basis    []float64
	stride   int
	s        []float64 // B^{-1/2}
	w, out   []float64
	h, qj, y []float64
	qprev    []float64 // the Lanczos vector before qj
	helpers  helpers   // who may help with the large kernels
	diag     []float64 // A's diagonal
	offA     []float64 // A's off-diagonal entries, in g's layout
	alpha    []float64
	beta     []float64
	// maxSteps bounds the Krylov dimension of sparsestCut (0:
	// cutMaxSteps).
	maxSteps int
}

// setMeasure prepares B^{-1/2}.
func (sp *spectralWork) setMeasure(b []float64) {
	sp.s = grow(sp.s, len(b))
	for i, x := range b {
		sp.s[i] = 1 / math.Sqrt(x)
	}
}

// toX maps a unit eigenvector y of A to x = B^{-1/2} y (so xᵀBx = 1) with
// the canonical sign: the first entry that is not negligible is positive.
func (sp *spectralWork) toX(y []float64) []float64 {
	sp.out = grow(sp.out, len(y))
	x := sp.out
	maxAbs := 0.0
	for i := range x {
		x[i] = float64(y[i] * sp.s[i])
		maxAbs = math.Max(maxAbs, math.Abs(x[i]))
	}
	for i := range x {
		if math.Abs(x[i]) > 1e-9*maxAbs {
			if x[i] < 0 {
				for j := range x {
					x[j] = -x[j]
				}
			}
			break
		}
	}
	return x
}

// sparsestCut is what the construction asks of the spectral step: the
// sweep cut of the Fiedler vector of g under measure b, scored by ψ with
// masses mass (ties by ids). Lanczos does not run to convergence: it stops
// when the smallest Ritz value has stalled (moved by less than the share
// cutStallTol over cutCheckEvery steps), because the sweep's guarantee
// depends only on the Rayleigh quotient of the vector it sweeps (the sweep
// proof of Cheeger's inequality for graphs; see F. Chung, Spectral Graph
// Theory, AMS 1997). side[i] = 0
// marks the chosen prefix. The error is errNoConvergence's, from the dense
// or the tridiagonal eigensolver.
func (sp *spectralWork) sparsestCut(g *graph.CSR, deg, b, mass []float64, ids []int32, seed uint64, sw *sweepWork, side []int8) error {
	n := g.N
	sp.setMeasure(b)
	var y []float64
	if n <= denseEigenLimit {
		var err error
		if _, y, err = sp.denseFiedler(g, deg); err != nil {
			return err
		}
	} else {
		lastTheta := math.Inf(1)
		steps := cutMaxSteps
		if sp.maxSteps > 0 {
			steps = sp.maxSteps
		}
		err := sp.lanczos(g, deg, b, ids, seed, min(steps, n-1), func(theta float64, _ []float64, residual float64) bool {
			stop := lastTheta-theta <= cutStallTol*math.Abs(theta) || residual <= 1e-11
			lastTheta = theta
			return stop
		})
		if err != nil {
			return err
		}
		y = sp.y
	}
	order, k, _ := sw.sweep(g, sp.toX(y), mass, ids)
	for i := range side {
		side[i] = 1
	}
	for _, u := range order[:k] {
		side[u] = 0
	}
	return nil
}

// prepareA stores A = B^{-1/2} (D − W) B^{-1/2} for applyA: its diagonal
// and its off-diagonal entries in g's row layout.
func (sp *spectralWork) prepareA(g *graph.CSR, deg []float64) {
	sp.diag = grow(sp.diag, g.N)
	sp.offA = grow(sp.offA, len(g.Targets))
	for i := 0; i < g.N; i++ {
		si := sp.s[i]
		sp.diag[i] = float64(deg[i]*si) * si
		for k := g.Offsets[i]; k < g.Offsets[i+1]; k++ {
			sp.offA[k] = float64(g.Weights[k]*si) * sp.s[g.Targets[k]]
		}
	}
}

// applyA sets out = A y (prepareA must have run for g). Rows are
// independent, so large graphs split them across CPUs.
func (sp *spectralWork) applyA(g *graph.CSR, y, out []float64) {
	parallelSpans(g.N, sp.helpers.parts(len(g.Targets)), func(lo, hi int) {
		sp.applyARows(g, y, out, lo, hi)
	})
}

func (sp *spectralWork) applyARows(g *graph.CSR, y, out []float64, lo, hi int) {
	for i := lo; i < hi; i++ {
		lo, hi := g.Offsets[i], g.Offsets[i+1]
		acc := float64(sp.diag[i] * y[i])
		ts, ws := g.Targets[lo:hi], sp.offA[lo:hi]
		ws = ws[:len(ts)]
		for k, t := range ts {
			acc -= float64(ws[k] * y[t])
		}
		out[i] = acc
	}
}

// errNoConvergence is what a failed dense eigensolve returns. LAPACK's
// QR iteration for symmetric matrices (Dsteqr, which gonum's EigenSym
// runs) may in principle fail to converge within its bound of 30n
// iterations; on the small, finite, symmetric matrices built here it is
// not known to, so reaching this is a bug or a numerical fault to report,
// not a reason to stop the whole process.
var errNoConvergence = errors.New("the dense eigensolver did not converge")

// factorizeSym is EigenSym.Factorize; tests replace it to reach the
// failure path, which real inputs do not reach.
var factorizeSym = func(es *mat.EigenSym, a mat.Symmetric, vectors bool) bool { return es.Factorize(a, vectors) }

// denseFiedler solves the small problem densely: the second eigenpair of
// A, or errNoConvergence.
func (sp *spectralWork) denseFiedler(g *graph.CSR, deg []float64) (float64, []float64, error) {
	n := g.N
	a := mat.NewSymDense(n, nil)
	for i := 0; i < n; i++ {
		a.SetSym(i, i, float64(deg[i]*sp.s[i])*sp.s[i])
		ts, ws := g.Neighbors(i)
		for k, t := range ts {
			a.SetSym(i, int(t), -float64(ws[k]*sp.s[i])*sp.s[t])
		}
	}
	var es mat.EigenSym
	if !factorizeSym(&es, a, true) {
		return 0, nil, fmt.Errorf("solve: splitting a set of %d super-nodes: %w", n, errNoConvergence)
	}
	vals := es.Values(nil)
	var vecs mat.Dense
	es.VectorsTo(&vecs)
	sp.w = grow(sp.w, n)
	for i := 0; i < n; i++ {
		sp.w[i] = vecs.At(i, 1)
	}
	return vals[1], sp.w, nil
}

// startValue maps a vertex id to a deterministic pseudo-random number in
// [−1, 1) (SplitMix64 of the seeded id).
func startValue(seed uint64, id int32) float64 {
	x := splitmix.Mix((seed ^ (uint64(uint32(id)) * splitmix.Gamma)) + splitmix.Gamma)
	return float64(x>>11)/float64(1<<52) - 1
}

// axpy sets y += α x.
func axpy(alpha float64, x, y []float64) {
	for i := range y {
		y[i] += float64(alpha * x[i])
	}
}

func dot(a, b []float64) float64 {
	s := 0.0
	for i := range a {
		s += float64(a[i] * b[i])
	}
	return s
}

// setColumn sets basis column j to scale·src and keeps a contiguous copy
// of it in dst (nil: no copy), so the next step reads it without striding
// through the basis.
func (sp *spectralWork) setColumn(j int, src []float64, scale float64, dst []float64) {
	parallelSpans(len(src), sp.helpers.parts(len(src)), func(lo, hi int) {
		for r := lo; r < hi; r++ {
			v := float64(src[r] * scale)
			sp.basis[r*sp.stride+j] = v
			if dst != nil {
				dst[r] = v
			}
		}
	})
}

// orthogonalise removes from w its components along basis columns 0..j by
// classical Gram–Schmidt, repeated once when the first pass cancelled most
// of w (the criterion of Daniel, Gragg, Kaufman and Stewart: "twice is
// enough"). It returns ‖w‖ afterwards.
func (sp *spectralWork) orthogonalise(w []float64, j int) float64 {
	before := math.Sqrt(dot(w, w))
	after := before
	m := j + 1
	parts := sp.helpers.parts(len(w) * m)
	for pass := 0; pass < 2; pass++ {
		h := grow(sp.h, m)
		sp.h = h
		sp.project(w, h)
		// w −= Q h, row by row.
		parallelSpans(len(w), parts, func(lo, hi int) {
			sp.subtract(w, h[:m], lo, hi)
		})
		after = math.Sqrt(dot(w, w))
		if after > 0.7071*before {
			break
		}
		before = after
	}
	return after
}

// project sets h = Qᵀw over basis columns 0..len(h)−1, each sum taken
// over the rows in order. It streams the basis row by row, which keeps it
// at the speed of memory; it stays on one goroutine, because splitting the
// rows would change the order of the sums.
func (sp *spectralWork) project(w, h []float64) {
	for i := range h {
		h[i] = 0
	}
	stride := sp.stride
	for r, wr := range w {
		row := sp.basis[r*stride : r*stride+len(h) : r*stride+len(h)]
		hh := h[:len(row)]
		for i, q := range row {
			hh[i] += float64(q * wr)
		}
	}
}

// subtract sets w[r] −= (row r of the basis)·h for rows lo..hi−1.
func (sp *spectralWork) subtract(w, h []float64, lo, hi int) {
	stride := sp.stride
	for r := lo; r < hi; r++ {
		row := sp.basis[r*stride : r*stride+len(h) : r*stride+len(h)]
		hh := h[:len(row)]
		// Four partial sums in a fixed order: faster, still deterministic.
		var a0, a1, a2, a3 float64
		i := 0
		for ; i+4 <= len(row); i += 4 {
			a0 += float64(row[i] * hh[i])
			a1 += float64(row[i+1] * hh[i+1])
			a2 += float64(row[i+2] * hh[i+2])
			a3 += float64(row[i+3] * hh[i+3])
		}
		for ; i < len(row); i++ {
			a0 += float64(row[i] * hh[i])
		}
		w[r] -= (a0 + a1) + (a2 + a3)
	}
}

// lanczos runs the Lanczos iteration (C. Lanczos, J. Res. Nat. Bur.
// Standards 45, 1950) with full reorthogonalisation on A — each new vector
// is orthogonalised against the whole basis, since in floating point the
// three-term recurrence loses orthogonality as Ritz values converge (C. C.
// Paige, PhD thesis, University of London, 1971; G. H. Golub & C. F. Van
// Loan, Matrix Computations, 4th ed., 2013, ch. 10) — with its known
// bottom eigenvector B^{1/2}1 deflated, so that the smallest Ritz pair
// approximates (λ₂, y₂). At step cutFirstCheck, every cutCheckEvery steps
// after it and at the last step it hands the smallest Ritz pair (y of unit
// norm, owned by sp) and its residual norm to check, and stops when check
// returns true.
func (sp *spectralWork) lanczos(g *graph.CSR, deg, b []float64, ids []int32, seed uint64, maxSteps int, check func(theta float64, y []float64, residual float64) bool) error {
	n := g.N
	w, qj, qprev := sp.startLanczos(g, deg, b, ids, seed, maxSteps)
	steps := 0
	for j := 1; j <= maxSteps; j++ {
		// qj holds basis column j, qprev column j−1.
		sp.applyA(g, qj, w)
		a := dot(qj, w)
		sp.alpha = append(sp.alpha, a)
		// The three-term recurrence first, then full reorthogonalisation
		// against every earlier vector, which only has rounding to remove.
		axpy(-a, qj, w)
		if j > 1 {
			axpy(-sp.beta[j-2], qprev, w)
		}
		beta := sp.orthogonalise(w, j)
		steps = j
		last := beta <= 1e-12*math.Max(1, math.Abs(a)) || j == maxSteps
		if !last {
			sp.beta = append(sp.beta, beta)
			qj, qprev = qprev, qj
			sp.setColumn(j+1, w, 1/beta, qj)
		}
		due := j >= cutFirstCheck && (j-cutFirstCheck)%cutCheckEvery == 0
		if !due && !last {
			continue
		}
		theta, coef, err := tridiagSmallest(sp.alpha, sp.beta[:steps-1])
		if err != nil {
			return err
		}
		residual := 0.0
		if !last {
			residual = math.Abs(float64(beta * coef[steps-1]))
		}
		if check(theta, sp.ritzVector(n, steps, coef), residual) || last {
			break
		}
	}
	return nil
}

// startLanczos sizes the buffers for maxSteps steps, stores A, and writes
// the first two basis columns: the known bottom eigenvector B^{1/2}1 and
// the seeded start vector made orthogonal to it. It returns the work
// vector and the columns 1 and 0 as the recurrence reads them.
func (sp *spectralWork) startLanczos(g *graph.CSR, deg, b []float64, ids []int32, seed uint64, maxSteps int) (w, qj, qprev []float64) {
	n := g.N
	sp.stride = maxSteps + 1
	sp.basis = grow(sp.basis, n*sp.stride)
	sp.w = grow(sp.w, n)
	sp.qj = grow(sp.qj, n)
	sp.qprev = grow(sp.qprev, n)
	sp.y = grow(sp.y, n)
	sp.alpha = sp.alpha[:0]
	sp.beta = sp.beta[:0]
	sp.prepareA(g, deg)
	w, qj, qprev = sp.w, sp.qj, sp.qprev

	// Column 0: the known bottom eigenvector B^{1/2}1, normalised.
	total := 0.0
	for _, x := range b {
		total += x
	}
	for i := range w {
		w[i] = math.Sqrt(b[i] / total)
	}
	sp.setColumn(0, w, 1, nil)
	// Column 1: the seeded start vector, made orthogonal to column 0.
	for i := range w {
		w[i] = startValue(seed, ids[i])
	}
	nrm := sp.orthogonalise(w, 0)
	if !(nrm > 0) {
		for i := range w {
			w[i] = float64(i) - float64(n-1)/2
		}
		nrm = sp.orthogonalise(w, 0)
	}
	sp.setColumn(1, w, 1/nrm, qj)
	return w, qj, qprev
}

// ritzVector writes into sp.y the unit Ritz vector of the first steps
// basis columns (after column 0) with coefficients coef, and returns it.
func (sp *spectralWork) ritzVector(n, steps int, coef []float64) []float64 {
	y := sp.y
	parallelSpans(n, sp.helpers.parts(n*steps), func(lo, hi int) {
		for r := lo; r < hi; r++ {
			row := sp.basis[r*sp.stride+1 : r*sp.stride+1+steps]
			y[r] = dot(row, coef)
		}
	})
	nrm := math.Sqrt(dot(y, y))
	for i := range y {
		y[i] /= nrm
	}
	return y
}

// tridiagSmallest returns the smallest eigenpair of the symmetric
// tridiagonal matrix with diagonal a and off-diagonal e: the eigenvalue
// by gonum's root-free QL/QR iteration (LAPACK's dsterf: Golub & Van
// Loan, Matrix Computations, 4th ed., §8.3), its unit eigenvector by
// inverse iteration (tridiagVector). The eigenvalues only cost O(k²)
// where a full decomposition costs O(k³), which the many small cuts of a
// solve would feel. The routines are pure Go with a fixed order of
// operations, so the pair is the same on every run; the Ritz vector's
// sign is fixed by the caller.
func tridiagSmallest(a, e []float64) (float64, []float64, error) {
	d := append([]float64(nil), a...)
	off := append([]float64(nil), e...)
	if !(gonumlapack.Implementation{}).Dsterf(len(d), d, off) {
		// dsterf stops after 30k sweeps without convergence, which a
		// symmetric tridiagonal matrix of finite entries is not known to
		// reach (see errNoConvergence).
		return 0, nil, errNoConvergence
	}
	theta := d[0] // ascending
	return theta, tridiagVector(a, e, theta), nil
}

// tridiagVector returns the unit eigenvector of the tridiagonal matrix
// (a, e) for its eigenvalue theta, by inverse iteration with gonum's
// tridiagonal solver (lapack64.Gtsv, partial pivoting).
func tridiagVector(a, e []float64, theta float64) []float64 {
	k := len(a)
	v := make([]float64, k)
	for i := range v {
		v[i] = 1
	}
	if k == 1 {
		return v
	}
	scale := 0.0
	for _, x := range a {
		scale = math.Max(scale, math.Abs(x))
	}
	shift := theta - 1e-10*math.Max(scale, 1e-300)
	dl, d, du := make([]float64, k-1), make([]float64, k), make([]float64, k-1)
	for it := 0; it < 3; it++ {
		copy(dl, e)
		copy(du, e)
		for i := range d {
			d[i] = a[i] - shift
		}
		tri := lapack64.Tridiagonal{N: k, DL: dl, D: d, DU: du}
		if !lapack64.Gtsv(blas.NoTrans, tri, blas64.General{Rows: k, Cols: 1, Stride: 1, Data: v}) {
			shift -= 1e-8 * math.Max(scale, 1e-300)
			for i := range v {
				v[i] = 1
			}
			continue
		}
		nrm := math.Sqrt(dot(v, v))
		for i := range v {
			v[i] /= nrm
		}
	}
	return v
}

// sweepWork holds the sweep's buffers.
type sweepWork struct {
	order []int32
	rank  []int32
	deg   []float64
}

// sweep is SweepCut with caller-supplied tie-break ids; the returned order
// is owned by sw.
func (sw *sweepWork) sweep(g *graph.CSR, x, mass []float64, ids []int32) ([]int32, int, float64) {
	n := g.N
	if cap(sw.order) < n {
		sw.order = make([]int32, n)
		sw.rank = make([]int32, n)
	}
	sw.order = sw.order[:n]
	sw.rank = sw.rank[:n]
	sw.deg = grow(sw.deg, n)
	order := sw.order
	for i := range order {
		order[i] = int32(i)
	}
	sort.Slice(order, func(a, b int) bool {
		ua, ub := order[a], order[b]
		if x[ua] != x[ub] {
			return x[ua] < x[ub]
		}
		return ids[ua] < ids[ub]
	})
	totalMass := 0.0
	for r, v := range order {
		sw.rank[v] = int32(r)
		totalMass += mass[v]
		sw.deg[v] = g.Degree(int(v))
	}
	bestK, bestPsi := 1, math.Inf(1)
	cut, mA := 0.0, 0.0
	for r := 0; r < n-1; r++ {
		u := order[r]
		inside := 0.0
		ts, ws := g.Neighbors(int(u))
		for k, t := range ts {
			if sw.rank[t] < int32(r) {
				inside += ws[k]
			}
		}
		cut += sw.deg[u] - 2*inside
		if cut < 0 {
			cut = 0 // rounding: a cut weight is never negative
		}
		mA += mass[u]
		psi := cut / float64(mA*(totalMass-mA))
		if psi < bestPsi {
			bestPsi, bestK = psi, r+1
		}
	}
	return order, bestK, bestPsi
}
