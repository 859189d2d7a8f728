package report

import (
	"encoding/xml"
	"math"
	"strconv"
	"strings"

	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// Plot geometry and colours. Colours are plain hex values (no CSS
// variables) so that a plot looks the same in any page.
//
// Text at phone width: the plots scale with their viewBox to the width of
// the page, 360 CSS pixels of content on a common phone (390 px wide less
// the margins). fontBase is chosen so that the smallest text is still
// phoneMinFont pixels there: 16 * 360 / 640 = 9 (about 9 px is the least
// that reads on a phone: common practice, no source).
const (
	svgWidth      = 640
	phoneWidth    = 360
	phoneMinFont  = 9
	fontBase      = 16
	fontTitle     = 17
	charWidth     = 0.56 * fontBase // average advance of a sans-serif glyph
	lineGap       = fontBase + 5
	colWindow     = "#aed6f1"
	colBackground = "#ffffff"
	colAxis       = "#333333"
	colGrid       = "#e3e3e3"
	colText       = "#222222"
	colSeries     = "#1f4e79"
	colBreak      = "#b03a2e"
	colCI         = "#f1948a"
	colEpisode    = "#f7dc6f"
	colCritical   = "#555555"
	colBar        = "#2e86c1"
	colBand       = "#7f8c8d"
)

// frame maps data coordinates to pixels inside a plot area.
type frame struct {
	x0, x1, y0, y1           float64 // data range
	left, top, width, height float64 // plot area in pixels
}

// scale maps v in [a, b] to [0, 1] without overflow for huge values; it
// returns 0.5 when the range is empty or not finite.
func scale(v, a, b float64) float64 {
	d := b*0.5 - a*0.5
	if !(d > 0) || !finite(d) {
		return 0.5
	}
	t := (v*0.5 - a*0.5) / d
	if !finite(t) {
		return 0.5
	}
	return t
}

// X is the pixel abscissa of data x, clamped to the plot area.
func (f *frame) X(x float64) float64 {
	t := math.Min(math.Max(scale(x, f.x0, f.x1), 0), 1)
	return f.left + t*f.width
}

// Y is the pixel ordinate of data y, clamped to the plot area.
func (f *frame) Y(y float64) float64 {
	t := math.Min(math.Max(scale(y, f.y0, f.y1), 0), 1)
	return f.top + (1-t)*f.height
}

// snap rounds a pixel coordinate to the 0.1 pixel that px prints (0 when
// not finite), so that what is printed and what is compared agree.
func snap(v float64) float64 {
	if !finite(v) {
		return 0
	}
	return math.Round(v*10) / 10
}

// px formats a pixel coordinate with one decimal; non-finite values (which
// the frame never produces) print as 0 so that NaN can never reach a plot.
func px(v float64) string {
	return strconv.FormatFloat(snap(v), 'f', 1, 64)
}

// esc escapes text for XML (and HTML): control characters are shown
// visibly (see visible), then markup characters become references.
func esc(s string) string {
	var b strings.Builder
	_ = xml.EscapeText(&b, []byte(outText(s)))
	return b.String()
}

// svgBuilder accumulates one <svg> element.
type svgBuilder struct {
	strings.Builder
	h       int
	scratch []byte
}

func newSVG(height int, title string) *svgBuilder {
	b := &svgBuilder{h: height}
	h := strconv.Itoa(height)
	b.WriteString(`<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ` + strconv.Itoa(svgWidth) + " " + h +
		`" width="` + strconv.Itoa(svgWidth) + `" height="` + h + `" role="img" font-family="sans-serif" font-size="` + strconv.Itoa(fontBase) + `">`)
	b.WriteString("<title>" + esc(title) + "</title>")
	b.WriteString(`<rect x="0" y="0" width="` + strconv.Itoa(svgWidth) + `" height="` + h + `" fill="` + colBackground + `"/>`)
	return b
}

func (b *svgBuilder) close() string {
	b.WriteString("</svg>")
	return b.String()
}

func (b *svgBuilder) text(x, y float64, anchor, fill, s string, extra string) {
	b.WriteString(`<text x="` + px(x) + `" y="` + px(y) + `" text-anchor="` + anchor + `" fill="` + fill + `"` + extra + `>` + esc(s) + `</text>`)
}

func (b *svgBuilder) line(x1, y1, x2, y2 float64, stroke string, extra string) {
	b.WriteString(`<line x1="` + px(x1) + `" y1="` + px(y1) + `" x2="` + px(x2) + `" y2="` + px(y2) +
		`" stroke="` + stroke + `"` + extra + `/>`)
}

func (b *svgBuilder) rect(x, y, w, h float64, fill string, extra string) {
	b.WriteString(`<rect x="` + px(x) + `" y="` + px(y) + `" width="` + px(math.Max(w, 0)) + `" height="` + px(math.Max(h, 0)) +
		`" fill="` + fill + `"` + extra + `/>`)
}

// writePx writes a pixel coordinate like px without allocating.
func (b *svgBuilder) writePx(v float64) {
	b.scratch = strconv.AppendFloat(b.scratch[:0], snap(v), 'f', 1, 64)
	b.Write(b.scratch)
}

// polyline draws the finite points of (xs, ys) as connected segments, broken
// at non-finite values; an isolated point is drawn as a dot. A segment with
// more points than 4 per pixel column is thinned to the first, lowest,
// highest and last point of each column, which draws the same picture.
func (b *svgBuilder) polyline(f *frame, xs, ys []float64, stroke, extra string) {
	n := min(len(xs), len(ys))
	maxPoints := 4 * int(f.width)
	flush := func(from, to int) { // the finite run xs[from:to]
		switch to - from {
		case 0:
			return
		case 1:
			b.WriteString(`<circle cx="` + px(f.X(xs[from])) + `" cy="` + px(f.Y(ys[from])) + `" r="2" fill="` + stroke + `"/>`)
			return
		}
		b.WriteString(`<polyline fill="none" stroke="` + stroke + `" stroke-width="1.5"` + extra + ` points="`)
		first := true
		point := func(i int) {
			if !first {
				b.WriteByte(' ')
			}
			first = false
			b.writePx(f.X(xs[i]))
			b.WriteByte(',')
			b.writePx(f.Y(ys[i]))
		}
		if to-from <= maxPoints {
			for i := from; i < to; i++ {
				point(i)
			}
		} else {
			for i := from; i < to; {
				col := math.Floor(snap(f.X(xs[i])))
				j, lo, hi := i, i, i
				for j < to && math.Floor(snap(f.X(xs[j]))) == col {
					if ys[j] < ys[lo] {
						lo = j
					}
					if ys[j] > ys[hi] {
						hi = j
					}
					j++
				}
				last := j - 1
				pts := [4]int{i, min(lo, hi), max(lo, hi), last}
				for k, p := range pts {
					if k == 0 || p != pts[k-1] {
						point(p)
					}
				}
				i = j
			}
		}
		b.WriteString(`"/>`)
	}
	start := 0
	for i := 0; i < n; i++ {
		if !(finite(xs[i]) && finite(ys[i])) {
			flush(start, i)
			start = i + 1
		}
	}
	flush(start, n)
}

// axes draws the plot border, horizontal grid lines with y labels and x
// ticks with labels from xlabel.
func (b *svgBuilder) axes(f *frame, yticks, xticks []float64, ystep float64, xlabel func(float64) string) {
	half := 0.0
	for _, v := range xticks {
		half = math.Max(half, textWidth(xlabel(v))/2)
	}
	for _, v := range yticks {
		y := f.Y(v)
		b.line(f.left, y, f.left+f.width, y, colGrid, "")
		b.text(f.left-6, y+5, "end", colText, tickLabel(v, ystep), "")
	}
	bottom := f.top + f.height
	for _, v := range xticks {
		x := f.X(v)
		b.line(x, bottom, x, bottom+4, colAxis, "")
		anchor := "middle"
		switch {
		case x > f.left+f.width-half:
			anchor = "end"
		case x < f.left+half:
			anchor = "start"
		}
		b.text(x, bottom+fontBase+3, anchor, colText, xlabel(v), "")
	}
	b.rect(f.left, f.top, f.width, f.height, "none", ` stroke="`+colAxis+`"`)
}

// dataRange returns the finite min and max of the values in vs, padded by
// 5% (a constant gives a range of ±max(10%, 1) around it); (0, 1) when no
// value is finite.
func dataRange(vs ...[]float64) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, v := range vs {
		for _, x := range v {
			if finite(x) {
				lo = math.Min(lo, x)
				hi = math.Max(hi, x)
			}
		}
	}
	if lo > hi {
		return 0, 1
	}
	if lo == hi {
		pad := math.Max(math.Abs(lo)*0.1, 1)
		return lo - pad, hi + pad
	}
	pad := (hi*0.5 - lo*0.5) * 0.1
	if finite(lo-pad) && finite(hi+pad) {
		lo, hi = lo-pad, hi+pad
	}
	return lo, hi
}

