// Package loop runs the review loop on a real taxonomy with a scripted
// reviewer: `review draw` → answers taken from the reference tree →
// `absorb` → `solve`, round after round, and measures each round against
// the reference. The ramify commands are run through a Runner, so the
// loop measures exactly what users get (the command in-process in tests,
// the built binary in the bench command).
package loop

import (
	"bufio"
	"bytes"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/internal/realdata"
	"github.com/ramify-tax/ramify/review"
	"github.com/ramify-tax/ramify/review/committee"
	"github.com/ramify-tax/ramify/solve"
	"github.com/ramify-tax/ramify/solve/regen"
)

// Runner runs one ramify command line (without the program name) and
// returns its standard output, or an error carrying what it printed.
type Runner func(args ...string) (string, error)

// Arm is one way of drawing packets.
type Arm struct {
	Name string
	// AuditShare is written to review.audit_share; negative keeps the
	// default.
	AuditShare float64
	// Oracle replaces the drawn packets' items by the ones an oracle who
	// knows the reference picks (oraclePackets): the ceiling of drawing.
	Oracle bool
}

// Arms are the arms of the benchmark: the default packets, every packet a
// uniformly random audit, and (only when asked for) the oracle's packets.
var Arms = []Arm{{"default", -1, false}, {"random", 1, false}, {"oracle", -1, true}}

// Config is one run of the loop.
type Config struct {
	Set    *realdata.Set
	Arm    Arm
	Order  int // 0: the items file as shipped; k > 0: a seeded shuffle
	Rounds int
	Count  int // packets drawn per round
	Dir    string
	Run    Runner
}

// Round is what one round did; round 0 is the first solve.
type Round struct {
	Round   int
	Packets int // packets answered so far
	Fixed   int // packets of this round answered "fixed"
	// Precision, Recall and F1 of the triplets after the round against the
	// reference (diff.TripletScores).
	Precision, Recall, F1 float64
	// Repaired and Broken count the triples the reference resolves that
	// the round's solve turned right and wrong.
	Repaired, Broken int
	// Resolved is the mean number of its triples the reference resolves,
	// over the round's packets: what an answer can teach (a packet inside
	// one flat category of the reference teaches nothing).
	Resolved float64
	// Wrong is the mean number of those the packet as drawn arranged
	// otherwise: what an answer can repair.
	Wrong float64
	// AUC is how well the committee's per-item uncertainty on the tree
	// the round started from predicts the items misplaced in it (those
	// whose triples are wrong more often than the tree's overall).
	AUC float64
}

// Run performs the loop and returns round 0 (the first solve) and every
// round after it.
func Run(cfg Config) ([]Round, error) {
	if err := writeRepo(cfg); err != nil {
		return nil, err
	}
	dir := cfg.Dir
	if _, err := cfg.Run("solve", "--dir", dir, "--quiet"); err != nil {
		return nil, err
	}
	p, tree, err := load(dir)
	if err != nil {
		return nil, err
	}
	ref := regen.FromCategory(cfg.Set.Reference, p.Index, len(p.Items))
	prec, rec := diff.TripletScores(tree, ref)
	rounds := []Round{{Precision: prec, Recall: rec, F1: f1(prec, rec)}}
	packets := 0
	for r := 1; r <= cfg.Rounds; r++ {
		auc, err := uncertaintyAUC(p, tree, ref)
		if err != nil {
			return nil, err
		}
		rounds[r-1].AUC = auc
		date := fmt.Sprintf("2027-%02d-%02d", 1+(r-1)/28, 1+(r-1)%28)
		if _, err := cfg.Run("review", "draw", "--dir", dir, "--count", fmt.Sprint(cfg.Count), "--date", date, "--quiet"); err != nil {
			return nil, err
		}
		if cfg.Arm.Oracle {
			if err := oraclePackets(dir, p, tree, ref); err != nil {
				return nil, err
			}
		}
		ans, err := AnswerOpen(dir, cfg.Set.Reference)
		if err != nil {
			return nil, err
		}
		packets += ans.Answered
		if _, err := cfg.Run("absorb", "--dir", dir, "--date", date, "--quiet"); err != nil {
			return nil, err
		}
		report, err := cfg.Run("solve", "--dir", dir, "--json")
		if err != nil {
			return nil, err
		}
		// What each round's solve did (local or rebuilt, the items moved,
		// the subtrees re-solved) stays beside the repository, for a run
		// kept with -keep.
		if err := os.WriteFile(filepath.Join(dir, fmt.Sprintf("solve-round-%02d.json", r)), []byte(report), 0o644); err != nil {
			return nil, err
		}
		np, next, err := load(dir)
		if err != nil {
			return nil, err
		}
		rc := compareTriples(ref, tree, next)
		prec, rec := diff.TripletScores(next, ref)
		rounds = append(rounds, Round{Round: r, Packets: packets, Fixed: ans.Fixed, Precision: prec, Recall: rec, F1: f1(prec, rec),
			Repaired: rc.repaired, Broken: rc.broken, Resolved: ans.resolvedPerPacket(), Wrong: ans.wrongPerPacket()})
		p, tree = np, next
	}
	auc, err := uncertaintyAUC(p, tree, ref)
	if err != nil {
		return nil, err
	}
	rounds[len(rounds)-1].AUC = auc
	return rounds, nil
}

