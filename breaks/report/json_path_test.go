// The candidate paths written by hand (marshalSeries, appendPath) are the
// bytes encoding/json writes for the same series (RFC 8259 text; ES6 number
// formatting as encoding/json implements it, the reference here), for
// statistics at the edges of the number formats, hidden characters beside
// the paths, several results with and without long paths, and a
// non-finite statistic (the error of encoding/json).
package report

import (
	"bytes"
	"encoding/json"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

func TestMarshalSeriesEqualsEncodingJSON(t *testing.T) {
	edges := []float64{0, math.Copysign(0, -1), 1e-6, 9.999999999999999e-7, -1e-7, 1e21, 9.99999999999999e20, -1e21,
		5e-324, math.MaxFloat64, -math.SmallestNonzeroFloat64, 1e-9, 123456789.125, -3.5516974842043340, 1, -1, 0.1, 2.5e-10}
	r := rand.New(rand.NewPCG(7, 13))
	path := func(n, first int) []schema.PathPoint {
		p := make([]schema.PathPoint, n)
		for i := range p {
			v := r.NormFloat64() * math.Pow(10, float64(r.IntN(50)-25))
			if i < len(edges) {
				v = edges[i]
			}
			p[i] = schema.PathPoint{Index: first + i, Statistic: v}
		}
		return p
	}
	stat := -4.25
	series := []schema.Series{
		{Name: "one long path", Results: []schema.Result{{Test: "za", Statistic: &stat, Path: path(700, 150)}}},
		{Name: "short and long \u202e hidden", Results: []schema.Result{
			{Test: "pio", Path: path(5, 3), Warnings: []string{"a \u200b warning", `"path":[{"index":-9223372036854775808,"statistic":0}]`}},
			{Test: "za", Path: path(minFastPath, -40)},
			{Test: "adf"},
			{Test: "p89", Path: []schema.PathPoint{}},
			{Test: "za", Path: path(300, math.MaxInt64-400), Warnings: []string{"after the path"}},
		}},
		{Name: "no results"},
	}
	for _, sr := range series {
		want, err := json.Marshal(&sr)
		if err != nil {
			t.Fatal(err)
		}
		want = JSONHidden(want)
		got, err := marshalSeries(&sr)
		if err != nil {
			t.Fatalf("%s: %v", sr.Name, err)
		}
		if !bytes.Equal(got, want) {
			t.Errorf("%s: hand-written paths differ from encoding/json\n got %.300s\nwant %.300s", sr.Name, got, want)
		}
	}
	bad := path(40, 1)
	bad[20].Statistic = math.NaN()
	sr := schema.Series{Name: "nan", Results: []schema.Result{{Test: "za", Path: bad}}}
	if _, err := marshalSeries(&sr); err == nil {
		t.Error("a NaN statistic in a path was encoded; encoding/json refuses it")
	}
}