// niceTicks returns about n round values covering [lo, hi] and their step.
func niceTicks(lo, hi float64, n int) ([]float64, float64) {
	span := hi*0.5 - lo*0.5
	if !(span > 0) || !finite(span) || n < 1 {
		if lo == hi {
			return []float64{lo}, 1
		}
		return []float64{lo, hi}, math.Abs(hi*0.5 - lo*0.5)
	}
	raw := 2 * span / float64(n)
	if !finite(raw) {
		raw = span / float64(n) * 2
	}
	mag := math.Pow(10, math.Floor(math.Log10(raw)))
	step := 10 * mag
	switch r := raw / mag; {
	case r < 1.5:
		step = mag
	case r < 3:
		step = 2 * mag
	case r < 7:
		step = 5 * mag
	}
	start := math.Ceil(lo/step) * step
	if !(step > 0) || !finite(step) || !finite(start) {
		return []float64{lo, hi}, math.Abs(hi*0.5 - lo*0.5)
	}
	var ticks []float64
	for i := 0; i <= n+2; i++ {
		v := start + float64(i)*step
		if v > hi || !finite(v) {
			break
		}
		if len(ticks) > 0 && v == ticks[len(ticks)-1] {
			continue
		}
		ticks = append(ticks, v)
	}
	if len(ticks) == 0 {
		ticks = []float64{lo, hi}
	}
	return ticks, step
}