func f1(p, r float64) float64 {
	if p+r == 0 {
		return 0
	}
	return 2 * p * r / (p + r)
}

// writeRepo creates the repository: the set's items (in the order asked)
// with text similarity only (the sets have no tags), and otherwise the
// default settings.
func writeRepo(cfg Config) error {
	if err := os.MkdirAll(cfg.Dir, 0o755); err != nil {
		return err
	}
	settings := "[items]\nfiles = [\"items.tsv\"]\n\n[[similarity.source]]\nkind = \"text\"\nweight = 1.0\n"
	if cfg.Arm.AuditShare >= 0 {
		settings += fmt.Sprintf("\n[review]\naudit_share = %g\n", cfg.Arm.AuditShare)
	}
	if err := os.WriteFile(filepath.Join(cfg.Dir, "ramify.toml"), []byte(settings), 0o644); err != nil {
		return err
	}
	return os.WriteFile(filepath.Join(cfg.Dir, "items.tsv"), shuffledItems(cfg.Set.ItemsTSV, cfg.Order), 0o644)
}

// shuffledItems keeps the header line and permutes the rows with a seed
// of the order number; order 0 keeps the file as it is.
func shuffledItems(tsv []byte, order int) []byte {
	if order == 0 {
		return tsv
	}
	var lines []string
	sc := bufio.NewScanner(bytes.NewReader(tsv))
	sc.Buffer(make([]byte, 1<<20), 1<<20)
	for sc.Scan() {
		if sc.Text() != "" {
			lines = append(lines, sc.Text())
		}
	}
	rows := lines[1:]
	rng := rand.New(rand.NewPCG(uint64(order), 0x6f72646572)) // "order"
	rng.Shuffle(len(rows), func(i, j int) { rows[i], rows[j] = rows[j], rows[i] })
	return []byte(lines[0] + "\n" + strings.Join(rows, "\n") + "\n")
}

func load(dir string) (*repo.Repo, *solve.Tree, error) {
	p, ds := repo.Load(dir)
	if len(ds) > 0 {
		return nil, nil, ds
	}
	if p.Outline == nil {
		return nil, nil, fmt.Errorf("%s: no outline after solve", dir)
	}
	return p, regen.FromCategory(p.Outline.Root, p.Index, len(p.Items)), nil
}

// uncertaintyAUC solves the committee `review draw` solves for the tree
// and scores its per-item uncertainty against the misplaced items.
func uncertaintyAUC(p *repo.Repo, tree, ref *solve.Tree) (float64, error) {
	structure := format.StructureHash(p.Outline.Root)
	c, _, err := committee.Solve(p, structure, nil)
	if err != nil {
		return 0, err
	}
	score := review.ItemUncertainty(c, tree)
	rc := compareTriples(ref, tree, tree)
	return AUC(score, rc.misplaced()), nil
}

