// Tests that the command line's help of the analysis settings is written
// from the engine's description of the settings (issue 14, item 4), which
// the page's settings form is built from: the two never disagree.
package main

import (
	"flag"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

// helpBlocks splits the options of a -h output into flag name -> help
// text (the indented lines after the flag's line, tab and indent removed).
func helpBlocks(out string) map[string]string {
	blocks := map[string]string{}
	_, opts, _ := strings.Cut(out, "\nOptions:\n")
	var name string
	var text []string
	flush := func() {
		if name != "" {
			blocks[name] = strings.Join(text, "\n")
		}
	}
	for _, l := range strings.Split(opts, "\n") {
		if strings.HasPrefix(l, "  -") {
			flush()
			f := strings.Fields(l)[0]
			name, text = strings.TrimLeft(f, "-"), nil
			continue
		}
		if t, ok := strings.CutPrefix(l, "    \t"); ok {
			text = append(text, t)
		}
	}
	flush()
	return blocks
}

// TestHelpFromDescription: in the help of test, demo and batch, every
// described setting has its flag, whose help is the label, the default,
// each accepted value with its label, and what it applies to, word for
// word as the page shows them; and every settings flag is described.
func TestHelpFromDescription(t *testing.T) {
	for _, cmd := range []string{"test", "demo", "batch"} {
		code, out, _ := runCLI(t, "", cmd, "-h")
		if code != 0 {
			t.Fatalf("%s -h: exit %d", cmd, code)
		}
		blocks := helpBlocks(out)
		for _, d := range describedSettings() {
			name := settingFlag(d.Field)
			text, ok := blocks[name]
			if !ok {
				t.Errorf("%s -h: setting %s has no flag --%s", cmd, d.Field, name)
				continue
			}
			if text != settingUsage(d) {
				t.Errorf("%s -h --%s:\n%s\nwant\n%s", cmd, name, text, settingUsage(d))
			}
			lines := strings.Split(text, "\n")
			if lines[0] != d.Label || lines[1] != "default: "+d.Default || lines[len(lines)-1] != "applies to: "+d.AppliesTo {
				t.Errorf("%s -h --%s: label, default or applies-to differ from the description: %q", cmd, name, lines)
			}
			for _, c := range d.Choices {
				if c.Value != "" && !strings.Contains(text, "\n  "+c.Value+"  "+c.Label+"\n") {
					t.Errorf("%s -h --%s: value %s (%s) missing", cmd, name, c.Value, c.Label)
				}
			}
		}
	}
	// Every flag bound for the settings is a described setting.
	described := map[string]bool{}
	for _, d := range describedSettings() {
		described[settingFlag(d.Field)] = true
	}
	fs := flag.NewFlagSet("x", flag.ContinueOnError)
	var s schema.Settings
	settingsFlags(fs, &s)
	n := 0
	fs.VisitAll(func(f *flag.Flag) {
		n++
		if !described[f.Name] {
			t.Errorf("settings flag --%s has no description entry", f.Name)
		}
		if strings.Contains(f.Usage, "not described") {
			t.Errorf("--%s: %s", f.Name, f.Usage)
		}
	})
	if n != len(described) {
		t.Errorf("%d settings flags, %d described settings", n, len(described))
	}
}
