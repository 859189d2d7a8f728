package core

// Long-run variance of a residual series (the spectral density at frequency
// zero times 2π), used by Phillips-Perron and KPSS.
//
//	λ̂² = γ̂(0) + 2 Σ_{j≥1} w(j) γ̂(j),   γ̂(j) = (1/T) Σ_{t=j+1..T} u_t u_{t-j}.
//
// Kernels:
//   - Bartlett: the bandwidth is the lag truncation l (the integer part of
//     the rule's value), w(j) = 1 - j/(l+1) for j ≤ l (Newey & West 1987;
//     Kwiatkowski, Phillips, Schmidt & Shin 1992, eq. 10).
//   - Quadratic spectral (Andrews 1991, eq. 2.7): w(j) = k(j/b) with
//     k(x) = 25/(12π²x²) [sin(6πx/5)/(6πx/5) - cos(6πx/5)], for all j < T.
//
// Bandwidth rules:
//   - Newey & West (1994): pilot n = floor(4 (T/100)^{2/9}) (Bartlett) or
//     floor(4 (T/100)^{2/25}) (QS); ŝ(0) = γ̂0 + 2Σ_{j=1..n} γ̂j,
//     ŝ(q) = 2Σ_{j=1..n} j^q γ̂j with q = 1 (Bartlett) or 2 (QS);
//     b = 1.1447 ((ŝ1/ŝ0)²)^{1/3} T^{1/3} (Bartlett) or
//     b = 1.3221 ((ŝ2/ŝ0)²)^{1/5} T^{1/5} (QS).
//   - Andrews (1991, eqs. 6.2-6.4) AR(1) plug-in with ρ̂ the first-order
//     autoregression of u: α(1) = 4ρ̂²/((1-ρ̂)²(1+ρ̂)²), α(2) = 4ρ̂²/(1-ρ̂)⁴;
//     b = 1.1447 (α(1) T)^{1/3} (Bartlett) or 1.3221 (α(2) T)^{1/5} (QS).
//     ρ̂ is clipped to ±0.97 (common practice, no source) so a near-unit-root
//     residual cannot produce an unbounded bandwidth.
//
// Every bandwidth is capped at T-1.
//
// References: Newey, W.K. & West, K.D. (1987), Econometrica 55, 703-708;
// Andrews, D.W.K. (1991), Econometrica 59, 817-858; Newey, W.K. & West, K.D.
// (1994), Rev. Econ. Studies 61, 631-653; Kwiatkowski et al. (1992),
// J. Econometrics 54, 159-178.

import (
	"fmt"
	"math"
)

// Autocov returns γ̂(j) = (1/T) Σ_{t=j+1..T} u_t u_{t-j} (u taken as mean
// zero, as residuals are); 0 when j ≥ len(u).
func Autocov(u []float64, j int) float64 {
	n := len(u)
	if j < 0 {
		j = -j
	}
	if j >= n || n == 0 {
		return 0
	}
	return DotFrom(0, u[j:], u[:n-j]) / float64(n)
}

// DotFrom returns s + Σ x_i y_i (len(y) >= len(x)) added to s in order
// from i = 0, as the plain loop `for i { s += x[i]*y[i] }` does, so the
// sum is the same bit for bit; the loop is unrolled by four. Under
// WebAssembly every pass of a Go loop is a jump through the function's
// block dispatcher plus a bounds check, which cost more than the product
// itself (the long-run variances of KPSS, Phillips-Perron and Bai-Perron
// and the break searches' long products are such sums). The tests hold
// the plain loop as its twin.
func DotFrom(s float64, x, y []float64) float64 {
	y = y[:len(x)]
	for len(x) >= 4 && len(y) >= 4 {
		a, b := (*[4]float64)(x), (*[4]float64)(y) // no bounds checks below
		s += a[0] * b[0]
		s += a[1] * b[1]
		s += a[2] * b[2]
		s += a[3] * b[3]
		x, y = x[4:], y[4:]
	}
	y = y[:len(x)]
	for i, v := range x {
		s += v * y[i]
	}
	return s
}

// QSWeight is the quadratic-spectral kernel k(x) of Andrews (1991, eq. 2.7).
func QSWeight(x float64) float64 {
	if x == 0 {
		return 1
	}
	// 25/(12π²x²) = 3/z²; near 0 use the series 1 - z²/10 + z⁴/280 to
	// avoid cancellation.
	z := 6 * math.Pi * x / 5
	if math.Abs(z) < 1e-3 {
		z2 := z * z
		return 1 - z2/10 + z2*z2/280
	}
	return 3 / (z * z) * (math.Sin(z)/z - math.Cos(z))
}

