package review

import "math"

// Votes tallies how the committee resolves the items a, b, c: the number
// of trees with each topology, indexed star, ab|c, ac|b, bc|a.
func (c *Committee) Votes(a, b, x int32) [4]int {
	var v [4]int
	for _, ix := range c.index {
		v[ix.topology(a, b, x)]++
	}
	return v
}

// VoteEntropy is the entropy, in nats, of a committee's votes (Dagan &
// Engelson's vote entropy): −Σ (v/B) ln(v/B) over the classes, B the
// number of votes. Unanimous votes give 0; votes spread evenly over k
// classes give ln k. No votes give 0.
func VoteEntropy(votes []int) float64 {
	total := 0
	for _, v := range votes {
		total += v
	}
	if total == 0 {
		return 0
	}
	h := 0.0
	for _, v := range votes {
		if v > 0 {
			p := float64(v) / float64(total)
			h -= float64(p * math.Log(p))
		}
	}
	return h + 0 // no negative zero
}

// MajorityDisagreement is the share of votes that do not go to the most
// popular class, 1 − max/B (D_maj of METHODS 8.3); 0 for no votes.
func MajorityDisagreement(votes []int) float64 {
	total, best := 0, 0
	for _, v := range votes {
		total += v
		best = max(best, v)
	}
	if total == 0 {
		return 0
	}
	return 1 - float64(best)/float64(total)
}

// Disagreement is the committee's vote entropy averaged over the triplets
// of items (METHODS 8.3: whole-packet votes saturate at ln B, triplets do
// not). Fewer than three items have no triplet and score 0.
func (c *Committee) Disagreement(items []int32) float64 {
	if len(items) < 3 {
		return 0
	}
	sum, count := 0.0, 0
	for i := 0; i < len(items); i++ {
		for j := i + 1; j < len(items); j++ {
			for k := j + 1; k < len(items); k++ {
				v := c.Votes(items[i], items[j], items[k])
				sum += VoteEntropy(v[:])
				count++
			}
		}
	}
	return sum / float64(count)
}
