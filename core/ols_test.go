// Tests of the least-squares kernel (LS, Householder QR with column scaling)
// and of the cross-product fast path (Normal): both are checked against
// gonum's QR (gonum.org/v1/gonum/mat), a general-purpose reference library,
// and against each other on badly scaled data (a series sitting at 1e6).
package core

import (
	"math"
	"math/rand/v2"
	"strconv"
	"testing"

	"gonum.org/v1/gonum/mat"
)

func gonumFit(X [][]float64, y []float64) (coef, se []float64) {
	n, k := len(y), len(X)
	A := mat.NewDense(n, k, nil)
	for j := range X {
		for i := range y {
			A.Set(i, j, X[j][i])
		}
	}
	var qr mat.QR
	qr.Factorize(A)
	var b mat.Dense
	if err := qr.SolveTo(&b, false, mat.NewDense(n, 1, y)); err != nil {
		panic(err)
	}
	coef = make([]float64, k)
	ssr := 0.0
	for i := 0; i < n; i++ {
		r := y[i]
		for j := 0; j < k; j++ {
			r -= X[j][i] * b.At(j, 0)
		}
		ssr += r * r
	}
	// (X'X)^-1 = R^-1 R^-T from the QR factor, never from X'X itself.
	var Rd mat.Dense
	qr.RTo(&Rd)
	R := mat.NewTriDense(k, mat.Upper, nil)
	for i := 0; i < k; i++ {
		for j := i; j < k; j++ {
			R.SetTri(i, j, Rd.At(i, j))
		}
	}
	var Ri mat.TriDense
	if err := Ri.InverseTri(R); err != nil {
		panic(err)
	}
	se = make([]float64, k)
	for j := 0; j < k; j++ {
		coef[j] = b.At(j, 0)
		s := 0.0
		for l := 0; l < k; l++ {
			s += Ri.At(j, l) * Ri.At(j, l)
		}
		se[j] = math.Sqrt(ssr / float64(n-k) * s)
	}
	return coef, se
}

func TestLSAgainstGonumQR(t *testing.T) {
	for _, tc := range []struct {
		name  string
		n, k  int
		level float64
		tol   float64 // relative; common practice, no source
	}{
		{"small", 30, 3, 0, 1e-9},
		{"medium", 500, 8, 0, 1e-9},
		{"level1e6", 200, 4, 1e6, 1e-7},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := rand.New(rand.NewPCG(1, 2))
			X := make([][]float64, tc.k)
			y := make([]float64, tc.n)
			for j := range X {
				X[j] = make([]float64, tc.n)
				for i := range X[j] {
					switch j {
					case 0:
						X[j][i] = 1
					case 1:
						X[j][i] = float64(i + 1)
					default:
						X[j][i] = tc.level + r.NormFloat64()
					}
				}
			}
			for i := range y {
				y[i] = tc.level + 0.3*X[1][i] + r.NormFloat64()
			}
			var ls LS
			f, err := ls.Fit(X, y)
			if err != nil {
				t.Fatal(err)
			}
			c, se := gonumFit(X, y)
			for j := range c {
				if d := math.Abs(f.Coef[j]-c[j]) / math.Max(1, math.Abs(c[j])); d > tc.tol {
					t.Errorf("coef %d: %g vs gonum %g", j, f.Coef[j], c[j])
				}
				if d := math.Abs(f.StdErr[j]-se[j]) / se[j]; d > tc.tol*10 {
					t.Errorf("se %d: %g vs gonum %g", j, f.StdErr[j], se[j])
				}
			}
		})
	}
}

