package core

import "math"

// Normal solves small least-squares problems from their cross-products: the
// fast path used by break searches and rolling windows, where X'X and X'y are
// updated per candidate instead of refitting. The caller is responsible for
// centring and scaling the data before accumulating (see Standardize): with
// raw series at 1e6 the cross-products lose about eight digits.
//
// Solve equilibrates A by its diagonal (Jacobi scaling) before a Cholesky
// factorisation, so columns of very different magnitude (a constant beside a
// trend t = 1..T) keep their accuracy. A Normal reuses its storage; Solve
// does not allocate once K has been seen.
type Normal struct {
	K int
	// A is X'X (K*K, row-major, only the lower triangle is read), B is X'y,
	// YY is y'y, N the number of observations.
	A  []float64
	B  []float64
	YY float64
	N  int

	l    []float64 // Cholesky factor of the scaled A
	d    []float64 // scaling
	z    []float64
	Coef []float64
}

// Reset prepares the Normal for k regressors, zeroing A, B and YY.
func (m *Normal) Reset(k int) {
	m.K = k
	m.A = grow(m.A, k*k)
	m.B = grow(m.B, k)
	m.l = grow(m.l, k*k)
	m.d = grow(m.d, k)
	m.z = grow(m.z, k)
	m.Coef = grow(m.Coef, k)
	for i := range m.A {
		m.A[i] = 0
	}
	for i := range m.B {
		m.B[i] = 0
	}
	m.YY, m.N = 0, 0
}

// Size prepares the Normal for k regressors like Reset but without zeroing
// A, B and YY: for callers that set the whole lower triangle of A, all of B,
// YY and N before Solve. On a repeated size it does no work at all, which
// matters on hot paths under WebAssembly, where the zeroing loops and the
// growth checks of Reset cost several times more than natively.
func (m *Normal) Size(k int) {
	if m.K == k && len(m.A) == k*k && len(m.Coef) == k {
		return
	}
	m.K = k
	m.A = grow(m.A, k*k)
	m.B = grow(m.B, k)
	m.l = grow(m.l, k*k)
	m.d = grow(m.d, k)
	m.z = grow(m.z, k)
	m.Coef = grow(m.Coef, k)
}

// Solve computes the coefficients into m.Coef and returns the sum of squared
// residuals YY - B'Coef (clamped at 0). It returns ErrSingular when the
// scaled matrix is not numerically positive definite.
func (m *Normal) Solve() (ssr float64, err error) {
	k := m.K
	if k == 2 && len(m.A) >= 4 && len(m.l) >= 4 && len(m.d) >= 2 && len(m.z) >= 2 && len(m.Coef) >= 2 && len(m.B) >= 2 {
		return m.solve2()
	}
	A, L, d := m.A, m.l, m.d
	for i := 0; i < k; i++ {
		a := A[i*k+i]
		if !(a > 0) {
			return 0, ErrSingular
		}
		d[i] = 1 / math.Sqrt(a)
	}
	for j := 0; j < k; j++ {
		s := A[j*k+j]*d[j]*d[j] - dotRow(L, k, j, j, j)
		if s <= 1e-12 {
			return 0, ErrSingular
		}
		ljj := math.Sqrt(s)
		L[j*k+j] = ljj
		for i := j + 1; i < k; i++ {
			L[i*k+j] = (A[i*k+j]*d[i]*d[j] - dotRow(L, k, i, j, j)) / ljj
		}
	}
	// Forward: L z = D b.
	z := m.z
	for i := 0; i < k; i++ {
		s := m.B[i] * d[i]
		for l := 0; l < i; l++ {
			s -= L[i*k+l] * z[l]
		}
		z[i] = s / L[i*k+i]
	}
	// Back: L' u = z; coef = D u.
	c := m.Coef
	for i := k - 1; i >= 0; i-- {
		s := z[i]
		for l := i + 1; l < k; l++ {
			s -= L[l*k+i] * c[l]
		}
		c[i] = s / L[i*k+i]
	}
	ssr = m.YY
	for i := 0; i < k; i++ {
		ssr -= z[i] * z[i]
		c[i] *= d[i]
	}
	if ssr < 0 {
		ssr = 0
	}
	return ssr, nil
}

// solve2 is Solve for two regressors (a constant and y_{t-1} in the
// rolling windows of the explosive-root tests): the same operations in the
// same order, written out without the loops, whose every pass is a jump
// through the function's block dispatcher under WebAssembly. An empty sum
// of the general loops is 0, and x - 0 = x, so the results are the same bit
// for bit (TestSolve2MatchesGeneral).
func (m *Normal) solve2() (ssr float64, err error) {
	A, L, d, z, c, B := m.A[:4], m.l[:4], m.d[:2], m.z[:2], m.Coef[:2], m.B[:2]
	a0, a1 := A[0], A[3]
	if !(a0 > 0) || !(a1 > 0) {
		return 0, ErrSingular
	}
	d0, d1 := 1/math.Sqrt(a0), 1/math.Sqrt(a1)
	d[0], d[1] = d0, d1
	s := a0 * d0 * d0
	if s <= 1e-12 {
		return 0, ErrSingular
	}
	l00 := math.Sqrt(s)
	l10 := A[2] * d1 * d0 / l00
	s = a1*d1*d1 - l10*l10
	if s <= 1e-12 {
		return 0, ErrSingular
	}
	l11 := math.Sqrt(s)
	L[0], L[2], L[3] = l00, l10, l11
	z0 := B[0] * d0 / l00
	z1 := (B[1]*d1 - l10*z0) / l11
	z[0], z[1] = z0, z1
	c1 := z1 / l11
	c0 := (z0 - l10*c1) / l00
	ssr = m.YY - z0*z0 - z1*z1
	c[0], c[1] = c0*d0, c1*d1
	if ssr < 0 {
		ssr = 0
	}
	return ssr, nil
}

