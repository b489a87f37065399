package solve

// stablePartition reorders seg by key, as a counting sort does: first the
// elements whose key is 0, then those whose key is 1, and so on up to
// k−1, each group in its old order; elements whose key is negative are
// dropped. The kept elements fill the front of seg, and the returned
// counts (counts reused when it is large enough) hold each group's size.
// key is called once per element; scratch is grown as needed and reused
// between calls.
func stablePartition(seg []int32, k int, key func(int32) int32, scratch *[]int32, counts []int) []int {
	if cap(counts) < k {
		counts = make([]int, k)
	}
	counts = counts[:k]
	clear(counts)
	n := len(seg)
	*scratch = growInt32(*scratch, 2*n)
	keys, buf := (*scratch)[:n], (*scratch)[n:2*n]
	for i, x := range seg {
		kk := key(x)
		keys[i] = kk
		if kk >= 0 {
			counts[kk]++
		}
	}
	var small [8]int // room for the starts of a few groups without allocating
	var starts []int
	if k > len(small) {
		starts = make([]int, k)
	} else {
		starts = small[:k]
	}
	kept := 0
	for i, c := range counts {
		starts[i] = kept
		kept += c
	}
	for i, x := range seg {
		if kk := keys[i]; kk >= 0 {
			buf[starts[kk]] = x
			starts[kk]++
		}
	}
	copy(seg, buf[:kept])
	return counts
}
