package main

import (
	"bytes"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/review"
)

// The demo's packets are what `review draw` writes today: canonical text
// in the current format, every item with its label from the items file.
func TestDemoPacketsAreCurrent(t *testing.T) {
	const demo = "../../examples/tool-library"
	p := loadProject(t, demo)
	open, ds := readPackets(demo, review.OpenDir)
	if len(ds) > 0 {
		t.Fatal(ds)
	}
	if len(open) == 0 {
		t.Fatal("the demo has no open packet")
	}
	for _, a := range open {
		if !bytes.HasPrefix(a.Data, []byte(format.PacketHeader+"\n")) {
			t.Errorf("%s does not start with %q", a.File, format.PacketHeader)
		}
		if got := format.FormatPacket(a.Packet); !bytes.Equal(got, a.Data) {
			t.Errorf("%s is not in canonical form (-file +canonical):\n%s", a.File, cmp.Diff(string(a.Data), string(got)))
		}
		want := map[string]string{}
		for _, id := range a.Items() {
			if l := p.Items[p.Index[id]].Label; l != "" {
				want[id] = format.PacketComment(l)
			}
		}
		if diff := cmp.Diff(want, a.Packet.Labels); diff != "" {
			t.Errorf("%s: labels are not the items' (-items +packet):\n%s", a.File, diff)
		}
	}
}
