package report

import (
	"math"
	"strconv"

	"github.com/rootshift/rootshift/core/dataset"
)

// ACF returns the sample autocorrelations r_0..r_lags of x (Box & Jenkins
// 1976, eq. 2.1.12):
//
//	r_k = Σ_{t=k+1..T} (x_t - m)(x_{t-k} - m) / Σ_{t=1..T} (x_t - m)²,
//
// with m the sample mean, so r_0 = 1. lags is capped at T-1. It returns nil
// when x has fewer than 2 values, a non-finite value, or no variation (the
// autocorrelations are then undefined).
func ACF(x []float64, lags int) []float64 {
	T := len(x)
	if T < 2 {
		return nil
	}
	lags = max(0, min(lags, T-1))
	m := 0.0
	for _, v := range x {
		if !finite(v) {
			return nil
		}
		m += v
	}
	m /= float64(T)
	den := 0.0
	for _, v := range x {
		d := v - m
		den += d * d
	}
	if !(den > 0) || !finite(den) {
		return nil
	}
	out := make([]float64, lags+1)
	for k := 0; k <= lags; k++ {
		s := 0.0
		for t := k; t < T; t++ {
			s += (x[t] - m) * (x[t-k] - m)
		}
		out[k] = s / den
	}
	if !finite(out[0]) {
		return nil
	}
	for k := range out {
		if !finite(out[k]) {
			return nil
		}
	}
	return out
}

// acfDefaultLags is the number of lags ACFSVG shows when asked for lags <= 0:
// min(10 log10(T), T-1), at least 1.
func acfDefaultLags(T int) int {
	if T < 2 {
		return 1
	}
	return max(1, min(int(math.Round(10*math.Log10(float64(T)))), T-1))
}

// ACFSVG plots the autocorrelation function of the level of s and of its
// first difference in two panels, as bars at lags 1..lags with the
// approximate 95% band ±1.96/√T under white noise (Bartlett 1946) dashed.
// Missing values are dropped before the level ACF; the difference uses only
// pairs of consecutive finite observations. lags <= 0 chooses
// min(10 log10 T, T-1); at most 500 lags are drawn. A panel whose ACF is undefined (too few
// observations, or a constant) says so. It returns a complete <svg> element.
func ACFSVG(s dataset.Series, lags int) string {
	const acfTop = 36
	const panel = 190
	const height = 2*panel + 40
	var level, diff []float64
	prev := math.NaN()
	for _, v := range s.Values {
		if finite(v) {
			level = append(level, v)
			if finite(prev) {
				diff = append(diff, v-prev)
			}
		}
		prev = v
	}
	if lags <= 0 {
		lags = acfDefaultLags(len(level))
	}
	lags = min(lags, 500) // more bars than pixels would not be readable
	b := newSVG(height, "Autocorrelation function of "+s.Name+": level and first difference")
	b.text(12, 20, "start", colText, titleText("Autocorrelations of "+s.Name), ` font-size="`+strconv.Itoa(fontTitle)+`" font-weight="bold"`)
	b.acfPanel(level, lags, "level", acfTop)
	b.acfPanel(diff, lags, "first difference", 36+panel+6)
	return b.close()
}

// acfFrame is the plot area of an ACF panel whose top edge is at y.
func acfFrame(lags int, y float64) *frame {
	const panelPlot = 120
	return &frame{x0: 0.5, x1: float64(lags) + 0.5, y0: -1, y1: 1, left: 56, top: y + 20, width: svgWidth - 56 - 16, height: panelPlot}
}

// acfPanel draws one ACF panel with its top edge at y.
func (b *svgBuilder) acfPanel(x []float64, lags int, name string, y float64) {
	f := acfFrame(lags, y)
	T := len(x)
	b.text(f.left, y+12, "start", colText, name+" (T="+strconv.Itoa(T)+")", "")
	r := ACF(x, lags)
	var xticks []float64
	if r != nil {
		xticks = indexTicks(1, max(1, len(r)-1), 8)
	}
	b.axes(f, []float64{-1, -0.5, 0, 0.5, 1}, xticks, 0.5, func(v float64) string { return strconv.Itoa(int(v)) })
	zero := f.Y(0)
	b.line(f.left, zero, f.left+f.width, zero, colAxis, "")
	if r == nil {
		msg := "autocorrelations undefined: too few observations"
		if T >= 2 {
			msg = "autocorrelations undefined: the values do not vary"
		}
		b.text(f.left+f.width/2, f.top+f.height/2-6, "middle", colText, msg, "")
		return
	}
	n := len(r) - 1
	bw := math.Max(1, math.Min(12, 0.6*f.width/float64(max(n, 1))))
	for k := 1; k <= n; k++ {
		xc := f.X(float64(k))
		yk := f.Y(r[k])
		top, h := math.Min(yk, zero), math.Abs(yk-zero)
		b.rect(xc-bw/2, top, bw, h, colBar, "")
	}
	band := 1.96 / math.Sqrt(float64(T))
	for _, v := range []float64{band, -band} {
		yb := f.Y(v)
		b.line(f.left, yb, f.left+f.width, yb, colBand, ` stroke-dasharray="5,3"`)
	}
	// The band's key sits on the panel's title line, right-aligned: inside
	// the plot it would overlap the bars of a slowly decaying ACF.
	b.text(f.left+f.width, y+12, "end", colBand, "dashed: ±1.96/√T", "")
	b.text(f.left+f.width/2, f.top+f.height+2*fontBase+4, "middle", colText, "lag", "")
}
