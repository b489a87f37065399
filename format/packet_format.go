package format

import (
	"bytes"
	"fmt"
)

// FormatPacket prints p in canonical form. The instructions are fixed
// text that names the item count; the tree is printed in canonical order
// (p itself is not changed), each item with its label (p.Labels, through
// PacketComment) as a trailing comment. ParsePacket reads the result back
// to p.
func FormatPacket(p *Packet) []byte {
	var b bytes.Buffer
	b.WriteString(PacketHeader + "\n")
	fmt.Fprintf(&b, "# reason: %s\n", p.Reason)
	fmt.Fprintf(&b, "# from: %s\n", p.From)
	fmt.Fprintf(&b, "# drawn: %s\n", p.Drawn)
	fmt.Fprintf(&b, "# size: %d\n", p.Size)
	if p.Reason == ReasonUncertain && p.Score != 0 {
		fmt.Fprintf(&b, "# score: %.4f\n", p.Score)
	}
	b.WriteString("#\n")
	fmt.Fprintf(&b, "# Check how these %d items are grouped.\n", p.Size)
	b.WriteString("# If the grouping is right, change \"pending\" below to \"ok\".\n")
	b.WriteString("# If it is wrong, move lines until it is right, change \"pending\" to \"fixed\",\n")
	b.WriteString("# and run `ramify absorb`. Put your name after \"reviewer:\".\n")
	if hasLabels(p) {
		b.WriteString("# The text after \"#\" on an item line is the item's label, to read only.\n")
	}
	writeField(&b, "verdict", p.Verdict)
	writeField(&b, "reviewer", p.Reviewer)
	writeField(&b, "note", p.Note)
	b.WriteByte('\n')
	if p.Tree != nil {
		tree := p.Tree.Clone()
		tree.Sort()
		writeNode(&b, tree, 0, p.Labels)
	}
	return b.Bytes()
}

func writeField(b *bytes.Buffer, name, value string) {
	b.WriteString(name + ":")
	if value != "" {
		b.WriteString(" " + value)
	}
	b.WriteByte('\n')
}

// hasLabels reports whether any item of p's tree is shown with a label.
func hasLabels(p *Packet) bool {
	if p.Tree == nil || len(p.Labels) == 0 {
		return false
	}
	for _, id := range p.Tree.AllItems() {
		if PacketComment(p.Labels[id]) != "" {
			return true
		}
	}
	return false
}