// tickLabel formats a tick value with as many decimals as the step needs.
func tickLabel(v, step float64) string {
	if !finite(v) {
		return ""
	}
	a := math.Abs(v)
	if v == 0 || (step > 0 && a < step*1e-6) {
		return "0" // also rounding noise such as 1e-17 next to a step of 0.1
	}
	if a >= 1e6 || a < 1e-4 || !(step > 0) || step < 1e-4 {
		return strconv.FormatFloat(v, 'g', 4, 64)
	}
	dec := 0
	if step < 1 {
		dec = int(math.Ceil(-math.Log10(step) - 1e-9))
	}
	s := strconv.FormatFloat(v, 'f', dec, 64)
	if strings.Trim(s, "-0.") == "" {
		return "0"
	}
	return s
}

// indexTicks returns integer tick positions within [lo, hi].
func indexTicks(lo, hi int, n int) []float64 {
	if hi <= lo {
		return []float64{float64(lo)}
	}
	ticks, step := niceTicks(float64(lo), float64(hi), n)
	if step < 1 {
		ticks, _ = niceTicks(float64(lo), float64(hi), hi-lo)
	}
	var out []float64
	for _, t := range ticks {
		r := math.Round(t)
		if r < float64(lo) || r > float64(hi) {
			continue
		}
		if len(out) > 0 && out[len(out)-1] == r {
			continue
		}
		out = append(out, r)
	}
	return out
}

// noData closes an empty plot with a message.
func (b *svgBuilder) noData(msg string) string {
	b.text(svgWidth/2, float64(b.h)/2, "middle", colText, msg, "")
	return b.close()
}

