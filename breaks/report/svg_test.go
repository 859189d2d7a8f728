package report

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// checkSVG asserts the properties every plot must have: one well-formed
// <svg> root with a viewBox and a <title> first, and no NaN or Inf printed.
func checkSVG(t *testing.T, name, svg string) {
	t.Helper()
	if !strings.HasPrefix(svg, "<svg ") || !strings.HasSuffix(svg, "</svg>") {
		t.Errorf("%s: not an <svg> element", name)
	}
	if err := xmlWellFormed(svg); err != nil {
		t.Errorf("%s: %v", name, err)
	}
	if !strings.Contains(svg, `viewBox="0 0 640 `) {
		t.Errorf("%s: no viewBox", name)
	}
	if !firstChildIsTitle(svg) {
		t.Errorf("%s: no <title>", name)
	}
	for _, bad := range []string{"NaN", "Inf", "var(--"} {
		if strings.Contains(svg, bad) {
			t.Errorf("%s: contains %q", name, bad)
		}
	}
}

func TestSeriesSVG(t *testing.T) {
	nan := math.NaN()
	br := []schema.Break{{Index: 2, Lower: 1, Upper: 3, CILevel: 0.9}}
	ep := []schema.Episode{{Start: schema.Point{Index: 2}, End: schema.Point{Index: 3}}}
	for _, c := range []struct {
		name     string
		s        dataset.Series
		breaks   []schema.Break
		episodes []schema.Episode
		want     []string
	}{
		{"empty", dataset.Series{Name: "e"}, nil, nil, []string{"no observations to plot"}},
		{"all missing", dataset.Series{Name: "m", Values: []float64{nan, nan}}, br, nil, []string{"no observations to plot"}},
		{"one point", dataset.Series{Name: "p", Values: []float64{3}}, nil, nil, []string{"<circle"}},
		{"constant", dataset.Series{Name: "c", Values: []float64{5, 5, 5, 5}}, br, ep, []string{"<polyline", ">5.0<"}},
		{"undated", dataset.Series{Name: "u", Values: []float64{1, 2, 3, 2, 1}}, br, nil, []string{">observation<", ">obs 2<"}},
		{"dated", dataset.Series{Name: "d", Values: []float64{1, 2, 3}, Dates: []string{"2001", "2002", "2003"}},
			[]schema.Break{{Index: 2, Date: "2002"}}, nil, []string{">date<", ">2002<"}},
		{"dates misaligned", dataset.Series{Name: "d", Values: []float64{1, 2, 3}, Dates: []string{"2001"}}, nil, nil, []string{">observation<"}},
		{"missing values", dataset.Series{Name: "g", Values: []float64{1, nan, 3, 4, math.Inf(1), 6}}, nil, nil, []string{"<circle", "<polyline"}},
		{"huge", dataset.Series{Name: "h", Values: []float64{-math.MaxFloat64, math.MaxFloat64, 0}}, nil, nil, nil},
		{"tiny range", dataset.Series{Name: "t", Values: []float64{1e16, 1e16 + 2, 1e16 + 4}}, nil, nil, nil},
		{"breaks out of range", dataset.Series{Name: "o", Values: []float64{1, 2}},
			[]schema.Break{{Index: -5, Lower: 9, Upper: 2}, {Index: 99}}, []schema.Episode{{Start: schema.Point{Index: 50}}}, nil},
		{"markup in name", dataset.Series{Name: "a<b>&\x01", Values: []float64{1, 2}}, nil, nil, []string{"a&lt;b&gt;&amp;"}},
	} {
		svg := SeriesSVG(c.s, c.breaks, c.episodes)
		checkSVG(t, c.name, svg)
		for _, w := range c.want {
			if !strings.Contains(svg, w) {
				t.Errorf("%s: lacks %q", c.name, w)
			}
		}
	}
}

