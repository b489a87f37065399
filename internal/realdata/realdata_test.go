package realdata

import "testing"

// The sizes are those of the set table in testdata/wordnet-dev/README.md (copied
// from the data's own README): every item appears once in its reference.
func TestSetsMatchTheirReadme(t *testing.T) {
	want := map[string]int{
		"beverage": 271, "building": 203, "dish": 259, "fabric": 247,
		"food": 600, "furniture": 153, "measuring": 196, "music": 254,
	}
	sets, err := All()
	if err != nil {
		t.Fatal(err)
	}
	if len(sets) != len(want) {
		t.Fatalf("All() gave %d sets, want %d", len(sets), len(want))
	}
	for _, s := range sets {
		if len(s.Items) != want[s.Name] {
			t.Errorf("%s: %d items, want %d", s.Name, len(s.Items), want[s.Name])
		}
		inRef := map[string]bool{}
		for _, id := range s.Reference.AllItems() {
			inRef[id] = true
		}
		for _, it := range s.Items {
			if !inRef[it.ID] {
				t.Errorf("%s: item %s is not in the reference", s.Name, it.ID)
			}
		}
		if len(inRef) != len(s.Items) {
			t.Errorf("%s: reference holds %d items, items.tsv %d", s.Name, len(inRef), len(s.Items))
		}
	}
}
