package review

import (
	"crypto/sha256"
	"encoding/hex"
	"regexp"
	"slices"
	"strconv"
	"strings"
)

// A packet's id is the date it was drawn and a hash of what it is about:
// the structure hash of the taxonomy it shows and its sorted item ids. It
// names the packet's file (reviews/open/ID.outline) and the constraint
// file its answer becomes, so two branches that draw or absorb different
// packets never write the same file, and the hash also lets absorb check
// that a reviewer kept exactly the items drawn.

// packetIDPattern matches DATE-HASH.
var packetIDPattern = regexp.MustCompile(`^([0-9]{4}-[0-9]{2}-[0-9]{2})-([0-9a-f]{12})$`)

// PacketHash is the 12-hex-digit content hash of a packet over the given
// items drawn from the taxonomy with structure hash from.
func PacketHash(from string, ids []string) string {
	sorted := slices.Clone(ids)
	slices.Sort(sorted)
	h := sha256.New()
	h.Write([]byte("ramify packet\n" + from + "\n"))
	h.Write([]byte(strings.Join(sorted, "\n")))
	sum := h.Sum(nil)
	return hex.EncodeToString(sum[:6])
}

// PacketID is the id of a packet drawn on date (YYYY-MM-DD).
func PacketID(date, from string, ids []string) string {
	return date + "-" + PacketHash(from, ids)
}

// SplitPacketID takes a packet id apart into its date and hash; ok is false
// when id is not of the form DATE-HASH (a file renamed by hand).
func SplitPacketID(id string) (date, hash string, ok bool) {
	m := packetIDPattern.FindStringSubmatch(id)
	if m == nil {
		return "", "", false
	}
	return m[1], m[2], true
}

// Seed turns a structure hash into the seed of the committee and of the
// audit draws, so that drawing twice from the same taxonomy gives the same
// packets. Anything that is not a structure hash seeds from its bytes.
func Seed(structure string) uint64 {
	if v, err := strconv.ParseUint(structure, 16, 64); err == nil && len(structure) == 12 {
		return replicateSeed(v, 0x7265) // "re"
	}
	sum := sha256.Sum256([]byte(structure))
	var v uint64
	for _, b := range sum[:8] {
		v = v<<8 | uint64(b)
	}
	return v
}