// NestedSSR fills out[p-1] with the sum of squared residuals of the fit on
// the first p regressors, for p = 1..K, from one factorisation: the
// Cholesky factor of a leading block of A is the leading block of A's
// factor, so SSR_p = YY - Σ_{i<p} z_i² with z = L⁻¹Db the forward
// substitution of the whole system (the same scaling, threshold and formula
// as Solve, which computes SSR_K). It returns ErrSingular when the scaled
// matrix is not numerically positive definite. It does not allocate once
// K has been seen.
func (m *Normal) NestedSSR(out []float64) error {
	k := m.K
	A, L, d := m.A, m.l, m.d
	for i := 0; i < k; i++ {
		a := A[i*k+i]
		if !(a > 0) {
			return ErrSingular
		}
		d[i] = 1 / math.Sqrt(a)
	}
	ssr := m.YY
	z := m.z
	for j := 0; j < k; j++ {
		s := A[j*k+j]*d[j]*d[j] - dotRow(L, k, j, j, j)
		if s <= 1e-12 {
			return ErrSingular
		}
		ljj := math.Sqrt(s)
		L[j*k+j] = ljj
		for i := j + 1; i < k; i++ {
			L[i*k+j] = (A[i*k+j]*d[i]*d[j] - dotRow(L, k, i, j, j)) / ljj
		}
		// Row j of L is complete: the forward substitution's z_j.
		v := m.B[j] * d[j]
		for l := 0; l < j; l++ {
			v -= L[j*k+l] * z[l]
		}
		z[j] = v / ljj
		ssr -= z[j] * z[j]
		out[j] = max(ssr, 0)
	}
	return nil
}

// InvDiag returns (X'X)^-1_jj from the last successful Solve, so that the
// standard error of Coef[j] is sqrt(ssr/(N-K) * InvDiag(j)). It does not allocate.
func (m *Normal) InvDiag(j int) float64 {
	// (X'X)^-1 = D (L L')^-1 D; (L L')^-1_jj = || L^-1 e_j ||^2.
	// Solve L w = e_j, starting at row j.
	k := m.K
	L, w := m.l, m.z
	if j == k-1 && j >= 0 && j*k+j < len(L) && j < len(w) && j < len(m.d) {
		// The last column (the t-ratio's, in the rolling windows): one
		// pass of the loop below, written out (s = 0 + w_j² = w_j²).
		wj := 1 / L[j*k+j]
		w[j] = wj
		return wj * wj * m.d[j] * m.d[j]
	}
	s := 0.0
	for i := j; i < k; i++ {
		v := 0.0
		if i == j {
			v = 1
		}
		for l := j; l < i; l++ {
			v -= L[i*k+l] * w[l]
		}
		w[i] = v / L[i*k+i]
		s += w[i] * w[i]
	}
	return s * m.d[j] * m.d[j]
}

func dotRow(L []float64, k, i, j, n int) float64 {
	s := 0.0
	for l := 0; l < n; l++ {
		s += L[i*k+l] * L[j*k+l]
	}
	return s
}

// Standardize returns (y - m)/s with m the mean and s the standard deviation
// of y (s = 1 for a constant series), and m, s. Tests whose statistics are
// invariant to affine changes of y (every test here with an intercept) run on
// the standardised series, so cross-products stay well scaled.
func Standardize(dst, y []float64) (out []float64, mean, sd float64) {
	n := len(y)
	dst = grow(dst, n)
	// Series near the limits of float64 are first divided by their largest
	// magnitude, so the sums below neither overflow nor underflow; mean and
	// sd are reported on the original scale.
	scale := 1.0
	big := 0.0
	for _, v := range y {
		// math.Max(big, |v|) without the call (a function call under
		// WebAssembly): NaN wins and stays, as in math.Max.
		if a := math.Abs(v); !(a <= big) && big == big {
			big = a
		}
	}
	if big > 1e150 || (big > 0 && big < 1e-150) {
		scale = big
	}
	if scale == 1 {
		// The same sums without the divisions by 1 (v/1 == v exactly),
		// which cost as much as the rest of the loops.
		for _, v := range y {
			mean += v
		}
		mean /= float64(n)
		for _, v := range y {
			d := v - mean
			sd += d * d
		}
	} else {
		for _, v := range y {
			mean += v / scale
		}
		mean /= float64(n)
		for _, v := range y {
			d := v/scale - mean
			sd += d * d
		}
	}
	sd = math.Sqrt(sd / float64(n))
	if sd == 0 || math.IsNaN(sd) {
		sd = 1
	}
	if scale == 1 {
		for i, v := range y {
			dst[i] = (v - mean) / sd
		}
	} else {
		for i, v := range y {
			dst[i] = (v/scale - mean) / sd
		}
	}
	return dst, mean * scale, sd * scale
}
