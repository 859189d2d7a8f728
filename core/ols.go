package core

import (
	"math"
)

// Fit is the result of a least-squares fit y = X b + e.
type Fit struct {
	// Coef are the estimated coefficients, one per column of X.
	Coef []float64
	// StdErr are the conventional OLS standard errors sqrt(s^2 (X'X)^-1_jj).
	StdErr []float64
	// Resid are the residuals y - X b.
	Resid []float64
	// SSR is the sum of squared residuals.
	SSR float64
	// Sigma2 is SSR / (N - K).
	Sigma2 float64
	// N is the number of observations, K the number of regressors.
	N, K int
}

// TStat returns Coef[j]/StdErr[j], or (for the unit-root coefficient in a
// Dickey-Fuller regression) the Dickey-Fuller t-ratio.
func (f *Fit) TStat(j int) float64 { return f.Coef[j] / f.StdErr[j] }

// LogLik is the Gaussian log-likelihood at the ML variance SSR/N.
func (f *Fit) LogLik() float64 {
	n := float64(f.N)
	return -0.5 * n * (math.Log(2*math.Pi) + math.Log(f.SSR/n) + 1)
}

// AIC is log(SSR/N) + 2K/N.
func (f *Fit) AIC() float64 { return math.Log(f.SSR/float64(f.N)) + 2*float64(f.K)/float64(f.N) }

// BIC is log(SSR/N) + K log(N)/N.
func (f *Fit) BIC() float64 {
	return math.Log(f.SSR/float64(f.N)) + float64(f.K)*math.Log(float64(f.N))/float64(f.N)
}

// LS is the least-squares kernel: Householder QR on a scaled copy of the
// design, reusable across calls so that repeated fits of the same shape do not
// allocate. It is the reference every cross-product fast path is tested
// against. The zero value is ready to use; an LS is not safe for concurrent use.
type LS struct {
	a     []float64 // column-major copy of X, overwritten by the QR factors
	qty   []float64
	scale []float64
	tau   []float64
	rinv  []float64
	fit   Fit
}

