package report

import (
	"regexp"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/rootshift/rootshift/core/schema"
)

// Escaping policy: one rule per format, applied to every string that can
// come from the user or from the input file (series and column names, file
// names, ids, dates, notes, messages) and, for simplicity, to every other
// text the writers print as well.
//
//   - Everywhere: control characters (C0 except none, DEL, C1), Unicode
//     bidirectional overrides and isolates, line and paragraph separators and
//     invalid UTF-8 are shown visibly as escapes ("\x1b", "\n", "\u202e",
//     "\xff") by visible, so that no terminal sequence, no hidden reordering
//     and no line break reaches the reader from a name.
//   - Everywhere: a file path inside a message keeps only its base name
//     (noFolders), as the source's name does (SafeName).
//   - table: visible, and the writer filters every line once more.
//   - csv: visible, then CSVCell: a cell whose first non-blank character is
//     = + - @ (or their full-width forms), or that starts with a tab or a
//     carriage return, gets a leading apostrophe so that no spreadsheet
//     reads it as a formula. Number cells are written by the writer itself
//     and are not text cells.
//   - md: visible, then mdText: backslash escapes for Markdown markup, and
//     "<" or "&" escaped only where they could open an HTML tag, an autolink
//     or an entity, so that "p<0.001" stays readable as written.
//   - latex: visible, then texEscape: every LaTeX special character replaced.
//   - html and svg: visible, then XML escaping (esc).
//   - json: encoding/json escapes control characters and <, > and &.

// visible returns s with every character that a terminal, an editor or a
// renderer could act on or hide shown as a visible escape.
func visible(s string) string {
	if visibleClean(s) {
		return s
	}
	var b strings.Builder
	b.Grow(len(s) + 8)
	for i := 0; i < len(s); {
		r, size := utf8.DecodeRuneInString(s[i:])
		if r == utf8.RuneError && size == 1 {
			b.WriteString(`\x` + hex2(s[i]))
			i++
			continue
		}
		i += size
		switch {
		case r == '\n':
			b.WriteString(`\n`)
		case r == '\r':
			b.WriteString(`\r`)
		case r == '\t':
			b.WriteString(`\t`)
		case r < 0x20 || r == 0x7f || (r >= 0x80 && r <= 0x9f):
			b.WriteString(`\x` + hex2(byte(r)))
		case hiddenRune(r):
			b.WriteString(`\u` + strconv.FormatInt(int64(r), 16))
		default:
			b.WriteRune(r)
		}
	}
	return b.String()
}

// visibleClean reports whether visible would return s unchanged.
func visibleClean(s string) bool {
	for i := 0; i < len(s); i++ {
		c := s[i]
		if c < 0x20 || c == 0x7f {
			return false
		}
		if c >= 0x80 {
			for _, r := range s[i:] {
				if r == utf8.RuneError || r < 0x20 || r == 0x7f || (r >= 0x80 && r <= 0x9f) || hiddenRune(r) {
					return false
				}
			}
			return utf8.ValidString(s[i:])
		}
	}
	return true
}

// hiddenRune reports the invisible formatting characters that reorder or
// break text: bidirectional marks, embeddings, overrides and isolates, the
// Arabic letter mark, line and paragraph separators, and the byte order
// mark inside text.
func hiddenRune(r rune) bool {
	switch {
	case r == 0x061c, r == 0x200e, r == 0x200f, r == 0xfeff:
		return true
	case r >= 0x2028 && r <= 0x202e:
		return true
	case r >= 0x2066 && r <= 0x2069:
		return true
	}
	return false
}

func hex2(c byte) string {
	const digits = "0123456789abcdef"
	return string([]byte{digits[c>>4], digits[c&15]})
}

// visibleLines is visible for a block of text whose line breaks are the
// writer's own: each line is made visible and the "\n" kept.
func visibleLines(s string) string {
	for rest := s; ; {
		i := strings.IndexByte(rest, '\n')
		if i < 0 {
			if visibleClean(rest) {
				return s
			}
			break
		}
		if !visibleClean(rest[:i]) {
			break
		}
		rest = rest[i+1:]
	}
	lines := strings.Split(s, "\n")
	for i, l := range lines {
		lines[i] = visible(l)
	}
	return strings.Join(lines, "\n")
}

