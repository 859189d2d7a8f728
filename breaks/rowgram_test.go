package breaks

// Tests of the T-independent cross-product engine (rowGram) behind the LM
// tests of Lee & Strazicich (2003, eqs. (2)-(3); 2013, eqs. (1)-(3)), the
// Lumsdaine & Papell (1997) test and the Perron & Vogelsang (1992) /
// Clemente, Montanes & Reyes (1998) mean-shift tests: whole searches at
// sample sizes where a QR refit per candidate is too slow are compared with
// the previous O(T)-per-candidate path (lmScanWork), spot candidates with the
// QR refit (lmBrute, adfBrute), on series at the 1e6 scale with a strong
// trend (where cross-products of raw data lose digits), and the search loops
// must not allocate (common practice: differential testing; no source).

import (
	"fmt"
	"testing"

	"github.com/rootshift/rootshift/core"
)

// lmTrendSeries is a random walk (or AR(1) with coefficient rho) with a
// level shift at 0.45 T, a slope change at 0.7 T, a strong trend and a 1e6
// offset.
func lmTrendSeries(T int, seed uint64, rho float64) []float64 {
	y := lmSim(T, seed, rho, 6, 0.45)
	for i := range y {
		t := float64(i + 1)
		y[i] = 1e6 + 2e3*(y[i]+0.05*t)
		if t > 0.7*float64(T) {
			y[i] += 2e3 * 0.08 * (t - 0.7*float64(T))
		}
	}
	return y
}

// TestLMEngineVsScan compares the LM statistic of lmWork with the previous
// O(T) path over whole searches (statistic to 1e-9, dates and lag orders
// identical) and with the QR refit at spot candidates.
func TestLMEngineVsScan(t *testing.T) {
	cases := []struct {
		T    int
		m    lmModel
		spec lmLagSpec
		rho  float64
	}{
		{1500, lmModel{nb: 1}, lmLagSpec{core.LagTSig, 8}, 1},
		{1500, lmModel{nb: 1, slope: true}, lmLagSpec{core.LagTSig, 8}, 0.8},
		{800, lmModel{nb: 1, slope: true}, lmLagSpec{core.LagBIC, 6}, 1},
		{400, lmModel{nb: 1}, lmLagSpec{core.LagFixed, 3}, 0.9},
		{110, lmModel{nb: 2}, lmLagSpec{core.LagTSig, 8}, 1},
		{100, lmModel{nb: 2, slope: true}, lmLagSpec{core.LagTSig, 5}, 0.7},
		{90, lmModel{nb: 2, slope: true}, lmLagSpec{core.LagAIC, 4}, 1},
	}
	for n, c := range cases {
		t.Run(fmt.Sprintf("T=%d/nb=%d/slope=%v/%v", c.T, c.m.nb, c.m.slope, c.spec), func(t *testing.T) {
			y := lmTrendSeries(c.T, uint64(300+n), c.rho)
			lo, hi, _ := Candidates(c.T, 0.15)
			lo = max(lo, c.spec.k+3)
			var fw lmWork
			var sw lmScanWork
			fw.setup(y, c.spec.k)
			sw.setup(y, c.spec.k)
			ff := func(tbs []int) (float64, int, int, error) { return fw.lmStat(c.m, tbs, c.spec) }
			sf := func(tbs []int) (float64, int, int, error) { return sw.lmStat(c.m, tbs, c.spec) }
			var fr, sr lmSearchResult
			if c.m.nb == 1 {
				fr, _ = lmSearch1(nil, lo, hi, ff, true)
				sr, _ = lmSearch1(nil, lo, hi, sf, true)
			} else {
				fr, _ = lmSearch2(nil, lo, hi, ff, true)
				sr, _ = lmSearch2(nil, lo, hi, sf, true)
			}
			if fr.ncand == 0 || fr.ncand != sr.ncand || !lmClose(fr.tau, sr.tau, 1e-9) || fr.tbs != sr.tbs || fr.k != sr.k || fr.nobs != sr.nobs {
				t.Fatalf("search: engine %.12g at %v (k=%d, %d candidates), scan %.12g at %v (k=%d, %d candidates)",
					fr.tau, fr.tbs, fr.k, fr.ncand, sr.tau, sr.tbs, sr.k, sr.ncand)
			}
			for i := range fr.path {
				if fr.path[i].Index != sr.path[i].Index || !lmClose(fr.path[i].Statistic, sr.path[i].Statistic, 1e-9) {
					t.Fatalf("path %d: engine %v, scan %v", i, fr.path[i], sr.path[i])
				}
			}
			for i := range fr.rows {
				if fr.rows[i].Index != sr.rows[i].Index || !lmClose(fr.rows[i].Statistic, sr.rows[i].Statistic, 1e-9) {
					t.Fatalf("row %d: engine %v, scan %v", i, fr.rows[i], sr.rows[i])
				}
			}
			// Spot candidates against the QR refit: the chosen dates and a
			// few others.
			spots := [][]int{fr.tbs[:c.m.nb]}
			for _, f := range []float64{0.2, 0.5, 0.8} {
				tb := lo + int(f*float64(hi-lo))
				if c.m.nb == 1 {
					spots = append(spots, []int{tb})
				} else if tb+lmMinGap+3 <= hi {
					spots = append(spots, []int{tb, tb + lmMinGap + 3}, []int{tb - 1, hi})
				}
			}
			for _, tbs := range spots {
				fs, fk, _, ferr := fw.lmStat(c.m, tbs, c.spec)
				bs, bk, berr := lmBrute(y, c.m, tbs, c.spec)
				if ferr != nil || berr != nil || fk != bk || !lmClose(fs, bs, 1e-9) {
					t.Errorf("tbs %v: engine %.12g (k=%d, %v), QR refit %.12g (k=%d, %v)", tbs, fs, fk, ferr, bs, bk, berr)
				}
			}
		})
	}
}