func TestNormalAgainstLS(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	n, k := 300, 4
	X := make([][]float64, k)
	y := make([]float64, n)
	for j := range X {
		X[j] = make([]float64, n)
	}
	for i := 0; i < n; i++ {
		X[0][i] = 1
		X[1][i] = float64(i + 1)
		X[2][i] = r.NormFloat64()
		X[3][i] = 1e6 + r.NormFloat64()
		y[i] = 2 + 0.1*X[1][i] + X[2][i] + r.NormFloat64()
	}
	// Centre and scale column 3 first, as the fast paths must.
	X[3], _, _ = Standardize(nil, X[3])
	var m Normal
	m.Reset(k)
	for i := 0; i < n; i++ {
		for a := 0; a < k; a++ {
			for b := 0; b <= a; b++ {
				m.A[a*k+b] += X[a][i] * X[b][i]
			}
			m.B[a] += X[a][i] * y[i]
		}
		m.YY += y[i] * y[i]
	}
	m.N = n
	ssr, err := m.Solve()
	if err != nil {
		t.Fatal(err)
	}
	var ls LS
	f, err := ls.Fit(X, y)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(ssr-f.SSR)/f.SSR > 1e-9 {
		t.Errorf("ssr %g vs QR %g", ssr, f.SSR)
	}
	for j := 0; j < k; j++ {
		if math.Abs(m.Coef[j]-f.Coef[j]) > 1e-9*math.Max(1, math.Abs(f.Coef[j])) {
			t.Errorf("coef %d: %g vs QR %g", j, m.Coef[j], f.Coef[j])
		}
		se := math.Sqrt(ssr / float64(n-k) * m.InvDiag(j))
		if math.Abs(se-f.StdErr[j])/f.StdErr[j] > 1e-8 {
			t.Errorf("se %d: %g vs QR %g", j, se, f.StdErr[j])
		}
	}
}

func TestLSSingular(t *testing.T) {
	x := []float64{1, 2, 3, 4, 5, 6}
	X := [][]float64{x, x}
	var ls LS
	if _, err := ls.Fit(X, []float64{1, 2, 1, 2, 1, 2}); err == nil {
		t.Fatal("collinear design: want ErrSingular")
	}
}

func TestStandardizeExtremeScales(t *testing.T) {
	// Common practice, no source: standardising must not overflow or
	// underflow for series near the limits of float64.
	for _, scale := range []float64{1, 1e200, 1e-200, 1e6} {
		y := []float64{1 * scale, 3 * scale, 2 * scale, 5 * scale}
		z, m, s := Standardize(nil, y)
		want := []float64{-1.1832159566199232, 0.16903085094570333, -0.50709255283711, 1.5212776585113297}
		for i := range z {
			if math.Abs(z[i]-want[i]) > 1e-12 {
				t.Errorf("scale %g: z[%d] = %g, want %g", scale, i, z[i], want[i])
			}
		}
		if math.Abs(m/scale-2.75) > 1e-12 || math.Abs(s/scale-1.479019945774904) > 1e-12 {
			t.Errorf("scale %g: mean %g sd %g", scale, m, s)
		}
	}
}

// dfDesign builds the design of an augmented Dickey-Fuller regression with
// a constant, a trend and three lagged differences (k = 6 regressors:
// 1, t, y_{t-1}, Δy_{t-1}, Δy_{t-2}, Δy_{t-3}) with n observations, from a
// seeded Gaussian random walk (common practice, no source). The level
// y_{t-1} and the dependent Δy_t are centred and scaled first
// (Standardize), as every fast path must do before accumulating
// cross-products.
func dfDesign(n int) (X [][]float64, y []float64) {
	const lags = 3
	r := rand.New(rand.NewPCG(uint64(n), 6))
	T := n + lags + 1
	w := make([]float64, T)
	for i := 1; i < T; i++ {
		w[i] = w[i-1] + r.NormFloat64()
	}
	X = make([][]float64, 3+lags)
	for j := range X {
		X[j] = make([]float64, n)
	}
	y = make([]float64, n)
	for i := 0; i < n; i++ {
		t := i + lags + 1 // index of y_t in w
		y[i] = w[t] - w[t-1]
		X[0][i] = 1
		X[1][i] = float64(t + 1)
		X[2][i] = w[t-1]
		for l := 1; l <= lags; l++ {
			X[2+l][i] = w[t-l] - w[t-l-1]
		}
	}
	X[2], _, _ = Standardize(nil, X[2])
	y, _, _ = Standardize(nil, y)
	return X, y
}

