package breaks

import (
	"context"
	"fmt"
	"math"
	"testing"

	"github.com/rootshift/rootshift/core"
)

// adfBrute computes the ADF-type statistic of test a at tbs from explicit
// columns with a full QR refit per lag order (the brute-force twin of
// adfWork.stat). The AO form follows Perron & Vogelsang (1992) literally:
// residuals ỹ of y on [1, DU_j], then Δỹ_t on ỹ_{t-1}, D(TB_j)_{t-i}
// (i = 0..k) and Δỹ_{t-i}.
func adfBrute(y []float64, a adfTest, tbs []int, spec lmLagSpec) (float64, int, error) {
	T := len(y)
	det := func(t int) []float64 {
		var r []float64
		switch a.form {
		case formLP:
			r = append(r, 1, float64(t))
			for _, tb := range tbs {
				r = append(r, lmInd(t > tb))
			}
			if a.slope {
				for _, tb := range tbs {
					r = append(r, float64(t-tb)*lmInd(t > tb))
				}
			}
		case formIO:
			r = append(r, 1)
			for _, tb := range tbs {
				r = append(r, lmInd(t > tb), lmInd(t == tb+1))
			}
		}
		return r
	}
	src := y
	if a.form == formAO {
		X := make([][]float64, 1+len(tbs))
		for t := 1; t <= T; t++ {
			X[0] = append(X[0], 1)
			for j, tb := range tbs {
				X[1+j] = append(X[1+j], lmInd(t > tb))
			}
		}
		f, err := core.Leastsq(X, y)
		if err != nil {
			return math.NaN(), 0, err
		}
		if f.SSR <= ExactFitTol*centredSS(y) {
			return math.NaN(), 0, errExactFit
		}
		src = f.Resid
	}
	yv := func(t int) float64 { return src[t-1] }
	dy := func(t int) float64 { return src[t-1] - src[t-2] }
	nd := len(det(1))
	build := func(k, t0 int) ([][]float64, []float64) {
		var cols [][]float64
		var dep []float64
		for t := t0; t <= T; t++ {
			var row []float64
			if a.form == formAO {
				row = append(row, yv(t-1))
				for _, tb := range tbs {
					row = append(row, lmInd(t == tb+1))
				}
				for i := 1; i <= k; i++ {
					for _, tb := range tbs {
						row = append(row, lmInd(t-i == tb+1))
					}
					row = append(row, dy(t-i))
				}
			} else {
				row = append(row, det(t)...)
				row = append(row, yv(t-1))
				for i := 1; i <= k; i++ {
					row = append(row, dy(t-i))
				}
			}
			if cols == nil {
				cols = make([][]float64, len(row))
			}
			for j, v := range row {
				cols[j] = append(cols[j], v)
			}
			dep = append(dep, dy(t))
		}
		return cols, dep
	}
	stat := func(int) int { return nd }
	last := func(k int) int { return nd + k }
	if a.form == formAO {
		stat = func(int) int { return 0 }
		last = func(k int) int { return len(tbs) + k*(1+len(tbs)) }
	}
	return lmBruteSelect(spec, build, stat, last)
}