// TestADFEngineTrend compares lp and meanshift with the QR refit on trending
// series at the 1e6 scale, at every pair of a coarse grid; the AO form's
// deleted dummy rows also with its dummies carried as columns.
func TestADFEngineTrend(t *testing.T) {
	for n, c := range []struct {
		id    string
		shift core.Shift
		T     int
		spec  lmLagSpec
	}{
		{"lp", core.ShiftLevel, 160, lmLagSpec{core.LagTSig, 8}},
		{"lp", core.ShiftBoth, 160, lmLagSpec{core.LagBIC, 5}},
		{"meanshift/innovational-1", core.ShiftLevel, 300, lmLagSpec{core.LagTSig, 8}},
		{"meanshift/additive-1", core.ShiftLevel, 300, lmLagSpec{core.LagTSig, 8}},
		{"meanshift/innovational-2", core.ShiftLevel, 160, lmLagSpec{core.LagFixed, 4}},
		{"meanshift/additive-2", core.ShiftLevel, 160, lmLagSpec{core.LagTSig, 8}},
	} {
		t.Run(fmt.Sprintf("%s/%s/%v", c.id, c.shift, c.spec), func(t *testing.T) {
			a, err := adfTestOf(msCase(c.id, &core.Config{Shift: c.shift}))
			if err != nil {
				t.Fatal(err)
			}
			y := lmTrendSeries(c.T, uint64(400+n), 0.9)
			var w adfWork
			w.setup(y, c.spec.k)
			cw := adfWork{aoColumns: true} // AO: dummies as columns
			cw.setup(y, c.spec.k)
			lo, hi, _ := Candidates(c.T, 0.15)
			lo = max(lo, c.spec.k+3)
			gap := lmMinGap
			if a.form == formAO {
				hi = min(hi, c.T-c.spec.k-2)
				gap = max(gap, c.spec.k+2)
			}
			checked := 0
			try := func(tbs []int) {
				bs, bk, berr := adfBrute(y, a, tbs, c.spec)
				fs, fk, _, ferr := w.stat(a, tbs, c.spec)
				if (berr == nil) != (ferr == nil) || berr == nil && (fk != bk || !lmClose(fs, bs, 1e-9)) {
					t.Errorf("tbs %v: engine %.12g (k=%d, %v), QR refit %.12g (k=%d, %v)", tbs, fs, fk, ferr, bs, bk, berr)
				}
				if a.form == formAO {
					cs, ck, _, cerr := cw.stat(a, tbs, c.spec)
					if (cerr == nil) != (ferr == nil) || cerr == nil && (ck != fk || !lmClose(cs, fs, 1e-9)) {
						t.Errorf("tbs %v: rows deleted %.12g (k=%d, %v), dummy columns %.12g (k=%d, %v)", tbs, fs, fk, ferr, cs, ck, cerr)
					}
				}
				checked++
			}
			for t1 := lo; t1 <= hi; t1 += 7 {
				if a.nb == 1 {
					try([]int{t1})
					continue
				}
				for t2 := t1 + gap; t2 <= hi; t2 += 11 {
					try([]int{t1, t2})
				}
			}
			if checked < 10 {
				t.Fatalf("only %d candidates checked", checked)
			}
		})
	}
}

// TestSearchLoopsNoAlloc: once the scratch has grown, whole LM and ADF-type
// searches (candidate loops included) do not allocate.
func TestSearchLoopsNoAlloc(t *testing.T) {
	y := lmTrendSeries(150, 9, 1)
	spec := lmLagSpec{core.LagTSig, 8}
	lo, hi, _ := Candidates(150, 0.15)
	lo = max(lo, spec.k+3)
	for _, m := range []lmModel{{nb: 1}, {nb: 1, slope: true}, {nb: 2}, {nb: 2, slope: true}} {
		var w lmWork
		w.setup(y, spec.k)
		f := func(tbs []int) (float64, int, int, error) { return w.lmStat(m, tbs, spec) }
		run := func() {
			if m.nb == 1 {
				lmSearch1(nil, lo, hi, f, false)
			} else {
				lmSearch2(nil, lo, hi, f, false)
			}
		}
		run()
		if a := testing.AllocsPerRun(3, run); a != 0 {
			t.Errorf("LM %+v: %v allocations per search", m, a)
		}
	}
	for _, id := range []string{"lp", "meanshift/innovational-1", "meanshift/additive-1", "meanshift/innovational-2", "meanshift/additive-2"} {
		a, _ := adfTestOf(msCase(id, &core.Config{Shift: core.ShiftLevel}))
		var w adfWork
		w.setup(y, spec.k)
		gap := lmMinGap
		h := hi
		if a.form == formAO {
			gap, h = spec.k+2, min(hi, 150-spec.k-2)
		}
		f := func(tbs []int) (float64, int, int, error) { return w.stat(a, tbs, spec) }
		run := func() {
			if a.nb == 1 {
				lmSearch1(nil, lo, h, f, false)
			} else {
				lmSearch2Gap(nil, lo, h, gap, f, false)
			}
		}
		run()
		if n := testing.AllocsPerRun(3, run); n != 0 {
			t.Errorf("%s: %v allocations per search", id, n)
		}
	}
}
