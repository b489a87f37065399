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

// VoteEntropy is the entropy, in nats, of a committee's votes (the vote
// entropy of I. Dagan & S. P. Engelson, "Committee-based sampling for
// training probabilistic classifiers", ICML 1995): −Σ (v/B) ln(v/B) over
// the classes, B the number of votes. Unanimous votes give 0; votes spread
// evenly over k classes give ln k. No votes give 0.
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

// Disagreement is the committee's vote entropy averaged over the triplets
// of items. Votes on the whole restricted tree would not rank packets: a
// packet of 8 items has 135135 binary shapes alone, so B committee trees
// tend to cast B different votes and the entropy sits at ln B; votes
// per triplet fall into four classes and do not saturate. Fewer than three
// items have no triplet and score 0.
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