// TestADFFastVsBrute checks lp and meanshift against the full QR refit at
// candidates and over whole searches (common practice: differential testing).
func TestADFFastVsBrute(t *testing.T) {
	cases := []struct {
		id    string
		shift core.Shift
		T     int
		spec  lmLagSpec
	}{
		{"lp", core.ShiftLevel, 50, lmLagSpec{core.LagTSig, 4}},
		{"lp", core.ShiftBoth, 50, lmLagSpec{core.LagFixed, 2}},
		{"meanshift/innovational-1", core.ShiftLevel, 90, lmLagSpec{core.LagTSig, 8}},
		{"meanshift/additive-1", core.ShiftLevel, 90, lmLagSpec{core.LagTSig, 8}},
		{"meanshift/innovational-2", core.ShiftLevel, 50, lmLagSpec{core.LagAIC, 3}},
		{"meanshift/additive-2", core.ShiftLevel, 60, lmLagSpec{core.LagTSig, 3}},
		{"meanshift/additive-2", core.ShiftLevel, 50, lmLagSpec{core.LagFixed, 0}},
	}
	for n, c := range cases {
		t.Run(fmt.Sprintf("%s/%s/%v", c.id, c.shift, c.spec), func(t *testing.T) {
			id, cfg := msCase(c.id, &core.Config{Shift: c.shift})
			a, err := adfTestOf(id, cfg)
			if err != nil {
				t.Fatal(err)
			}
			y := lmSim(c.T, uint64(200+n), 0.8, 3, 0.35, 0.7)
			for i := range y {
				y[i] = 1e3*y[i] - 40
			}
			var w adfWork
			w.setup(y, c.spec.k)
			lo, hi, _ := Candidates(c.T, 0.15)
			lo = max(lo, c.spec.k+3)
			gap := lmMinGap
			if a.form == formAO {
				hi = min(hi, c.T-c.spec.k-2)
				gap = max(gap, c.spec.k+2)
			}
			f := func(tbs []int) (float64, int, int, error) { return w.stat(a, tbs, c.spec) }
			var r lmSearchResult
			if a.nb == 1 {
				r, _ = lmSearch1(nil, lo, hi, f, false)
			} else {
				r, _ = lmSearch2Gap(nil, lo, hi, gap, f, false)
			}
			best, arg := math.Inf(1), []int(nil)
			checked := 0
			try := func(tbs []int) {
				s, k, err := adfBrute(y, a, tbs, c.spec)
				if err != nil {
					return
				}
				fs, fk, _, ferr := w.stat(a, tbs, c.spec)
				if ferr != nil || fk != k || !lmClose(fs, s, 1e-9) {
					t.Errorf("tbs %v: fast %.12g (k=%d, %v), brute %.12g (k=%d)", tbs, fs, fk, ferr, s, k)
				}
				checked++
				if s < best {
					best, arg = s, append([]int(nil), tbs...)
				}
			}
			if a.nb == 1 {
				for tb := lo; tb <= hi; tb++ {
					try([]int{tb})
				}
			} else {
				for t1 := lo; t1+gap <= hi; t1++ {
					for t2 := t1 + gap; t2 <= hi; t2++ {
						try([]int{t1, t2})
					}
				}
			}
			if checked == 0 || !lmClose(r.tau, best, 1e-9) || r.tbs[0] != arg[0] || (a.nb == 2 && r.tbs[1] != arg[1]) {
				t.Errorf("search: fast %.12g at %v, brute %.12g at %v (%d checked)", r.tau, r.tbs, best, arg, checked)
			}
		})
	}
}

// TestADFRun checks the public lp and cmr entry points on a stationary
// series with large mean shifts: result fields, dates near the truth,
// rejection (common practice), and the settings errors.
func TestADFRun(t *testing.T) {
	ctx := context.Background()
	for _, c := range []struct {
		id    string
		shift core.Shift
		brk   []float64
	}{
		{"lp", core.ShiftLevel, []float64{0.3, 0.65}},
		{"lp", core.ShiftBoth, []float64{0.3, 0.65}},
		{"meanshift/innovational-1", core.ShiftLevel, []float64{0.5}},
		{"meanshift/additive-1", core.ShiftLevel, []float64{0.5}},
		{"meanshift/innovational-2", core.ShiftLevel, []float64{0.3, 0.65}},
		{"meanshift/additive-2", core.ShiftLevel, []float64{0.3, 0.65}},
	} {
		t.Run(c.id+"/"+c.shift.String(), func(t *testing.T) {
			id, cfg := msCase(c.id, &core.Config{Shift: c.shift})
			info, err := core.Lookup(id)
			if err != nil {
				t.Fatal(err)
			}
			T := 120
			y := lmSim(T, 5, 0.3, 10, c.brk...)
			res, err := info.Run(ctx, y, cfg)
			if err != nil {
				t.Fatal(err)
			}
			if res.Statistic == nil || res.PValueMethod == "" || len(res.CriticalValues) == 0 || res.CriticalSource == "" || res.Surface == nil && len(c.brk) == 2 {
				t.Fatalf("incomplete result %+v", res)
			}
			// In the AO form the dummies D(TB)_{t-i}, i = 0..k, absorb a jump
			// up to k observations after TB, so the minimum-t date may lead
			// the true one by up to k (Perron & Vogelsang 1992, section 4).
			tol := 3
			if cfg.Outlier == core.OutlierAdditive {
				tol += res.Lags
			}
			for i, b := range res.Breaks {
				if want := int(c.brk[i] * float64(T)); lmAbs(b.Index-want) > tol {
					t.Errorf("break %d at %d, true %d", i, b.Index, want)
				}
			}
			if !res.Reject {
				t.Errorf("not rejected: %v", *res.Statistic)
			}
		})
	}
	y := lmSim(80, 1, 1, 0)
	for _, id := range []string{"lp", "meanshift/innovational-1", "meanshift/additive-2"} {
		tid, cfg := msCase(id, &core.Config{Shift: core.ShiftSlope})
		info, _ := core.Lookup(tid)
		if _, err := info.Run(ctx, y, cfg); err == nil {
			t.Errorf("%s: slope-only shift accepted", id)
		}
	}
}
