package main

import (
	"encoding/binary"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
	"time"

	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/graph"
	"github.com/ramify-tax/ramify/solve/planted"
)

// The peer mode puts ramify beside fastcluster (Müllner, "fastcluster:
// Fast hierarchical, agglomerative clustering routines for R and Python",
// J. Stat. Softw. 53(9), 2013) on the same planted points: its average
// linkage on all pairwise Euclidean distances, and linkage_vector Ward,
// which needs only O(N·d) memory. ramify clusters the kNN cosine graph of
// the points, as `ramify solve` does for a vectors source. Each run is a
// child process of its own, so its time and peak memory are its alone.
// The peers run under Debian's python3 with python3-fastcluster; when that
// is missing their columns say so and the rest of the table stands.

// debianPython is the interpreter the Debian packages install into.
const debianPython = "/usr/bin/python3"

// peerScript reads n×d float64 points (little-endian) from argv[1], runs
// the method in argv[4], writes the (n−1)×4 linkage matrix to argv[2] and
// prints its time and the process's peak memory.
const peerScript = `
import json, resource, sys, time
import numpy, fastcluster
src, dst, n, d, method = sys.argv[1], sys.argv[2], int(sys.argv[3]), int(sys.argv[4]), sys.argv[5]
x = numpy.fromfile(src, dtype="<f8").reshape(n, d)
t0 = time.perf_counter()
if method == "average":
    z = fastcluster.linkage(x, method="average", metric="euclidean")
else:
    z = fastcluster.linkage_vector(x, method="ward", metric="euclidean")
sec = time.perf_counter() - t0
numpy.ascontiguousarray(z, dtype="<f8").tofile(dst)
print(json.dumps({"seconds": sec, "peak_kb": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss, "version": fastcluster.__version__}))
`

// peerAvailable reports whether the Debian interpreter can import
// fastcluster, and its version.
func peerAvailable() (string, bool) {
	out, err := exec.Command(debianPython, "-c", "import numpy, fastcluster; print(fastcluster.__version__)").Output()
	if err != nil {
		return "", false
	}
	return strings.TrimSpace(string(out)), true
}

// peerRow measures one size: ramify in a child process, then each peer.
func peerRow(self string, n int, seed uint64, avgMax int, have bool) (string, error) {
	out, err := exec.Command(self, "-peer-one", strconv.Itoa(n), "-seed", strconv.FormatUint(seed, 10)).Output()
	if err != nil {
		return "", fmt.Errorf("ramify at n=%d: %w", n, err)
	}
	var mine peerResult
	if err := json.Unmarshal(out, &mine); err != nil {
		return "", err
	}
	cells := []string{strconv.Itoa(n), fmt.Sprintf("%.2f", mine.Seconds), fmt.Sprintf("%.0f", mine.PeakKB/1024), mine.Agreement}
	inst := planted.Generate(seed, n, 4, levelsFor(n))
	for _, method := range []string{"ward", "average"} {
		switch {
		case !have:
			cells = append(cells, "not installed", "", "")
			continue
		case method == "average" && n > avgMax:
			gib := float64(n) * float64(n-1) / 2 * 8 / (1 << 30)
			cells = append(cells, fmt.Sprintf("skipped (%.1f GiB of distances)", gib), "", "")
			continue
		}
		r, err := runPeer(inst, method)
		if err != nil {
			return "", fmt.Errorf("fastcluster %s at n=%d: %w", method, n, err)
		}
		cells = append(cells, fmt.Sprintf("%.2f", r.Seconds), fmt.Sprintf("%.0f", r.PeakKB/1024), r.Agreement)
	}
	ratio := ""
	if have {
		if w, err := strconv.ParseFloat(cells[4], 64); err == nil && w > 0 {
			ratio = fmt.Sprintf("%.2f", mine.Seconds/w)
		}
	}
	cells = append(cells, ratio)
	return "| " + strings.Join(cells, " | ") + " |", nil
}

type peerResult struct {
	Seconds   float64 `json:"seconds"`
	PeakKB    float64 `json:"peak_kb"`
	Agreement string  `json:"agreement"`
}

