package review

import (
	"bytes"
	"cmp"
	"crypto/sha256"
	"encoding/binary"
	"encoding/gob"
	"encoding/hex"
	"errors"
	"fmt"
	"hash"
	"io"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/graph"
)

// The committee is a pure function of what it is solved from: the views'
// graphs, the compiled constraints, the solve options, its size and seed,
// and the program that solves it. `review draw`, `review status` and
// `report --support` on the same taxonomy solve the same committee, which
// at 20,000 items takes most of a minute on two cores; the cache keeps the
// members of the last few committees so that the second of those commands
// reads them back instead. A hit gives exactly the trees a fresh solve
// would, because the key covers every input of the solve, the program's
// own bytes included, so outputs never depend on whether the cache was
// there.
//
// The cache lives in the user's cache folder, never in the repository: a
// pull request cannot plant members there. What is read back is checked to
// be well-formed trees over the right items before it is used, and any
// failure to read or write the cache only costs the solve it would have
// saved.

// cacheKeep is how many cached committees are kept; older ones are
// removed when a new one is written.
const cacheKeep = 8

// cacheMagic opens every cache file; a change to the file layout changes it.
const cacheMagic = "ramify committee cache 1\n"

// CommitteeCacheDir is the folder of the committee cache: the environment
// variable RAMIFY_CACHE when set ("off" turns the cache off), else
// ramify/committee under the user's cache folder (os.UserCacheDir); ""
// when there is none.
func CommitteeCacheDir() string {
	switch env := os.Getenv("RAMIFY_CACHE"); env {
	case "off":
		return ""
	case "":
	default:
		return env
	}
	dir, err := os.UserCacheDir()
	if err != nil || dir == "" {
		return ""
	}
	return filepath.Join(dir, "ramify", "committee")
}

// CachedViewCommittee is BuildViewCommittee with the committee cache in
// dir ("" turns the cache off): the members come from the cache when a
// committee with the same inputs was solved before, and are written to it
// otherwise.
func CachedViewCommittee(dir string, views []*graph.CSR, c *solve.Constraints, opt solve.Options, size int, seed uint64) (*Committee, error) {
	if dir == "" || len(views) == 0 || views[0] == nil {
		return BuildViewCommittee(views, c, opt, size, seed)
	}
	key, err := committeeKey(views, c, opt, size, seed)
	if err != nil {
		return BuildViewCommittee(views, c, opt, size, seed)
	}
	path := filepath.Join(dir, "committee-"+key+".bin")
	if com, ok := readCachedCommittee(path, views[0].N, size); ok {
		return com, nil
	}
	com, err := BuildViewCommittee(views, c, opt, size, seed)
	if err != nil {
		return nil, err
	}
	writeCachedCommittee(dir, path, com)
	return com, nil
}

// committeeKey hashes every input of the committee's solve, and the
// running program, into a file name.
func committeeKey(views []*graph.CSR, c *solve.Constraints, opt solve.Options, size int, seed uint64) (string, error) {
	h := sha256.New()
	io.WriteString(h, cacheMagic)
	if err := hashExecutable(h); err != nil {
		return "", err
	}
	fmt.Fprintf(h, "size %d seed %d min %d children %d depth %d\n", size, seed, opt.MinSize, opt.MaxChildren, opt.MaxDepth)
	for _, v := range views {
		fmt.Fprintf(h, "view %d %d\n", v.N, len(v.Targets))
		binary.Write(h, binary.LittleEndian, v.Offsets)
		binary.Write(h, binary.LittleEndian, v.Targets)
		for _, w := range v.Weights {
			binary.Write(h, binary.LittleEndian, math.Float64bits(w))
		}
	}
	if c != nil {
		fmt.Fprintf(h, "triplets %d\n", len(c.Triplets))
		for _, t := range c.Triplets {
			binary.Write(h, binary.LittleEndian, [4]int64{int64(t.A), int64(t.B), int64(t.C), int64(t.Record)})
		}
		fmt.Fprintf(h, "clusters %d\n", len(c.Clusters))
		for _, cl := range c.Clusters {
			fmt.Fprintf(h, "cluster %d %d\n", cl.Record, len(cl.Leaves))
			binary.Write(h, binary.LittleEndian, cl.Leaves)
		}
	}
	return hex.EncodeToString(h.Sum(nil)[:16]), nil
}

// hashExecutable writes the running program's bytes into h, so that a
// committee solved by one build is never read back by another.
func hashExecutable(h hash.Hash) error {
	exe, err := os.Executable()
	if err != nil {
		return err
	}
	f, err := os.Open(exe)
	if err != nil {
		return err
	}
	defer f.Close()
	_, err = io.Copy(h, f)
	return err
}

// cachedTree is one tree as the cache stores it.
type cachedTree struct {
	Root int32
	Kids [][]int32
}

