// Fuzz tests of the command's own parsers (project rule: fuzz tests for
// parsers and public entry points): the head reader of `batch merge` and
// the --shard parser never panic, and agree with the full decoder on the
// records they accept.
package main

import (
	"encoding/json"
	"testing"
)

func FuzzRecordHead(f *testing.F) {
	f.Add([]byte(`{"schema":"rootshift.results/v2","version":"0.1.0","settings":{},"source":{"name":"a.csv","rows":3,"index":2},"series":[{"name":"x","n":3}],"caution":""}`))
	f.Add([]byte(`{"schema":"rootshift.results/v2","source":{"name":"a"},"series":[{"n":1,"name":"y"}]}`))
	f.Add([]byte(`{"series":[],"schema":1}`))
	f.Add([]byte(`[1,2]`))
	f.Fuzz(func(t *testing.T, raw []byte) {
		h, err := recordHead(raw)
		if err != nil {
			return
		}
		var full struct {
			Source struct {
				Name  string `json:"name"`
				Index int    `json:"index"`
			} `json:"source"`
			Series []struct {
				Name string `json:"name"`
			} `json:"series"`
		}
		if json.Unmarshal(raw, &full) != nil {
			return // the head reader stops before the end of the line
		}
		if len(full.Series) > 0 && (full.Series[0].Name != h.Name || full.Source.Index != h.Source.Index) {
			t.Fatalf("head %+v differs from the full decode %+v", h, full)
		}
	})
}

func FuzzParseShard(f *testing.F) {
	for _, s := range []string{"1/2", "auto", "0/0", "3/2", "a/b", "9223372036854775807/1"} {
		f.Add(s, "3", "1", "8", "", 0)
	}
	f.Fuzz(func(t *testing.T, spec, id, lo, hi, idx string, flagN int) {
		env := map[string]string{"SLURM_ARRAY_TASK_ID": id, "SLURM_ARRAY_TASK_MIN": lo, "SLURM_ARRAY_TASK_MAX": hi, "JOB_COMPLETION_INDEX": idx}
		i, n, _, err := parseShard(spec, flagN, func(k string) string { return env[k] })
		if err == nil && (n < 1 || i < 1 || i > n) {
			t.Fatalf("%q: accepted shard %d/%d", spec, i, n)
		}
	})
}
