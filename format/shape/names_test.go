package shape

import (
	"slices"
	"strconv"
	"testing"

	"github.com/ramify-tax/ramify/format"
)

func parseAnswer(t *testing.T, text string) *format.Category {
	t.Helper()
	o, err := format.ParseOutline("answer", []byte("# ramify outline 1\n"+text))
	if err != nil {
		t.Fatal(err)
	}
	return o.Root
}

// itemIndex maps "i0".."i9" to 0..9.
func itemIndex(id string) (int32, bool) {
	k, err := strconv.Atoi(id[1:])
	return int32(k), err == nil && id[0] == 'i'
}

func linkedOf(t *testing.T, texts ...string) (trips [][3]int32, records []int) {
	links := linksOf(t, texts...)
	for _, l := range links {
		trips = append(trips, l.Triplets...)
		records = append(records, l.Record)
	}
	return trips, records
}

func linksOf(t *testing.T, texts ...string) []Link {
	t.Helper()
	var answers []Answer
	for i, s := range texts {
		answers = append(answers, Answer{Tree: parseAnswer(t, s), Record: 10 + i})
	}
	var links []Link
	Linked(answers, itemIndex, func(l Link) { links = append(links, l) })
	return links
}

// lcaNode is the lowest common ancestor of a set of leaves of t.
func (lt leafTree) lcaNode(leaves []int32) int {
	common := lt.ancestors(int(leaves[0]))
	for _, x := range leaves[1:] {
		up := lt.ancestors(int(x))
		common = slices.DeleteFunc(common, func(v int) bool { return !slices.Contains(up, v) })
	}
	return common[0]
}

// apart reports whether the lowest common ancestors of two leaf sets are
// neither equal nor one above the other.
func (lt leafTree) apart(a, b []int32) bool {
	u, v := lt.lcaNode(a), lt.lcaNode(b)
	return !slices.Contains(lt.ancestors(u), v) && !slices.Contains(lt.ancestors(v), u)
}

// The linked triplets mean exactly that the named categories are apart:
// over every rooted tree on six leaves (OEIS A000311: 2752 of them), a
// tree displays them all if and only if the lowest common ancestor of
// each name's items (gathered from both answers) lies apart from the
// other's. Neither answer alone says where i4 or i5 goes relative to i0.
func TestLinkedMeansApart(t *testing.T) {
	trips, _ := linkedOf(t,
		"Wine/\n  i0\n  i1\nBrew/\n  i2\n",
		"Wine/\n  i4\nBrew/\n  i3\n  i5\n",
	)
	wine, brew := []int32{0, 1, 4}, []int32{2, 3, 5}
	if len(trips) != len(wine)-1+len(brew)-1 {
		t.Errorf("%d triplets %v, want %d (a chain over each side)", len(trips), trips, len(wine)+len(brew)-2)
	}
	for _, lt := range allTrees(6, false) {
		if got, want := displaysAll(lt, trips), lt.apart(wine, brew); got != want {
			t.Fatalf("tree %v: displays the linked triplets %v, names apart %v", lt, got, want)
		}
	}
}

func TestLinkedReadsNamesWithCare(t *testing.T) {
	for _, c := range []struct {
		why     string
		answers []string
		want    [][3]int32 // nil: no triplet
	}{
		{"one answer says nothing its own shape does not",
			[]string{"Wine/\n  i0\n  i1\nBrew/\n  i2\n"},
			[][3]int32{{0, 1, 2}}},
		{"provisional names are not typed: they link nothing",
			[]string{"~ wine/\n  i0\n  i1\n~ brew/\n  i2\n", "~ wine/\n  i3\n~ brew/\n  i4\n"},
			nil},
		{"a name inside another in one answer and apart from it in another is dropped",
			[]string{"Brew/\n  i0\n  Wine/\n    i1\n    i2\n", "Wine/\n  i3\nBrew/\n  i4\n"},
			nil},
		{"an item under two names apart drops both",
			[]string{"Wine/\n  i0\n  i1\nBrew/\n  i2\n", "Wine/\n  i3\nBrew/\n  i0\n"},
			nil},
		{"a name twice in one answer is not one category",
			[]string{"A/\n  Other/\n    i0\n    i1\nB/\n  Other/\n    i2\n    i3\n"},
			nil},
		{"only the widest pair apart is listed: Red inside Wine adds nothing against Brew",
			[]string{"Wine/\n  Red/\n    i0\n    i1\n  i2\nBrew/\n  i3\n", "Wine/\n  i4\nBrew/\n  i5\n"},
			// Wine {0,1,2,4} apart from Brew {3,5}; Red {0,1} apart from
			// nothing but inside Wine.
			[][3]int32{{3, 5, 0}, {0, 1, 3}, {1, 2, 3}, {2, 4, 3}}},
	} {
		got, _ := linkedOf(t, c.answers...)
		if !slices.Equal(got, c.want) {
			t.Errorf("%s: got %v, want %v", c.why, got, c.want)
		}
	}
}

// A link rests on the latest record that placed one of its items under
// its names: the answers are records 10, 11 and 12, and Brew holds i6
// from the third, so both links rest on it; Wine against Mead is not
// known (no answer shows them together).
func TestLinkedRecordIsTheLatest(t *testing.T) {
	links := linksOf(t,
		"Wine/\n  i0\n  i1\nBrew/\n  i2\n",
		"Wine/\n  i4\nBrew/\n  i3\n",
		"Mead/\n  i5\nBrew/\n  i6\n",
	)
	got := map[[2]string]int{}
	for _, l := range links {
		got[l.Names] = l.Record
	}
	want := map[[2]string]int{{"Brew", "Wine"}: 12, {"Brew", "Mead"}: 12}
	if len(got) != len(want) || got[[2]string{"Brew", "Wine"}] != 12 || got[[2]string{"Brew", "Mead"}] != 12 {
		t.Errorf("links rest on %v, want %v", got, want)
	}
}
