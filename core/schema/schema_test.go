// Tests that the JSON Schema file (v2.json) and the Go types stay in step:
// every JSON field of every schema type is declared in the JSON Schema, and
// every declared property exists in the Go types. Source: the project's own
// contract (issue "Foundation"), no external reference.
package schema

import (
	"encoding/json"
	"reflect"
	"strings"
	"testing"
)

func jsonFields(t reflect.Type) []string {
	var out []string
	for i := 0; i < t.NumField(); i++ {
		tag := t.Field(i).Tag.Get("json")
		name, _, _ := strings.Cut(tag, ",")
		if name != "" && name != "-" {
			out = append(out, name)
		}
	}
	return out
}

func TestSchemaFileMatchesTypes(t *testing.T) {
	var js map[string]any
	if err := json.Unmarshal(SchemaJSON, &js); err != nil {
		t.Fatalf("v2.json is not JSON: %v", err)
	}
	defs := js["$defs"].(map[string]any)
	props := func(m map[string]any) map[string]any { return m["properties"].(map[string]any) }
	result := props(defs["result"].(map[string]any))
	verdict := props(defs["verdict"].(map[string]any))
	cases := []struct {
		name  string
		typ   reflect.Type
		props map[string]any
	}{
		{"document", reflect.TypeOf(Document{}), props(js)},
		{"settings", reflect.TypeOf(Settings{}), props(defs["settings"].(map[string]any))},
		{"series", reflect.TypeOf(Series{}), props(defs["series"].(map[string]any))},
		{"result", reflect.TypeOf(Result{}), result},
		{"component", reflect.TypeOf(Component{}), props(defs["component"].(map[string]any))},
		{"break", reflect.TypeOf(Break{}), props(defs["break"].(map[string]any))},
		{"verdict", reflect.TypeOf(Verdict{}), verdict},
		{"window", reflect.TypeOf(WindowCheck{}), props(verdict["window"].(map[string]any))},
		{"surface", reflect.TypeOf(Surface{}), props(result["surface"].(map[string]any))},
		{"sequence", reflect.TypeOf(Sequence{}), props(result["sequence"].(map[string]any))},
	}
	for _, c := range cases {
		fields := jsonFields(c.typ)
		for _, f := range fields {
			if _, ok := c.props[f]; !ok {
				t.Errorf("%s: Go field %q is missing from v2.json", c.name, f)
			}
		}
		for p := range c.props {
			found := false
			for _, f := range fields {
				found = found || f == p
			}
			if !found {
				t.Errorf("%s: v2.json declares %q, which the Go type lacks", c.name, p)
			}
		}
	}
}

func TestFAndLevelKey(t *testing.T) {
	// Contract of the schema (issue "Foundation"): non-finite numbers are null,
	// critical-value keys are "0.01", "0.05", "0.10".
	if F(nan()) != nil || F(1) == nil || *F(1) != 1 {
		t.Error("F must map NaN to nil and keep finite values")
	}
	for p, want := range map[float64]string{0.01: "0.01", 0.025: "0.025", 0.05: "0.05", 0.10: "0.10", 0.2: "0.2"} {
		if got := LevelKey(p); got != want {
			t.Errorf("LevelKey(%g) = %q, want %q", p, got, want)
		}
	}
}

func nan() float64 { var z float64; return z / z }
