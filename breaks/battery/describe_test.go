package battery

import (
	"encoding/json"
	"reflect"
	"slices"
	"strconv"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

// TestSettingsDescription checks the published settings description
// against schema.Settings and Validate: every field exists under its JSON
// name, every choice is accepted, the closed lists name every accepted value,
// each entry has a label, a default and what it applies to, and every
// field is described (SettingsDescription or CommandOnlySettings).
func TestSettingsDescription(t *testing.T) {
	names := map[string]bool{}
	st := reflect.TypeOf(schema.Settings{})
	for i := 0; i < st.NumField(); i++ {
		tag := st.Field(i).Tag.Get("json")
		if n, _, _ := cutComma(tag); n != "" {
			names[n] = true
		}
	}
	seen := map[string]bool{}
	for _, d := range append(SettingsDescription(), CommandOnlySettings()...) {
		if !names[d.Field] {
			t.Errorf("%s: not a settings field", d.Field)
		}
		if seen[d.Field] {
			t.Errorf("%s: described twice", d.Field)
		}
		seen[d.Field] = true
		if d.Label == "" || d.Default == "" || d.AppliesTo == "" {
			t.Errorf("%s: label %q default %q applies_to %q", d.Field, d.Label, d.Default, d.AppliesTo)
		}
		if (d.Kind == "choice") != (len(d.Choices) > 0) {
			t.Errorf("%s: kind %s with %d choices", d.Field, d.Kind, len(d.Choices))
		}
		var values []string
		for _, c := range d.Choices {
			values = append(values, c.Value)
			if c.Label == "" {
				t.Errorf("%s=%q: no label", d.Field, c.Value)
			}
			var raw any = c.Value
			if x, err := strconv.ParseFloat(c.Value, 64); err == nil {
				raw = x
			}
			if c.Value == "" {
				continue
			}
			b, _ := json.Marshal(map[string]any{d.Field: raw})
			var s schema.Settings
			if err := json.Unmarshal(b, &s); err != nil {
				t.Errorf("%s=%q: %v", d.Field, c.Value, err)
				continue
			}
			if err := Validate(s); err != nil {
				t.Errorf("%s=%q: %v", d.Field, c.Value, err)
			}
		}
		if want, ok := describedValues(d.Field); ok {
			a, b := slices.Clone(values), slices.Clone(want)
			slices.Sort(a)
			slices.Sort(b)
			if !slices.Equal(a, b) {
				t.Errorf("%s: choices %v, accepted %v", d.Field, a, b)
			}
		}
	}
	// Every setting but the long-table reading (its own options) is
	// described, for the page or for the command line only.
	for n := range names {
		if !seen[n] && n != "long" {
			t.Errorf("%s not described", n)
		}
	}
}

func cutComma(s string) (string, string, bool) {
	for i := 0; i < len(s); i++ {
		if s[i] == ',' {
			return s[:i], s[i+1:], true
		}
	}
	return s, "", false
}
