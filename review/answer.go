package review

import (
	"bytes"
	"fmt"
	"slices"
	"strings"

	"github.com/ramify-tax/ramify/format"
)

// Answer is a packet read from reviews/open: its repository path, its id
// (the file name without .outline), its text and what it says.
type Answer struct {
	File   string
	ID     string
	Data   []byte
	Packet *format.Packet
}

// Answered reports whether the reviewer gave a verdict.
func (a *Answer) Answered() bool { return a.Packet.Verdict != format.VerdictPending }

// Items lists the packet's item ids, sorted.
func (a *Answer) Items() []string {
	ids := a.Packet.Tree.AllItems()
	slices.Sort(ids)
	return ids
}

// CheckAnswer reports what keeps an answered packet from being absorbed,
// each problem at its line: items the repository does not have; items
// that are not the ones drawn (when the file name carries the packet's
// hash); and, when shown is the packet's tree as drawn (known when it was
// drawn from the current taxonomy; nil otherwise), an "ok" whose tree was
// changed or a "fixed" whose tree arranges every triplet as before.
func CheckAnswer(a *Answer, known func(id string) bool, shown *format.Category) format.Diags {
	var ds format.Diags
	p := a.Packet
	p.Tree.Walk(func(c *format.Category, _ int) bool {
		for i, id := range c.Items {
			if !known(id) {
				line := p.TreeLine
				if i < len(c.ItemLines) {
					line = c.ItemLines[i]
				}
				ds.Add(format.Pos{File: a.File, Line: line, Col: 1}, "item %q is not in the items files; every line of the packet must stay as it was drawn", id)
			}
		}
		return true
	})
	if len(ds) > 0 {
		return ds
	}
	if _, hash, ok := SplitPacketID(a.ID); ok && hash != PacketHash(p.From, a.Items()) {
		ds.Add(format.Pos{File: a.File, Line: lineOf(a.Data, "# size:"), Col: 1},
			"the packet's items are not the %d it was drawn with; keep every item line (move lines, do not add, remove or retype them), or draw a new packet", p.Size)
		return ds
	}
	if shown == nil {
		return nil
	}
	same := SameShape(shown, p.Tree)
	named := TypesNewName(shown, p.Tree)
	verdictAt := format.Pos{File: a.File, Line: lineOf(a.Data, "verdict:"), Col: 1}
	switch {
	case p.Verdict == format.VerdictOK && !same:
		ds.Add(verdictAt, "the verdict is ok but the tree below was changed; write \"verdict: fixed\" if the changed tree is your answer")
	case p.Verdict == format.VerdictOK && named:
		ds.Add(verdictAt, "the verdict is ok but a category was renamed; write \"verdict: fixed\" to record the name")
	case p.Verdict == format.VerdictFixed && same && !named:
		ds.Add(verdictAt, "the verdict is fixed but the tree groups the items as drawn; move lines to show the right grouping, or write \"verdict: ok\"")
	}
	return ds
}

// TypesNewName reports whether the answer names a category (a confirmed
// name) that the packet as drawn did not name so: a name typed by the
// reviewer, which a "fixed" answer records.
func TypesNewName(shown, answer *format.Category) bool {
	had := map[string]string{}
	shown.Walk(func(c *format.Category, _ int) bool {
		if c != shown {
			had[strings.Join(sortedItems(c), "\x00")] = c.DisplayName()
		}
		return true
	})
	found := false
	answer.Walk(func(c *format.Category, _ int) bool {
		if c != answer && !c.Provisional && had[strings.Join(sortedItems(c), "\x00")] != c.DisplayName() {
			found = true
		}
		return !found
	})
	return found
}

func sortedItems(c *format.Category) []string {
	ids := c.AllItems()
	slices.Sort(ids)
	return ids
}

// SameShape reports whether two trees over the same items resolve the
// same triplets the same way.
func SameShape(a, b *format.Category) bool {
	key := func(c *format.Category) []string {
		var out []string
		for _, t := range format.ShapeTriplets(c) {
			pair := []string{t[0], t[1]}
			slices.Sort(pair)
			out = append(out, pair[0]+" "+pair[1]+"|"+t[2])
		}
		slices.Sort(out)
		return out
	}
	return slices.Equal(key(a), key(b))
}

// lineOf is the 1-based line of the first line starting with prefix
// (case-insensitively, after spaces), or 1.
func lineOf(data []byte, prefix string) int {
	for i, line := range strings.Split(string(data), "\n") {
		if strings.HasPrefix(strings.ToLower(strings.TrimLeft(line, " ")), prefix) {
			return i + 1
		}
	}
	return 1
}

// ShapeFile is the constraint file a "fixed" answer becomes: one shape
// record with the reviewer's tree, the packet id and the structure it was
// drawn from.
func ShapeFile(a *Answer, by, date string) *format.ConstraintFile {
	note := a.Packet.Note
	if note == "" {
		note = fmt.Sprintf("answer to review packet %s (%s)", a.ID, a.Packet.Reason)
	}
	// An answer keeps its side-by-side entries too: the packet as drawn
	// shows the tree restricted to its items, where they already meet as
	// drawn, so the statement binds only where the reviewer laid grouped
	// items side by side (see SideBySide).
	return &format.ConstraintFile{Shapes: []format.Shape{{
		Tree:       a.Packet.Tree.Clone(),
		Packet:     a.ID,
		Structure:  a.Packet.From,
		SideBySide: true,
		Provenance: format.Provenance{By: by, Date: date, Note: note},
	}}}
}

// ShapePath is where the answer to packet id is recorded.
func ShapePath(id string) string { return format.ConstraintsDir + "/review-" + id + ".toml" }

// Review folders, relative to the repository.
const (
	OpenDir = "reviews/open"
	DoneDir = "reviews/done"
)

// DoneText is the packet as it is kept in reviews/done: the answer as
// given, with the reviewer filled in and a line saying when it was
// absorbed. The packet stays readable by format.ParsePacket.
func DoneText(a *Answer, reviewer, date string) []byte {
	p := *a.Packet
	p.Reviewer = reviewer
	text := format.FormatPacket(&p)
	line := []byte("# absorbed on " + date + "\n")
	// After the header fields, before the instructions.
	if i := bytes.Index(text, []byte("\n#\n")); i >= 0 {
		out := append([]byte{}, text[:i+1]...)
		out = append(out, line...)
		return append(out, text[i+1:]...)
	}
	return append(line, text...)
}
