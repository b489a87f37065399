package format

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"unicode/utf8"
)

// Limits on what ramify reads. Inputs can come from an untrusted pull
// request, so every reader is bounded before it allocates.
const (
	// MaxLineBytes bounds one line of any text input.
	MaxLineBytes = 1 << 20
	// MaxDataFileBytes bounds item, vector and link files (a million items
	// with descriptions fits well inside it).
	MaxDataFileBytes = 1 << 30
	// MaxSmallFileBytes bounds settings, constraint files and packets.
	MaxSmallFileBytes = 16 << 20
	// MaxOutlineBytes bounds an outline.
	MaxOutlineBytes = 256 << 20
	// MaxDepth bounds the nesting of an outline; ramify itself never
	// writes deeper trees than max_depth allows, far below this.
	MaxDepth = 256
)

// ReadFileLimited reads a whole file, refusing one larger than limit
// without reading it into memory first.
func ReadFileLimited(path, display string, limit int64) ([]byte, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	info, err := f.Stat()
	if err != nil {
		return nil, err
	}
	if !info.Mode().IsRegular() {
		return nil, Diags{{Pos: Pos{File: display}, Msg: "not a regular file"}}
	}
	if info.Size() > limit {
		return nil, Diags{{Pos: Pos{File: display}, Msg: fmt.Sprintf("file is %d bytes; the limit for this kind of file is %d", info.Size(), limit)}}
	}
	// The size is known: one buffer of it, and a byte more to notice a
	// file that grew since, instead of the copies a growing buffer makes
	// (a quarter of a gigabyte of links would be copied about twice).
	data := make([]byte, 0, min(info.Size(), limit)+1)
	r := io.LimitReader(f, limit+1)
	for {
		if len(data) == cap(data) {
			data = append(data, 0)[:len(data)]
		}
		n, err := r.Read(data[len(data):cap(data)])
		data = data[:len(data)+n]
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, err
		}
	}
	if int64(len(data)) > limit {
		return nil, Diags{{Pos: Pos{File: display}, Msg: fmt.Sprintf("file is larger than the limit of %d bytes", limit)}}
	}
	return data, nil
}

// CleanText checks that data is text ramify can read — valid UTF-8, no NUL
// bytes, no line longer than MaxLineBytes — and returns it with CRLF line
// endings turned into LF. A leading byte-order mark is dropped. Problems are
// reported at most once per kind, at their first place, so a binary file
// does not flood the report.
func CleanText(file string, data []byte) ([]byte, Diags) {
	var ds Diags
	data = bytes.TrimPrefix(data, []byte("\xef\xbb\xbf"))
	line, col := 1, 1
	lineStart := 0
	sawNUL, sawBadUTF8, sawLong := false, false, false
	for i := 0; i < len(data); {
		c := data[i]
		if c == '\n' {
			if !sawLong && i-lineStart > MaxLineBytes {
				sawLong = true
				ds.Add(Pos{file, line, 1}, "line is %d bytes long; the limit is %d", i-lineStart, MaxLineBytes)
			}
			line++
			col = 1
			i++
			lineStart = i
			continue
		}
		if c == 0 && !sawNUL {
			sawNUL = true
			ds.Add(Pos{file, line, col}, "NUL byte: this is not a text file")
		}
		if c < utf8.RuneSelf {
			i++
			col++
			continue
		}
		r, size := utf8.DecodeRune(data[i:])
		if r == utf8.RuneError && size == 1 && !sawBadUTF8 {
			sawBadUTF8 = true
			ds.Add(Pos{file, line, col}, "invalid UTF-8 (byte 0x%02x); files must be UTF-8", c)
		}
		i += size
		col++
	}
	if !sawLong && len(data)-lineStart > MaxLineBytes {
		ds.Add(Pos{file, line, 1}, "line is %d bytes long; the limit is %d", len(data)-lineStart, MaxLineBytes)
	}
	if len(ds) > 0 {
		return nil, ds
	}
	if bytes.IndexByte(data, '\r') >= 0 {
		data = bytes.ReplaceAll(data, []byte("\r\n"), []byte("\n"))
	}
	return data, nil
}

// RuneCol converts a byte offset within a line to a 1-based character column.
func RuneCol(line string, byteOff int) int {
	if byteOff > len(line) {
		byteOff = len(line)
	}
	return utf8.RuneCountInString(line[:byteOff]) + 1
}
