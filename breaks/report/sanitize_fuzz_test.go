package report

import (
	"encoding/json"
	"encoding/xml"
	"regexp"
	"strings"
	"testing"
	"unicode/utf8"
)

// FuzzEscaping checks the escaping policy (sanitize.go) on any string, as
// the fuzzer finds them: visible leaves no control or hidden character and
// is idempotent; CSVCell never starts like a formula; Markdown text opens no
// tag, autolink or entity; LaTeX text holds no command but the escapes'
// own; XML text parses; SafeName holds no separator; JSONHidden keeps the
// value. Seeds: the hostile corpus (hostile_test.go).
func FuzzEscaping(f *testing.F) {
	for _, s := range hostileNames {
		f.Add(s)
	}
	texCmd := regexp.MustCompile(`\\([A-Za-z]+)`)
	texOK := map[string]bool{"textbackslash": true, "textasciitilde": true, "textasciicircum": true, "textless": true, "textgreater": true, "textbar": true}
	f.Fuzz(func(t *testing.T, s string) {
		v := visible(s)
		if !utf8.ValidString(v) {
			t.Fatalf("visible(%q) not UTF-8", s)
		}
		for _, r := range v {
			if r < 0x20 || r == 0x7f || (r >= 0x80 && r <= 0x9f) || hiddenRune(r) {
				t.Fatalf("visible(%q) keeps %U", s, r)
			}
		}
		if visible(v) != v {
			t.Fatalf("visible not idempotent on %q", s)
		}
		if c := CSVCell(s); formulaLike(c) || strings.ContainsAny(c, "\n\r\t\x1b") {
			t.Fatalf("CSVCell(%q) = %q", s, c)
		}
		if m := mdText(s); mdTag.MatchString(m) || mdEntity.MatchString(m) || mdUnescaped.MatchString(m) {
			t.Fatalf("mdText(%q) = %q", s, m)
		}
		for _, m := range texCmd.FindAllStringSubmatch(texEscape(s), -1) {
			if !texOK[m[1]] {
				t.Fatalf("texEscape(%q) holds \\%s", s, m[1])
			}
		}
		var sink struct {
			Text string `xml:",chardata"`
		}
		if err := xml.Unmarshal([]byte("<t>"+esc(s)+"</t>"), &sink); err != nil {
			t.Fatalf("esc(%q): %v", s, err)
		}
		if n := SafeName(s); strings.ContainsAny(n, `/\`) {
			t.Fatalf("SafeName(%q) = %q", s, n)
		}
		b, err := json.Marshal(s)
		if err != nil {
			t.Fatal(err)
		}
		var back1, back2 string
		if json.Unmarshal(b, &back1) != nil || json.Unmarshal(JSONHidden(b), &back2) != nil || back1 != back2 {
			t.Fatalf("JSONHidden changes %q", s)
		}
	})
}
