package dataset

import (
	"math"
	"strconv"
	"strings"
)

// MissingMarkers lists the cell texts (compared after trimming spaces,
// ignoring case) that mark a missing value, besides the empty cell.
var MissingMarkers = []string{"NA", "N/A", "NaN", ".", "#N/A", "null", "-"}

// IsMissing reports whether a cell is empty or one of MissingMarkers.
func IsMissing(s string) bool {
	s = trimSpace(s)
	switch len(s) {
	case 0:
		return true
	case 1:
		return s == "." || s == "-"
	case 2:
		return strings.EqualFold(s, "NA")
	case 3:
		return strings.EqualFold(s, "N/A") || strings.EqualFold(s, "NaN")
	case 4:
		return strings.EqualFold(s, "#N/A") || strings.EqualFold(s, "null")
	}
	return false
}

// decimal is the decimal mark used when reading numbers.
type decimal uint8

const (
	decPoint decimal = iota
	decComma
)

// trimSpace trims ASCII white space and no-break spaces.
func trimSpace(s string) string {
	if len(s) > 0 && s[0] > ' ' && s[len(s)-1] > ' ' && s[0] < 0x80 && s[len(s)-1] < 0x80 {
		return s
	}
	return strings.TrimFunc(s, func(r rune) bool {
		return r == ' ' || r == '\t' || r == '\n' || r == '\r' || r == '\v' || r == '\f' || r == 0xA0 || r == 0x202F
	})
}

// plainNumber reports whether s has only the characters of a plain decimal
// float: digits, sign, '.', exponent.
func plainNumber(s string) bool {
	if s == "" {
		return false
	}
	digit := false
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case c >= '0' && c <= '9':
			digit = true
		case c == '.' || c == '+' || c == '-' || c == 'e' || c == 'E':
		default:
			return false
		}
	}
	return digit
}

// parseNumber reads one cell as a finite number with decimal mark dec.
// ok is false when the cell is not a number.
func parseNumber(s string, dec decimal) (float64, bool) {
	s = trimSpace(s)
	if dec == decPoint && plainNumber(s) {
		v, err := strconv.ParseFloat(s, 64)
		if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
			return 0, false
		}
		return v, true
	}
	return parseGrouped(s, dec)
}

// parseGrouped handles thousands groups and a decimal comma.
func parseGrouped(s string, dec decimal) (float64, bool) {
	if s == "" {
		return 0, false
	}
	var b [64]byte
	out := b[:0]
	i := 0
	if s[0] == '+' || s[0] == '-' {
		out = append(out, s[0])
		i = 1
	}
	decMark := byte('.')
	if dec == decComma {
		decMark = ','
	}
	// Integer part with optional thousands groups.
	groups := 0   // separators seen
	groupLen := 0 // digits in the current group
	var sep rune  // the grouping separator in use
	nInt := 0
	for i < len(s) {
		c := s[i]
		if c >= '0' && c <= '9' {
			out = append(out, c)
			groupLen++
			nInt++
			i++
			continue
		}
		if c == decMark || c == 'e' || c == 'E' {
			break
		}
		// A grouping separator.
		r, size := rune(c), 1
		if c >= 0x80 {
			r, size = decodeRune(s[i:])
		}
		isSep := r == ' ' || r == 0xA0 || r == 0x202F || r == '\'' || (r == ',' && dec == decPoint) || (r == '.' && dec == decComma)
		if !isSep || (sep != 0 && r != sep) {
			return 0, false
		}
		sep = r
		if groups == 0 {
			if groupLen < 1 || groupLen > 3 {
				return 0, false
			}
		} else if groupLen != 3 {
			return 0, false
		}
		groups++
		groupLen = 0
		i += size
	}
	if groups > 0 && groupLen != 3 {
		return 0, false
	}
	if i < len(s) && s[i] == decMark {
		out = append(out, '.')
		i++
		for i < len(s) && s[i] >= '0' && s[i] <= '9' {
			out = append(out, s[i])
			nInt++
			i++
		}
	}
	if nInt == 0 {
		return 0, false
	}
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		out = append(out, 'e')
		i++
		if i < len(s) && (s[i] == '+' || s[i] == '-') {
			out = append(out, s[i])
			i++
		}
		nExp := 0
		for i < len(s) && s[i] >= '0' && s[i] <= '9' {
			out = append(out, s[i])
			nExp++
			i++
		}
		if nExp == 0 {
			return 0, false
		}
	}
	if i != len(s) {
		return 0, false
	}
	v, err := strconv.ParseFloat(string(out), 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		return 0, false
	}
	return v, true
}

func decodeRune(s string) (rune, int) {
	for _, r := range s {
		return r, len(string(r))
	}
	return 0, 0
}

// decimalVote classifies a cell as evidence for a decimal comma or a decimal
// point, or neither (integers, ambiguous "1,234" / "1.234", non-numbers).
// ambiguous reports a cell that reads differently under the two marks.
func decimalVote(s string) (comma, point, ambiguous bool) {
	s = trimSpace(s)
	if s == "" {
		return
	}
	if s[0] == '+' || s[0] == '-' {
		s = s[1:]
	}
	if k := strings.IndexAny(s, "eE"); k >= 0 {
		s = s[:k]
	}
	nd, nc := 0, 0
	for i := 0; i < len(s); i++ {
		switch c := s[i]; {
		case c >= '0' && c <= '9':
		case c == '.':
			nd++
		case c == ',':
			nc++
		default:
			return
		}
	}
	if nd == 0 && nc == 0 {
		return
	}
	if nd > 0 && nc > 0 {
		if strings.LastIndexByte(s, ',') > strings.LastIndexByte(s, '.') {
			return nd > 0 && validGroups(s[:strings.LastIndexByte(s, ',')], '.'), false, false
		}
		return false, validGroups(s[:strings.LastIndexByte(s, '.')], ','), false
	}
	mark, other := byte('.'), false
	n := nd
	if nc > 0 {
		mark, n, other = ',', nc, true
	}
	if n > 1 {
		// Several marks: thousands groups of the other convention.
		if validGroups(s, mark) {
			return !other, other, false
		}
		return
	}
	k := strings.IndexByte(s, mark)
	after := len(s) - k - 1
	if after != 3 || k == 0 || (k == 1 && s[0] == '0') || k > 3 {
		// A decimal mark.
		return other, !other, false
	}
	return false, false, true
}

// validGroups reports whether s is digits grouped by sep in threes
// ("1.234.567").
func validGroups(s string, sep byte) bool {
	parts := strings.Split(s, string(sep))
	for i, p := range parts {
		if p == "" || len(p) > 3 || (i > 0 && len(p) != 3) {
			return false
		}
		for j := 0; j < len(p); j++ {
			if p[j] < '0' || p[j] > '9' {
				return false
			}
		}
	}
	return true
}
