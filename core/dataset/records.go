package dataset

import (
	"io"
	"strings"
)

// record is one logical row of delimited text: its fields and the 1-based
// physical line where it starts.
type record struct {
	line   int
	fields []string
	title  []string // title rows skipped above this header row (workbooks)
}

// recordReader splits delimited text into records, accepting LF, CRLF and CR
// line ends, a leading UTF-8 byte-order mark and double-quoted fields that may
// span lines. Blank lines are skipped. It buffers its input itself.
type recordReader struct {
	r     io.Reader
	delim byte
	line  int // physical lines consumed
	buf   []byte
	pos   int
	err   error // sticky read error (io.EOF at end)
	bom   bool  // BOM check done
	// keepBlank makes next return blank lines as records with nil fields.
	keepBlank bool
}

func newRecordReader(r io.Reader, delim byte) *recordReader {
	return &recordReader{r: r, delim: delim, buf: make([]byte, 0, 64<<10)}
}

// fill reads more input, keeping buf[pos:].
func (r *recordReader) fill() {
	if r.err != nil {
		return
	}
	if r.pos > 0 {
		n := copy(r.buf, r.buf[r.pos:])
		r.buf = r.buf[:n]
		r.pos = 0
	}
	if len(r.buf) == cap(r.buf) {
		nb := make([]byte, len(r.buf), 2*cap(r.buf))
		copy(nb, r.buf)
		r.buf = nb
	}
	n, err := r.r.Read(r.buf[len(r.buf):cap(r.buf)])
	r.buf = r.buf[:len(r.buf)+n]
	if err != nil {
		r.err = err
	} else if n == 0 {
		// Guard against readers returning 0, nil forever.
		n, err = r.r.Read(r.buf[len(r.buf):cap(r.buf)])
		r.buf = r.buf[:len(r.buf)+n]
		if err != nil {
			r.err = err
		} else if n == 0 {
			r.err = io.ErrNoProgress
		}
	}
}

// readLine returns the next physical line without its terminator.
func (r *recordReader) readLine() (string, bool, error) {
	if !r.bom {
		for len(r.buf)-r.pos < 3 && r.err == nil {
			r.fill()
		}
		if len(r.buf)-r.pos >= 3 && string(r.buf[r.pos:r.pos+3]) == "\xEF\xBB\xBF" {
			r.pos += 3
		}
		r.bom = true
	}
	scan := r.pos
	for {
		k := -1
		for i := scan; i < len(r.buf); i++ {
			if c := r.buf[i]; c == '\n' || c == '\r' {
				k = i
				break
			}
		}
		if k >= 0 {
			if r.buf[k] == '\r' && k+1 == len(r.buf) && r.err == nil {
				// Need one more byte to tell CR from CRLF.
				off := k - r.pos
				r.fill()
				scan = r.pos + off
				continue
			}
			line := string(r.buf[r.pos:k])
			if r.buf[k] == '\r' && k+1 < len(r.buf) && r.buf[k+1] == '\n' {
				k++
			}
			r.pos = k + 1
			r.line++
			return line, true, nil
		}
		if r.err != nil {
			if r.err != io.EOF {
				return "", false, r.err
			}
			if r.pos == len(r.buf) {
				return "", false, nil
			}
			line := string(r.buf[r.pos:])
			r.pos = len(r.buf)
			r.line++
			return line, true, nil
		}
		off := len(r.buf) - r.pos
		r.fill()
		scan = r.pos + off
	}
}

// quoteState follows the quoting of splitFields across one line: a quote
// opens a quoted field only at the start of a field (after spaces), "" inside
// quotes is a quote, and a quote elsewhere is an ordinary character. It
// returns whether a quoted field is still open at the end of the line.
func quoteState(s string, delim byte, inQ bool) bool {
	start := !inQ
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case inQ && c == '"' && i+1 < len(s) && s[i+1] == '"':
			i++
		case inQ && c == '"':
			inQ = false
		case inQ:
		case c == delim:
			start = true
		case c == '"' && start:
			inQ, start = true, false
		case c == ' ' || c == '\t':
		default:
			start = false
		}
	}
	return inQ
}

// next returns the next non-blank record (or, with keepBlank, a blank
// record with nil fields), or io.EOF. A quoted field that is still open at
// the end of the input is a *ParseError wrapping ErrQuote naming the line
// where the record began.
func (r *recordReader) next() (record, error) { return r.nextInto(nil) }

// nextInto is next with the fields appended to dst[:0] (a reused slice):
// the streaming reader's rows allocate one string per row, nothing per cell.
func (r *recordReader) nextInto(dst []string) (record, error) {
	for {
		s, ok, err := r.readLine()
		if err != nil {
			return record{}, err
		}
		if !ok {
			return record{}, io.EOF
		}
		start := r.line
		if strings.IndexByte(s, '"') >= 0 && quoteState(s, r.delim, false) {
			var b strings.Builder
			b.WriteString(s)
			inQ := true
			for inQ {
				more, ok, err := r.readLine()
				if err != nil {
					return record{}, err
				}
				if !ok {
					return record{}, &ParseError{Row: start, Err: wrapf(ErrQuote,
						"a quoted cell opened on line %d is never closed (the rest of the file would be one cell); remove the stray quote or double it", start)}
				}
				b.WriteByte('\n')
				b.WriteString(more)
				inQ = quoteState(more, r.delim, true)
			}
			s = b.String()
		}
		if trimSpace(s) == "" {
			if r.keepBlank {
				return record{line: start}, nil
			}
			continue
		}
		return record{line: start, fields: splitFieldsInto(dst, s, r.delim)}, nil
	}
}

