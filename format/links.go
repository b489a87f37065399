package format

import (
	"bytes"
	"hash/maphash"
	"math"
	"runtime"
	"slices"
	"strings"
	"sync"
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
//
// A large file is read in pieces at once, one a processor
// (parseLinkPieces); the table is the same as one read from the top.
func ParseLinkTableWithin(file string, data []byte, b Budget, ids int) (*LinkTable, error) {
	text, ds := CleanText(file, data)
	if len(ds) > 0 {
		return nil, ds
	}
	if n := min(runtime.GOMAXPROCS(0), len(text)/linkPieceBytes); n > 1 {
		if t := parseLinkPieces(file, text, b, ids, n); t != nil {
			return t, nil
		}
	}
	return parseLinkText(file, text, b, ids)
}

// linkPieceBytes is the least a piece read on its own holds: below it,
// starting a reader costs more than it saves.
const linkPieceBytes = 1 << 20

// parseLinkText reads a cleaned links file from the top: the table, or
// every problem in it.
func parseLinkText(file string, text []byte, b Budget, ids int) (*LinkTable, error) {
	var ds Diags
	t, idt := newLinkTable(file, text, b, ids)
	readLinkRows(file, text, 0, true, b, t, idt, &ds)
	return orProblems(t, ds)
}

// newLinkTable makes an empty table of file with room for the rows of text
// (at most b.Left of them) and for about ids distinct ids.
func newLinkTable(file string, text []byte, b Budget, ids int) (*LinkTable, *idTable) {
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
	return t, newIDTable(idRoom, &t.IDs)
}

// parseLinkPieces reads text in n pieces that end at line ends, each on
// its own goroutine into a table of its own, and joins the tables in file
// order. The joined table numbers ids in order of first appearance just
// as one read from the top does: the first piece's ids keep their
// numbers, and each later piece's ids, in that piece's order, take the
// number they already have or the next one. It returns nil when any
// piece has a problem, or the pieces hold more than b.Left links, so the
// caller reads the file from the top for the problems in file order.
func parseLinkPieces(file string, text []byte, b Budget, ids, n int) *LinkTable {
	type piece struct {
		text  []byte
		lines int // lines before the piece
		t     *LinkTable
		idt   *idTable
		ds    Diags
	}
	pieces := make([]piece, 0, n)
	for rest, lines := text, 0; len(rest) > 0; {
		end := len(rest)
		if len(pieces) < n-1 && len(rest) > len(text)/n {
			if nl := bytes.IndexByte(rest[len(text)/n:], '\n'); nl >= 0 {
				end = len(text)/n + nl + 1
			}
		}
		pieces = append(pieces, piece{text: rest[:end], lines: lines})
		lines += bytes.Count(rest[:end], []byte{'\n'})
		rest = rest[end:]
	}
	var wg sync.WaitGroup
	for i := range pieces {
		wg.Add(1)
		go func(p *piece, first bool) {
			defer wg.Done()
			// Every piece may hold up to b.Left links; their sum is checked
			// once all are read.
			p.t, p.idt = newLinkTable(file, p.text, b, ids)
			readLinkRows(file, p.text, p.lines, first, b, p.t, p.idt, &p.ds)
		}(&pieces[i], i == 0)
	}
	wg.Wait()
	total := 0
	for _, p := range pieces {
		if len(p.ds) > 0 {
			return nil
		}
		total += p.t.Len()
	}
	if total > b.Left {
		return nil
	}
	t, idt := pieces[0].t, pieces[0].idt
	t.A, t.B = slices.Grow(t.A, total-t.Len()), slices.Grow(t.B, total-t.Len())
	t.Weight, t.Line = slices.Grow(t.Weight, total-t.Len()), slices.Grow(t.Line, total-t.Len())
	for _, p := range pieces[1:] {
		num := make([]int32, len(p.t.IDs))
		for k, id := range p.t.IDs {
			if num[k] = idt.lookup(0, id); num[k] < 0 {
				num[k] = idt.add(0, id)
			}
		}
		for k := range p.t.A {
			t.A = append(t.A, num[p.t.A[k]])
			t.B = append(t.B, num[p.t.B[k]])
		}
		t.Weight = append(t.Weight, p.t.Weight...)
		t.Line = append(t.Line, p.t.Line...)
	}
	return t
}

// readLinkRows adds the links of text, whose first line is line lines+1 of
// file, to t, numbering ids with idt, and the problems to ds. header says
// whether text starts the file, and so with the header row.
func readLinkRows(file string, text []byte, lines int, header bool, b Budget, t *LinkTable, idt *idTable, ds *Diags) {
	readTSV(file, string(text), lines, ds, func(row *tsvRow) bool {
		if header {
			header = false
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
		w, ok := linkWeight(row, file, ds)
		bad = bad || !ok
		if !bad && len(*ds) == 0 {
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
	if header && lines == 0 {
		ds.Add(Pos{file, 1, 1}, "the file is empty; it needs the header \"a\\tb\\tweight\"")
	}
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