// legendItem is one entry of a plot legend.
type legendItem struct {
	label, colour string
	kind          int // 0 line, 1 dashed line, 2 filled box
}

// textWidth estimates the width of s at the base font size.
func textWidth(s string) float64 { return charWidth * float64(len([]rune(s))) }

// legendRows lays items out left to right from x, wrapping at the plot's
// right edge; it returns the row of each item and the number of rows.
func legendRows(x float64, items []legendItem) ([]int, []float64, int) {
	rows := make([]int, len(items))
	xs := make([]float64, len(items))
	row, cx := 0, x
	for i, it := range items {
		w := 22 + textWidth(it.label) + 16
		if cx > x && cx+w-16 > svgWidth-8 {
			row++
			cx = x
		}
		rows[i], xs[i] = row, cx
		cx += w
	}
	if len(items) == 0 {
		return rows, xs, 0
	}
	return rows, xs, row + 1
}

// legend draws items left to right from (x, y), wrapping onto further rows
// lineGap below.
func (b *svgBuilder) legend(x, y float64, items []legendItem) {
	rows, xs, _ := legendRows(x, items)
	for i, it := range items {
		lx, ly := xs[i], y+float64(rows[i])*lineGap
		switch it.kind {
		case 0:
			b.line(lx, ly-5, lx+18, ly-5, it.colour, ` stroke-width="2"`)
		case 1:
			b.line(lx, ly-5, lx+18, ly-5, it.colour, ` stroke-width="1.5" stroke-dasharray="5,3"`)
		default:
			b.rect(lx, ly-12, 18, 12, it.colour, ` fill-opacity="0.6"`)
		}
		b.text(lx+22, ly, "start", colText, it.label, "")
	}
}

// plotTop is the top of the plot area under a title and a legend of n rows.
func plotTop(n int) float64 { return 26 + float64(max(n, 1))*lineGap + 6 }

// plotLeft is the left edge of the plot area: room for the widest y label.
func plotLeft(yticks []float64, ystep float64) float64 {
	w := 0.0
	for _, v := range yticks {
		w = math.Max(w, textWidth(tickLabel(v, ystep)))
	}
	return math.Max(48, math.Ceil(w)+12)
}

// titleText cuts a plot title to the width of the plot.
func titleText(s string) string {
	r := []rune(s)
	most := int(math.Floor(float64(svgWidth-24) / (charWidth * fontTitle / fontBase)))
	if len(r) <= most {
		return s
	}
	return string(r[:most-1]) + "…"
}

// seriesDates returns s.Dates when they label every observation.
func seriesDates(s *dataset.Series) []string {
	if len(s.Dates) == len(s.Values) {
		return s.Dates
	}
	return nil
}

// SeriesSVG plots the series s against its observation number (or dates
// when s.Dates labels every observation): a line broken at missing values,
// a vertical line between observations TB and TB+1 for each break, the
// confidence interval of each break (Lower..Upper) shaded, and explosive
// episodes shaded. Dated series get ticks at calendar boundaries (years, or
// quarters for a short sample). It returns a complete <svg> element.
func SeriesSVG(s dataset.Series, breaks []schema.Break, episodes []schema.Episode) string {
	return seriesSVG(s, breaks, episodes, nil)
}

// SeriesPlot is SeriesSVG for the series sr of a document: the breaks of
// PlotBreaks, the explosive episodes of its results, and the analyst's
// suspected window shaded when the verdict locates it (Window.FromIndex and
// ToIndex).
func SeriesPlot(s dataset.Series, sr *schema.Series) string {
	var episodes []schema.Episode
	for i := range sr.Results {
		episodes = append(episodes, sr.Results[i].Episodes...)
	}
	var w *schema.WindowCheck
	if sr.Verdict != nil {
		w = sr.Verdict.Window
	}
	return seriesSVG(s, PlotBreaks(sr), episodes, w)
}

