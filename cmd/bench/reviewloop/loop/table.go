package loop

import (
	"fmt"
	"io"
	"math"
	"slices"
)

// Result is one run of the loop with what identifies it.
type Result struct {
	Set, Arm string
	Order    int
	Rounds   []Round
}

// PrintRounds writes the per-round table of every result.
func PrintRounds(w io.Writer, results []Result) {
	fmt.Fprintf(w, "%-10s %-7s %5s %5s %7s %5s %8s %6s %9s %7s %7s %8s %7s %6s\n",
		"set", "arm", "order", "round", "packets", "fixed", "resolved", "wrong", "precision", "recall", "F1", "repaired", "broken", "AUC")
	for _, r := range results {
		for _, x := range r.Rounds {
			fmt.Fprintf(w, "%-10s %-7s %5d %5d %7d %5d %8.1f %6.1f %9.4f %7.4f %7.4f %8d %7d %6.3f\n",
				r.Set, r.Arm, r.Order, x.Round, x.Packets, x.Fixed, x.Resolved, x.Wrong, x.Precision, x.Recall, x.F1, x.Repaired, x.Broken, x.AUC)
		}
	}
}

// Summary is what the targets are judged on, for one set and arm (means
// over item orders) or over every set.
type Summary struct {
	Set, Arm string
	// NotFalling is the share of rounds whose F1 is not below the round
	// before's.
	NotFalling           float64
	Repaired             float64 // triples repaired per order, summed over rounds
	Broken               float64
	F1At                 map[int]float64 // F1 after k packets, by k (rounded down to a round)
	FinalRecall, FinalF1 float64
	AUC                  float64 // mean over rounds
	Resolved             float64 // triples resolved per packet, mean over rounds
	Wrong                float64 // of those, drawn wrong per packet, mean over rounds
	// PacketsToReach is the first packet count at which this arm's F1
	// reaches Target (the other arm's final F1); -1 if never.
	PacketsToReach float64
}

// Summarize folds the results of one set and arm over their orders.
func Summarize(results []Result, set, arm string) Summary {
	s := Summary{Set: set, Arm: arm, F1At: map[int]float64{}}
	rounds, notFalling, runs, aucs := 0, 0, 0, 0
	for _, r := range results {
		if r.Set != set || r.Arm != arm {
			continue
		}
		runs++
		for i, x := range r.Rounds {
			if i > 0 {
				rounds++
				if x.F1 >= r.Rounds[i-1].F1 {
					notFalling++
				}
				s.Repaired += float64(x.Repaired)
				s.Broken += float64(x.Broken)
				s.Resolved += x.Resolved
				s.Wrong += x.Wrong
			}
			s.AUC += x.AUC
			aucs++
			s.F1At[x.Packets] += x.F1
		}
		last := r.Rounds[len(r.Rounds)-1]
		s.FinalRecall += last.Recall
		s.FinalF1 += last.F1
	}
	if runs == 0 {
		return s
	}
	s.NotFalling = float64(notFalling) / float64(max(1, rounds))
	s.Resolved /= float64(max(1, rounds))
	s.Wrong /= float64(max(1, rounds))
	s.Repaired /= float64(runs)
	s.Broken /= float64(runs)
	s.FinalRecall /= float64(runs)
	s.FinalF1 /= float64(runs)
	s.AUC /= float64(max(1, aucs))
	for k := range s.F1At {
		s.F1At[k] /= float64(runs)
	}
	return s
}

// F1After is the mean F1 over runs after the round in which the packet
// count first reached k (or the last round).
func F1After(results []Result, set, arm string, k int) float64 {
	sum, runs := 0.0, 0
	for _, r := range results {
		if r.Set != set || r.Arm != arm {
			continue
		}
		runs++
		pick := r.Rounds[len(r.Rounds)-1]
		for _, x := range r.Rounds {
			if x.Packets >= k {
				pick = x
				break
			}
		}
		sum += pick.F1
	}
	if runs == 0 {
		return math.NaN()
	}
	return sum / float64(runs)
}

