// Tests of the SADF statistic with drift dummies (sadf_drift.go) against
// its brute-force twin, a full least-squares refit (core.LS, Householder QR)
// of every window regression, and against the project's SADF (core, which
// implements Phillips, Wu & Yu 2011, eq. 6) when there is no drift break.
// The fast path accumulates cross-products of the standardised series, so
// it must also agree on a series sitting at 1e6.
package decide

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/rootshift/rootshift/core"
)

// sadfDriftBrute refits every window by QR.
func sadfDriftBrute(y []float64, k int, breaks []int, w0 int) float64 {
	T := len(y)
	start := k + 2
	best := math.Inf(-1)
	var ls core.LS
	for e := w0; e <= T; e++ {
		n := e - start + 1
		var cols [][]float64
		col := func(f func(t int) float64) {
			c := make([]float64, n)
			for i := range c {
				c[i] = f(start + i)
			}
			cols = append(cols, c)
		}
		col(func(int) float64 { return 1 })
		for _, tb := range breaks {
			if tb >= start && e-tb >= minAfter {
				col(func(t int) float64 {
					if t > tb {
						return 1
					}
					return 0
				})
			}
		}
		ri := len(cols)
		col(func(t int) float64 { return y[t-2] })
		for i := 1; i <= k; i++ {
			col(func(t int) float64 { return y[t-1-i] - y[t-2-i] })
		}
		dep := make([]float64, n)
		for i := range dep {
			t := start + i
			dep[i] = y[t-1] - y[t-2]
		}
		f, err := ls.Fit(cols, dep)
		if err != nil {
			continue
		}
		best = math.Max(best, f.TStat(ri))
	}
	return best
}

func TestSADFDriftMatchesBruteForce(t *testing.T) {
	cases := []struct {
		key    string
		k      int
		breaks []int
		offset float64
	}{
		{"rw", 0, nil, 0},
		{"rw", 2, nil, 0},
		{"rw-trough", 1, []int{100}, 0},
		{"rw-drift-turns", 3, []int{60, 140}, 0},
		{"rw-trough", 1, []int{100}, 1e6},
		{"explosive-1.02", 2, []int{150}, 0},
	}
	for _, c := range cases {
		p, _ := ProcessByKey(c.key)
		y := make([]float64, 200)
		p.Gen(y, rand.New(rand.NewPCG(5, uint64(c.k))))
		for i := range y {
			y[i] += c.offset
		}
		s := newSADFDrift(len(y), c.k, c.breaks)
		got, err := s.stat(y)
		if err != nil {
			t.Fatalf("%s: %v", c.key, err)
		}
		want := sadfDriftBrute(y, c.k, c.breaks, s.w0)
		if math.Abs(got-want) > 1e-8*math.Max(1, math.Abs(want)) {
			t.Errorf("%s k=%d breaks=%v offset=%g: fast %.12g, QR twin %.12g", c.key, c.k, c.breaks, c.offset, got, want)
		}
	}
}

func TestSADFDriftEqualsCoreSADF(t *testing.T) {
	info, err := core.Lookup("sadf")
	if err != nil {
		t.Fatal(err)
	}
	for _, k := range []int{0, 2} {
		p, _ := ProcessByKey("rw")
		y := make([]float64, 300)
		p.Gen(y, rand.New(rand.NewPCG(8, uint64(k))))
		cfg := &core.Config{Trend: core.TrendConstant, LagRule: core.LagFixed, Lags: k, NoPath: true}
		want, err := info.StatOf(len(y), cfg)(y)
		if err != nil {
			t.Fatal(err)
		}
		got, err := newSADFDrift(len(y), k, nil).stat(y)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(got-want) > 1e-8 {
			t.Errorf("k=%d: %v here, core sadf %v", k, got, want)
		}
	}
}

func TestSADFDriftDoesNotAllocate(t *testing.T) {
	p, _ := ProcessByKey("rw-trough")
	y := make([]float64, 200)
	p.Gen(y, rand.New(rand.NewPCG(1, 1)))
	s := newSADFDrift(len(y), 2, []int{100})
	s.stat(y)
	if a := testing.AllocsPerRun(20, func() { s.stat(y) }); a > 0 {
		t.Errorf("%v allocations per call", a)
	}
}

func benchSADFDrift(b *testing.B, T int, brute bool) {
	p, _ := ProcessByKey("rw-trough")
	y := make([]float64, T)
	p.Gen(y, rand.New(rand.NewPCG(1, 1)))
	s := newSADFDrift(T, 2, []int{T / 2})
	b.ResetTimer()
	for b.Loop() {
		if brute {
			sadfDriftBrute(y, 2, []int{T / 2}, s.w0)
		} else {
			s.stat(y)
		}
	}
}

func BenchmarkSADFDrift(b *testing.B) {
	for _, T := range []int{100, 1000} {
		b.Run("fast/T="+itoa(T), func(b *testing.B) { benchSADFDrift(b, T, false) })
		b.Run("brute/T="+itoa(T), func(b *testing.B) { benchSADFDrift(b, T, true) })
	}
}

func itoa(i int) string {
	if i == 0 {
		return "0"
	}
	s := ""
	for ; i > 0; i /= 10 {
		s = string(rune('0'+i%10)) + s
	}
	return s
}