func seriesSVG(s dataset.Series, breaks []schema.Break, episodes []schema.Episode, window *schema.WindowCheck) string {
	const height = 320
	title := "Series " + s.Name
	if len(breaks) > 0 {
		title += " with estimated break dates"
	}
	if len(episodes) > 0 {
		title += " and explosive episodes"
	}
	b := newSVG(height, title)
	b.text(12, 20, "start", colText, titleText(s.Name), ` font-size="`+strconv.Itoa(fontTitle)+`" font-weight="bold"`)
	T := len(s.Values)
	ys := s.Values
	lo, hi := dataRange(ys)
	anyFinite := false
	for _, v := range ys {
		if finite(v) {
			anyFinite = true
			break
		}
	}
	if !anyFinite {
		return b.noData("no observations to plot")
	}
	hasWindow := window != nil && window.FromIndex >= 1 && window.ToIndex >= window.FromIndex && window.FromIndex <= T
	hasCI := false
	for _, br := range breaks {
		if br.Lower > 0 && br.Upper >= br.Lower {
			hasCI = true
		}
	}
	items := []legendItem{{"series", colSeries, 0}}
	if len(episodes) > 0 {
		items = append(items, legendItem{"explosive episode", colEpisode, 2})
	}
	if len(breaks) > 0 {
		items = append(items, legendItem{"break", colBreak, 1})
	}
	if hasCI {
		items = append(items, legendItem{"break confidence interval", colCI, 2})
	}
	if hasWindow {
		items = append(items, legendItem{"suspected window", colWindow, 2})
	}
	yticks, ystep := niceTicks(lo, hi, 5)
	left := plotLeft(yticks, ystep)
	_, _, nrows := legendRows(left, items)
	top := plotTop(nrows)
	f := &frame{x0: 1, x1: float64(T), y0: lo, y1: hi, left: left, top: top, width: svgWidth - left - 16, height: height - top - 2*lineGap - 6}
	if T == 1 {
		f.x0, f.x1 = 0, 2
	}
	dates := seriesDates(&s)
	bottom := f.top + f.height
	if hasWindow {
		x1, x2 := f.X(float64(window.FromIndex)-0.5), f.X(float64(min(window.ToIndex, T))+0.5)
		b.rect(x1, f.top, x2-x1, f.height, colWindow, ` fill-opacity="0.45"`)
	}
	for _, e := range episodes {
		x1, x2 := f.X(float64(e.Start.Index)-0.5), f.X(float64(e.End.Index)+0.5)
		b.rect(x1, f.top, x2-x1, f.height, colEpisode, ` fill-opacity="0.6"`)
	}
	for _, br := range breaks {
		if br.Lower > 0 && br.Upper >= br.Lower {
			x1, x2 := f.X(float64(br.Lower)+0.5), f.X(float64(br.Upper)+0.5)
			b.rect(x1, f.top, x2-x1, f.height, colCI, ` fill-opacity="0.35"`)
		}
	}
	xticks := indexTicks(1, max(T, 1), 6)
	xlabel := func(v float64) string { return strconv.Itoa(int(v)) }
	if dates != nil {
		labels := map[float64]string{}
		if ts, ls := calendarTicks(dates, 8); len(ts) >= 2 {
			xticks = ts
			for k, t := range ts {
				labels[t] = ls[k]
			}
		}
		xlabel = func(v float64) string {
			if l, ok := labels[v]; ok {
				return l
			}
			i := int(v)
			if i >= 1 && i <= len(dates) {
				return dates[i-1]
			}
			return strconv.Itoa(i)
		}
	}
	b.axes(f, yticks, xticks, ystep, xlabel)
	xs := make([]float64, T)
	for i := range xs {
		xs[i] = float64(i + 1)
	}
	b.polyline(f, xs, ys, colSeries, "")
	for _, br := range breaks {
		x := f.X(float64(br.Index) + 0.5)
		b.line(x, f.top, x, bottom, colBreak, ` stroke-width="1.5" stroke-dasharray="6,3"`)
		label := breakLabel(br.Index, br.Date)
		anchor, lx := "start", x+3
		if lx+textWidth(label) > f.left+f.width {
			anchor, lx = "end", x-3
		}
		b.text(lx, f.top+fontBase, anchor, colBreak, label, "")
	}
	b.legend(left, 26+lineGap, items)
	xtitle := "observation"
	if dates != nil {
		xtitle = "date"
	}
	b.text(f.left+f.width/2, height-8, "middle", colText, xtitle, "")
	return b.close()
}

