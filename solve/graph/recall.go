package graph

// Recall is the share of exact's edges that approx also has: the edge
// recall of an approximate kNN graph against the exact one on the same
// items. Where several items tie for the last neighbour slot the two graphs
// may keep different but equally good ones, which counts as a miss here, so
// this is a lower bound on the usual (tie-aware) neighbour recall. A graph
// without edges is fully recalled by anything. Only vertices present in both
// graphs are compared.
func Recall(approx, exact *CSR) float64 {
	found, total := 0, 0
	for u := 0; u < min(approx.N, exact.N); u++ {
		et, _ := exact.Neighbors(u)
		at, _ := approx.Neighbors(u)
		p := 0
		for _, t := range et {
			if int(t) <= u {
				continue
			}
			total++
			for p < len(at) && at[p] < t {
				p++
			}
			if p < len(at) && at[p] == t {
				found++
			}
		}
	}
	if total == 0 {
		return 1
	}
	return float64(found) / float64(total)
}

// listRecall is the tie-aware neighbour recall of approximate lists against
// exact ones (rows best first, scores from the same function): for each row
// with exact neighbours, the approximate entries scoring at least as well as
// the exact list's last entry, at most as many as the exact list holds,
// over the exact list's length. approxRow maps a row of exact to the row of
// approx for the same item (exact may cover a sample of the items).
func listRecall(approx, exact *neighborLists, approxRow func(r int) int) float64 {
	hits, total := 0, 0
	for r := 0; r < exact.n; r++ {
		_, es := exact.row(r)
		if len(es) == 0 {
			continue
		}
		tau := es[len(es)-1]
		_, as := approx.row(approxRow(r))
		h := 0
		for _, s := range as {
			if s >= tau {
				h++
			}
		}
		hits += min(h, len(es))
		total += len(es)
	}
	if total == 0 {
		return 1
	}
	return float64(hits) / float64(total)
}
