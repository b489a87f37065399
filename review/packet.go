package review

import (
	"math"

	"github.com/ramify-tax/ramify/format"
)

// NewPacket turns a draft into the packet file's contents: the taxonomy
// root restricted to the draft's items (with the full tree's names), drawn
// from the structure hash from on date. ids maps item indices to ids. It
// returns the packet and its id.
func NewPacket(d Draft, root *format.Category, ids []string, from, date string) (*format.Packet, string) {
	items := make([]string, len(d.Items))
	for i, x := range d.Items {
		items[i] = ids[x]
	}
	p := &format.Packet{
		Reason:  d.Reason,
		From:    from,
		Drawn:   date,
		Size:    len(items),
		Verdict: format.VerdictPending,
		Tree:    Restrict(root, items),
	}
	if d.Reason == format.ReasonUncertain {
		// Four decimals, as the file shows it, so the packet reads back the
		// same.
		p.Score = math.Round(d.Score*1e4) / 1e4
	}
	return p, PacketID(date, from, items)
}
