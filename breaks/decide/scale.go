package decide

// Stage 1: the scale the series lives on.
//
// A positive series that grows geometrically, with multiplicative noise
// (changes proportional to its level), is analysed in logs; every other
// series in levels. Two conditions, both needed: the mean of the log
// differences (the growth rate) is significant by its HAC t-ratio at 5%
// (Bartlett, Newey-West bandwidth), so the series does grow; and the
// Box & Cox (1964) profile log-likelihood of the
// first-order autoregression with a constant on each scale,
//
//	Δy^(λ)_t = a + ρ y^(λ)_{t-1} + e_t,   λ = 1 (levels), λ = 0 (logs),
//
// conditional on the first observation:
//
//	ℓ(λ) = -(n/2) log σ̂²(λ) + (λ - 1) Σ_{t=2..T} log y_t,
//
// with σ̂²(λ) the residual variance on that scale and n = T - 1 (the Jacobian
// term makes the two comparable). The regression nests the random walk
// with drift and the explosive root, so the trend of the series does not
// decide, only its noise: a geometric random walk (multiplicative noise)
// favours logs, an explosive root or a random walk with additive noise
// favours levels. Logs are chosen when ℓ(0) - ℓ(1) exceeds 1.92, half the
// 5% point of χ²(1) (a margin of our choosing, common practice for a
// likelihood comparison, no source), so that a series with no clear
// preference stays in levels, where its numbers are read.

import "math"

// scaleMargin is the log-likelihood margin logs must win by.
const scaleMargin = 1.92

// chooseScale returns whether to work in logs and the likelihood difference
// ℓ(0) - ℓ(1) (NaN when the series is not positive).
func chooseScale(y []float64) (useLogs bool, diff float64) {
	T := len(y)
	if T < 3 {
		return false, math.NaN()
	}
	for _, v := range y {
		if !(v > 0) || math.IsInf(v, 0) {
			return false, math.NaN()
		}
	}
	n := float64(T - 1)
	v1 := arResidVar(y, func(x float64) float64 { return x })
	v0 := arResidVar(y, math.Log)
	if !(v1 > 0) || !(v0 > 0) {
		return false, math.NaN()
	}
	jac := 0.0
	for t := 1; t < T; t++ {
		jac += math.Log(y[t])
	}
	l1 := -0.5 * n * math.Log(v1)
	l0 := -0.5*n*math.Log(v0) - jac
	diff = l0 - l1
	if diff <= scaleMargin {
		return false, diff
	}
	lg := make([]float64, T)
	for i, v := range y {
		lg[i] = math.Log(v)
	}
	if math.Abs(hacMeanT(diffOf(lg))) <= 1.959964 {
		return false, diff
	}
	return true, diff
}

func diffOf(y []float64) []float64 {
	d := make([]float64, len(y)-1)
	for i := range d {
		d[i] = y[i+1] - y[i]
	}
	return d
}

// arResidVar is the residual variance SSR/n of Δx_t = a + ρ x_{t-1} + e_t,
// x = f(y), computed from centred sums.
func arResidVar(y []float64, f func(float64) float64) float64 {
	T := len(y)
	n := float64(T - 1)
	mx, md := 0.0, 0.0
	for t := 1; t < T; t++ {
		mx += f(y[t-1])
		md += f(y[t]) - f(y[t-1])
	}
	mx /= n
	md /= n
	sxx, sxd, sdd := 0.0, 0.0, 0.0
	for t := 1; t < T; t++ {
		x := f(y[t-1]) - mx
		d := f(y[t]) - f(y[t-1]) - md
		sxx += x * x
		sxd += x * d
		sdd += d * d
	}
	if !(sxx > 0) {
		return sdd / n
	}
	return max(sdd-sxd*sxd/sxx, 0) / n
}