// normalFit accumulates X'X, X'y and y'y into m and solves; it returns the
// sum of squared residuals (the cross-product fast path from scratch).
func normalFit(m *Normal, X [][]float64, y []float64) (float64, error) {
	k, n := len(X), len(y)
	m.Reset(k)
	for i := 0; i < n; i++ {
		yi := y[i]
		for a := 0; a < k; a++ {
			xa := X[a][i]
			row := m.A[a*k : a*k+a+1]
			for c := range row {
				row[c] += xa * X[c][i]
			}
			m.B[a] += xa * yi
		}
		m.YY += yi * yi
	}
	m.N = n
	return m.Solve()
}

var benchSizes = []int{100, 1000, 10000}

// BenchmarkLS times the Householder-QR kernel (coefficients, standard
// errors, residuals) on the k = 6 Dickey-Fuller design.
func BenchmarkLS(b *testing.B) {
	for _, n := range benchSizes {
		b.Run("n="+strconv.Itoa(n), func(b *testing.B) {
			X, y := dfDesign(n)
			var ls LS
			if _, err := ls.Fit(X, y); err != nil {
				b.Fatal(err)
			}
			b.ReportAllocs()
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				if _, err := ls.Fit(X, y); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkNormal times the cross-product fast path from scratch:
// accumulating X'X, X'y, y'y over n rows, the Cholesky solve and every
// standard error. Before timing, it must agree with LS (its brute-force
// twin) to 1e-9.
func BenchmarkNormal(b *testing.B) {
	for _, n := range benchSizes {
		b.Run("n="+strconv.Itoa(n), func(b *testing.B) {
			X, y := dfDesign(n)
			var m Normal
			ssr, err := normalFit(&m, X, y)
			if err != nil {
				b.Fatal(err)
			}
			var ls LS
			f, err := ls.Fit(X, y)
			if err != nil {
				b.Fatal(err)
			}
			if math.Abs(ssr-f.SSR) > 1e-9*f.SSR {
				b.Fatalf("ssr %g, LS %g", ssr, f.SSR)
			}
			for j := range f.Coef {
				if math.Abs(m.Coef[j]-f.Coef[j]) > 1e-9*math.Max(1, math.Abs(f.Coef[j])) {
					b.Fatalf("coef %d: %g, LS %g", j, m.Coef[j], f.Coef[j])
				}
			}
			k := len(X)
			b.ReportAllocs()
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				ssr, err := normalFit(&m, X, y)
				if err != nil {
					b.Fatal(err)
				}
				s2 := ssr / float64(n-k)
				for j := 0; j < k; j++ {
					_ = math.Sqrt(s2 * m.InvDiag(j))
				}
			}
		})
	}
}

// BenchmarkLSGonumQR is the brute-force twin of BenchmarkLS and
// BenchmarkNormal: gonum's general QR (mat.QR, Factorize and SolveTo) on the
// same design, coefficients only, copying X into a reused matrix as LS
// copies it into its own storage. It must agree with LS to 1e-9.
func BenchmarkLSGonumQR(b *testing.B) {
	for _, n := range benchSizes {
		b.Run("n="+strconv.Itoa(n), func(b *testing.B) {
			X, y := dfDesign(n)
			k := len(X)
			A := mat.NewDense(n, k, nil)
			yv := mat.NewDense(n, 1, y)
			var qr mat.QR
			var coef mat.Dense
			fit := func() error {
				for j := range X {
					for i, v := range X[j] {
						A.Set(i, j, v)
					}
				}
				qr.Factorize(A)
				return qr.SolveTo(&coef, false, yv)
			}
			if err := fit(); err != nil {
				b.Fatal(err)
			}
			var ls LS
			f, err := ls.Fit(X, y)
			if err != nil {
				b.Fatal(err)
			}
			for j := range f.Coef {
				if c := coef.At(j, 0); math.Abs(c-f.Coef[j]) > 1e-9*math.Max(1, math.Abs(f.Coef[j])) {
					b.Fatalf("coef %d: gonum %g, LS %g", j, c, f.Coef[j])
				}
			}
			b.ReportAllocs()
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				if err := fit(); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