// Bandwidth returns the bandwidth the rule gives for u under kernel (for
// BandwidthFixed, bw itself). For Bartlett the result is the integer lag
// truncation l. Errors wrap ErrSettings or ErrTooShort.
func Bandwidth(u []float64, kernel Kernel, rule BandwidthRule, bw float64) (float64, error) {
	T := len(u)
	if T < 2 {
		return 0, fmt.Errorf("%w: %d observations for a long-run variance", ErrTooShort, T)
	}
	var b float64
	switch rule {
	case BandwidthFixed:
		if bw < 0 || math.IsNaN(bw) || math.IsInf(bw, 0) {
			return 0, fmt.Errorf("%w: bandwidth %v (want a finite value >= 0)", ErrSettings, bw)
		}
		b = bw
	case BandwidthNeweyWest:
		Tf := float64(T)
		if kernel == KernelQS {
			n := int(math.Floor(4 * math.Pow(Tf/100, 2.0/25)))
			n = min(n, T-1)
			s0, s2 := Autocov(u, 0), 0.0
			for j := 1; j <= n; j++ {
				g := Autocov(u, j)
				s0 += 2 * g
				s2 += 2 * float64(j*j) * g
			}
			b = nwFinish(1.3221*math.Pow((s2/s0)*(s2/s0), 0.2)*math.Pow(Tf, 0.2), s0)
		} else {
			n := int(math.Floor(4 * math.Pow(Tf/100, 2.0/9)))
			n = min(n, T-1)
			s0, s1 := Autocov(u, 0), 0.0
			for j := 1; j <= n; j++ {
				g := Autocov(u, j)
				s0 += 2 * g
				s1 += 2 * float64(j) * g
			}
			b = nwFinish(1.1447*math.Pow((s1/s0)*(s1/s0), 1.0/3)*math.Pow(Tf, 1.0/3), s0)
		}
	case BandwidthAndrews:
		num, den := 0.0, 0.0
		for t := 1; t < T; t++ {
			num += u[t] * u[t-1]
			den += u[t-1] * u[t-1]
		}
		rho := 0.0
		if den > 0 {
			rho = num / den
		}
		rho = math.Max(-0.97, math.Min(0.97, rho))
		Tf := float64(T)
		if kernel == KernelQS {
			a2 := 4 * rho * rho / math.Pow(1-rho, 4)
			b = 1.3221 * math.Pow(a2*Tf, 0.2)
		} else {
			a1 := 4 * rho * rho / ((1 - rho) * (1 - rho) * (1 + rho) * (1 + rho))
			b = 1.1447 * math.Pow(a1*Tf, 1.0/3)
		}
	default:
		return 0, fmt.Errorf("%w: bandwidth rule %d", ErrSettings, rule)
	}
	if math.IsNaN(b) {
		b = 0
	}
	b = math.Min(b, float64(T-1))
	if kernel == KernelBartlett {
		b = math.Floor(b)
	}
	return b, nil
}

// nwFinish guards the Newey-West rule against a degenerate pilot (ŝ0 ≤ 0).
func nwFinish(b, s0 float64) float64 {
	if !(s0 > 0) || math.IsNaN(b) || math.IsInf(b, 0) {
		return 0
	}
	return b
}

// LongRunVarianceFixed returns λ̂² of u with the given kernel and bandwidth
// (Bartlett: l = floor(bw)). It does not allocate.
func LongRunVarianceFixed(u []float64, kernel Kernel, bw float64) float64 {
	T := len(u)
	s := Autocov(u, 0)
	if kernel == KernelQS {
		if bw <= 0 {
			return s
		}
		for j := 1; j < T; j++ {
			s += 2 * QSWeight(float64(j)/bw) * Autocov(u, j)
		}
		return s
	}
	l := int(math.Floor(bw))
	l = min(l, T-1)
	for j := 1; j <= l; j++ {
		s += 2 * (1 - float64(j)/float64(l+1)) * Autocov(u, j)
	}
	return s
}

// LongRunVariance returns the long-run variance λ̂² of the residual series
// u and the bandwidth used, with kernel and bandwidth rule as documented at
// the top of this file (bw is used only by BandwidthFixed). Errors wrap
// ErrTooShort, ErrSettings, ErrNonFinite, or ErrNoEstimate when the estimate
// is not positive (possible with some kernels and bandwidths).
func LongRunVariance(u []float64, kernel Kernel, rule BandwidthRule, bw float64) (lrv, usedBW float64, err error) {
	b, err := Bandwidth(u, kernel, rule, bw)
	if err != nil {
		return 0, 0, err
	}
	v := LongRunVarianceFixed(u, kernel, b)
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, b, fmt.Errorf("%w: long-run variance", ErrNonFinite)
	}
	if !(v > 0) {
		return 0, b, fmt.Errorf("%w: long-run variance estimate %g is not positive", ErrNoEstimate, v)
	}
	return v, b, nil
}
