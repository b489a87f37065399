package format

import (
	"bytes"
	"hash/maphash"
	"math"
	"strings"
)

// Link is an explicit similarity between two items.
type Link struct {
	A, B   string
	Weight float64
	Pos    Pos
}

// LinkTable is a links file in columns: each distinct item id is kept once
// in IDs, and link k joins IDs[A[k]] and IDs[B[k]] with weight Weight[k],
// written on line Line[k] of File. A million-item file has millions of
// rows; columns of numbers (16 bytes a link: two int32 indices, a float32
// weight, an int32 line) cost a fraction of the memory of one Link per
// row, let a caller resolve each distinct id once instead of once per row,
// and go to the graph builder as they are (graph.LinkColumns).
type LinkTable struct {
	File   string
	IDs    []string // in order of first appearance
	A, B   []int32
	Weight []float32
	Line   []int32
}

// Len is the number of links.
func (t *LinkTable) Len() int { return len(t.A) }

// Pos is where link k was written.
func (t *LinkTable) Pos(k int) Pos { return Pos{t.File, int(t.Line[k]), 1} }

// LinksHeader is the header row every links file starts with.
const LinksHeader = "a\tb\tweight"

// ParseLinkTableWithin is ParseLinkTable keeping at most b.Left links: the
// row past them is reported and reading stops there. ids is how many
// distinct ids the file likely names (the number of items), room made up
// front so the id map does not regrow as it fills; 0 when unknown.
func ParseLinkTableWithin(file string, data []byte, b Budget, ids int) (*LinkTable, error) {
	text, ds := CleanText(file, data)
	if len(ds) > 0 {
		return nil, ds
	}
	// Room for one link per line, up to a bound: a hostile file of empty
	// rows must not make ramify reserve gigabytes up front.
	room := min(bytes.Count(text, []byte{'\n'}), 1<<24, max(b.Left, 0))
	t := &LinkTable{
		File:   file,
		A:      make([]int32, 0, room),
		B:      make([]int32, 0, room),
		Weight: make([]float32, 0, room),
		Line:   make([]int32, 0, room),
	}
	// No more distinct ids than two a link.
	idRoom := max(min(ids, 2*room), 0)
	t.IDs = make([]string, 0, idRoom)
	idt := newIDTable(idRoom, &t.IDs)
	header := false
	readTSV(file, string(text), &ds, func(row *tsvRow) bool {
		if !header {
			header = true
			if strings.TrimRight(row.text, " ") != LinksHeader {
				ds.Add(row.pos(file, 0), "the header must be a, b and weight separated by tabs (\"a\\tb\\tweight\"), not %q", clip(row.text))
				return false
			}
			return true
		}
		if t.Len() >= b.Left {
			ds.Add(row.pos(file, 0), "%s", b.Over)
			return false
		}
		if len(row.Cells) != 3 {
			at := row.pos(file, 0)
			if len(row.Cells) > 3 {
				at = row.pos(file, 3)
			}
			ds.Add(at, "row has %d cells; a link row has 3: a, b and weight", len(row.Cells))
			return true
		}
		a, b := strings.TrimSpace(row.Cells[0]), strings.TrimSpace(row.Cells[1])
		bad := false
		var num [2]int32
		for i, id := range [2]string{a, b} {
			num[i] = idt.lookup(i, id)
			if num[i] < 0 && !ValidItemID(id) {
				ds.Add(row.pos(file, i), "%q is not a valid item id: %s", clip(id), ItemIDRule)
				bad = true
			}
		}
		if !bad && a == b {
			ds.Add(row.pos(file, 1), "item %q is linked to itself", a)
			bad = true
		}
		w, ok := linkWeight(row, file, &ds)
		bad = bad || !ok
		if !bad && len(ds) == 0 {
			for i, id := range [2]string{a, b} {
				if num[i] < 0 {
					num[i] = idt.add(i, id)
				}
			}
			t.A = append(t.A, num[0])
			t.B = append(t.B, num[1])
			t.Weight = append(t.Weight, float32(w))
			t.Line = append(t.Line, int32(row.Line))
		}
		return true
	})
	if !header {
		ds.Add(Pos{file, 1, 1}, "the file is empty; it needs the header \"a\\tb\\tweight\"")
	}
	return orProblems(t, ds)
}

