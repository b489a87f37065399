package review

import (
	"math"

	"github.com/ramify-tax/ramify/format"
)

// NewPacket turns a draft into the packet file's contents: the taxonomy
// root restricted to the draft's items (with the full tree's names), each
// item shown with its label, drawn from the structure hash from on date.
// items are the repository's items, by index. It returns the packet and
// its id.
func NewPacket(d Draft, root *format.Category, items []format.Item, from, date string) (*format.Packet, string) {
	ids := make([]string, len(d.Items))
	var labels map[string]string
	for i, x := range d.Items {
		ids[i] = items[x].ID
		if l := items[x].Label; l != "" {
			if labels == nil {
				labels = make(map[string]string, len(d.Items))
			}
			labels[ids[i]] = l
		}
	}
	p := &format.Packet{
		Reason:  d.Reason,
		From:    from,
		Drawn:   date,
		Size:    len(ids),
		Verdict: format.VerdictPending,
		Tree:    Restrict(root, ids),
		Labels:  labels,
	}
	if d.Reason == format.ReasonUncertain {
		// Four decimals, as the file shows it, so the packet reads back the
		// same.
		p.Score = math.Round(d.Score*1e4) / 1e4
	}
	return p, PacketID(date, from, ids)
}
