// Tests of the fitted I(1) null and its wild bootstrap (null.go,
// bootstrap.go): the drift path against a brute-force twin, the stability
// of the recolouring polynomial, reproducibility, and the wild bootstrap's
// defining property that every residual keeps its date (Cavaliere & Taylor
// 2008; Harvey, Leybourne, Sollis & Taylor 2016). Reference values are our
// own computations (brute force), no published source.
package decide

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"
)

// driftPathBrute is the brute-force twin of driftPath: every admissible
// partition is refitted from scratch (means and SSR by direct sums).
func driftPathBrute(d []float64, maxBreaks int, trim float64) (float64, []int) {
	n := len(d)
	h := max(int(math.Ceil(trim*float64(n))), 8)
	ssr := func(a, b int) float64 {
		m := 0.0
		for _, v := range d[a:b] {
			m += v
		}
		m /= float64(b - a)
		s := 0.0
		for _, v := range d[a:b] {
			s += (v - m) * (v - m)
		}
		return s
	}
	fn := float64(n)
	bic := func(s float64, m int) float64 { return fn*math.Log(s/fn) + float64(2*m+1)*math.Log(fn) }
	best, cuts := bic(ssr(0, n), 0), []int(nil)
	if maxBreaks >= 1 {
		for b := h; b <= n-h; b++ {
			if v := bic(ssr(0, b)+ssr(b, n), 1); v < best-1e-9 {
				best, cuts = v, []int{b + 1}
			}
		}
	}
	if maxBreaks >= 2 {
		for a := h; a <= n-2*h; a++ {
			for b := a + h; b <= n-h; b++ {
				if v := bic(ssr(0, a)+ssr(a, b)+ssr(b, n), 2); v < best-1e-9 {
					best, cuts = v, []int{a + 1, b + 1}
				}
			}
		}
	}
	return best, cuts
}

func TestDriftPathMatchesBruteForce(t *testing.T) {
	for _, key := range []string{"rw", "rw-drift-turns", "rw-trough", "rw-jump10"} {
		for s := uint64(0); s < 5; s++ {
			p, _ := ProcessByKey(key)
			y := make([]float64, 90)
			p.Gen(y, rand.New(rand.NewPCG(s, 11)))
			d := diff(y)
			for _, m := range []int{1, 2} {
				_, got := driftPath(d, m, 0.15)
				_, want := driftPathBrute(d, m, 0.15)
				if len(got) != len(want) {
					t.Fatalf("%s seed %d m=%d: breaks %v, brute force %v", key, s, m, got, want)
				}
				for i := range got {
					if got[i] != want[i] {
						t.Errorf("%s seed %d m=%d: breaks %v, brute force %v", key, s, m, got, want)
					}
				}
			}
		}
	}
}

func TestDriftPathFindsATurn(t *testing.T) {
	// A drift of +1 then -1 with unit noise over 200 observations: the
	// turn at observation 100 must be found within a few observations.
	y := make([]float64, 200)
	r := rand.New(rand.NewPCG(1, 2))
	s := 0.0
	for i := range y {
		d := 1.0
		if i >= 100 {
			d = -1
		}
		s += d + r.NormFloat64()
		y[i] = s
	}
	mu, b := driftPath(diff(y), 2, 0.15)
	if len(b) == 0 || math.Abs(float64(b[0]-100)) > 5 {
		t.Fatalf("breaks %v, want one near 100", b)
	}
	if mu[0] < 0.7 || mu[len(mu)-1] > -0.7 {
		t.Errorf("drift %.2f before and %.2f after, want about +1 and -1", mu[0], mu[len(mu)-1])
	}
}

func TestStabilise(t *testing.T) {
	for _, g := range [][]float64{{1.2}, {0.7, 0.5}, {-1, -1, -1, -1}, {0.3}} {
		s := stabilise(append([]float64(nil), g...))
		if r := arRadius(s); r >= 0.98 {
			t.Errorf("%v: radius %.3f after stabilising", g, r)
		}
		if arRadius(g) < 0.98 {
			for i := range g {
				if g[i] != s[i] {
					t.Errorf("%v: a stable polynomial was changed to %v", g, s)
				}
			}
		}
	}
}

func TestBootstrapKeepsDatesAndIsReproducible(t *testing.T) {
	p, _ := ProcessByKey("rw-jump10")
	y := make([]float64, 120)
	p.Gen(y, rand.New(rand.NewPCG(4, 4)))
	mu, db := driftPath(diff(y), 2, 0.15)
	m, err := fitNull(y, dynSpec{k: 1, trend: 1}, mu, db)
	if err != nil {
		t.Fatal(err)
	}
	a := make([]float64, 120)
	b := make([]float64, 120)
	u := make([]float64, 120)
	m.draw(a, u, rand.New(rand.NewPCG(9, 9)))
	m.draw(b, u, rand.New(rand.NewPCG(9, 9)))
	for i := range a {
		if a[i] != b[i] {
			t.Fatalf("draw not reproducible at %d", i)
		}
	}
	// The jump of 10 at t = T/2+1 stays there in every draw, with either sign.
	for s := uint64(0); s < 20; s++ {
		m.draw(a, u, rand.New(rand.NewPCG(s, 1)))
		jump := math.Abs(a[60] - a[59])
		biggest := 0.0
		for i := 1; i < len(a); i++ {
			if i != 60 {
				biggest = math.Max(biggest, math.Abs(a[i]-a[i-1]))
			}
		}
		if jump < biggest {
			t.Errorf("draw %d: the change at the jump's date (%.1f) is not the largest (%.1f)", s, jump, biggest)
		}
	}
	f := func(x []float64) (float64, error) { return x[len(x)-1] - x[0], nil }
	p1, _, err := bootstrapP(context.Background(), m, 120, 49, 7, 0, f)
	if err != nil {
		t.Fatal(err)
	}
	p2, _, _ := bootstrapP(context.Background(), m, 120, 49, 7, 0, f)
	if p1 != p2 || p1 <= 0 || p1 > 1 {
		t.Errorf("bootstrap p %v then %v", p1, p2)
	}
}
