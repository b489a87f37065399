package project

import (
	"bytes"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/sbinet/npyio"
	"gonum.org/v1/gonum/mat"
)

// The same embeddings as vectors.tsv and as a .npy matrix with an id file
// give the same outline. The data are generated here: 36 items around
// three random centres in 8 dimensions.
func TestNPYVectorsSolveLikeTSV(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	const n, dim = 36, 8
	centres := make([][]float64, 3)
	for c := range centres {
		centres[c] = make([]float64, dim)
		for j := range dim {
			centres[c][j] = rng.NormFloat64() * 3
		}
	}
	vals := make([]float64, n*dim)
	var items, tsv, ids strings.Builder
	items.WriteString("id\tlabel\n")
	tsv.WriteString("id")
	for j := range dim {
		fmt.Fprintf(&tsv, "\tf%d", j+1)
	}
	tsv.WriteString("\n")
	for i := range n {
		id := fmt.Sprintf("item-%02d", i)
		fmt.Fprintf(&items, "%s\tthing %d\n", id, i)
		ids.WriteString(id + "\n")
		tsv.WriteString(id)
		for j := range dim {
			x := float64(float32(centres[i%3][j] + rng.NormFloat64()*0.5))
			vals[i*dim+j] = x
			fmt.Fprintf(&tsv, "\t%v", x)
		}
		tsv.WriteString("\n")
	}
	var npy bytes.Buffer
	if err := npyio.Write(&npy, mat.NewDense(n, dim, vals)); err != nil {
		t.Fatal(err)
	}
	solveWith := func(files map[string][]byte, vectors string) []byte {
		dir := t.TempDir()
		files["items.tsv"] = []byte(items.String())
		files[SettingsFile] = []byte("[items]\nfiles = [\"items.tsv\"]\n" + vectors + "\n[[similarity.source]]\nkind = \"vector\"\n")
		for name, body := range files {
			if err := os.WriteFile(filepath.Join(dir, name), body, 0o644); err != nil {
				t.Fatal(err)
			}
		}
		p, ds := Load(dir)
		if len(ds) > 0 {
			t.Fatal(ds)
		}
		sol, err := p.Regenerate(MethodConstrained, nil)
		if err != nil {
			t.Fatal(err)
		}
		return sol.Text
	}
	fromTSV := solveWith(map[string][]byte{"vectors.tsv": []byte(tsv.String())}, `vectors = "vectors.tsv"`)
	fromNPY := solveWith(map[string][]byte{"emb.npy": npy.Bytes(), "emb-ids.txt": []byte(ids.String())},
		"vectors = \"emb.npy\"\nvector_ids = \"emb-ids.txt\"")
	if !bytes.Equal(fromTSV, fromNPY) {
		t.Errorf("outline from .npy differs from .tsv:\n%s\nvs\n%s", fromNPY, fromTSV)
	}
}