// splitFields splits one record; unquoted fields are substrings of s.
func splitFields(s string, delim byte) []string { return splitFieldsInto(nil, s, delim) }

// splitFieldsInto is splitFields appending to dst[:0] (nil: a new slice).
func splitFieldsInto(dst []string, s string, delim byte) []string {
	if strings.IndexByte(s, '"') < 0 {
		out := dst[:0]
		if dst == nil {
			out = make([]string, 0, strings.Count(s, string(delim))+1)
		}
		for {
			k := strings.IndexByte(s, delim)
			if k < 0 {
				return append(out, s)
			}
			out = append(out, s[:k])
			s = s[k+1:]
		}
	}
	out := dst[:0]
	var b strings.Builder
	inQ, quoted := false, false
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case inQ && c == '"' && i+1 < len(s) && s[i+1] == '"':
			b.WriteByte('"')
			i++
		case inQ && c == '"':
			inQ = false
		case !inQ && c == '"' && (!quoted && trimSpace(b.String()) == ""):
			b.Reset()
			inQ, quoted = true, true
		case !inQ && c == delim:
			out = append(out, b.String())
			b.Reset()
			quoted = false
		default:
			b.WriteByte(c)
		}
	}
	return append(out, b.String())
}

// headerLike reports whether a record has a cell that is text (not a
// number, a date or a missing marker).
func headerLike(fields []string) bool {
	for _, f := range fields {
		f = trimSpace(f)
		if IsMissing(f) {
			continue
		}
		if _, ok := parseNumber(f, decPoint); ok {
			continue
		}
		if _, ok := parseNumber(f, decComma); ok {
			continue
		}
		if _, ok := parseDate(f); ok {
			continue
		}
		return true
	}
	return false
}

// consistentDelimiter is the first candidate whose count is the same
// non-zero number on every line.
func consistentDelimiter(lines []string, cands []byte) (byte, bool) {
	for _, c := range cands {
		h := countOutside(lines[0], c)
		if h == 0 {
			continue
		}
		same := true
		for _, l := range lines[1:] {
			if countOutside(l, c) != h {
				same = false
				break
			}
		}
		if same {
			return c, true
		}
	}
	return 0, false
}

// countOutside counts delim outside double quotes in one line.
func countOutside(line string, delim byte) int {
	n, inQ := 0, false
	for i := 0; i < len(line); i++ {
		switch line[i] {
		case '"':
			inQ = !inQ
		case delim:
			if !inQ {
				n++
			}
		}
	}
	return n
}

// sampleLines returns up to max non-blank physical lines of data; the last
// line is dropped when data was cut (partial).
func sampleLines(data []byte, max int, partial bool) []string {
	s := string(data)
	s = strings.TrimPrefix(s, "\xEF\xBB\xBF")
	var out []string
	for len(s) > 0 && len(out) < max+1 {
		k := strings.IndexAny(s, "\r\n")
		var line string
		if k < 0 {
			line, s = s, ""
			if partial {
				break
			}
		} else {
			line = s[:k]
			if s[k] == '\r' && k+1 < len(s) && s[k+1] == '\n' {
				k++
			}
			s = s[k+1:]
		}
		if trimSpace(line) != "" {
			out = append(out, line)
		}
	}
	if len(out) > max {
		out = out[:max]
	}
	return out
}

// detectDelimiter picks the delimiter of the sampled lines: the first of tab,
// ';', ',', '|' whose count is the same non-zero number on every line, else
// the one most frequent in the header line, else (one column) tab.
func detectDelimiter(lines []string) byte {
	cands := []byte{'\t', ';', ',', '|'}
	if len(lines) == 0 {
		return '\t'
	}
	// Title lines above the header (no delimiter at all, while the lines
	// below agree on one) are passed over.
	for k := 1; k <= 3 && k+2 <= len(lines); k++ {
		none := true
		for _, c := range cands {
			none = none && countOutside(lines[k-1], c) == 0
		}
		if !none {
			break
		}
		if d, ok := consistentDelimiter(lines[k:], cands); ok && headerLike(splitFields(lines[k], d)) {
			return d
		}
	}
	if d, ok := consistentDelimiter(lines, cands); ok {
		return d
	}
	// A single column: no delimiter splits it, and a tab keeps decimal commas
	// inside the cell for decimal-mark detection.
	best, bestN := byte('\t'), 0
	for _, c := range cands {
		if n := countOutside(lines[0], c); n > bestN {
			best, bestN = c, n
		}
	}
	return best
}
