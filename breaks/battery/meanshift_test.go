package battery

import (
	"context"
	"errors"
	"testing"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

// TestMeanShiftSettings checks that the outlier type and the number of
// shifts reach the meanshift test's configuration and its result, that the
// zero values mean the documented defaults (innovational, one shift) and
// that other values are usage errors naming the field.
func TestMeanShiftSettings(t *testing.T) {
	for _, c := range []struct {
		s       schema.Settings
		outlier core.Outlier
		shifts  int
		variant string
	}{
		{schema.Settings{}, core.OutlierInnovational, 1, "innovational outlier, 1 mean shift(s)"},
		{schema.Settings{Outlier: "additive"}, core.OutlierAdditive, 1, "additive outlier, 1 mean shift(s)"},
		{schema.Settings{Outlier: "innovational", Shifts: 2}, core.OutlierInnovational, 2, "innovational outlier, 2 mean shift(s)"},
	} {
		if err := Validate(c.s); err != nil {
			t.Fatal(err)
		}
		cfg := Config(c.s, "meanshift", nil)
		if cfg.Outlier != c.outlier || cfg.ShiftsOr() != c.shifts {
			t.Errorf("%+v: config outlier %v shifts %d", c.s, cfg.Outlier, cfg.ShiftsOr())
		}
		y := make([]float64, 120)
		x := uint64(7)
		for i := range y {
			x = x*6364136223846793005 + 1442695040888963407
			e := float64(int64(x>>11)%2000)/1000 - 1
			if i > 0 {
				y[i] = 0.5*y[i-1] + e
			}
			if i >= 60 {
				y[i] += 0.2
			}
		}
		info, err := core.Lookup("meanshift")
		if err != nil {
			t.Fatal(err)
		}
		cfg.NoPath = true
		res, err := info.Run(context.Background(), y, cfg)
		if err != nil {
			t.Fatal(err)
		}
		if res.Variant != c.variant || len(res.Breaks) != c.shifts {
			t.Errorf("%+v: variant %q, %d breaks", c.s, res.Variant, len(res.Breaks))
		}
	}
	for _, s := range []schema.Settings{{Outlier: "io"}, {Shifts: 3}, {Shifts: -1}} {
		var ue *UsageError
		if err := Validate(s); !errors.As(err, &ue) || (ue.Field != "outlier" && ue.Field != "shifts") {
			t.Errorf("%+v: %v", s, err)
		}
	}
	for _, id := range []string{"cmrio1", "cmrao2"} {
		if err := Validate(schema.Settings{Tests: []string{id}}); err == nil {
			t.Errorf("old id %s accepted", id)
		}
	}
}
