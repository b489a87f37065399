package report

import (
	"bufio"
	"strings"
)

// Functions that only the tests call, kept out of the built package.

// JSON is the data the page embeds, as one document {"meta": ...,
// "items": ...}, for tests and scripts.
func (pg *Page) JSON() []byte {
	var b strings.Builder
	bw := bufio.NewWriter(&b)
	bw.WriteString(`{"meta":`)
	pg.writeMeta(&jsonWriter{w: bw})
	bw.WriteString(",\n\"items\":")
	pg.writeItems(&jsonWriter{w: bw})
	bw.WriteString("}\n")
	bw.Flush()
	return []byte(b.String())
}