type cachedCommittee struct {
	N      int
	Trees  []cachedTree
	Binary []cachedTree
}

// readCachedCommittee reads a committee of size trees over n items, or
// reports false when there is none or it is not well formed.
func readCachedCommittee(path string, n, size int) (*Committee, bool) {
	f, err := os.Open(path)
	if err != nil {
		return nil, false
	}
	defer f.Close()
	st, err := f.Stat()
	// Two trees per member, each at most 2n nodes: a bound on what a
	// genuine file can hold, so a damaged one cannot make the read grow.
	if err != nil || st.Size() > int64(size)*int64(n)*64+1<<20 {
		return nil, false
	}
	data, err := io.ReadAll(f)
	if err != nil || !bytes.HasPrefix(data, []byte(cacheMagic)) {
		return nil, false
	}
	var cc cachedCommittee
	if err := gob.NewDecoder(bytes.NewReader(data[len(cacheMagic):])).Decode(&cc); err != nil {
		return nil, false
	}
	if cc.N != n || len(cc.Trees) != size || len(cc.Binary) != size {
		return nil, false
	}
	trees, err := fromCached(n, cc.Trees)
	if err != nil {
		return nil, false
	}
	bin, err := fromCached(n, cc.Binary)
	if err != nil {
		return nil, false
	}
	return newCommittee(n, trees, bin), true
}

func fromCached(n int, ts []cachedTree) ([]*solve.Tree, error) {
	out := make([]*solve.Tree, len(ts))
	for i, ct := range ts {
		if err := checkCachedTree(n, ct); err != nil {
			return nil, err
		}
		out[i] = &solve.Tree{N: n, Kids: ct.Kids, Root: ct.Root}
	}
	return out, nil
}

// checkCachedTree makes sure a tree read back is a rooted tree over the
// leaves 0..n-1: leaves have no children, every other node has one parent,
// the root none, and every node hangs below the root.
func checkCachedTree(n int, ct cachedTree) error {
	nodes := len(ct.Kids)
	if nodes < n || ct.Root < 0 || int(ct.Root) >= nodes {
		return errors.New("bad node count or root")
	}
	parents := make([]int32, nodes)
	for v, kids := range ct.Kids {
		if v < n && len(kids) > 0 {
			return errors.New("a leaf with children")
		}
		for _, k := range kids {
			if k < 0 || int(k) >= nodes || int32(v) == k {
				return errors.New("a child out of range")
			}
			parents[k]++
		}
	}
	for v, p := range parents {
		if (int32(v) == ct.Root) != (p == 0) || p > 1 {
			return errors.New("a node without exactly one parent")
		}
	}
	// With one parent each, the nodes reachable from the root form a tree;
	// a cycle elsewhere would leave its nodes unreached.
	seen := 0
	stack := []int32{ct.Root}
	for len(stack) > 0 && seen <= nodes {
		v := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		seen++
		stack = append(stack, ct.Kids[v]...)
	}
	if seen != nodes {
		return errors.New("nodes not below the root")
	}
	return nil
}

// writeCachedCommittee stores com at path and keeps only the cacheKeep
// newest committees in dir. Failures are ignored: the cache only saves
// time.
func writeCachedCommittee(dir, path string, com *Committee) {
	cc := cachedCommittee{N: com.N}
	for _, t := range com.Trees {
		cc.Trees = append(cc.Trees, cachedTree{Root: t.Root, Kids: t.Kids})
	}
	for _, t := range com.Binary {
		cc.Binary = append(cc.Binary, cachedTree{Root: t.Root, Kids: t.Kids})
	}
	var buf bytes.Buffer
	buf.WriteString(cacheMagic)
	if err := gob.NewEncoder(&buf).Encode(cc); err != nil {
		return
	}
	if err := os.MkdirAll(dir, 0o700); err != nil {
		return
	}
	if err := format.WriteFileAtomic(path, buf.Bytes(), 0o600); err != nil {
		return
	}
	pruneCache(dir)
}

// pruneCache removes all but the cacheKeep newest committee files.
func pruneCache(dir string) {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return
	}
	type file struct {
		name string
		mod  int64
	}
	var files []file
	for _, e := range entries {
		if !e.Type().IsRegular() || !strings.HasPrefix(e.Name(), "committee-") || !strings.HasSuffix(e.Name(), ".bin") {
			continue
		}
		if info, err := e.Info(); err == nil {
			files = append(files, file{e.Name(), info.ModTime().UnixNano()})
		}
	}
	slices.SortFunc(files, func(a, b file) int {
		if c := cmp.Compare(b.mod, a.mod); c != 0 {
			return c
		}
		return strings.Compare(a.name, b.name)
	})
	for _, f := range files[min(len(files), cacheKeep):] {
		os.Remove(filepath.Join(dir, f.name))
	}
}
