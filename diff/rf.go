package diff

import (
	"math/rand/v2"

	"github.com/ramify-tax/ramify/solve/hier"
)

// clusterSet lists a tree's distinct non-trivial clusters (leaf sets of
// 2..n−1 leaves) by one node each, with a hash of each node's leaf set.
type clusterSet struct {
	nodes []int32
	hash  []uint64 // indexed by node
}

// rfKeySeed seeds the per-leaf random keys whose XOR hashes a cluster.
// Equal sets always hash alike; a collision of unequal sets is caught by
// the exact set comparison, so the seed changes only speed, never results.
const rfKeySeed = 0x52462d6b657973 // "RF-keys"

func leafKeys(n int) []uint64 {
	rng := rand.New(rand.NewPCG(rfKeySeed, uint64(n)))
	keys := make([]uint64, n)
	for i := range keys {
		keys[i] = rng.Uint64()
	}
	return keys
}

// clusters hashes every node bottom-up (XOR of its children) and keeps one
// node per distinct non-trivial leaf set. A chain of single-child nodes
// shares one leaf set; only its lowest node is kept.
func clusters(t *hier.Tree, x treeIndex, keys []uint64) clusterSet {
	cs := clusterSet{hash: make([]uint64, len(t.Kids))}
	for _, v := range x.Post {
		if int(v) < x.N {
			cs.hash[v] = keys[v]
			continue
		}
		h := uint64(0)
		for _, c := range t.Kids[v] {
			h ^= cs.hash[c]
		}
		cs.hash[v] = h
		s := x.Size(v)
		if s < 2 || int(s) >= x.N {
			continue
		}
		if kids := t.Kids[v]; len(kids) == 1 && x.Size(kids[0]) == s {
			continue
		}
		cs.nodes = append(cs.nodes, v)
	}
	return cs
}

// rfCounts returns the numbers of distinct non-trivial clusters of a and
// b and how many they share. A cluster of a is looked up by hash among b's;
// a candidate v is confirmed exactly: the leaves of u, as positions in b's
// leaf order, all fall in v's range and the sizes agree, so the sets are
// equal (positions are distinct). The positions' minimum and maximum per
// node of a are computed bottom-up, so confirmation costs O(1).
func rfCounts(a, b *hier.Tree, x, y treeIndex) (na, nb, shared int) {
	keys := leafKeys(x.N)
	ca, cb := clusters(a, x, keys), clusters(b, y, keys)
	byHash := make(map[uint64][]int32, len(cb.nodes))
	for _, v := range cb.nodes {
		byHash[cb.hash[v]] = append(byHash[cb.hash[v]], v)
	}
	minPos := make([]int32, len(a.Kids))
	maxPos := make([]int32, len(a.Kids))
	for _, u := range x.Post {
		if int(u) < x.N {
			minPos[u], maxPos[u] = y.Pos[u], y.Pos[u]
			continue
		}
		lo, hi := int32(len(y.Pos)), int32(-1)
		for _, c := range a.Kids[u] {
			lo, hi = min(lo, minPos[c]), max(hi, maxPos[c])
		}
		minPos[u], maxPos[u] = lo, hi
	}
	for _, u := range ca.nodes {
		for _, v := range byHash[ca.hash[u]] {
			if x.Size(u) == y.Size(v) && minPos[u] >= y.Lo[v] && maxPos[u] < y.Hi[v] {
				shared++
				break
			}
		}
	}
	return len(ca.nodes), len(cb.nodes), shared
}