// CSVCell makes s safe as a text cell of a CSV file opened in a spreadsheet
// or printed on a terminal: control characters are shown visibly (see
// visible), and a cell that a spreadsheet could read as a formula (its
// first non-blank character is =, +, -, @ or a full-width form of them, or
// it starts with a tab or a carriage return) gets a leading apostrophe.
// Every CSV writer of the tool passes its text cells through CSVCell;
// cells holding numbers written by the tool itself need not.
func CSVCell(s string) string {
	if s == "" {
		return s
	}
	risky := s[0] == '\t' || s[0] == '\r'
	t := outText(s)
	if !risky {
		first, _ := utf8.DecodeRuneInString(strings.TrimLeft(t, " "))
		switch first {
		case '=', '+', '-', '@', '＝', '＋', '－', '＠':
			risky = true
		}
	}
	if risky {
		return "'" + t
	}
	return t
}

// SafeName returns the last element of a file path (either separator), so
// that no report carries the folders of the machine that ran it.
func SafeName(path string) string {
	if i := strings.LastIndexAny(path, `/\`); i >= 0 {
		if rest := path[i+1:]; rest != "" {
			return rest
		}
		return SafeName(strings.TrimRight(path, `/\`))
	}
	return path
}

// JSONHidden rewrites, in JSON text produced by encoding/json, the
// characters that it leaves raw but a terminal or an editor acts on or
// hides (C1 controls, bidirectional marks and overrides, the byte order
// mark) as \u escapes. The value the JSON encodes is unchanged; the
// JSON writers pass their output through it.
func JSONHidden(b []byte) []byte {
	clean := true
	for i := 0; i < len(b); i++ {
		if b[i] >= 0x80 {
			clean = false
			break
		}
	}
	if clean {
		return b
	}
	out := make([]byte, 0, len(b)+16)
	for i := 0; i < len(b); {
		r, size := utf8.DecodeRune(b[i:])
		if (r >= 0x80 && r <= 0x9f) || hiddenRune(r) {
			out = append(out, `\u`...)
			s := strconv.FormatInt(int64(r), 16)
			out = append(out, strings.Repeat("0", 4-len(s))...)
			out = append(out, s...)
		} else {
			out = append(out, b[i:i+size]...)
		}
		i += size
	}
	return out
}

// pathRe matches a file path inside a message: a run without blanks or
// quotes that holds a folder separator and ends in a data file's extension.
var pathRe = regexp.MustCompile(`[^\s"'<>|;,()\[\]{}=]*[/\\][^\s"'<>|;,()\[\]{}=]*\.(?i:csv|tsv|txt|xlsx|xls|json|jsonl|ndjson|dat|gz)\b`)

// noFolders replaces every file path inside s (an error message that names
// its input file, for example) by its base name; see SafeName.
func noFolders(s string) string {
	if !strings.ContainsAny(s, `/\`) {
		return s
	}
	return pathRe.ReplaceAllStringFunc(s, SafeName)
}

// outText is the text every writer prints: no folder of a file path, and
// every control character visible.
func outText(s string) string { return noFolders(visible(s)) }

// exportSource and exportSeries give a document's parts as the JSON
// writers export them: the source's base name only, and no folder of a file
// path in the series' errors and warnings.

// exportSource is src as exported (its base name only): src itself when
// there is nothing to change, else a copy.
func exportSource(src *schema.Source) *schema.Source {
	if src == nil || SafeName(src.Name) == src.Name {
		return src
	}
	out := *src
	out.Name = SafeName(src.Name)
	return &out
}

// seriesDirty reports a series whose errors or warnings name a folder.
func seriesDirty(s *schema.Series) bool {
	for _, e := range s.Errors {
		if noFolders(e.Message) != e.Message {
			return true
		}
	}
	for _, w := range s.Warnings {
		if noFolders(w) != w {
			return true
		}
	}
	return false
}

// exportSeries is s as exported (no folder of a file path in its errors
// and warnings): s itself when there is nothing to change, else a shallow
// copy (s is never modified).
func exportSeries(s *schema.Series) *schema.Series {
	if !seriesDirty(s) {
		return s
	}
	out := *s
	errs := append([]schema.Error(nil), s.Errors...)
	for j := range errs {
		errs[j].Message = noFolders(errs[j].Message)
	}
	out.Errors = errs
	ws := append([]string(nil), s.Warnings...)
	for j := range ws {
		ws[j] = noFolders(ws[j])
	}
	out.Warnings = ws
	return &out
}
