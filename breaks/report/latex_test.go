package report

import (
	"bytes"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

// unescaped counts the occurrences of c in s that are not escaped with a
// backslash.
func unescaped(s string, c byte) int {
	n := 0
	for i := 0; i < len(s); i++ {
		if s[i] == '\\' {
			i++ // skip the escaped character (or the command's first letter)
			continue
		}
		if s[i] == c {
			n++
		}
	}
	return n
}

// TestLaTeXStructure checks the fragment without a LaTeX engine: balanced
// braces and dollars, one tabular, every body row with the right number of
// cells, escaped special characters, and no NaN.
func TestLaTeXStructure(t *testing.T) {
	var buf bytes.Buffer
	if err := WriteLaTeX(&buf, fixtureDoc()); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	body := stripTeXComments(out)
	if o, c := unescaped(body, '{'), unescaped(body, '}'); o != c {
		t.Errorf("unbalanced braces: %d open, %d close", o, c)
	}
	if d := unescaped(body, '$'); d%2 != 0 {
		t.Errorf("odd number of math delimiters: %d", d)
	}
	for _, env := range []string{"tabular", "table"} {
		b, e := strings.Count(body, `\begin{`+env+`}`), strings.Count(body, `\end{`+env+`}`)
		if b != 1 || e != 1 || strings.Index(body, `\begin{`+env+`}`) > strings.Index(body, `\end{`+env+`}`) {
			t.Errorf("%s: %d begin, %d end", env, b, e)
		}
	}
	// The fixture has simulated p-values, so the tabular has 9 columns.
	if !strings.Contains(body, `\begin{tabular}{lllrrrrrl}`) {
		t.Error("tabular spec is not lllrrrrrl")
	}
	for _, l := range strings.Split(body, "\n") {
		if !strings.HasSuffix(l, `\\`) || strings.HasPrefix(l, `\multicolumn`) {
			continue
		}
		if n := unescaped(strings.TrimSuffix(l, `\\`), '&'); n != 8 {
			t.Errorf("row has %d cell separators, want 8: %q", n, l)
		}
	}
	for _, want := range []string{
		`\textit{GDP\_real \& co \%}`, `\textit{CPI \#2 \{x\}\$}`, `supF(1\textbar{}0)`,
		`(T/100)\textasciicircum{}(1/4)`, `Notes: trend: chosen per test (auto)`, `simulation: 999 replications, seed 42`,
		`trimming: 0.15`, `level: 0.05`, `max lags: Schwert (1989)`,
	} {
		if !strings.Contains(body, want) {
			t.Errorf("LaTeX lacks %q", want)
		}
	}
	if strings.Contains(body, "NaN") || strings.Contains(body, "Inf") {
		t.Error("LaTeX prints NaN or Inf")
	}
}

func stripTeXComments(s string) string {
	var out []string
	for _, l := range strings.Split(s, "\n") {
		if strings.HasPrefix(l, "%") {
			continue
		}
		out = append(out, l)
	}
	return strings.Join(out, "\n")
}

// TestStars checks the significance stars against the p-value thresholds
// 0.10, 0.05, 0.01 (strict: p = 0.01 earns **), falling back to the
// simulated p-value and then to the critical values (common practice: the
// usual convention of applied papers).
func TestStars(t *testing.T) {
	cvLeft := map[string]float64{"0.01": -3.9, "0.05": -3.3, "0.10": -3.0}
	cvRight := map[string]float64{"0.01": 0.739, "0.05": 0.463, "0.10": 0.347}
	for _, c := range []struct {
		name      string
		p, psim   *float64
		stat      *float64
		cvs       map[string]float64
		tail      string
		wantStars string
	}{
		{"p 0.005", fp(0.005), nil, fp(-4), cvLeft, "left", "***"},
		{"p 0.01 exactly", fp(0.01), nil, fp(-4), cvLeft, "left", "**"},
		{"p 0.03", fp(0.03), nil, fp(-4), cvLeft, "left", "**"},
		{"p 0.07", fp(0.07), nil, fp(-4), cvLeft, "left", "*"},
		{"p 0.10 exactly", fp(0.10), nil, fp(-4), cvLeft, "left", ""},
		{"p 0.2 wins over cv", fp(0.2), nil, fp(-4), cvLeft, "left", ""},
		{"sim p when no p", nil, fp(0.02), fp(0), nil, "left", "**"},
		{"cv left 1%", nil, nil, fp(-4), cvLeft, "left", "***"},
		{"cv left 5%", nil, nil, fp(-3.5), cvLeft, "left", "**"},
		{"cv left 10%", nil, nil, fp(-3.1), cvLeft, "left", "*"},
		{"cv left none", nil, nil, fp(-2), cvLeft, "left", ""},
		{"cv right 1%", nil, nil, fp(0.8), cvRight, "right", "***"},
		{"cv right 10%", nil, nil, fp(0.4), cvRight, "right", "*"},
		{"no statistic", nil, nil, nil, cvLeft, "left", ""},
		{"p 0", schema.F(0), nil, fp(1), nil, "left", "***"},
		{"NaN p falls back to cv", fp(math.NaN()), nil, fp(-4), cvLeft, "left", "***"},
	} {
		if got := stars(c.p, c.psim, c.stat, c.cvs, c.tail); got != c.wantStars {
			t.Errorf("%s: stars %q, want %q", c.name, got, c.wantStars)
		}
	}
	// In the table, the stars sit on the statistic of the matching row.
	doc := &schema.Document{Series: []schema.Series{{Name: "s", Results: []schema.Result{
		{Test: "t1", Statistic: fp(-4.1), PValue: fp(0.004), Tail: "left"},
		{Test: "t2", Statistic: fp(-3.4), PValue: fp(0.049), Tail: "left"},
		{Test: "t3", Statistic: fp(-3.1), PValue: fp(0.0999), Tail: "left"},
		{Test: "t4", Statistic: fp(-1.1), PValue: fp(0.6), Tail: "left"},
		{Test: "t5", Statistic: fp(-3.6), CriticalValues: cvLeft, Tail: "left"},
	}}}}
	var buf bytes.Buffer
	if err := WriteLaTeX(&buf, doc); err != nil {
		t.Fatal(err)
	}
	want := map[string]string{
		"t1": `$-4.1000^{***}$`, "t2": `$-3.4000^{**}$`, "t3": `$-3.1000^{*}$`, "t4": `$-1.1000$`, "t5": `$-3.6000^{**}$`,
	}
	for _, l := range strings.Split(buf.String(), "\n") {
		cells := strings.Split(l, " & ")
		if w, ok := want[cells[0]]; ok {
			if cells[3] != w {
				t.Errorf("%s: statistic cell %q, want %q", cells[0], cells[3], w)
			}
			delete(want, cells[0])
		}
	}
	if len(want) > 0 {
		t.Errorf("rows not found: %v", want)
	}
}

// TestLaTeXCompiles runs a LaTeX engine on the fragment inside a minimal
// article, when one is on PATH.
func TestLaTeXCompiles(t *testing.T) {
	var engine string
	for _, e := range []string{"pdflatex", "lualatex", "xelatex"} {
		if p, err := exec.LookPath(e); err == nil {
			engine = p
			break
		}
	}
	if engine == "" {
		t.Skip("no LaTeX engine on PATH")
	}
	hostile, _ := hostileDoc()
	for name, doc := range map[string]*schema.Document{"fixture": fixtureDoc(), "hostile": hostile} {
		var buf bytes.Buffer
		if err := WriteLaTeX(&buf, doc); err != nil {
			t.Fatal(err)
		}
		dir := t.TempDir()
		src := "\\documentclass{article}\n\\begin{document}\n" + buf.String() + "\\end{document}\n"
		if err := os.WriteFile(filepath.Join(dir, "r.tex"), []byte(src), 0o644); err != nil {
			t.Fatal(err)
		}
		// The hostile names hold \input{/etc/passwd} and \write18: escaped,
		// they typeset as text; unescaped, the run would read the file or
		// fail, and the log would show it.
		cmd := exec.Command(engine, "-interaction=nonstopmode", "-halt-on-error", "-no-shell-escape", "r.tex")
		cmd.Dir = dir
		out, err := cmd.CombinedOutput()
		if err != nil {
			t.Fatalf("%s: %s failed: %v\n%s", name, engine, err, out)
		}
		if strings.Contains(string(out), "/etc/passwd") || strings.Contains(string(out), "write18") {
			t.Errorf("%s: the log shows a command from a name:\n%s", name, out)
		}
	}
}
