// Command stability measures how much one new editorial record moves: on
// the demo and on generated repositories it adds one record at a time to
// the same solved base (a triplet the tree breaks, or a group over items
// from two categories), runs `ramify solve`, and counts the items whose
// category changed beyond those the record names, and the top-level
// categories that vanished although the record names none of their items.
//
//	go run ./bench/stability [-sizes 1000,20000] [-trials 15] [-ramify BIN]
//
// Target (DESIGN.md section 9): median at most 1% of the items per record,
// and no top-level category dissolved by a record that does not name it.
package main

import (
	"flag"
	"fmt"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"text/tabwriter"

	"github.com/ramify-tax/ramify/diff"
	"github.com/ramify-tax/ramify/format"
)

func main() {
	sizes := flag.String("sizes", "1000,20000", "generated repository sizes (0 for none)")
	trials := flag.Int("trials", 15, "records of each kind per repository")
	bin := flag.String("ramify", "", "ramify binary (default: build ./cmd/ramify)")
	flag.Parse()
	tmp, err := os.MkdirTemp("", "ramify-stability-")
	check(err)
	defer os.RemoveAll(tmp)
	if *bin == "" {
		*bin = filepath.Join(tmp, "ramify")
		run("go", "build", "-o", *bin, "./cmd/ramify")
	}
	type repo struct{ name, dir string }
	repos := []repo{{"demo", filepath.Join(tmp, "demo")}}
	run("cp", "-r", "examples/tool-library", repos[0].dir)
	os.RemoveAll(filepath.Join(repos[0].dir, "reviews", "open"))
	for _, s := range strings.Split(*sizes, ",") {
		n, err := strconv.Atoi(strings.TrimSpace(s))
		if err != nil || n <= 0 {
			continue
		}
		d := filepath.Join(tmp, "gen"+s)
		run("go", "run", "./bench/genrepo", "-n", s, "-out", d)
		repos = append(repos, repo{"generated " + s, d})
	}
	tw := tabwriter.NewWriter(os.Stdout, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "repository\trecord\ttrials\tmedian moved\tmax moved\ttop-level dissolved\t")
	for _, r := range repos {
		check(os.MkdirAll(filepath.Join(r.dir, "constraints"), 0o755))
		run(*bin, "solve", "--dir", r.dir, "--quiet")
		base, err := os.ReadFile(filepath.Join(r.dir, "taxonomy.outline"))
		check(err)
		for _, kind := range []string{"triplet", "group"} {
			shares, dissolved := measure(*bin, r.dir, base, kind, *trials)
			if len(shares) == 0 {
				continue
			}
			slices.Sort(shares)
			fmt.Fprintf(tw, "%s\t%s\t%d\t%.2f%%\t%.2f%%\t%d\t\n", r.name, kind, len(shares),
				100*shares[len(shares)/2], 100*shares[len(shares)-1], dissolved)
		}
	}
	tw.Flush()
}

// measure adds trials records of one kind, each alone to the base, and
// returns the share of the items each moved beyond those it names, and
// how many top-level categories vanished that the record did not name.
func measure(bin, dir string, base []byte, kind string, trials int) ([]float64, int) {
	outlinePath := filepath.Join(dir, "taxonomy.outline")
	recPath := filepath.Join(dir, "constraints", "bench-stability.toml")
	o, err := format.ParseOutline("base", base)
	check(err)
	parent := map[string]*format.Category{}
	top := map[string]*format.Category{}
	var cats []*format.Category
	o.Root.Walk(func(c *format.Category, depth int) bool {
		if depth > 0 {
			cats = append(cats, c)
		}
		for _, it := range c.Items {
			parent[it] = c
		}
		return true
	})
	for _, c := range o.Root.Children {
		for _, it := range c.AllItems() {
			top[it] = c
		}
	}
	items := o.Root.AllItems()
	slices.Sort(items)
	rng := rand.New(rand.NewPCG(1, uint64(len(kind))))
	var shares []float64
	dissolved := 0
	for t := 0; t < trials; t++ {
		var named []string
		var rec string
		switch kind {
		case "triplet":
			// a and c share a category, b sits elsewhere: ab|c is broken.
			for range 1000 {
				a, b := items[rng.IntN(len(items))], items[rng.IntN(len(items))]
				sib := parent[a].Items
				if parent[a] == parent[b] || len(sib) < 2 {
					continue
				}
				c := sib[rng.IntN(len(sib))]
				if c == a {
					continue
				}
				named = []string{a, b, c}
				rec = fmt.Sprintf("[[triplet]]\npair = [%q, %q]\nout = %q\n", a, b, c)
				break
			}
		case "group":
			// Two or three items of one category and one from another.
			for range 1000 {
				c := cats[rng.IntN(len(cats))]
				if len(c.Items) < 3 {
					continue
				}
				k := 2 + rng.IntN(2)
				pick := slices.Clone(c.Items)
				rng.Shuffle(len(pick), func(i, j int) { pick[i], pick[j] = pick[j], pick[i] })
				x := items[rng.IntN(len(items))]
				if parent[x] == c {
					continue
				}
				named = append(pick[:k:k], x)
				q := make([]string, len(named))
				for i, n := range named {
					q[i] = strconv.Quote(n)
				}
				rec = "[[group]]\nitems = [" + strings.Join(q, ", ") + "]\n"
				break
			}
		}
		if rec == "" {
			continue
		}
		check(os.WriteFile(recPath, []byte(rec+"by = \"bench\"\ndate = 2026-12-02\nnote = \"stability benchmark\"\n"), 0o644))
		check(os.WriteFile(outlinePath, base, 0o644))
		out, err := exec.Command(bin, "solve", "--dir", dir, "--quiet").CombinedOutput()
		if err != nil {
			// A record that contradicts the demo's own records is skipped.
			os.Remove(recPath)
			if strings.Contains(string(out), "cannot all hold") {
				continue
			}
			fmt.Fprintf(os.Stderr, "solve: %v\n%s", err, out)
			os.Exit(1)
		}
		after, err := os.ReadFile(outlinePath)
		check(err)
		o2, err := format.ParseOutline("after", after)
		check(err)
		isNamed := map[string]bool{}
		for _, n := range named {
			isNamed[n] = true
		}
		moved := 0
		for _, m := range diff.Compare(o.Root, o2.Root).AllMoved() {
			if !isNamed[m.Item] {
				moved++
			}
		}
		shares = append(shares, float64(moved)/float64(len(items)-len(named)))
		// A top-level category the record names no item of must survive
		// as a top-level category with the same members.
		touched := map[*format.Category]bool{}
		for _, n := range named {
			touched[top[n]] = true
		}
		now := map[string]bool{}
		for _, c := range o2.Root.Children {
			now[strings.Join(sorted(c.AllItems()), " ")] = true
		}
		for _, c := range o.Root.Children {
			if !touched[c] && !now[strings.Join(sorted(c.AllItems()), " ")] {
				dissolved++
			}
		}
		os.Remove(recPath)
	}
	check(os.WriteFile(outlinePath, base, 0o644))
	return shares, dissolved
}

func sorted(s []string) []string {
	s = slices.Clone(s)
	slices.Sort(s)
	return s
}

func run(name string, args ...string) {
	cmd := exec.Command(name, args...)
	cmd.Stderr = os.Stderr
	check(cmd.Run())
}

func check(err error) {
	if err != nil {
		fmt.Fprintln(os.Stderr, "stability:", err)
		os.Exit(1)
	}
}