// PrintSummary writes one line per set and arm, the means over sets, and
// the targets of the benchmark with whether each is met.
func PrintSummary(w io.Writer, results []Result, sets []string, count int) {
	fmt.Fprintf(w, "\n%-10s %-7s %10s %9s %8s %7s %8s %8s %8s %6s %8s %6s\n",
		"set", "arm", "notfalling", "repaired", "broken", "ratio", "F1@20", "F1@40", "recall40", "AUC", "resolved", "wrong")
	type acc struct{ notFalling, repaired, broken, f20, f40, rec, auc, resolved, wrong float64 }
	means := map[string]*acc{}
	reach := 0.0
	var ran []Arm // the arms with results, in Arms order
	for _, arm := range Arms {
		if slices.ContainsFunc(results, func(r Result) bool { return r.Arm == arm.Name }) {
			ran = append(ran, arm)
		}
	}
	for _, set := range sets {
		for _, arm := range ran {
			s := Summarize(results, set, arm.Name)
			f20, f40 := F1After(results, set, arm.Name, 20), F1After(results, set, arm.Name, 40)
			fmt.Fprintf(w, "%-10s %-7s %10.3f %9.0f %8.0f %7.2f %8.4f %8.4f %8.4f %6.3f %8.1f %6.1f\n",
				set, arm.Name, s.NotFalling, s.Repaired, s.Broken, ratio(s.Repaired, s.Broken), f20, f40, s.FinalRecall, s.AUC, s.Resolved, s.Wrong)
			m := means[arm.Name]
			if m == nil {
				m = &acc{}
				means[arm.Name] = m
			}
			m.notFalling += s.NotFalling
			m.repaired += s.Repaired
			m.broken += s.Broken
			m.f20 += f20
			m.f40 += f40
			m.rec += s.FinalRecall
			m.auc += s.AUC
			m.resolved += s.Resolved
			m.wrong += s.Wrong
		}
		if F1After(results, set, "default", 20) >= F1After(results, set, "random", 40) {
			reach++
		}
	}
	k := float64(len(sets))
	for _, arm := range ran {
		m := means[arm.Name]
		fmt.Fprintf(w, "%-10s %-7s %10.3f %9.0f %8.0f %7.2f %8.4f %8.4f %8.4f %6.3f %8.1f %6.1f\n",
			"MEAN", arm.Name, m.notFalling/k, m.repaired/k, m.broken/k, ratio(m.repaired, m.broken), m.f20/k, m.f40/k, m.rec/k, m.auc/k, m.resolved/k, m.wrong/k)
	}
	d, r := means["default"], means["random"]
	if d == nil || r == nil {
		return // the targets compare the two arms
	}
	fmt.Fprintf(w, "\ntargets (default arm, means over %d sets, %d packets a round):\n", len(sets), count)
	check := func(name string, ok bool, got string) {
		mark := "MISSED"
		if ok {
			mark = "met"
		}
		fmt.Fprintf(w, "  %-52s %-7s %s\n", name, mark, got)
	}
	check("agreement (F1) never falls in >= 95% of rounds", d.notFalling/k >= 0.95, fmt.Sprintf("%.1f%%", 100*d.notFalling/k))
	check("repaired >= 5 x broken", d.repaired >= 5*d.broken, fmt.Sprintf("%.2f x", ratio(d.repaired, d.broken)))
	check("F1 after 20 packets >= random arm's after 40", d.f20 >= r.f40, fmt.Sprintf("%.4f vs %.4f (%d of %d sets)", d.f20/k, r.f40/k, int(reach), len(sets)))
	check("triplet recall after 40 packets >= 0.85", d.rec/k >= 0.85, fmt.Sprintf("%.4f", d.rec/k))
	check("uncertainty AUC >= 0.75", d.auc/k >= 0.75, fmt.Sprintf("%.3f", d.auc/k))
}

func ratio(a, b float64) float64 {
	if b == 0 {
		return math.Inf(1)
	}
	return a / b
}
