package naming

import (
	"math"
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/format"
)

// Separator joins the words of a provisional name, as in "laser · level".
const Separator = " · "

// maxWordBytes bounds one word of a made-up name, so two words and the
// separator stay well inside the 200 bytes a category name may have.
const maxWordBytes = 60

// ProvisionalName makes a name for a category from its members' words,
// relative to its parent category (for a top-level category, all items):
// the two words that are most frequent inside the category and rarest in
// the rest of the parent, joined by Separator. With p_C(w) and p_P(w) the
// shares of the category's and the parent's items that hold word w, a word
// scores
//
//	score(w) = p_C(w) · ln(p_C(w) / p_P(w)),
//
// its term in the Kullback–Leibler divergence of the category's words from
// its parent's: a tf-idf-like weight (Salton & Buckley 1988) in which the
// frequency inside counts (tf) and a word common in the parent is
// discounted (idf). A word that every member of the parent holds scores 0,
// one rarer inside than around scores below 0; only positive scores make
// a name. Ties go to the word more members hold, then to byte order;
// scores are compared rounded to 12 significant digits so that the last
// bits of a logarithm cannot decide.
// When no word scores above 0 the most frequent words are used; with no
// words at all the name is the smallest member id. (Assign also steers
// clear of the parent's own name: it takes the next best pair of words.) Words that could not
// start a category name (empty, "#…", "~ …", control characters) or are
// longer than 60 bytes are skipped. The result passes
// format.CheckCategoryName.
func ProvisionalName(members, parent []string, words func(item string) []string) string {
	w := newWordCounter(words)
	return w.name(0, members, 1, parent, "")
}

// wordCounter counts words over sets of items, remembering the counts of
// categories that are also parents of others.
type wordCounter struct {
	words func(string) []string
	cache map[int]map[string]int // by category index; −1 is the root
	clean map[string][]string    // usable distinct words of each item
	// up records, for each category named so far, its parent and the
	// parent's name, so that the names along a path can be read back.
	up map[int]link
	// given holds the names made so far under each parent.
	given map[int]map[string]bool
}

type link struct {
	parent int
	name   string
}

func newWordCounter(words func(string) []string) *wordCounter {
	return &wordCounter{
		words: words, cache: map[int]map[string]int{}, clean: map[string][]string{},
		up: map[int]link{}, given: map[int]map[string]bool{},
	}
}

// pathWords are the words of the names above a category whose parent is
// parent (named parentName): its parent's and, through the categories
// named before, every ancestor's that is known.
func (w *wordCounter) pathWords(parent int, parentName string) map[string]bool {
	out := map[string]bool{}
	name := parentName
	for {
		for _, part := range strings.Split(name, Separator) {
			for _, x := range strings.Fields(strings.ToLower(part)) {
				out[x] = true
			}
		}
		l, ok := w.up[parent]
		if !ok || parent < 0 {
			return out
		}
		parent, name = l.parent, l.name
	}
}

func (w *wordCounter) itemWords(item string) []string {
	if ws, ok := w.clean[item]; ok {
		return ws
	}
	var ws []string
	if w.words != nil {
		for _, x := range w.words(item) {
			x = strings.TrimSpace(x)
			if len(x) <= maxWordBytes && format.CheckCategoryName(x) == "" {
				ws = append(ws, x)
			}
		}
	}
	slices.Sort(ws)
	ws = slices.Compact(ws)
	w.clean[item] = ws
	return ws
}

func (w *wordCounter) df(key int, items []string) map[string]int {
	if m, ok := w.cache[key]; ok {
		return m
	}
	m := map[string]int{}
	for _, it := range items {
		for _, x := range w.itemWords(it) {
			m[x]++
		}
	}
	w.cache[key] = m
	return m
}

// name makes the provisional name of category self (members) under
// category parent (parentItems, named parentName); the indices key the
// count cache.
func (w *wordCounter) name(self int, members []string, parent int, parentItems []string, parentName string) string {
	name := w.pick(self, members, parent, parentItems, parentName)
	w.up[self] = link{parent, parentName}
	if w.given[parent] == nil {
		w.given[parent] = map[string]bool{}
	}
	w.given[parent][name] = true
	return name
}

// pick chooses the name; see ProvisionalName. Words of the names above the
// category are left out (a subcategory named "~ chair · garden" under
// "~ chair · back" says "chair" twice and tells the reader nothing new),
// and so are names a sibling was given already.
func (w *wordCounter) pick(self int, members []string, parent int, parentItems []string, parentName string) string {
	inCat := w.df(self, members)
	inParent := w.df(parent, parentItems)
	above := w.pathWords(parent, parentName)
	type scored struct {
		word  string
		score float64
		df    int
	}
	var cands []scored
	nC, nP := float64(len(members)), float64(len(parentItems))
	for x, df := range inCat {
		if above[strings.ToLower(x)] {
			continue
		}
		// The category is inside its parent, so df_P ≥ df_C > 0.
		pC, pP := float64(df)/nC, float64(max(inParent[x], df))/nP
		cands = append(cands, scored{x, round12(pC * math.Log(pC/pP)), df})
	}
	slices.SortFunc(cands, func(a, b scored) int {
		switch {
		case a.score != b.score:
			if a.score > b.score {
				return -1
			}
			return 1
		case a.df != b.df:
			return b.df - a.df
		}
		return strings.Compare(a.word, b.word)
	})
	if len(cands) == 0 {
		if len(members) == 0 {
			return "unnamed"
		}
		smallest := slices.Min(members)
		return smallest[:min(len(smallest), 200)]
	}
	// Only positive scores count, unless no word has one.
	usable := len(cands)
	if cands[0].score > 0 {
		usable = 0
		for usable < len(cands) && cands[usable].score > 0 {
			usable++
		}
	}
	taken := w.given[parent]
	if usable == 1 || len(cands) == 1 {
		if !taken[cands[0].word] || len(cands) == 1 {
			return cands[0].word
		}
		usable = max(usable, 2)
	}
	// The best pair, in rank order (0,1), (0,2), (1,2), (0,3), …, that no
	// sibling has and that differs from the parent's name.
	first := cands[0].word + Separator + cands[1].word
	for j := 1; j < len(cands); j++ {
		if j >= usable && j > 1 {
			break
		}
		for i := 0; i < j; i++ {
			if n := cands[i].word + Separator + cands[j].word; n != parentName && !taken[n] {
				return n
			}
		}
	}
	return first
}

// round12 rounds to 12 significant digits.
func round12(x float64) float64 {
	if x == 0 || math.IsInf(x, 0) || math.IsNaN(x) {
		return x
	}
	e := math.Floor(math.Log10(math.Abs(x)))
	scale := math.Pow(10, 11-e)
	return math.Round(x*scale) / scale
}
