package format

import (
	"math"
	"strconv"
	"strings"
)

// PacketHeader is the first line of every review packet: the number is
// the version of the packet format.
const PacketHeader = "# ramify packet format 1"

// legacyPacketHeader is the first line packets had before it named the
// format; such packets are read as format 1.
const legacyPacketHeader = "# ramify packet 1"

// packetVersionPrefix starts the first line of every packet format.
const packetVersionPrefix = "# ramify packet format "

// IsPacketText reports whether data starts like a review packet, of any
// format version.
func IsPacketText(data []byte) bool {
	text := strings.TrimPrefix(string(data[:min(len(data), 64)]), "\ufeff")
	return strings.HasPrefix(text, packetVersionPrefix) || strings.HasPrefix(text, legacyPacketHeader)
}

// Packet reasons and verdicts.
const (
	ReasonUncertain = "uncertain" // drawn where the committee disagrees most
	ReasonAudit     = "audit"     // drawn uniformly at random
	VerdictPending  = "pending"
	VerdictOK       = "ok"
	VerdictFixed    = "fixed"
)

var (
	packetReasons  = []string{ReasonUncertain, ReasonAudit}
	packetVerdicts = []string{VerdictOK, VerdictFixed, VerdictPending}
	packetHeaders  = []string{"reason", "from", "drawn", "size", "score"}
	packetFields   = []string{"verdict", "reviewer", "note"}
)

// Packet is a review packet (README "A tour of the workflow"): the tree
// restricted to a few items, with why and from what it was drawn and the
// reviewer's answer.
type Packet struct {
	Reason string // ReasonUncertain or ReasonAudit
	From   string // structure hash of the taxonomy it was drawn from
	Drawn  string // YYYY-MM-DD
	Size   int    // items in the packet
	// Score is how uncertain the drawn part of the tree was, for uncertain
	// packets; written with 4 decimals, and not written when 0.
	Score    float64
	Verdict  string // VerdictPending, VerdictOK or VerdictFixed
	Reviewer string
	Note     string
	Tree     *Category // canonical order; lines are file lines
	// Labels are the item labels shown beside item ids as trailing
	// comments ("claw-hammer  # Claw hammer, 16 oz"), by id: only for the
	// reviewer to read. A comment never changes an answer, so nothing
	// but the packet printer uses them.
	Labels map[string]string
	// TreeLine is the file line where the tree begins.
	TreeLine int
}

// MaxScore bounds a packet score, so that four decimals print it exactly.
const MaxScore = 1_000_000

// ParsePacket reads a review packet. Reviewers edit these files by hand,
// so the verdict is read case-insensitively and every problem is reported
// with its line.
func ParsePacket(file string, data []byte) (*Packet, error) {
	text, ds := CleanText(file, data)
	if len(ds) > 0 {
		return nil, ds
	}
	lines := strings.Split(string(text), "\n")
	p := &Packet{}
	pp := &packetParser{file: file, p: p, seen: map[string]int{}, lastLine: len(lines)}
	if len(lines) > 1 && lines[len(lines)-1] == "" {
		pp.lastLine-- // text after the final line break is no line
	}
	first := strings.TrimRight(lines[0], " ")
	if v, ok := strings.CutPrefix(first, packetVersionPrefix); ok && v != "1" {
		pp.ds.Add(Pos{file, 1, 1}, "unsupported packet format %q; this ramify reads format 1", clip(v))
		return nil, pp.ds
	}
	if first != PacketHeader && first != legacyPacketHeader {
		pp.ds.Add(Pos{file, 1, 1}, "not a ramify packet: the first line must be %q, not %q", PacketHeader, clip(lines[0]))
		return nil, pp.ds
	}
	i := 1
	// Header: comment lines. "# key: value" lines carry the fields; the
	// rest are the instructions, which are read past.
	for ; i < len(lines) && strings.HasPrefix(lines[i], "#"); i++ {
		pp.headerLine(i+1, lines[i])
	}
	// Answer fields, up to the first blank line or the first line that is
	// not a field: there the tree begins.
	for ; i < len(lines); i++ {
		line := lines[i]
		if strings.TrimSpace(line) == "" {
			if pp.fields > 0 {
				i++
				break
			}
			continue
		}
		if strings.HasPrefix(line, "#") {
			continue
		}
		if !pp.fieldLine(i+1, line) {
			break
		}
	}
	p.TreeLine = i + 1
	treeLines := lines[min(i, len(lines)):]
	p.Labels = cutItemComments(treeLines)
	tree, _, tds := parseTree(file, []byte(strings.Join(treeLines, "\n")), p.TreeLine, false)
	pp.ds = append(pp.ds, tds...)
	pp.treeErrors = len(tds)
	tree.Sort()
	p.Tree = tree
	pp.finish()
	return orProblems(p, pp.ds)
}

type packetParser struct {
	file string
	p    *Packet
	seen map[string]int // field or header name -> line
	// fields counts answer lines read, treeErrors the problems in the tree.
	fields, treeErrors int
	lastLine           int // the last line of the file an editor shows
	ds                 Diags
}