// linkWeight reads a link row's weight: a finite number above 0 that
// single precision holds, as the graph keeps it. A problem is added to ds
// at the weight's cell.
func linkWeight(row *tsvRow, file string, ds *Diags) (float64, bool) {
	w, msg := parseFinite(row.Cells[2])
	switch {
	case msg != "":
		ds.Add(row.pos(file, 2), "weight: %s", msg)
	case w <= 0:
		ds.Add(row.pos(file, 2), "weight %s must be greater than 0", quoteClip(strings.TrimSpace(row.Cells[2])))
	case w > math.MaxFloat32 || float32(w) == 0:
		ds.Add(row.pos(file, 2), "weight %s is out of range: a weight is kept in single precision, between 1.4e-45 and 3.4e38", quoteClip(strings.TrimSpace(row.Cells[2])))
	default:
		return w, true
	}
	return 0, false
}

// idTable numbers the distinct ids of a links file. Edge lists are often
// grouped by a column, so the id last seen in each column is remembered
// and a repeat costs one string comparison instead of a hash lookup.
//
// The other column names ids at random, a million of them in a large
// file: a lookup in a map of strings waits on memory three times (the
// slot, the key's header, its bytes). The table here is open addressing
// with linear probing, each slot holding the id's hash, its number and,
// for an id of up to idInline bytes, the id itself, so a lookup usually
// reads one slot and nothing else.
type idTable struct {
	seed  maphash.Seed
	slots []idSlot // a power of two of them, at most half full
	count int
	ids   *[]string // the ids by number, for those too long to keep inline
	last  [2]int32
	lastS [2]string
}

// idInline is the longest id a slot keeps itself.
const idInline = 19

// idSlot is one slot of an idTable: empty while num is 0.
type idSlot struct {
	hash uint64
	num  int32 // the id's number + 1
	size uint8 // len(id), or idInline+1 when the id is not kept inline
	key  [idInline]byte
}

// newIDTable makes room for about room ids, numbered into ids.
func newIDTable(room int, ids *[]string) *idTable {
	size := 16
	for size < 2*room {
		size *= 2
	}
	return &idTable{seed: maphash.MakeSeed(), slots: make([]idSlot, size), ids: ids, last: [2]int32{-1, -1}}
}

// lookup returns the number of id, seen in column col, or -1 when it is
// new. A numbered id is valid: only valid ids are added.
func (t *idTable) lookup(col int, id string) int32 {
	if t.last[col] >= 0 && id == t.lastS[col] {
		return t.last[col]
	}
	h := maphash.String(t.seed, id)
	mask := uint64(len(t.slots) - 1)
	for i := h & mask; ; i = (i + 1) & mask {
		s := &t.slots[i]
		if s.num == 0 {
			return -1
		}
		if s.hash == h && t.holds(s, id) {
			// id, not the kept copy: the next row's id is compared with
			// it, and id lies in the text being read, in the cache.
			k := s.num - 1
			t.last[col], t.lastS[col] = k, id
			return k
		}
	}
}

// holds reports whether slot s is id's.
func (t *idTable) holds(s *idSlot, id string) bool {
	if s.size <= idInline {
		return int(s.size) == len(id) && string(s.key[:s.size]) == id
	}
	return (*t.ids)[s.num-1] == id
}

// add numbers a new id, appending a copy of it to the ids: a kept
// substring would pin the whole file in memory.
func (t *idTable) add(col int, id string) int32 {
	if 2*(t.count+1) > len(t.slots) {
		t.grow()
	}
	k := int32(len(*t.ids))
	v := strings.Clone(id)
	*t.ids = append(*t.ids, v)
	t.place(idSlot{hash: maphash.String(t.seed, v), num: k + 1}, v)
	t.count++
	t.last[col], t.lastS[col] = k, v
	return k
}

// place puts s, the slot of id, in the first free slot of its probe run.
func (t *idTable) place(s idSlot, id string) {
	s.size = idInline + 1
	if len(id) <= idInline {
		s.size = uint8(copy(s.key[:], id))
	}
	mask := uint64(len(t.slots) - 1)
	i := s.hash & mask
	for t.slots[i].num != 0 {
		i = (i + 1) & mask
	}
	t.slots[i] = s
}

// grow doubles the slots and puts every id back.
func (t *idTable) grow() {
	old := t.slots
	t.slots = make([]idSlot, 2*len(old))
	for _, s := range old {
		if s.num != 0 {
			t.place(s, (*t.ids)[s.num-1])
		}
	}
}
