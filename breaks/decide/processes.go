package decide

// The simulated processes on which the procedure's error rates are
// measured (reliability.go, cmd/rates, the targets test). The processes
// and their parameters are ours (common practice, no source), except the
// bubble episode, built after the data-generating process of Phillips, Shi
// & Yu (2015, section 5: a random walk, an explosive episode with
// δ_T = 1 + T^-0.6, then a collapse back to the level it started from) with
// our own episode dates and noise. Innovations are N(0,1) unless stated.
// Breaks and episodes are at fixed fractions of the sample.

import (
	"math"
	"math/rand/v2"
)

// Direction groups classes by what they tell the analyst to do.
const (
	DirStationary = "I(0)"
	DirIntegrated = "I(1)"
	DirExplosive  = "explosive"
	DirNone       = "none"
)

// Direction returns the direction of a class.
func Direction(class string) string {
	switch class {
	case ClassStationary, ClassTrendStationary, ClassBreakStationary:
		return DirStationary
	case ClassUnitRoot, ClassUnitRootBreaks:
		return DirIntegrated
	case ClassExplosive:
		return DirExplosive
	}
	return DirNone
}

// Process is one simulated process.
type Process struct {
	Key, Description string
	// Truth is the direction the process has.
	Truth string
	// Gen fills y (length T).
	Gen func(y []float64, r *rand.Rand)
}

func ar1(y []float64, r *rand.Rand, phi float64, sd func(t int) float64) {
	u := 0.0
	for t := range y {
		u = phi*u + sd(t)*r.NormFloat64()
		y[t] = u
	}
}

func one(int) float64 { return 1 }