// PathSVG plots a search statistic: Result.Path (the statistic at every
// candidate break date) against its 5% critical value as a dashed horizontal
// line, with the chosen break marked; or, when there is no path,
// Result.Sequence (e.g. the BSADF sequence) against its critical value
// sequence with explosive episodes shaded; or else the rows of
// Result.Surface (the best statistic over second breaks for each first
// break). It returns a complete <svg> element.
func PathSVG(r schema.Result) string { return PathPlot(r, nil) }

// ResultPlot is the search plot of r for the series in (nil: observation
// numbers): PathPlot with in's dates, shifted by one for a result on the
// first difference (dated at its end).
func ResultPlot(r schema.Result, in *dataset.Series) string {
	var dates []string
	if in != nil {
		dates = seriesDates(in)
	}
	if len(dates) > 1 && strings.Contains(r.Variant, "first difference") {
		dates = dates[1:]
	}
	return PathPlot(r, dates)
}

// PathPlot is PathSVG with the x axis in calendar dates when dates labels
// every observation of the series (ticks at year or quarter boundaries, as
// in the series plot); nil dates give observation numbers.
func PathPlot(r schema.Result, dates []string) string {
	const height = 300
	var xs, ys, crit []float64
	var title, xtitle, critLabel string
	critConst, hasConst := 0.0, false
	switch {
	case len(r.Path) > 0:
		title = r.Test + " statistic over candidate break dates"
		xtitle = "candidate break date TB (observation)"
		for _, p := range r.Path {
			xs = append(xs, float64(p.Index))
			ys = append(ys, p.Statistic)
		}
		critConst, hasConst = cv(r.CriticalValues, "0.05")
		critLabel = "5% critical value"
	case r.Sequence != nil && len(r.Sequence.Index) > 0:
		sq := r.Sequence
		name := sq.Name
		if name == "" {
			name = r.Test
		}
		title = name + " sequence of " + r.Test + " against its critical values"
		xtitle = "observation"
		n := min(len(sq.Index), len(sq.Values))
		for i := 0; i < n; i++ {
			xs = append(xs, float64(sq.Index[i]))
			ys = append(ys, sq.Values[i])
		}
		if len(sq.Critical) > 0 {
			crit = make([]float64, n)
			for i := range crit {
				crit[i] = math.NaN()
				if i < len(sq.Critical) {
					crit[i] = sq.Critical[i]
				}
			}
			critLabel = "critical value"
			if p, ok := percent(sq.Level); ok {
				critLabel = p + " critical value"
			}
		}
	case r.Surface != nil && len(r.Surface.Rows) > 0:
		title = r.Test + ": best statistic over second breaks, by first break"
		xtitle = "first break TB1 (observation)"
		for _, p := range r.Surface.Rows {
			xs = append(xs, float64(p.Index))
			ys = append(ys, p.Statistic)
		}
		critConst, hasConst = cv(r.CriticalValues, "0.05")
		critLabel = "5% critical value"
	default:
		b := newSVG(height, r.Test+": no search path")
		return b.noData("no search path to plot")
	}
	b := newSVG(height, title)
	b.text(12, 20, "start", colText, titleText(title), ` font-size="`+strconv.Itoa(fontTitle)+`" font-weight="bold"`)
	cvals := crit
	if hasConst {
		cvals = []float64{critConst}
	}
	lo, hi := dataRange(ys, cvals)
	xlo, xhi := dataRange(xs)
	xmin, xmax := math.Inf(1), math.Inf(-1)
	for i, x := range xs {
		if finite(x) && finite(ys[i]) {
			xmin, xmax = math.Min(xmin, x), math.Max(xmax, x)
		}
	}
	if xmin > xmax {
		return b.noData("no finite statistic to plot")
	}
	if xmin < xmax {
		xlo, xhi = xmin, xmax
	}
	drawBreaks := len(r.Path) > 0 || (r.Surface != nil && len(r.Path) == 0 && r.Sequence == nil)
	items := []legendItem{{"statistic", colSeries, 0}}
	if hasConst || crit != nil {
		items = append(items, legendItem{critLabel, colCritical, 1})
	}
	if drawBreaks && len(r.Breaks) > 0 {
		items = append(items, legendItem{"chosen break", colBreak, 1})
	}
	if len(r.Episodes) > 0 {
		items = append(items, legendItem{"explosive episode", colEpisode, 2})
	}
	yticks, ystep := niceTicks(lo, hi, 5)
	left := plotLeft(yticks, ystep)
	_, _, nrows := legendRows(left, items)
	top := plotTop(nrows)
	f := &frame{x0: xlo, x1: xhi, y0: lo, y1: hi, left: left, top: top, width: svgWidth - left - 16, height: height - top - 2*lineGap - 6}
	for _, e := range r.Episodes {
		x1, x2 := f.X(float64(e.Start.Index)-0.5), f.X(float64(e.End.Index)+0.5)
		b.rect(x1, f.top, x2-x1, f.height, colEpisode, ` fill-opacity="0.6"`)
	}
	var xticks []float64
	if xmin < xmax && xmax-xmin < 1e9 {
		xticks = indexTicks(int(math.Ceil(xmin)), int(math.Floor(xmax)), 6)
	} else {
		xticks = []float64{xmin}
	}
	xlabel := func(v float64) string { return tickLabel(v, 1) }
	if len(dates) > 0 && xmax <= float64(len(dates)) && xmin >= 1 {
		labels := map[float64]string{}
		if ts, ls := calendarTicks(dates, 8); len(ts) >= 2 {
			var in []float64
			for k, t := range ts {
				if t >= xmin && t <= xmax {
					in = append(in, t)
					labels[t] = ls[k]
				}
			}
			if len(in) >= 2 {
				xticks = in
				xlabel = func(v float64) string {
					if l, ok := labels[v]; ok {
						return l
					}
					if i := int(v); i >= 1 && i <= len(dates) {
						return dates[i-1]
					}
					return tickLabel(v, 1)
				}
				switch {
				case len(r.Path) > 0:
					xtitle = "candidate break date TB (last observation of the old regime)"
				case r.Surface != nil && r.Sequence == nil:
					xtitle = "first break TB1 (last observation of the old regime)"
				default:
					xtitle = "date (end of the window)"
				}
			}
		}
	}
	b.axes(f, yticks, xticks, ystep, xlabel)
	if hasConst {
		y := f.Y(critConst)
		b.line(f.left, y, f.left+f.width, y, colCritical, ` stroke-width="1.5" stroke-dasharray="6,4"`)
	}
	if crit != nil {
		b.polyline(f, xs, crit, colCritical, ` stroke-dasharray="6,4"`)
	}
	b.polyline(f, xs, ys, colSeries, "")
	if drawBreaks {
		for k, br := range r.Breaks {
			if len(r.Path) == 0 && k > 0 {
				break // the surface rows are indexed by the first break only
			}
			x := f.X(float64(br.Index))
			b.line(x, f.top, x, f.top+f.height, colBreak, ` stroke-width="1.5" stroke-dasharray="2,2"`)
			for i := range xs {
				if int(xs[i]) == br.Index && finite(ys[i]) {
					b.WriteString(`<circle cx="` + px(x) + `" cy="` + px(f.Y(ys[i])) + `" r="4" fill="none" stroke="` + colBreak + `" stroke-width="2"/>`)
					break
				}
			}
			label := breakLabel(br.Index, br.Date)
			anchor, lx := "start", x+3
			if lx+textWidth(label) > f.left+f.width {
				anchor, lx = "end", x-3
			}
			b.text(lx, f.top+fontBase, anchor, colBreak, label, "")
		}
	}
	b.legend(left, 26+lineGap, items)
	b.text(f.left+f.width/2, height-8, "middle", colText, xtitle, "")
	return b.close()
}
