// Tests of the paired Zivot-Andrews statistics (zapair.go): Zivot & Andrews
// (1992) models A and C (eqs. (1) and (3)) at one fixed lag order computed
// from one preparation of the series must equal two separate searches (the
// za statistic function, newZAStat) bit for bit, for series of different
// kinds, lengths and orders; errors must be the separate searches' errors;
// the pair does not allocate after the first series. A benchmark times the
// pair beside the two separate searches, its twin.
package breaks

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/rootshift/rootshift/core"
)

func pairSeries(kind string, T int, seed uint64) []float64 {
	r := rand.New(rand.NewPCG(seed, 5))
	y := make([]float64, T)
	s, u := 0.0, 0.0
	for i := range y {
		e := r.NormFloat64()
		s += e
		u = 0.6*u + e
		switch kind {
		case "walk":
			y[i] = s
		case "ar":
			y[i] = u
		case "shift":
			y[i] = u
			if i > T/2 {
				y[i] += 5
			}
		case "far":
			y[i] = 1e6 + s
		}
	}
	return y
}

func zaSeparate(T, k int, shift core.Shift) core.StatFunc {
	return newZAStat(T, &core.Config{Trend: core.TrendLinear, Shift: shift, LagRule: core.LagFixed, Lags: k, NoPath: true})
}

func TestZAPairEqualsSearches(t *testing.T) {
	for _, kind := range []string{"walk", "ar", "shift", "far"} {
		for _, T := range []int{60, 200, 500} {
			for _, k := range []int{0, 1, 4, 8} {
				p := NewZAPair(T, k, nil)
				if !p.fused {
					t.Fatalf("T=%d k=%d: the default pair does not take the fused candidate loop", T, k)
				}
				fa, fc := zaSeparate(T, k, core.ShiftLevel), zaSeparate(T, k, core.ShiftBoth)
				for rep := range 3 {
					y := pairSeries(kind, T, uint64(T*10+k*3+rep))
					tA, tC, err := p.Stats(y)
					if err != nil {
						t.Fatalf("%s T=%d k=%d: %v", kind, T, k, err)
					}
					wA, errA := fa(y)
					wC, errC := fc(y)
					if errA != nil || errC != nil {
						t.Fatalf("%s T=%d k=%d: separate searches: %v %v", kind, T, k, errA, errC)
					}
					if math.Float64bits(tA) != math.Float64bits(wA) || math.Float64bits(tC) != math.Float64bits(wC) {
						t.Errorf("%s T=%d k=%d rep %d: pair (%.17g, %.17g), separate (%.17g, %.17g)", kind, T, k, rep, tA, tC, wA, wC)
					}
				}
			}
		}
	}
}

func TestZAPairErrors(t *testing.T) {
	p := NewZAPair(100, 2, nil)
	if _, _, err := p.Stats(pairSeries("walk", 99, 1)); err == nil {
		t.Error("wrong length: no error")
	}
	y := pairSeries("walk", 100, 1)
	y[10] = math.NaN()
	_, _, err := p.Stats(y)
	_, err2 := zaSeparate(100, 2, core.ShiftLevel)(y)
	if err == nil || err2 == nil || err.Error() != err2.Error() {
		t.Errorf("missing value: pair error %v, separate %v", err, err2)
	}
	if _, _, err := NewZAPair(100, 2, &core.Config{Trim: 0.7}).Stats(pairSeries("walk", 100, 1)); err == nil {
		t.Error("trimming 0.7: no error")
	}
}

func TestZAPairNoAlloc(t *testing.T) {
	p := NewZAPair(300, 3, nil)
	y := pairSeries("ar", 300, 2)
	p.Stats(y)
	if a := testing.AllocsPerRun(10, func() { p.Stats(y) }); a != 0 {
		t.Errorf("ZAPair.Stats allocates %v times per call", a)
	}
}

func BenchmarkZAPair(b *testing.B) {
	for _, T := range []int{300, 1000} {
		y := pairSeries("ar", T, 3)
		p := NewZAPair(T, 2, nil)
		fa, fc := zaSeparate(T, 2, core.ShiftLevel), zaSeparate(T, 2, core.ShiftBoth)
		b.Run(fmt.Sprintf("pair/T=%d", T), func(b *testing.B) {
			for range b.N {
				p.Stats(y)
			}
		})
		b.Run(fmt.Sprintf("separate/T=%d", T), func(b *testing.B) {
			for range b.N {
				fa(y)
				fc(y)
			}
		})
	}
}

// FuzzZAPair feeds arbitrary series, orders and trimmings to the pair: it
// must not panic, and it must give the two searches' statistics and errors.
func FuzzZAPair(f *testing.F) {
	f.Add([]byte{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16, 17, 18, 19, 20, 21, 22, 23, 24, 25, 26, 27, 28, 29, 30}, uint8(1), uint8(15))
	f.Add([]byte{0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0}, uint8(0), uint8(10))
	f.Add([]byte{9, 1, 8, 2, 7, 3, 6, 4, 5, 5, 4, 6, 3, 7, 2, 8, 1, 9, 0, 10, 200, 3, 5, 7}, uint8(3), uint8(30))
	f.Fuzz(func(t *testing.T, b []byte, k, trim uint8) {
		y := make([]float64, len(b))
		s := 0.0
		for i, v := range b {
			s += float64(int(v)-128) / 16
			y[i] = s
		}
		lags := int(k % 6)
		cfg := &core.Config{Trim: float64(trim%50) / 100}
		p := NewZAPair(len(y), lags, cfg)
		tA, tC, err := p.Stats(y)
		ca := *cfg
		ca.Trend, ca.Shift, ca.LagRule, ca.Lags, ca.NoPath = core.TrendLinear, core.ShiftLevel, core.LagFixed, lags, true
		cc := ca
		cc.Shift = core.ShiftBoth
		wA, errA := newZAStat(len(y), &ca)(y)
		wC, errC := newZAStat(len(y), &cc)(y)
		want := errA
		if want == nil {
			want = errC
		}
		if (err == nil) != (want == nil) || (err != nil && err.Error() != want.Error()) {
			t.Fatalf("pair error %v, separate %v / %v", err, errA, errC)
		}
		if err == nil && (math.Float64bits(tA) != math.Float64bits(wA) || math.Float64bits(tC) != math.Float64bits(wC)) {
			t.Fatalf("pair (%v, %v), separate (%v, %v)", tA, tC, wA, wC)
		}
	})
}
