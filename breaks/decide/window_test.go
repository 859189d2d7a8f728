// Tests of the crisis-window stage (window.go): a Zivot & Andrews (1992)
// search restricted to the analyst's window, with critical values simulated
// for that restricted search. Size under a random walk must be within
// simulation error of the nominal 5% (our own simulation: the rejection
// count is binomial; tolerance three standard errors); power against a
// level shift inside the window is reported. Windows that cannot be placed
// are usage errors.
package decide

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

func windowReject(t *testing.T, y []float64, spec string, sims int) *schema.WindowCheck {
	t.Helper()
	w := &work{in: &Input{Y: y, Settings: schema.Settings{Window: spec, Sims: sims}}, y: y, z: y, alpha: 0.05}
	win, err := w.placeWindow()
	if err != nil {
		t.Fatal(err)
	}
	wc, err := w.windowTest(context.Background(), win, &schema.Verdict{})
	if err != nil {
		t.Fatal(err)
	}
	return wc
}

func TestWindowSizeAndPower(t *testing.T) {
	if testing.Short() {
		t.Skip("simulation")
	}
	const T, draws, sims = 100, 120, 199
	rw, _ := ProcessByKey("rw")
	shift, _ := ProcessByKey("ar-shift5")
	size, power := 0, 0
	y := make([]float64, T)
	for d := range draws {
		rw.Gen(y, rand.New(rand.NewPCG(31, uint64(d))))
		if wc := windowReject(t, y, "40:60", sims); wc.BreakInside {
			size++
		}
		if d < draws/2 {
			shift.Gen(y, rand.New(rand.NewPCG(32, uint64(d))))
			wc := windowReject(t, y, "40:60", sims)
			if wc.BreakInside {
				power++
				if b := wc.Test.Breaks[0].Index; b < 40 || b > 60 {
					t.Errorf("break dated at %d, outside the window 40..60", b)
				}
			}
		}
	}
	rate := float64(size) / draws
	se := math.Sqrt(0.05 * 0.95 / draws)
	t.Logf("restricted window 40..60 at T=%d: size %.3f (%d of %d random walks); power %.2f against a 5-sigma level shift at 50 in a stationary AR(1) (%d of %d)", T, rate, size, draws, float64(power)/(draws/2), power, draws/2)
	if math.Abs(rate-0.05) > 3*se {
		t.Errorf("size %.3f, want 0.05 within 3 s.e. (%.3f)", rate, 3*se)
	}
	if power < draws/2*8/10 {
		t.Errorf("power %d of %d against a 5-sigma shift inside the window, want at least 80%%", power, draws/2)
	}
}

func TestWindowUsageErrors(t *testing.T) {
	y := make([]float64, 60)
	rw, _ := ProcessByKey("rw")
	rw.Gen(y, rand.New(rand.NewPCG(1, 1)))
	dates := make([]string, 60)
	for i := range dates {
		dates[i] = []string{"2005", "2006", "2007", "2008", "2009"}[i/12] + "-" + []string{"01", "02", "03", "04", "05", "06", "07", "08", "09", "10", "11", "12"}[i%12]
	}
	for _, spec := range []string{"2009-06:2008-09", "2011-01:2011-06", "2008-09", "x:y", "0:10"} {
		_, err := Run(context.Background(), Input{Y: y, Dates: dates, Frequency: "monthly", Settings: schema.Settings{Window: spec}})
		var we *WindowError
		if !errors.As(err, &we) {
			t.Errorf("window %q: error %v, want a *WindowError", spec, err)
		}
	}
	out, err := Run(context.Background(), Input{Y: y, Dates: dates, Frequency: "monthly", Settings: schema.Settings{Window: "2007-06:2008-06"}})
	if err != nil {
		t.Fatal(err)
	}
	w := out.Verdict.Window
	if w == nil || w.FromIndex != 30 || w.ToIndex != 42 || w.Test == nil || w.Test.PValue == nil || w.Answer == "" {
		t.Fatalf("window check %+v", w)
	}
	if w.BreakInside != w.Test.Reject {
		t.Errorf("break_inside %v but the restricted test's decision is %v", w.BreakInside, w.Test.Reject)
	}
}
