// Tests of the written-out small cases of the cross-product solver
// (Normal.Solve with two regressors, Normal.InvDiag of the last column)
// against the general loops they replace, kept here as solveLoops and
// invDiagLoops: the results must be the same bit for bit (our own check
// against the previous code, no external source). The small cases exist
// for WebAssembly, where every pass of a short loop is a jump through the
// function's block dispatcher.
package core

import (
	"math"
	"math/rand/v2"
	"testing"
)

// solveLoops is Normal.Solve as it was before the two-regressor case was
// written out: the general Jacobi-scaled Cholesky loops.
func solveLoops(m *Normal) (ssr float64, err error) {
	k := m.K
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
	z := m.z
	for i := 0; i < k; i++ {
		s := m.B[i] * d[i]
		for l := 0; l < i; l++ {
			s -= L[i*k+l] * z[l]
		}
		z[i] = s / L[i*k+i]
	}
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

// invDiagLoops is Normal.InvDiag as it was: the general loop.
func invDiagLoops(m *Normal, j int) float64 {
	k := m.K
	L, w := m.l, m.z
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

// TestSolve2MatchesGeneral: with two regressors Solve (written out) and
// InvDiag of the last column give the general loops' coefficients, SSR,
// factor and inverse diagonal bit for bit, and the same singularity
// verdicts, on random windows (a constant beside a random walk, as in the
// explosive-root scans), nearly collinear and singular designs; InvDiag of
// the last column also for k = 1..5.
func TestSolve2MatchesGeneral(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 5))
	same := func(a, b float64) bool { return math.Float64bits(a) == math.Float64bits(b) }
	for trial := 0; trial < 20000; trial++ {
		n := 3 + r.IntN(60)
		var a, b Normal
		a.Reset(2)
		b.Reset(2)
		lev := r.NormFloat64() * 3
		scale := math.Pow(10, float64(r.IntN(7)-3))
		for i := 0; i < n; i++ {
			x := [2]float64{1, lev}
			switch trial % 4 {
			case 1:
				x[1] = 1 + 1e-9*r.NormFloat64() // nearly collinear
			case 2:
				x[1] = 2 // singular
			}
			dy := r.NormFloat64() * scale
			if trial%7 == 0 {
				dy = 0.5 * x[1] // exact fit
			}
			for p := 0; p < 2; p++ {
				for q := 0; q <= p; q++ {
					a.A[p*2+q] += x[p] * x[q]
				}
				a.B[p] += x[p] * dy
			}
			a.YY += dy * dy
			lev += dy
		}
		copy(b.A, a.A)
		copy(b.B, a.B)
		b.YY, b.N, a.N = a.YY, n, n
		sa, ea := a.Solve()
		sb, eb := solveLoops(&b)
		if (ea == nil) != (eb == nil) {
			t.Fatalf("trial %d: error %v, general %v", trial, ea, eb)
		}
		if ea != nil {
			continue
		}
		if !same(sa, sb) || !same(a.Coef[0], b.Coef[0]) || !same(a.Coef[1], b.Coef[1]) {
			t.Fatalf("trial %d: ssr %v coef %v, general %v %v", trial, sa, a.Coef, sb, b.Coef)
		}
		for i := 0; i < 4; i++ {
			if i != 1 && !same(a.l[i], b.l[i]) {
				t.Fatalf("trial %d: factor %v, general %v", trial, a.l, b.l)
			}
		}
		if va, vb := a.InvDiag(1), invDiagLoops(&b, 1); !same(va, vb) {
			t.Fatalf("trial %d: InvDiag(1) %v, general %v", trial, va, vb)
		}
		if va, vb := a.InvDiag(0), invDiagLoops(&b, 0); !same(va, vb) {
			t.Fatalf("trial %d: InvDiag(0) %v, general %v", trial, va, vb)
		}
	}
	// InvDiag of the last column for larger systems (general Solve).
	for k := 1; k <= 5; k++ {
		for trial := 0; trial < 200; trial++ {
			var a Normal
			a.Reset(k)
			x := make([]float64, k)
			for i := 0; i < 3*k+5; i++ {
				for p := range x {
					x[p] = r.NormFloat64()
				}
				for p := 0; p < k; p++ {
					for q := 0; q <= p; q++ {
						a.A[p*k+q] += x[p] * x[q]
					}
					a.B[p] += x[p]
				}
				a.YY++
			}
			if _, err := a.Solve(); err != nil {
				continue
			}
			if va, vb := a.InvDiag(k-1), invDiagLoops(&a, k-1); !same(va, vb) {
				t.Fatalf("k=%d trial %d: InvDiag %v, general %v", k, trial, va, vb)
			}
		}
	}
}

// BenchmarkSolve2 times Solve and InvDiag of the last column with two
// regressors (the explosive-root window regression) beside the general
// loops, its brute-force twin.
func BenchmarkSolve2(b *testing.B) {
	var m Normal
	m.Reset(2)
	m.A[0], m.A[2], m.A[3], m.B[0], m.B[1], m.YY, m.N = 100, 12, 40, 3, -2, 50, 100
	b.Run("written-out", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			if _, err := m.Solve(); err != nil {
				b.Fatal(err)
			}
			m.InvDiag(1)
		}
	})
	b.Run("loops", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			if _, err := solveLoops(&m); err != nil {
				b.Fatal(err)
			}
			invDiagLoops(&m, 1)
		}
	})
}
