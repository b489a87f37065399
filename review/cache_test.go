package review

import (
	"os"
	"path/filepath"
	"slices"
	"testing"

	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/graph"
	"github.com/ramify-tax/ramify/solve/planted"
)

func cacheFiles(t *testing.T, dir string) []string {
	t.Helper()
	names, err := filepath.Glob(filepath.Join(dir, "committee-*.bin"))
	if err != nil {
		t.Fatal(err)
	}
	return names
}

func sameMembers(t *testing.T, what string, got, want *Committee) {
	t.Helper()
	for b := range want.Trees {
		for _, pair := range [][2]*solve.Tree{{got.Trees[b], want.Trees[b]}, {got.Binary[b], want.Binary[b]}} {
			x, y := pair[0], pair[1]
			if x.N != y.N || x.Root != y.Root || !slices.EqualFunc(x.Kids, y.Kids, slices.Equal[[]int32]) {
				t.Fatalf("%s: member %d differs from a fresh solve", what, b)
			}
		}
	}
}

// A committee read back from the cache is the committee a fresh solve
// gives, member for member; other inputs miss the cache; a damaged file is
// solved again, never used.
func TestCommitteeCacheGivesTheFreshCommittee(t *testing.T) {
	dir := t.TempDir()
	in := planted.Generate(3, 240, 3, 2)
	views := []*graph.CSR{in.Graph}
	c := &solve.Constraints{Triplets: []solve.Triplet{{A: 0, B: 1, C: 2}}}
	fresh, err := BuildViewCommittee(views, c, testOptions, 4, 9)
	if err != nil {
		t.Fatal(err)
	}
	first, err := CachedViewCommittee(dir, views, c, testOptions, 4, 9)
	if err != nil {
		t.Fatal(err)
	}
	sameMembers(t, "first call", first, fresh)
	files := cacheFiles(t, dir)
	if len(files) != 1 {
		t.Fatalf("cache holds %d files after one committee, want 1", len(files))
	}
	again, err := CachedViewCommittee(dir, views, c, testOptions, 4, 9)
	if err != nil {
		t.Fatal(err)
	}
	sameMembers(t, "read back", again, fresh)

	// Another record, another seed, other options: each its own entry.
	other := &solve.Constraints{Triplets: []solve.Triplet{{A: 0, B: 2, C: 1}}}
	if _, err := CachedViewCommittee(dir, views, other, testOptions, 4, 9); err != nil {
		t.Fatal(err)
	}
	if _, err := CachedViewCommittee(dir, views, c, testOptions, 4, 10); err != nil {
		t.Fatal(err)
	}
	opt := testOptions
	opt.MinSize = 4
	if _, err := CachedViewCommittee(dir, views, c, opt, 4, 9); err != nil {
		t.Fatal(err)
	}
	if n := len(cacheFiles(t, dir)); n != 4 {
		t.Fatalf("cache holds %d files after four different committees, want 4", n)
	}

	// Damage: a leaf given a child; then bytes cut off.
	cc, ok := readCachedCommittee(files[0], in.N, 4)
	if !ok {
		t.Fatal("the cached committee does not read back")
	}
	var damaged cachedCommittee
	damaged.N = cc.N
	for b := range cc.Trees {
		damaged.Trees = append(damaged.Trees, cachedTree{Root: cc.Trees[b].Root, Kids: cc.Trees[b].Kids})
		damaged.Binary = append(damaged.Binary, cachedTree{Root: cc.Binary[b].Root, Kids: cc.Binary[b].Kids})
	}
	damaged.Trees[0].Kids = slices.Clone(damaged.Trees[0].Kids)
	damaged.Trees[0].Kids[5] = []int32{6}
	writeCachedCommitteeData(t, files[0], damaged)
	got, err := CachedViewCommittee(dir, views, c, testOptions, 4, 9)
	if err != nil {
		t.Fatal(err)
	}
	sameMembers(t, "after damage", got, fresh)
	data, err := os.ReadFile(files[0])
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(files[0], data[:len(data)/2], 0o600); err != nil {
		t.Fatal(err)
	}
	got, err = CachedViewCommittee(dir, views, c, testOptions, 4, 9)
	if err != nil {
		t.Fatal(err)
	}
	sameMembers(t, "after truncation", got, fresh)
}

func writeCachedCommitteeData(t *testing.T, path string, cc cachedCommittee) {
	t.Helper()
	com := &Committee{N: cc.N}
	for b := range cc.Trees {
		com.Trees = append(com.Trees, &solve.Tree{N: cc.N, Root: cc.Trees[b].Root, Kids: cc.Trees[b].Kids})
		com.Binary = append(com.Binary, &solve.Tree{N: cc.N, Root: cc.Binary[b].Root, Kids: cc.Binary[b].Kids})
	}
	writeCachedCommittee(filepath.Dir(path), path, com)
	if _, ok := readCachedCommittee(path, cc.N, len(cc.Trees)); ok {
		t.Fatal("a damaged committee reads back as valid")
	}
}

func TestCheckCachedTree(t *testing.T) {
	// Leaves 0..2, internal 3 = (0,1), root 4 = (3,2).
	good := cachedTree{Root: 4, Kids: [][]int32{nil, nil, nil, {0, 1}, {3, 2}}}
	if err := checkCachedTree(3, good); err != nil {
		t.Fatalf("a good tree is refused: %v", err)
	}
	for name, bad := range map[string]cachedTree{
		"leaf with a child":      {Root: 4, Kids: [][]int32{{1}, nil, nil, {0, 1}, {3, 2}}},
		"two parents":            {Root: 4, Kids: [][]int32{nil, nil, nil, {0, 1}, {3, 2, 1}}},
		"a leaf missing":         {Root: 4, Kids: [][]int32{nil, nil, nil, {0, 1}, {3}}},
		"a cycle off the root":   {Root: 5, Kids: [][]int32{nil, nil, nil, {0, 4}, {3, 1}, {2}}},
		"child out of range":     {Root: 4, Kids: [][]int32{nil, nil, nil, {0, 1}, {3, 9}}},
		"root out of range":      {Root: 7, Kids: [][]int32{nil, nil, nil, {0, 1}, {3, 2}}},
		"fewer nodes than items": {Root: 1, Kids: [][]int32{nil, {0}}},
	} {
		if err := checkCachedTree(3, bad); err == nil {
			t.Errorf("%s: accepted", name)
		}
	}
}

// The cache keeps the newest cacheKeep committees.
func TestCommitteeCacheKeepsTheNewest(t *testing.T) {
	dir := t.TempDir()
	in := planted.Generate(4, 60, 3, 1)
	views := []*graph.CSR{in.Graph}
	for seed := range uint64(cacheKeep + 3) {
		if _, err := CachedViewCommittee(dir, views, nil, testOptions, 2, seed); err != nil {
			t.Fatal(err)
		}
	}
	if n := len(cacheFiles(t, dir)); n != cacheKeep {
		t.Errorf("cache holds %d committees, want %d", n, cacheKeep)
	}
}