func TestPathSVG(t *testing.T) {
	nan := math.NaN()
	cvs := map[string]float64{"0.05": -4.8}
	for _, c := range []struct {
		name string
		r    schema.Result
		want []string
	}{
		{"nothing", schema.Result{Test: "za"}, []string{"no search path to plot"}},
		{"one point", schema.Result{Test: "za", Path: []schema.PathPoint{{Index: 7, Statistic: -3}}, CriticalValues: cvs,
			Breaks: []schema.Break{{Index: 7}}}, []string{"<circle", "5% critical value", `stroke-dasharray="6,4"`}},
		{"all NaN", schema.Result{Test: "za", Path: []schema.PathPoint{{Index: 1, Statistic: nan}, {Index: 2, Statistic: math.Inf(-1)}}},
			[]string{"no finite statistic to plot"}},
		{"path", schema.Result{Test: "za", Path: []schema.PathPoint{{Index: 5, Statistic: -3}, {Index: 6, Statistic: -5}, {Index: 7, Statistic: nan}, {Index: 8, Statistic: -4}},
			CriticalValues: cvs, Breaks: []schema.Break{{Index: 6, Date: "1990Q2"}}}, []string{"chosen break", ">1990Q2<", "candidate break date"}},
		{"no cv", schema.Result{Test: "za", Path: []schema.PathPoint{{Index: 5, Statistic: 1}, {Index: 6, Statistic: 1}}}, []string{"<polyline"}},
		{"sequence", schema.Result{Test: "gsadf", Sequence: &schema.Sequence{Name: "BSADF", Index: []int{10, 11, 12},
			Values: []float64{0.1, 2, nan}, Critical: []float64{1, 1.1}, Level: 0.05},
			Episodes: []schema.Episode{{Start: schema.Point{Index: 11}, End: schema.Point{Index: 11}}}},
			[]string{"BSADF", "5% critical value", "explosive episode"}},
		{"sequence ragged", schema.Result{Test: "gsadf", Sequence: &schema.Sequence{Index: []int{1, 2, 3}, Values: []float64{1}}}, []string{"<circle"}},
		{"surface", schema.Result{Test: "ls2", Surface: &schema.Surface{Rows: []schema.PathPoint{{Index: 3, Statistic: -2}, {Index: 4, Statistic: -6}}},
			CriticalValues: cvs, Breaks: []schema.Break{{Index: 4}, {Index: 9}}}, []string{"first break", "chosen break"}},
	} {
		svg := PathSVG(c.r)
		checkSVG(t, c.name, svg)
		for _, w := range c.want {
			if !strings.Contains(svg, w) {
				t.Errorf("%s: lacks %q", c.name, w)
			}
		}
	}
}

// TestACF checks the sample autocorrelations against values computed by
// hand from the definition (Box & Jenkins 1976, eq. 2.1.12).
func TestACF(t *testing.T) {
	for _, c := range []struct {
		name string
		x    []float64
		lags int
		want []float64 // nil: undefined
	}{
		// 1..5: mean 3, deviations -2..2, Σd² = 10; r1 = (2+0+0+2)/10, r2 = (0-1+0)/10,
		// r3 = (-2·1 + -1·2)/10 ... computed by hand.
		{"linear", []float64{1, 2, 3, 4, 5}, 4, []float64{1, 0.4, -0.1, -0.4, -0.4}},
		// Alternating ±1: mean 0, Σx² = 4, r1 = -3/4, r2 = 2/4, r3 = -1/4.
		{"alternating", []float64{1, -1, 1, -1}, 3, []float64{1, -0.75, 0.5, -0.25}},
		{"lags capped at T-1", []float64{1, -1, 1, -1}, 10, []float64{1, -0.75, 0.5, -0.25}},
		{"no lags", []float64{1, 2}, 0, []float64{1}},
		{"constant", []float64{2, 2, 2}, 2, nil},
		{"one value", []float64{2}, 2, nil},
		{"NaN", []float64{1, math.NaN(), 3}, 1, nil},
	} {
		got := ACF(c.x, c.lags)
		if (got == nil) != (c.want == nil) || len(got) != len(c.want) {
			t.Errorf("%s: got %v, want %v", c.name, got, c.want)
			continue
		}
		for k := range got {
			if math.Abs(got[k]-c.want[k]) > 1e-12 {
				t.Errorf("%s: r_%d = %v, want %v", c.name, k, got[k], c.want[k])
			}
		}
	}
	// Hand check of r3 and r4 for 1..5: Σ_{t=4..5} d_t d_{t-3} = 1·(-2) + 2·(-1) = -4;
	// Σ_{t=5} d_5 d_1 = 2·(-2) = -4; both over 10.
}

func TestACFSVG(t *testing.T) {
	nan := math.NaN()
	for _, c := range []struct {
		name string
		s    dataset.Series
		lags int
		want []string
	}{
		{"series", dataset.Series{Name: "x", Values: []float64{1, 3, 2, 5, 4, 6, 5, 8, 7, 9}}, 4, []string{"level (T=10)", "first difference (T=9)", "±1.96/√T"}},
		{"default lags", dataset.Series{Name: "x", Values: []float64{1, 3, 2, 5, 4, 6, 5, 8, 7, 9}}, 0, []string{"level (T=10)"}},
		{"constant", dataset.Series{Name: "c", Values: []float64{4, 4, 4}}, 3, []string{"the values do not vary"}},
		{"linear: constant difference", dataset.Series{Name: "l", Values: []float64{1, 2, 3, 4}}, 2, []string{"level (T=4)", "the values do not vary"}},
		{"empty", dataset.Series{Name: "e"}, 5, []string{"too few observations"}},
		{"one point", dataset.Series{Name: "o", Values: []float64{1}}, 5, []string{"too few observations"}},
		{"missing", dataset.Series{Name: "m", Values: []float64{1, nan, 3, 2, nan, nan, 5, 1}}, 3, []string{"level (T=5)", "first difference (T=2)"}},
		{"huge lags", dataset.Series{Name: "h", Values: []float64{1, 3, 2, 5}}, 1 << 30, []string{"level (T=4)"}},
		{"huge values", dataset.Series{Name: "h", Values: []float64{math.MaxFloat64, -math.MaxFloat64, math.MaxFloat64}}, 2, nil},
	} {
		svg := ACFSVG(c.s, c.lags)
		checkSVG(t, c.name, svg)
		for _, w := range c.want {
			if !strings.Contains(svg, w) {
				t.Errorf("%s: lacks %q", c.name, w)
			}
		}
	}
	// The band is ±1.96/√T: for T = 100 white noise the dashed lines sit at ±0.196.
	x := make([]float64, 100)
	for i := range x {
		x[i] = math.Sin(float64(i * i))
	}
	f := acfFrame(10, 36) // the first panel's top edge (ACFSVG)
	y := px(f.Y(0.196))
	if svg := ACFSVG(dataset.Series{Name: "w", Values: x}, 10); !strings.Contains(svg, `y1="`+y+`"`) {
		t.Errorf("no band line at y=%s for +0.196", y)
	}
}

