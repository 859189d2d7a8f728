package report

import (
	"bytes"
	"strings"
	"testing"
	"unicode/utf8"
)

// visibleSlow is the brute-force twin of visible: every rune through the
// escaping loop, without the clean-text fast path.
func visibleSlow(s string) string {
	var b strings.Builder
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
			b.WriteString(`\u` + hexRune(r))
		default:
			b.WriteRune(r)
		}
	}
	return b.String()
}

func hexRune(r rune) string {
	const digits = "0123456789abcdef"
	var out []byte
	for v := uint32(r); v > 0; v >>= 4 {
		out = append([]byte{digits[v&15]}, out...)
	}
	return string(out)
}

// TestVisibleTwin: the fast path and the brute-force twin agree on the
// hostile corpus and on clean names (common practice, no source).
func TestVisibleTwin(t *testing.T) {
	for _, s := range append(hostileNames, "", "gdp", "GDP_real & co %", "Ölpreis €", "日本") {
		if a, b := visible(s), visibleSlow(s); a != b {
			t.Errorf("visible(%q) = %q, twin %q", s, a, b)
		}
	}
}

// BenchmarkVisible: a clean name (the common case, no allocation) and a
// hostile one, each beside the brute-force twin.
func BenchmarkVisible(b *testing.B) {
	for _, c := range []struct{ name, s string }{{"clean", "private_service_providing"}, {"hostile", "red \x1b[31mALERT\x1b[0m \u202e"}} {
		b.Run(c.name, func(b *testing.B) {
			b.ReportAllocs()
			for i := 0; i < b.N; i++ {
				_ = visible(c.s)
			}
		})
		b.Run(c.name+"/twin", func(b *testing.B) {
			b.ReportAllocs()
			for i := 0; i < b.N; i++ {
				_ = visibleSlow(c.s)
			}
		})
	}
}

// BenchmarkWriteHostile writes the hostile document in every text format.
func BenchmarkWriteHostile(b *testing.B) {
	doc, inputs := hostileDoc()
	var buf bytes.Buffer
	for _, f := range []string{"table", "csv", "md", "latex", "html"} {
		b.Run(f, func(b *testing.B) {
			for i := 0; i < b.N; i++ {
				buf.Reset()
				if err := Write(&buf, f, doc, inputs); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
