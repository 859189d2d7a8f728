package dataset

import (
	"bytes"
	"unicode/utf16"
	"unicode/utf8"
)

// decodeText returns data as UTF-8: a UTF-16 file with a byte-order mark
// (little- or big-endian, as spreadsheet programs write "Unicode text") is
// converted and a note says so; UTF-32 and UTF-16 without a byte-order mark
// (zero bytes in every other position) are refused by name. Text that is not
// valid UTF-8 is read as Windows-1252 (noted); a UTF-8 BOM is skipped by the
// record reader.
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
	if !utf8.Valid(data) {
		return cp1252To8(data), cp1252Note, nil
	}
	return data, "", nil
}

// cp1252Note is the note on text read as Windows-1252.
const cp1252Note = "the file is not UTF-8: read as Windows-1252 (Latin-1 with the typographic characters of 0x80-0x9F); save it as UTF-8 if names look wrong"

// cp1252High maps the bytes 0x80-0x9F of Windows-1252 (WHATWG Encoding
// Standard, index windows-1252); 0 marks the five unassigned bytes, read as
// U+FFFD. Bytes 0xA0-0xFF are the Latin-1 code points.
var cp1252High = [32]rune{
	0x20AC, 0, 0x201A, 0x0192, 0x201E, 0x2026, 0x2020, 0x2021, 0x02C6, 0x2030, 0x0160, 0x2039, 0x0152, 0, 0x017D, 0,
	0, 0x2018, 0x2019, 0x201C, 0x201D, 0x2022, 0x2013, 0x2014, 0x02DC, 0x2122, 0x0161, 0x203A, 0x0153, 0, 0x017E, 0x0178,
}

// cp1252To8 converts Windows-1252 text to UTF-8.
func cp1252To8(b []byte) []byte {
	out := make([]byte, 0, len(b)+len(b)/8)
	for _, c := range b {
		switch {
		case c < 0x80:
			out = append(out, c)
		case c < 0xA0:
			r := cp1252High[c-0x80]
			if r == 0 {
				r = utf8.RuneError
			}
			out = utf8.AppendRune(out, r)
		default:
			out = utf8.AppendRune(out, rune(c))
		}
	}
	return out
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