// Processes lists the processes of the study, integrated ones first.
var Processes = []Process{
	{"rw", "random walk: y_t = y_{t-1} + e_t", DirIntegrated, func(y []float64, r *rand.Rand) { ar1(y, r, 1, one) }},
	{"rw-drift", "random walk with drift 0.3", DirIntegrated, func(y []float64, r *rand.Rand) {
		ar1(y, r, 1, one)
		for t := range y {
			y[t] += 0.3 * float64(t+1)
		}
	}},
	{"rw-jump5", "random walk with a 5-sigma jump at T/2", DirIntegrated, func(y []float64, r *rand.Rand) { rwJump(y, r, 5) }},
	{"rw-jump10", "random walk with a 10-sigma jump at T/2", DirIntegrated, func(y []float64, r *rand.Rand) { rwJump(y, r, 10) }},
	{"rw-drift-turns", "random walk whose drift turns from +0.5 to -0.5 at T/2", DirIntegrated, func(y []float64, r *rand.Rand) {
		s, T := 0.0, len(y)
		for t := range y {
			d := 0.5
			if t >= T/2 {
				d = -0.5
			}
			s += d + r.NormFloat64()
			y[t] = s
		}
	}},
	{"rw-trough", "random walk whose drift turns from -0.5 to +0.5 at T/2 (a downturn and recovery)", DirIntegrated, func(y []float64, r *rand.Rand) {
		s, T := 0.0, len(y)
		for t := range y {
			d := -0.5
			if t >= T/2 {
				d = 0.5
			}
			s += d + r.NormFloat64()
			y[t] = s
		}
	}},
	{"rw-garch", "random walk with GARCH(1,1) errors (0.05, 0.10, 0.85)", DirIntegrated, func(y []float64, r *rand.Rand) {
		h, e, s := 1.0, 0.0, 0.0
		for t := range y {
			h = 0.05 + 0.10*e*e + 0.85*h
			e = math.Sqrt(h) * r.NormFloat64()
			s += e
			y[t] = s
		}
	}},
	{"rw-burst", "random walk with a crisis burst of volatility (sigma x4 for 0.1T from T/2)", DirIntegrated, func(y []float64, r *rand.Rand) {
		T := len(y)
		ar1(y, r, 1, func(t int) float64 {
			if t >= T/2 && t < T/2+T/10 {
				return 4
			}
			return 1
		})
	}},
	{"rw-ma", "random walk with MA(1) errors, theta = -0.8", DirIntegrated, func(y []float64, r *rand.Rand) {
		prev, s := r.NormFloat64(), 0.0
		for t := range y {
			e := r.NormFloat64()
			s += e - 0.8*prev
			prev = e
			y[t] = s
		}
	}},
	{"geometric", "positive series with geometric growth: log y_t = log y_{t-1} + 0.01 + 0.02 e_t, y_0 = 100", DirIntegrated, func(y []float64, r *rand.Rand) {
		l := math.Log(100)
		for t := range y {
			l += 0.01 + 0.02*r.NormFloat64()
			y[t] = math.Exp(l)
		}
	}},
	{"ar", "stationary AR(1), phi = 0.5", DirStationary, func(y []float64, r *rand.Rand) { ar1(y, r, 0.5, one) }},
	{"ar-shift3", "stationary AR(1) phi = 0.5 with a 3-sigma level shift at T/2", DirStationary, func(y []float64, r *rand.Rand) { arShift(y, r, 3) }},
	{"ar-shift5", "stationary AR(1) phi = 0.5 with a 5-sigma level shift at T/2", DirStationary, func(y []float64, r *rand.Rand) { arShift(y, r, 5) }},
	{"ar-shift10", "stationary AR(1) phi = 0.5 with a 10-sigma level shift at T/2", DirStationary, func(y []float64, r *rand.Rand) { arShift(y, r, 10) }},
	{"ts", "trend-stationary: 0.05 t + AR(1) phi = 0.5", DirStationary, func(y []float64, r *rand.Rand) { tsSlope(y, r, 0.05, 0.05) }},
	{"ts-slows", "trend-stationary whose slope slows from 0.05 to 0.02 at T/2", DirStationary, func(y []float64, r *rand.Rand) { tsSlope(y, r, 0.05, 0.02) }},
	{"ts-turns", "trend-stationary whose slope turns from 0.05 to -0.05 at T/2", DirStationary, func(y []float64, r *rand.Rand) { tsSlope(y, r, 0.05, -0.05) }},
	{"explosive-1.02", "explosive AR(1): y_t = 1.02 y_{t-1} + e_t, y_0 = 0", DirExplosive, func(y []float64, r *rand.Rand) { ar1(y, r, 1.02, one) }},
	{"explosive-1.05", "explosive AR(1): y_t = 1.05 y_{t-1} + e_t, y_0 = 0", DirExplosive, func(y []float64, r *rand.Rand) { ar1(y, r, 1.05, one) }},
	{"bubble", "bubble episode in a random walk (after Phillips, Shi & Yu 2015): y_0 = 100, explosive root 1 + T^-0.6 from 0.4T to 0.55T, then collapse to the pre-episode level", DirExplosive, bubble},
}

func rwJump(y []float64, r *rand.Rand, size float64) {
	s, T := 0.0, len(y)
	for t := range y {
		s += r.NormFloat64()
		if t == T/2 {
			s += size
		}
		y[t] = s
	}
}

func arShift(y []float64, r *rand.Rand, size float64) {
	T := len(y)
	ar1(y, r, 0.5, one)
	for t := T / 2; t < T; t++ {
		y[t] += size
	}
}

func tsSlope(y []float64, r *rand.Rand, b1, b2 float64) {
	T := len(y)
	ar1(y, r, 0.5, one)
	tb := float64(T / 2)
	for t := range y {
		x := float64(t + 1)
		y[t] += b1 * x
		if x > tb {
			y[t] += (b2 - b1) * (x - tb)
		}
	}
}

func bubble(y []float64, r *rand.Rand) {
	T := len(y)
	delta := 1 + math.Pow(float64(T), -0.6)
	te, tf := int(0.4*float64(T)), int(0.55*float64(T))
	x := 100.0
	start := 0.0
	for t := range y {
		switch {
		case t < te:
			x += r.NormFloat64()
		case t == te:
			start = x
			x = delta*x + r.NormFloat64()
		case t <= tf:
			x = delta*x + r.NormFloat64()
		case t == tf+1:
			x = start + r.NormFloat64()
		default:
			x += r.NormFloat64()
		}
		y[t] = x
	}
}