// headerLine reads one comment line of the header.
func (pp *packetParser) headerLine(lineNo int, line string) {
	body := strings.TrimSpace(strings.TrimPrefix(line, "#"))
	key, value, ok := strings.Cut(body, ":")
	if !ok || !isLowerWord(key) {
		return // an instruction line
	}
	value = strings.TrimSpace(value)
	at := Pos{pp.file, lineNo, 1}
	if !contains(packetHeaders, key) {
		pp.ds.Add(at, "unknown header field %q%s", key, didYouMean(key, packetHeaders))
		return
	}
	if prev, dup := pp.seen[key]; dup {
		pp.ds.Add(at, "header field %q appears twice (first at line %d)", key, prev)
		return
	}
	pp.seen[key] = lineNo
	p := pp.p
	switch key {
	case "reason":
		if !contains(packetReasons, value) {
			pp.ds.Add(at, "reason %q is not one of uncertain, audit%s", clip(value), didYouMean(value, packetReasons))
		}
		p.Reason = value
	case "from":
		if len(value) != 12 || !isHex(value) {
			pp.ds.Add(at, "from %q is not a structure hash (12 hex digits)", clip(value))
		}
		p.From = value
	case "drawn":
		if !validDate(value) {
			pp.ds.Add(at, "drawn %q is not a date written YYYY-MM-DD", clip(value))
		}
		p.Drawn = value
	case "size":
		n, err := strconv.Atoi(value)
		if err != nil || n < 1 || n > MaxItems {
			pp.ds.Add(at, "size %q is not a number of items", clip(value))
		}
		p.Size = n
	case "score":
		x, err := strconv.ParseFloat(value, 64)
		if err != nil || math.IsNaN(x) || x < 0 || x > MaxScore {
			pp.ds.Add(at, "score %q is not a number between 0 and %s", clip(value), grouped(MaxScore))
			return
		}
		// Keep what four decimals say, so the packet prints back the same.
		p.Score = math.Round(x*1e4) / 1e4
		if p.Score == 0 {
			p.Score = 0 // no negative zero
		}
	}
}

// fieldLine reads a "name: value" answer line; it reports false when the
// line is not a field at all (the tree has begun).
func (pp *packetParser) fieldLine(lineNo int, line string) bool {
	key, value, ok := strings.Cut(line, ":")
	key = strings.TrimSpace(key)
	if !ok || !isLowerWord(strings.ToLower(key)) {
		return false
	}
	pp.fields++
	at := Pos{pp.file, lineNo, 1}
	name := strings.ToLower(key)
	if !contains(packetFields, name) {
		if s := Suggest(name, packetFields); s != "" {
			pp.ds.Add(at, "unknown field %q; did you mean %q?", key, s)
			return true
		}
		pp.fields--
		return false
	}
	if prev, dup := pp.seen[name]; dup {
		pp.ds.Add(at, "field %q appears twice (first at line %d)", name, prev)
		return true
	}
	pp.seen[name] = lineNo
	value = strings.TrimSpace(value)
	switch name {
	case "verdict":
		v := strings.ToLower(value)
		if !contains(packetVerdicts, v) {
			col := RuneCol(line, strings.Index(line, ":")+1)
			if value == "" {
				pp.ds.Add(Pos{pp.file, lineNo, col}, "verdict is empty; write ok, fixed or pending")
			} else {
				pp.ds.Add(Pos{pp.file, lineNo, col}, "verdict %q is not ok, fixed or pending%s", clip(value), didYouMean(v, packetVerdicts))
			}
		}
		pp.p.Verdict = v
	case "reviewer":
		pp.p.Reviewer = value
	case "note":
		pp.p.Note = value
	}
	return true
}

// finish checks what the whole packet must have.
func (pp *packetParser) finish() {
	p := pp.p
	top := Pos{pp.file, 1, 1}
	for _, key := range []string{"reason", "from", "drawn", "size"} {
		if _, ok := pp.seen[key]; !ok {
			pp.ds.Add(top, "the header has no %q line", "# "+key+": ")
		}
	}
	if _, ok := pp.seen["verdict"]; !ok {
		pp.ds.Add(Pos{pp.file, min(p.TreeLine, pp.lastLine), 1}, "the packet has no verdict line; write \"verdict: ok\", \"verdict: fixed\" or \"verdict: pending\" above the tree")
	}
	if line, ok := pp.seen["score"]; ok && p.Reason == ReasonAudit {
		pp.ds.Add(Pos{pp.file, line, 1}, "score is only for uncertain packets; an audit packet is drawn at random")
	}
	if n := p.Tree.Size(); p.Size > 0 && n != p.Size && pp.treeErrors == 0 {
		pp.ds.Add(Pos{pp.file, pp.seen["size"], 1}, "the header says size %d but the tree has %d items; every item of the packet must stay in it exactly once", p.Size, n)
	}
}

func isLowerWord(s string) bool {
	if s == "" {
		return false
	}
	for _, c := range []byte(s) {
		if c < 'a' || c > 'z' {
			return false
		}
	}
	return true
}
