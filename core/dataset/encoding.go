package dataset

import (
	"bytes"
	"unicode/utf16"
	"unicode/utf8"
)

// decodeText returns data as UTF-8: a UTF-16 file with a byte-order mark
// (little- or big-endian, as spreadsheet programs write "Unicode text") is
// converted and a note says so; UTF-32 and UTF-16 without a byte-order mark
// (zero bytes in every other position) are refused by name. Other bytes are
// read as they are (numbers and dates are ASCII; a UTF-8 BOM is skipped by
// the record reader).
func decodeText(name string, data []byte) ([]byte, string, error) {
	switch {
	case bytes.HasPrefix(data, []byte{0xFF, 0xFE, 0, 0}), bytes.HasPrefix(data, []byte{0, 0, 0xFE, 0xFF}):
		return nil, "", &ParseError{File: name, Err: wrapf(ErrEncoding, "the file is UTF-32 text; save it as UTF-8 (or UTF-16)")}
	case bytes.HasPrefix(data, []byte{0xFF, 0xFE}):
		return utf16To8(data[2:], false), "the file is UTF-16 (little-endian) text: converted to UTF-8", nil
	case bytes.HasPrefix(data, []byte{0xFE, 0xFF}):
		return utf16To8(data[2:], true), "the file is UTF-16 (big-endian) text: converted to UTF-8", nil
	}
	// UTF-16 without a byte-order mark: zero bytes in every other position.
	n := min(len(data), 1024)
	if n >= 4 {
		zeroEven, zeroOdd := 0, 0
		for i := 0; i < n; i++ {
			if data[i] == 0 {
				if i%2 == 0 {
					zeroEven++
				} else {
					zeroOdd++
				}
			}
		}
		if 4*zeroEven > n || 4*zeroOdd > n {
			return nil, "", &ParseError{File: name, Err: wrapf(ErrEncoding, "the file looks like UTF-16 text without a byte-order mark; save it as UTF-8")}
		}
	}
	return data, "", nil
}

// utf16To8 converts UTF-16 code units to UTF-8 (an odd trailing byte is
// dropped; unpaired surrogates become U+FFFD).
func utf16To8(b []byte, big bool) []byte {
	u := make([]uint16, len(b)/2)
	for i := range u {
		if big {
			u[i] = uint16(b[2*i])<<8 | uint16(b[2*i+1])
		} else {
			u[i] = uint16(b[2*i+1])<<8 | uint16(b[2*i])
		}
	}
	out := make([]byte, 0, len(u))
	for _, r := range utf16.Decode(u) {
		out = utf8.AppendRune(out, r)
	}
	return out
}
