package diff

import (
	"bufio"
	"fmt"
	"os"
	"strconv"
	"strings"
	"testing"
)

// RF against distances computed from Biopython 1.80's clade lists
// (testdata/rf/README.md: Bio.Phylo.read + find_clades/get_terminals).
func TestRFMatchesBiopythonReference(t *testing.T) {
	f, err := os.Open("testdata/rf/reference.tsv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	sc.Buffer(nil, 1<<20)
	rows := 0
	for sc.Scan() {
		line := sc.Text()
		if strings.HasPrefix(line, "#") || strings.HasPrefix(line, "case\t") || line == "" {
			continue
		}
		fs := strings.Split(line, "\t")
		if len(fs) != 7 {
			t.Fatalf("reference.tsv: %d fields in %q", len(fs), line)
		}
		n, _ := strconv.Atoi(fs[1])
		wantRF, _ := strconv.Atoi(fs[2])
		ca, _ := strconv.Atoi(fs[3])
		cb, _ := strconv.Atoi(fs[4])
		labels := make([]string, n)
		for i := range labels {
			labels[i] = fmt.Sprintf("t%d", i)
		}
		a, err := parseNewick(fs[5], labels)
		if err != nil {
			t.Fatalf("case %s: %v", fs[0], err)
		}
		b, err := parseNewick(fs[6], labels)
		if err != nil {
			t.Fatalf("case %s: %v", fs[0], err)
		}
		d, norm := RF(a, b)
		if d != wantRF {
			t.Errorf("case %s (n=%d): RF = %d, Biopython clusters give %d", fs[0], n, d, wantRF)
		}
		if want := float64(wantRF) / float64(ca+cb); ca+cb > 0 && norm != want {
			t.Errorf("case %s: normalised RF = %v, want %d/(%d+%d) = %v", fs[0], norm, wantRF, ca, cb, want)
		}
		rows++
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	if rows != 24 {
		t.Fatalf("read %d reference pairs, want 24", rows)
	}
}