// measurePeerOne is the child run of ramify: the kNN graph of the points
// and the constrained solve, timed together.
func measurePeerOne(n int, seed uint64) (string, error) {
	inst := planted.Generate(seed, n, 4, levelsFor(n))
	values := flatten(inst.Vectors)
	start := time.Now()
	g, err := graph.Builder{K: 15, Seed: graph.DefaultSeed, FarPartners: graph.DefaultFarPartners}.Vectors(values, n, planted.Dim, graph.Cosine)
	if err != nil {
		return "", err
	}
	res, err := solve.Solve(g, nil, plantedOptions(inst))
	if err != nil {
		return "", err
	}
	sec := time.Since(start).Seconds()
	var ru syscall.Rusage
	syscall.Getrusage(syscall.RUSAGE_SELF, &ru)
	b, err := json.Marshal(peerResult{Seconds: sec, PeakKB: float64(ru.Maxrss), Agreement: agreement(res.Taxonomy, inst.Tree)})
	return string(b), err
}

func runPeer(inst *planted.Instance, method string) (peerResult, error) {
	dir, err := os.MkdirTemp("", "solvebench-peer")
	if err != nil {
		return peerResult{}, err
	}
	defer os.RemoveAll(dir)
	src, dst := filepath.Join(dir, "points.f64"), filepath.Join(dir, "linkage.f64")
	values := flatten(inst.Vectors)
	buf := make([]byte, 8*len(values))
	for i, v := range values {
		binary.LittleEndian.PutUint64(buf[8*i:], math.Float64bits(v))
	}
	if err := os.WriteFile(src, buf, 0o600); err != nil {
		return peerResult{}, err
	}
	out, err := exec.Command(debianPython, "-c", peerScript, src, dst, strconv.Itoa(inst.N), strconv.Itoa(planted.Dim), method).Output()
	if err != nil {
		return peerResult{}, err
	}
	var r peerResult
	if err := json.Unmarshal(out, &r); err != nil {
		return peerResult{}, err
	}
	z, err := os.ReadFile(dst)
	if err != nil {
		return peerResult{}, err
	}
	t, err := linkageTree(inst.N, z)
	if err != nil {
		return peerResult{}, err
	}
	r.Agreement = agreement(t, inst.Tree)
	return r, nil
}

// linkageTree turns an (n−1)×4 linkage matrix (row k merges clusters
// Z[k,0] and Z[k,1]; ids below n are points, n+j the cluster of row j)
// into a binary tree.
func linkageTree(n int, z []byte) (*solve.Tree, error) {
	if len(z) != (n-1)*4*8 {
		return nil, errors.New("linkage matrix has the wrong size")
	}
	at := func(k, c int) float64 { return math.Float64frombits(binary.LittleEndian.Uint64(z[8*(4*k+c):])) }
	t := solve.NewTree(n)
	node := make([]int32, 2*n-1)
	for i := 0; i < n; i++ {
		node[i] = int32(i)
	}
	for k := 0; k < n-1; k++ {
		a, b := int(at(k, 0)), int(at(k, 1))
		if a < 0 || b < 0 || a >= n+k || b >= n+k || a == b {
			return nil, fmt.Errorf("linkage row %d merges %d and %d", k, a, b)
		}
		node[n+k] = t.Add(node[a], node[b])
	}
	return t, nil
}

func flatten(rows [][]float64) []float64 {
	out := make([]float64, 0, len(rows)*planted.Dim)
	for _, r := range rows {
		out = append(out, r...)
	}
	return out
}

// agreement is rooted triplet agreement with the planted tree, sampled
// above 3,000 items.
func agreement(t, planted *solve.Tree) string {
	if t.N <= 3000 {
		return fmt.Sprintf("%.4f (exact)", diff.TripletAgreement(t, planted))
	}
	est, lo, hi := diff.TripletAgreementSampled(t, planted, 200000, 1)
	return fmt.Sprintf("%.4f [%.4f, %.4f] (sampled)", est, lo, hi)
}