// Fit fits y on the columns of X (X[j] is column j, each of length len(y)).
// The returned *Fit is owned by the LS and valid until the next call; copy
// what must outlive it. Each column is scaled by its Euclidean norm before the
// factorisation; the rank is judged on the scaled R, and a column whose
// scaled diagonal falls below 1e-10 relative to the largest gives ErrSingular.
func (w *LS) Fit(X [][]float64, y []float64) (*Fit, error) {
	n, k := len(y), len(X)
	if k == 0 {
		return nil, ErrSingular
	}
	if n <= k {
		return nil, ErrTooShort
	}
	w.a = grow(w.a, n*k)
	w.qty = grow(w.qty, n)
	w.scale = grow(w.scale, k)
	w.tau = grow(w.tau, k)
	w.rinv = grow(w.rinv, k*k)
	f := &w.fit
	f.Coef = grow(f.Coef, k)
	f.StdErr = grow(f.StdErr, k)
	f.Resid = grow(f.Resid, n)
	f.N, f.K = n, k
	a := w.a
	for j := 0; j < k; j++ {
		col := X[j]
		if len(col) != n {
			panic("core: LS.Fit column length mismatch")
		}
		s := norm2(col)
		if s == 0 || math.IsNaN(s) || math.IsInf(s, 0) {
			if math.IsNaN(s) || math.IsInf(s, 0) {
				return nil, ErrNonFinite
			}
			return nil, ErrSingular
		}
		w.scale[j] = s
		dst := a[j*n : (j+1)*n]
		for i, v := range col {
			dst[i] = v / s
		}
	}
	copy(w.qty, y)
	// Householder QR: for column j, reflect a[j:n, j] onto e1.
	for j := 0; j < k; j++ {
		cj := a[j*n : (j+1)*n]
		norm := norm2(cj[j:])
		if norm < 1e-10 {
			return nil, ErrSingular
		}
		if cj[j] > 0 {
			norm = -norm
		}
		// v = x - norm e1, stored in cj[j:], with v_j = cj[j]-norm; tau = -v_j/norm.
		vj := cj[j] - norm
		for i := j + 1; i < n; i++ {
			cj[i] /= vj
		}
		w.tau[j] = -vj / norm
		cj[j] = norm // R_jj
		// Apply H = I - tau v v' (v_j = 1) to the remaining columns and to qty.
		for l := j + 1; l < k; l++ {
			cl := a[l*n : (l+1)*n]
			d := cl[j]
			for i := j + 1; i < n; i++ {
				d += cj[i] * cl[i]
			}
			d *= w.tau[j]
			cl[j] -= d
			for i := j + 1; i < n; i++ {
				cl[i] -= d * cj[i]
			}
		}
		d := w.qty[j]
		for i := j + 1; i < n; i++ {
			d += cj[i] * w.qty[i]
		}
		d *= w.tau[j]
		w.qty[j] -= d
		for i := j + 1; i < n; i++ {
			w.qty[i] -= d * cj[i]
		}
	}
	// Back-substitute R b = Q'y (scaled coefficients).
	for j := k - 1; j >= 0; j-- {
		s := w.qty[j]
		for l := j + 1; l < k; l++ {
			s -= a[l*n+j] * f.Coef[l]
		}
		f.Coef[j] = s / a[j*n+j]
	}
	ssr := 0.0
	for i := k; i < n; i++ {
		ssr += w.qty[i] * w.qty[i]
	}
	// Residuals from the original data (more accurate than Q applied back).
	for i := 0; i < n; i++ {
		r := y[i]
		for j := 0; j < k; j++ {
			r -= X[j][i] * f.Coef[j] / w.scale[j]
		}
		f.Resid[i] = r
	}
	f.SSR = ssr
	f.Sigma2 = ssr / float64(n-k)
	// (R'R)^-1 diagonal: invert upper-triangular R into rinv (column-major),
	// then diag((R^-1)(R^-1)') = row sums of squares of R^-1.
	ri := w.rinv
	for i := range ri[:k*k] {
		ri[i] = 0
	}
	for j := 0; j < k; j++ {
		ri[j*k+j] = 1 / a[j*n+j]
		for i := j - 1; i >= 0; i-- {
			s := 0.0
			for l := i + 1; l <= j; l++ {
				s += a[l*n+i] * ri[j*k+l]
			}
			ri[j*k+i] = -s / a[i*n+i]
		}
	}
	for j := 0; j < k; j++ {
		s := 0.0
		for l := j; l < k; l++ {
			v := ri[l*k+j]
			s += v * v
		}
		f.StdErr[j] = math.Sqrt(f.Sigma2*s) / w.scale[j]
		f.Coef[j] /= w.scale[j]
	}
	return f, nil
}

// Leastsq is a convenience wrapper allocating a fresh kernel and returning a
// copy of the fit.
func Leastsq(X [][]float64, y []float64) (Fit, error) {
	var w LS
	f, err := w.Fit(X, y)
	if err != nil {
		return Fit{}, err
	}
	out := *f
	out.Coef = append([]float64(nil), f.Coef...)
	out.StdErr = append([]float64(nil), f.StdErr...)
	out.Resid = append([]float64(nil), f.Resid...)
	return out, nil
}

// norm2 is the Euclidean norm of x, computed without overflow or underflow:
// the values are divided by the largest magnitude before squaring.
func norm2(x []float64) float64 {
	big := 0.0
	for _, v := range x {
		if a := math.Abs(v); a > big || a != a {
			big = a
		}
	}
	if big == 0 || big != big || math.IsInf(big, 0) {
		return big
	}
	s := 0.0
	for _, v := range x {
		r := v / big
		s += r * r
	}
	return big * math.Sqrt(s)
}

func grow(s []float64, n int) []float64 {
	if cap(s) < n {
		return make([]float64, n)
	}
	return s[:n]
}
