package loop

import (
	"os"
	"path/filepath"
	"slices"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/review"
	"github.com/ramify-tax/ramify/solve"
)

// oraclePackets rewrites every pending open packet as one an oracle who
// knows the reference would draw: the items whose triples the current tree
// gets most wrong, grown greedily by the triples among them it gets wrong.
// It is the ceiling of packet choice: what the loop reaches when packets
// are as informative as they can be, so that what falls short of it is the
// repair's doing, not the drawing's.
func oraclePackets(dir string, p *repo.Repo, tree, ref *solve.Tree) error {
	files, err := filepath.Glob(filepath.Join(dir, review.OpenDir, "*.outline"))
	if err != nil {
		return err
	}
	slices.Sort(files)
	o := newOracle(tree, ref)
	for _, f := range files {
		data, err := os.ReadFile(f)
		if err != nil {
			return err
		}
		pk, err := format.ParsePacket(f, data)
		if err != nil {
			return err
		}
		if pk.Verdict != format.VerdictPending {
			continue
		}
		chosen := o.pick(pk.Size)
		if len(chosen) == 0 {
			break
		}
		ids := make([]string, len(chosen))
		for i, x := range chosen {
			ids[i] = p.Items[x].ID
		}
		pk.Tree = review.Restrict(p.Outline.Root, ids)
		pk.Size = len(ids)
		pk.Reason = format.ReasonUncertain
		// The file name carries the hash of the packet's items, which
		// absorb checks: the oracle's packet gets its own name.
		if err := os.Remove(f); err != nil {
			return err
		}
		name := review.PacketID(pk.Drawn, pk.From, ids) + ".outline"
		if err := os.WriteFile(filepath.Join(filepath.Dir(f), name), format.FormatPacket(pk), 0o644); err != nil {
			return err
		}
	}
	return nil
}

// oracle picks packets from what the tree gets wrong against the
// reference; used marks the items already in a packet of this round.
type oracle struct {
	n          int
	dRef, dNow []int16
	wrongWith  []int
	used       []bool
}

func newOracle(tree, ref *solve.Tree) *oracle {
	rc := compareTriples(ref, tree, tree)
	return &oracle{n: tree.N, dRef: lcaDepths(ref), dNow: lcaDepths(tree), wrongWith: rc.wrongWith, used: make([]bool, tree.N)}
}

// wrong reports whether the tree arranges the triple otherwise than the
// reference, which resolves it.
func (o *oracle) wrong(a, b, c int) bool {
	x := [3]int{a, b, c}
	slices.Sort(x[:])
	r := topology(o.dRef, o.n, x[0], x[1], x[2])
	return r != 0 && topology(o.dNow, o.n, x[0], x[1], x[2]) != r
}

// pick chooses up to size unused items: the one in the most wrong triples,
// then greedily the item with the most wrong triples among the chosen
// (ties: the most wrong triples with the first); none when every item is
// used.
func (o *oracle) pick(size int) []int {
	n := o.n
	seed := -1
	for x := 0; x < n; x++ {
		if !o.used[x] && (seed < 0 || o.wrongWith[x] > o.wrongWith[seed]) {
			seed = x
		}
	}
	if seed < 0 {
		return nil
	}
	// pair[y]: the wrong triples holding both the seed and y, which
	// orders candidates before any triple lies inside the packet.
	pair := make([]int, n)
	for y := 0; y < n; y++ {
		if y == seed {
			continue
		}
		for z := 0; z < n; z++ {
			if z != seed && z != y && o.wrong(seed, y, z) {
				pair[y]++
			}
		}
	}
	chosen := []int{seed}
	o.used[seed] = true
	for len(chosen) < size {
		best, bestScore := -1, [2]int{-1, -1}
		for y := 0; y < n; y++ {
			if o.used[y] {
				continue
			}
			inside := 0
			for i := range chosen {
				for j := i + 1; j < len(chosen); j++ {
					if o.wrong(chosen[i], chosen[j], y) {
						inside++
					}
				}
			}
			s := [2]int{inside, pair[y]}
			if s[0] > bestScore[0] || (s[0] == bestScore[0] && s[1] > bestScore[1]) {
				best, bestScore = y, s
			}
		}
		if best < 0 {
			break
		}
		chosen = append(chosen, best)
		o.used[best] = true
	}
	return chosen
}