func TestNiceTicks(t *testing.T) {
	for _, c := range []struct {
		lo, hi float64
		n      int
		want   []float64
	}{
		{0, 10, 5, []float64{0, 2, 4, 6, 8, 10}},
		{-1.2, 3.7, 5, []float64{-1, 0, 1, 2, 3}},
		{95, 142, 5, []float64{100, 110, 120, 130, 140}},
		{3, 3, 5, []float64{3}},
	} {
		got, _ := niceTicks(c.lo, c.hi, c.n)
		if len(got) != len(c.want) {
			t.Errorf("niceTicks(%v, %v) = %v, want %v", c.lo, c.hi, got, c.want)
			continue
		}
		for i := range got {
			if math.Abs(got[i]-c.want[i]) > 1e-9 {
				t.Errorf("niceTicks(%v, %v) = %v, want %v", c.lo, c.hi, got, c.want)
				break
			}
		}
	}
	for _, c := range []struct {
		v, step float64
		want    string
	}{
		{0.5, 0.5, "0.5"}, {2, 1, "2"}, {-0.25, 0.05, "-0.25"}, {1e7, 1e6, "1e+07"}, {0, 1, "0"}, {-1e-17, 0.1, "0"}, {3e-5, 1e-5, "3e-05"},
	} {
		if got := tickLabel(c.v, c.step); got != c.want {
			t.Errorf("tickLabel(%v, %v) = %q, want %q", c.v, c.step, got, c.want)
		}
	}
}

// parsePoints reads the points attribute of every <polyline> in svg.
func parsePoints(t *testing.T, svg string) [][2]float64 {
	t.Helper()
	var out [][2]float64
	for _, part := range strings.Split(svg, `points="`)[1:] {
		for _, p := range strings.Fields(part[:strings.Index(part, `"`)]) {
			var x, y float64
			if _, err := fmt.Sscanf(p, "%g,%g", &x, &y); err != nil {
				t.Fatalf("point %q: %v", p, err)
			}
			out = append(out, [2]float64{x, y})
		}
	}
	return out
}

// TestPolylineThinning compares the thinned polyline of a long series with
// its brute-force twin (every point drawn): per pixel column the first,
// last, lowest and highest pixel are the same, so the picture is the same.
func TestPolylineThinning(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	n := 5000
	xs, ys := make([]float64, n), make([]float64, n)
	acc := 0.0
	for i := range xs {
		acc += r.NormFloat64()
		xs[i], ys[i] = float64(i+1), acc
	}
	lo, hi := dataRange(ys)
	f := &frame{x0: 1, x1: float64(n), y0: lo, y1: hi, left: 10, top: 10, width: 100, height: 100}
	thin := &svgBuilder{}
	thin.polyline(f, xs, ys, "#000", "")
	got := parsePoints(t, thin.String())
	if len(got) > 4*100+4 || len(got) < 100 {
		t.Fatalf("%d points after thinning", len(got))
	}
	type agg struct{ first, last, min, max float64 }
	columns := func(pts [][2]float64) map[float64]*agg {
		m := map[float64]*agg{}
		for _, p := range pts {
			col := math.Floor(p[0])
			a, ok := m[col]
			if !ok {
				m[col] = &agg{p[1], p[1], p[1], p[1]}
				continue
			}
			a.last, a.min, a.max = p[1], math.Min(a.min, p[1]), math.Max(a.max, p[1])
		}
		return m
	}
	// Brute force: every point, through the same rounding as px.
	var all [][2]float64
	for i := range xs {
		var x, y float64
		fmt.Sscanf(px(f.X(xs[i]))+","+px(f.Y(ys[i])), "%g,%g", &x, &y)
		all = append(all, [2]float64{x, y})
	}
	want, have := columns(all), columns(got)
	if len(want) != len(have) {
		t.Fatalf("%d columns, want %d", len(have), len(want))
	}
	for col, w := range want {
		h := have[col]
		if h == nil || *h != *w {
			t.Errorf("column %v: thinned %+v, every point %+v", col, h, w)
		}
	}
	// A short series is drawn point by point.
	short := &svgBuilder{}
	short.polyline(f, xs[:300], ys[:300], "#000", "")
	if k := len(parsePoints(t, short.String())); k != 300 {
		t.Errorf("short series: %d points, want 300", k)
	}
}
