package regen

import (
	"bytes"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/parquet-go/parquet-go"
	"github.com/sbinet/npyio"
	"gonum.org/v1/gonum/mat"

	"github.com/ramify-tax/ramify/format/repo"
)

// embeddingData is generated test data: 36 items around three random
// centres in 8 dimensions, as an items file, a vectors.tsv, an id file and
// the matrix (values exactly representable as float32).
type embeddingData struct {
	n, dim          int
	ids             []string
	vals            []float64
	items, tsv, idf string
}

func makeEmbeddings() *embeddingData {
	rng := rand.New(rand.NewPCG(3, 4))
	e := &embeddingData{n: 36, dim: 8}
	centres := make([][]float64, 3)
	for c := range centres {
		centres[c] = make([]float64, e.dim)
		for j := range e.dim {
			centres[c][j] = rng.NormFloat64() * 3
		}
	}
	e.vals = make([]float64, e.n*e.dim)
	var items, tsv, ids strings.Builder
	items.WriteString("id\tlabel\n")
	tsv.WriteString("id")
	for j := range e.dim {
		fmt.Fprintf(&tsv, "\tf%d", j+1)
	}
	tsv.WriteString("\n")
	for i := range e.n {
		id := fmt.Sprintf("item-%02d", i)
		e.ids = append(e.ids, id)
		fmt.Fprintf(&items, "%s\tthing %d\n", id, i)
		ids.WriteString(id + "\n")
		tsv.WriteString(id)
		for j := range e.dim {
			x := float64(float32(centres[i%3][j] + rng.NormFloat64()*0.5))
			e.vals[i*e.dim+j] = x
			fmt.Fprintf(&tsv, "\t%v", x)
		}
		tsv.WriteString("\n")
	}
	e.items, e.tsv, e.idf = items.String(), tsv.String(), ids.String()
	return e
}

// solveVectors writes a repository of the items, files and the vectors
// setting, and returns the outline solve writes from the vector source.
func solveVectors(t *testing.T, e *embeddingData, files map[string][]byte, vectors string) []byte {
	t.Helper()
	dir := t.TempDir()
	files["items.tsv"] = []byte(e.items)
	files[repo.SettingsFile] = []byte("[items]\nfiles = [\"items.tsv\"]\n" + vectors + "\n[[similarity.source]]\nkind = \"vector\"\n")
	for name, body := range files {
		if err := os.WriteFile(filepath.Join(dir, name), body, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return regenerateDir(t, dir)
}

// npyMatrix writes the matrix with npyio (github.com/sbinet/npyio v0.6.0),
// as float64 or, through a fixed-size array npyio writes as "<f4", float32.
func npyMatrix(t *testing.T, e *embeddingData, float32s bool) []byte {
	t.Helper()
	var npy bytes.Buffer
	var m any = mat.NewDense(e.n, e.dim, e.vals)
	if float32s {
		var a [36][8]float32
		for i := range e.n {
			for j := range e.dim {
				a[i][j] = float32(e.vals[i*e.dim+j])
			}
		}
		m = a
	}
	if err := npyio.Write(&npy, m); err != nil {
		t.Fatal(err)
	}
	return npy.Bytes()
}

// The same embeddings as vectors.tsv and as a .npy matrix with an id file
// give the same outline.
func TestNPYVectorsSolveLikeTSV(t *testing.T) {
	e := makeEmbeddings()
	fromTSV := solveVectors(t, e, map[string][]byte{"vectors.tsv": []byte(e.tsv)}, `vectors = "vectors.tsv"`)
	fromNPY := solveVectors(t, e, map[string][]byte{"emb.npy": npyMatrix(t, e, false), "emb-ids.txt": []byte(e.idf)},
		"vectors = \"emb.npy\"\nvector_ids = \"emb-ids.txt\"")
	if !bytes.Equal(fromTSV, fromNPY) {
		t.Errorf("outline from .npy differs from .tsv:\n%s\nvs\n%s", fromNPY, fromTSV)
	}
}

type parquetRow64 struct {
	ID        string    `parquet:"id"`
	Embedding []float64 `parquet:"embedding,list"`
}

type parquetRow32 struct {
	ID        string    `parquet:"id"`
	Embedding []float32 `parquet:"embedding,list"`
}

// parquetTable writes the embeddings with parquet-go
// (github.com/parquet-go/parquet-go v0.32.0, parquet.Write) as an id column
// and a list column, rows in reverse order: the file's order must not
// matter.
func parquetTable(t *testing.T, e *embeddingData, float32s bool) []byte {
	t.Helper()
	var b bytes.Buffer
	var err error
	if float32s {
		rows := make([]parquetRow32, e.n)
		for i := range e.n {
			r := &rows[e.n-1-i]
			r.ID = e.ids[i]
			for _, x := range e.vals[i*e.dim : (i+1)*e.dim] {
				r.Embedding = append(r.Embedding, float32(x))
			}
		}
		err = parquet.Write(&b, rows)
	} else {
		rows := make([]parquetRow64, e.n)
		for i := range e.n {
			rows[e.n-1-i] = parquetRow64{ID: e.ids[i], Embedding: e.vals[i*e.dim : (i+1)*e.dim]}
		}
		err = parquet.Write(&b, rows)
	}
	if err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

// A Parquet table of doubles solves exactly like vectors.tsv, and one of
// floats exactly like a float32 .npy matrix (both kept as float32).
func TestParquetVectorsSolveLikeTSVAndNPY(t *testing.T) {
	e := makeEmbeddings()
	fromTSV := solveVectors(t, e, map[string][]byte{"vectors.tsv": []byte(e.tsv)}, `vectors = "vectors.tsv"`)
	from64 := solveVectors(t, e, map[string][]byte{"emb.parquet": parquetTable(t, e, false)}, `vectors = "emb.parquet"`)
	if !bytes.Equal(fromTSV, from64) {
		t.Errorf("outline from Parquet doubles differs from .tsv:\n%s\nvs\n%s", from64, fromTSV)
	}
	fromNPY32 := solveVectors(t, e, map[string][]byte{"emb.npy": npyMatrix(t, e, true), "emb-ids.txt": []byte(e.idf)},
		"vectors = \"emb.npy\"\nvector_ids = \"emb-ids.txt\"")
	from32 := solveVectors(t, e, map[string][]byte{"emb.parquet": parquetTable(t, e, true)},
		"vectors = \"emb.parquet\"\nvector_column = \"embedding\"")
	if !bytes.Equal(fromNPY32, from32) {
		t.Errorf("outline from Parquet floats differs from a float32 .npy:\n%s\nvs\n%s", from32, fromNPY32)
	}
}

// A Parquet vectors file that is not one stops the load with its name.
func TestParquetVectorsBadFile(t *testing.T) {
	dir := t.TempDir()
	e := makeEmbeddings()
	for name, body := range map[string]string{
		"items.tsv":       e.items,
		"emb.parquet":     "id\tf1\n",
		repo.SettingsFile: "[items]\nfiles = [\"items.tsv\"]\nvectors = \"emb.parquet\"\n[[similarity.source]]\nkind = \"vector\"\n",
	} {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	_, ds := repo.Load(dir)
	if len(ds) == 0 || !strings.HasPrefix(ds.Error(), "emb.parquet:1:1: not a Parquet file") {
		t.Errorf("Load = %v, want emb.parquet:1:1: not a Parquet file", ds)
	}
}
