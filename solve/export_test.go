package solve

import (
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/ramify-tax/ramify/solve/graph"
)

// The spectral step's pieces that only tests call: the exact Fiedler pair
// (the construction stops Lanczos early, see sparsestCut), all Laplacian
// eigenvalues, and the sweep over a given vector.

// Fiedler returns the second-smallest eigenvalue λ₂ of L x = λ B x on g and
// its eigenvector x, scaled so that xᵀBx = 1, with a canonical sign (the
// first entry that is not negligibly small is positive). mass gives b; nil
// means the weighted degrees (the normalised Laplacian). A disconnected
// graph (or one with isolated vertices) has λ₂ = 0: the vector then
// separates the component of vertex 0 from the rest, and no NaN arises.
// seed fixes the Lanczos start vector.
func Fiedler(g *graph.CSR, mass []float64, seed uint64) (float64, []float64) {
	n := g.N
	if n < 2 {
		return 0, make([]float64, n)
	}
	deg := make([]float64, n)
	for v := 0; v < n; v++ {
		deg[v] = g.Degree(v)
	}
	b := mass
	if b == nil {
		b = deg
	}
	comp, ncomp := components(g)
	if ncomp > 1 {
		return 0, componentVector(comp, b)
	}
	for _, x := range b {
		if !(x > 0) {
			panic("solve: Fiedler needs positive vertex masses")
		}
	}
	ids := make([]int32, n)
	for i := range ids {
		ids[i] = int32(i)
	}
	var sp spectralWork
	lambda, x := sp.fiedler(g, deg, b, ids, seed)
	return lambda, append([]float64(nil), x...)
}

// LaplacianEigenvalues returns all eigenvalues, ascending, of the
// combinatorial Laplacian D − W of g, or of the normalised Laplacian
// I − D^{-1/2} W D^{-1/2} when normalized is set (an isolated vertex
// contributes the eigenvalue 0 there). Dense: meant for small graphs.
func LaplacianEigenvalues(g *graph.CSR, normalized bool) []float64 {
	n := g.N
	deg := make([]float64, n)
	for v := 0; v < n; v++ {
		deg[v] = g.Degree(v)
	}
	a := mat.NewSymDense(n, nil)
	for v := 0; v < n; v++ {
		ts, ws := g.Neighbors(v)
		if normalized {
			if deg[v] > 0 {
				a.SetSym(v, v, 1)
			}
			for k, t := range ts {
				a.SetSym(v, int(t), -ws[k]/math.Sqrt(float64(deg[v]*deg[t])))
			}
			continue
		}
		a.SetSym(v, v, deg[v])
		for k, t := range ts {
			a.SetSym(v, int(t), -ws[k])
		}
	}
	var es mat.EigenSym
	if !factorizeSym(&es, a, false) {
		panic(errNoConvergence) // test code: a failure fails the test
	}
	return es.Values(nil)
}

// components labels the connected components of g in order of their
// smallest vertex.
func components(g *graph.CSR) ([]int32, int) {
	comp := make([]int32, g.N)
	for i := range comp {
		comp[i] = -1
	}
	var queue []int32
	nc := int32(0)
	for s := 0; s < g.N; s++ {
		if comp[s] >= 0 {
			continue
		}
		comp[s] = nc
		queue = append(queue[:0], int32(s))
		for len(queue) > 0 {
			u := queue[len(queue)-1]
			queue = queue[:len(queue)-1]
			ts, _ := g.Neighbors(int(u))
			for _, t := range ts {
				if comp[t] < 0 {
					comp[t] = nc
					queue = append(queue, t)
				}
			}
		}
		nc++
	}
	return comp, int(nc)
}

// componentVector is the λ = 0 "Fiedler vector" of a disconnected graph:
// constant on the component of vertex 0 and on the rest, B-orthogonal to 1,
// unit B-norm. Vertices with b ≤ 0 (isolated ones under degree masses)
// count with mass 1 so that the scale stays finite.
func componentVector(comp []int32, b []float64) []float64 {
	bb := func(i int) float64 {
		if b[i] > 0 {
			return b[i]
		}
		return 1
	}
	var m0, m1 float64
	for i := range comp {
		if comp[i] == 0 {
			m0 += bb(i)
		} else {
			m1 += bb(i)
		}
	}
	// x = α on component 0, −β elsewhere with α m0 = β m1 and
	// α² m0 + β² m1 = 1.
	alpha := math.Sqrt(m1 / (m0 * (m0 + m1)))
	beta := float64(alpha*m0) / m1
	x := make([]float64, len(comp))
	for i := range comp {
		if comp[i] == 0 {
			x[i] = alpha
		} else {
			x[i] = -beta
		}
	}
	return x
}

// fiedler solves the generalised problem on a connected graph g with
// degrees deg and positive measure b to full accuracy (up to
// fiedlerMaxSteps Lanczos steps). ids name the vertices for the start
// vector, so a vertex's start value does not depend on its position. The
// returned slice is owned by sp.
func (sp *spectralWork) fiedler(g *graph.CSR, deg, b []float64, ids []int32, seed uint64) (float64, []float64) {
	n := g.N
	sp.setMeasure(b)
	if n <= denseEigenLimit {
		lambda, y, err := sp.denseFiedler(g, deg)
		if err != nil {
			panic(err) // test code: a failure fails the test
		}
		return lambda, sp.toX(y)
	}
	var lambda float64
	var y []float64
	sp.lanczos(g, deg, b, ids, seed, min(fiedlerMaxSteps, n-1), func(theta float64, v []float64, residual float64) bool {
		lambda, y = theta, v
		return residual <= 1e-11*math.Max(1, math.Abs(theta))
	})
	return lambda, sp.toX(y)
}

// SweepCut orders the vertices of g by x (ties by vertex id) and returns
// that order and the prefix length k (1 ≤ k < n) whose set A = order[:k]
// minimises the uniform sparsity with masses
//
//	ψ(A, B) = w(A, B) / (m(A) · m(B)),
//
// together with that ψ (ties go to the smallest k). mass nil
// means unit masses. n must be at least 2.
func SweepCut(g *graph.CSR, x, mass []float64) ([]int32, int, float64) {
	ids := make([]int32, g.N)
	for i := range ids {
		ids[i] = int32(i)
	}
	m := mass
	if m == nil {
		m = make([]float64, g.N)
		for i := range m {
			m[i] = 1
		}
	}
	var sw sweepWork
	order, k, psi := sw.sweep(g, x, m, ids)
	return append([]int32(nil), order...), k, psi
}
