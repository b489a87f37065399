package export

import "strings"

// A spreadsheet opening a CSV file runs a cell that begins with "=", "+",
// "-" or "@" as a formula, and some also treat a leading tab or carriage
// return that way. The usual guard against such formula injection (common
// practice) writes a single quote before the cell, which spreadsheets show
// as text and hide. To keep the export lossless, a cell that already
// begins with quotes before such a character gets one quote more, and
// UnguardCell, which `ramify init --from` applies to every cell, takes
// exactly one away: the two are inverse on every string.

// formulaLead reports whether s begins with a character a spreadsheet
// reads as the start of a formula.
func formulaLead(s string) bool {
	return s != "" && strings.IndexByte("=+-@\t\r", s[0]) >= 0
}

// guarded reports whether s is a run of one or more quotes and then a
// formula character, or a formula character alone.
func needsGuard(s string) bool {
	return formulaLead(strings.TrimLeft(s, "'"))
}

// GuardCell is the cell as the CSV export writes it: with a quote before
// it when it would start a formula (see above).
func GuardCell(s string) string {
	if needsGuard(s) {
		return "'" + s
	}
	return s
}

// UnguardCell undoes GuardCell: it reports how many bytes it took away
// from the front (0 or 1), so that positions in the cell stay exact.
func UnguardCell(s string) (string, int) {
	if strings.HasPrefix(s, "'") && needsGuard(s) {
		return s[1:], 1
	}
	return s, 0
}
