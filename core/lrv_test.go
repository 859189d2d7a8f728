package core

import (
	"errors"
	"math"
	"math/rand/v2"
	"strconv"
	"testing"
)

func dfAR1(T int, phi float64, seed uint64) []float64 {
	r := rand.New(rand.NewPCG(seed, 2))
	u := make([]float64, T)
	prev := 0.0
	for i := -100; i < T; i++ {
		prev = phi*prev + r.NormFloat64()
		if i >= 0 {
			u[i] = prev
		}
	}
	return u
}

// TestLRVAutocovAndBartlettByHand: γ̂(j) and the Bartlett estimate with
// weights 1 - j/(l+1) (KPSS 1992, eq. 10) equal direct sums.
func TestLRVAutocovAndBartlettByHand(t *testing.T) {
	u := []float64{1, -2, 0.5, 3, -1, 0.25, -0.75}
	n := float64(len(u))
	// γ(1) = (u2u1 + u3u2 + ...)/n, by hand.
	g1 := (-2*1 + 0.5*-2 + 3*0.5 + -1*3 + 0.25*-1 + -0.75*0.25) / n
	if got := Autocov(u, 1); math.Abs(got-g1) > 1e-15 {
		t.Errorf("Autocov(1) = %g, want %g", got, g1)
	}
	if Autocov(u, 7) != 0 || Autocov(u, 100) != 0 {
		t.Error("autocovariance beyond the sample should be 0")
	}
	for l := 0; l <= 4; l++ {
		want := Autocov(u, 0)
		for j := 1; j <= l; j++ {
			want += 2 * (1 - float64(j)/float64(l+1)) * Autocov(u, j)
		}
		got, bw, err := LongRunVariance(u, KernelBartlett, BandwidthFixed, float64(l))
		if err != nil {
			t.Fatal(err)
		}
		if bw != float64(l) || math.Abs(got-want) > 1e-14 {
			t.Errorf("l=%d: %g (bw %g), want %g", l, got, bw, want)
		}
	}
}

// TestLRVBandwidthRulesByHand: the automatic bandwidths equal the formulas of
// Newey & West (1994, pilot and γ constants) and Andrews (1991, AR(1) plug-in).
func TestLRVBandwidthRulesByHand(t *testing.T) {
	u := dfAR1(500, 0.4, 3)
	T := float64(len(u))
	gam := func(j int) float64 { return Autocov(u, j) }
	// Newey-West, Bartlett: n = floor(4 (T/100)^(2/9)).
	n := int(math.Floor(4 * math.Pow(T/100, 2.0/9)))
	s0, s1, s2 := gam(0), 0.0, 0.0
	for j := 1; j <= n; j++ {
		s0 += 2 * gam(j)
		s1 += 2 * float64(j) * gam(j)
	}
	want := math.Floor(1.1447 * math.Pow(s1/s0*s1/s0, 1.0/3) * math.Pow(T, 1.0/3))
	if got, _ := Bandwidth(u, KernelBartlett, BandwidthNeweyWest, 0); got != want {
		t.Errorf("NW Bartlett bandwidth %g, want %g", got, want)
	}
	// Newey-West, QS: n = floor(4 (T/100)^(2/25)).
	n = int(math.Floor(4 * math.Pow(T/100, 2.0/25)))
	s0 = gam(0)
	for j := 1; j <= n; j++ {
		s0 += 2 * gam(j)
		s2 += 2 * float64(j*j) * gam(j)
	}
	want = 1.3221 * math.Pow(s2/s0*s2/s0, 0.2) * math.Pow(T, 0.2)
	if got, _ := Bandwidth(u, KernelQS, BandwidthNeweyWest, 0); math.Abs(got-want) > 1e-12 {
		t.Errorf("NW QS bandwidth %g, want %g", got, want)
	}
	// Andrews (1991) AR(1) plug-in.
	num, den := 0.0, 0.0
	for i := 1; i < len(u); i++ {
		num += u[i] * u[i-1]
		den += u[i-1] * u[i-1]
	}
	rho := num / den
	a1 := 4 * rho * rho / math.Pow((1-rho)*(1+rho), 2)
	a2 := 4 * rho * rho / math.Pow(1-rho, 4)
	if got, _ := Bandwidth(u, KernelBartlett, BandwidthAndrews, 0); got != math.Floor(1.1447*math.Pow(a1*T, 1.0/3)) {
		t.Errorf("Andrews Bartlett bandwidth %g", got)
	}
	if got, _ := Bandwidth(u, KernelQS, BandwidthAndrews, 0); math.Abs(got-1.3221*math.Pow(a2*T, 0.2)) > 1e-12 {
		t.Errorf("Andrews QS bandwidth %g", got)
	}
}

// TestLRVConsistentAR1: for an AR(1) with φ = 0.5 and unit innovations the
// long-run variance is 1/(1-φ)² = 4; every kernel and rule gets within 15%
// at T = 20000 (common practice; Bartlett's bias is O(1/l), its s.d. ≈ 0.2 here).
func TestLRVConsistentAR1(t *testing.T) {
	u := dfAR1(20000, 0.5, 9)
	for _, k := range []Kernel{KernelBartlett, KernelQS} {
		for _, r := range []BandwidthRule{BandwidthNeweyWest, BandwidthAndrews} {
			v, bw, err := LongRunVariance(u, k, r, 0)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(v-4) > 0.6 {
				t.Errorf("%v/%v: λ² = %g (bw %g), want ≈ 4", k, r, v, bw)
			}
		}
	}
}

// TestLRVQSWeight: k(0) = 1, continuity at 0, and k(x) for x = 1 by the
// formula of Andrews (1991, eq. 2.7) written out.
func TestLRVQSWeight(t *testing.T) {
	if QSWeight(0) != 1 || math.Abs(QSWeight(1e-6)-1) > 1e-9 {
		t.Error("QS kernel not 1 at 0")
	}
	z := 6 * math.Pi / 5
	want := 25 / (12 * math.Pi * math.Pi) * (math.Sin(z)/z - math.Cos(z))
	if math.Abs(QSWeight(1)-want) > 1e-15 {
		t.Errorf("k(1) = %g, want %g", QSWeight(1), want)
	}
}

// TestLRVErrors: settings and degenerate input.
func TestLRVErrors(t *testing.T) {
	if _, _, err := LongRunVariance([]float64{1}, KernelBartlett, BandwidthNeweyWest, 0); !errors.Is(err, ErrTooShort) {
		t.Errorf("short: %v", err)
	}
	if _, _, err := LongRunVariance([]float64{1, 2, 3}, KernelBartlett, BandwidthFixed, -1); !errors.Is(err, ErrSettings) {
		t.Errorf("negative bandwidth: %v", err)
	}
	if _, _, err := LongRunVariance(make([]float64, 10), KernelQS, BandwidthNeweyWest, 0); !errors.Is(err, ErrNoEstimate) {
		t.Errorf("zero series: %v", err)
	}
	if _, _, err := LongRunVariance([]float64{1, math.NaN(), 3}, KernelBartlett, BandwidthFixed, 1); !errors.Is(err, ErrNonFinite) {
		t.Errorf("NaN: %v", err)
	}
}

func BenchmarkLRV(b *testing.B) {
	for _, n := range []int{100, 1000, 10000} {
		u := dfAR1(n, 0.5, 1)
		for _, k := range []Kernel{KernelBartlett, KernelQS} {
			b.Run(k.String()+"/n="+strconv.Itoa(n), func(b *testing.B) {
				for b.Loop() {
					_, _, _ = LongRunVariance(u, k, BandwidthNeweyWest, 0)
				}
			})
		}
	}
}