// Answers is what AnswerOpen did.
type Answers struct {
	Answered, Fixed int
	// Resolved sums, over the answered packets, the triples of each
	// packet's items that the reference resolves.
	Resolved int
	// Wrong sums the triples among those that the packet as drawn
	// arranged otherwise: what the answers could repair.
	Wrong int
}

func (a Answers) resolvedPerPacket() float64 {
	if a.Answered == 0 {
		return 0
	}
	return float64(a.Resolved) / float64(a.Answered)
}

func (a Answers) wrongPerPacket() float64 {
	if a.Answered == 0 {
		return 0
	}
	return float64(a.Wrong) / float64(a.Answered)
}

// AnswerOpen answers every pending open packet as a reviewer who knows
// the reference would: "ok" when the packet already arranges its items as
// the reference restricted to them does, else "fixed" with that
// arrangement.
func AnswerOpen(dir string, ref *format.Category) (Answers, error) {
	var a Answers
	files, err := filepath.Glob(filepath.Join(dir, review.OpenDir, "*.outline"))
	if err != nil {
		return a, err
	}
	slices.Sort(files)
	for _, f := range files {
		data, err := os.ReadFile(f)
		if err != nil {
			return a, err
		}
		pk, err := format.ParsePacket(f, data)
		if err != nil {
			return a, err
		}
		if pk.Verdict != format.VerdictPending {
			continue
		}
		want := review.Restrict(ref, pk.Tree.AllItems())
		resolved, wrong := packetTriples(want, pk.Tree)
		a.Resolved += resolved
		a.Wrong += wrong
		pk.Reviewer = "Scripted Reviewer"
		pk.Verdict = format.VerdictOK
		if !review.SameShape(pk.Tree, want) {
			pk.Verdict = format.VerdictFixed
			pk.Tree = want
			a.Fixed++
		}
		a.Answered++
		if err := os.WriteFile(f, format.FormatPacket(pk), 0o644); err != nil {
			return a, err
		}
	}
	return a, nil
}

// resolvedTriples counts the triples of a tree's items that it resolves:
// one pair's lowest common category lies strictly below the other two's.
func resolvedTriples(root *format.Category) int {
	resolved, _ := packetTriples(root, root)
	return resolved
}

// packetTriples compares a packet as drawn (shown) with the answer (want,
// over the same items): resolved counts the triples want resolves, wrong
// those among them that shown does not resolve the same way, which are
// what the answer can repair.
func packetTriples(want, shown *format.Category) (resolved, wrong int) {
	wantPaths, ids := itemPaths(want)
	shownPaths, _ := itemPaths(shown)
	topo := func(paths map[string][]*format.Category, a, b, c string) int {
		ab, ac, bc := commonDepth(paths[a], paths[b]), commonDepth(paths[a], paths[c]), commonDepth(paths[b], paths[c])
		switch {
		case ab > max(ac, bc):
			return 1
		case ac > max(ab, bc):
			return 2
		case bc > max(ab, ac):
			return 3
		}
		return 0
	}
	for i := range ids {
		for j := i + 1; j < len(ids); j++ {
			for k := j + 1; k < len(ids); k++ {
				r := topo(wantPaths, ids[i], ids[j], ids[k])
				if r == 0 {
					continue
				}
				resolved++
				if topo(shownPaths, ids[i], ids[j], ids[k]) != r {
					wrong++
				}
			}
		}
	}
	return resolved, wrong
}

// itemPaths is each item's categories, root first, and the items in walk
// order.
func itemPaths(root *format.Category) (map[string][]*format.Category, []string) {
	paths := map[string][]*format.Category{}
	var ids []string
	var walk func(c *format.Category, above []*format.Category)
	walk = func(c *format.Category, above []*format.Category) {
		here := append(slices.Clip(above), c)
		for _, id := range c.Items {
			paths[id] = here
			ids = append(ids, id)
		}
		for _, k := range c.Children {
			walk(k, here)
		}
	}
	walk(root, nil)
	return paths, ids
}

// commonDepth is how many categories two root-first paths share.
func commonDepth(a, b []*format.Category) int {
	k := 0
	for k < len(a) && k < len(b) && a[k] == b[k] {
		k++
	}
	return k
}
