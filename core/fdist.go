package core

// The F distribution's upper tail, for the F test on seasonal dummies in
// seasonality.go: P(F(d1, d2) ≥ f) = I_{d2/(d2+d1 f)}(d2/2, d1/2), with the
// regularised incomplete beta function I_x(a, b) evaluated by its continued
// fraction (Abramowitz & Stegun 1964, 26.5.8), summed by the modified Lentz
// method (Lentz 1976, Applied Optics 15, 668-671), on the side x < (a+1)/(a+b+2)
// where it converges fast and by the symmetry I_x(a,b) = 1 - I_{1-x}(b,a)
// otherwise.

import "math"

// FUpper returns P(F ≥ f) for an F(d1, d2) variable; NaN for invalid input.
func FUpper(f, d1, d2 float64) float64 {
	if !(d1 > 0) || !(d2 > 0) || math.IsNaN(f) {
		return math.NaN()
	}
	if f <= 0 {
		return 1
	}
	if math.IsInf(f, 1) {
		return 0
	}
	return regIncBeta(d2/(d2+d1*f), d2/2, d1/2)
}

// regIncBeta is I_x(a, b) for a, b > 0 and 0 <= x <= 1.
func regIncBeta(x, a, b float64) float64 {
	if x <= 0 {
		return 0
	}
	if x >= 1 {
		return 1
	}
	la, _ := math.Lgamma(a)
	lb, _ := math.Lgamma(b)
	lab, _ := math.Lgamma(a + b)
	front := math.Exp(lab - la - lb + a*math.Log(x) + b*math.Log1p(-x))
	if x < (a+1)/(a+b+2) {
		return front * betaCF(x, a, b) / a
	}
	return 1 - front*betaCF(1-x, b, a)/b
}

// betaCF evaluates the continued fraction of I_x(a,b) by modified Lentz.
func betaCF(x, a, b float64) float64 {
	const tiny = 1e-300
	qab, qap, qam := a+b, a+1, a-1
	c, d := 1.0, 1-qab*x/qap
	if math.Abs(d) < tiny {
		d = tiny
	}
	d = 1 / d
	h := d
	for m := 1; m <= 300; m++ {
		fm := float64(m)
		m2 := 2 * fm
		aa := fm * (b - fm) * x / ((qam + m2) * (a + m2))
		d = 1 + aa*d
		if math.Abs(d) < tiny {
			d = tiny
		}
		c = 1 + aa/c
		if math.Abs(c) < tiny {
			c = tiny
		}
		d = 1 / d
		h *= d * c
		aa = -(a + fm) * (qab + fm) * x / ((a + m2) * (qap + m2))
		d = 1 + aa*d
		if math.Abs(d) < tiny {
			d = tiny
		}
		c = 1 + aa/c
		if math.Abs(c) < tiny {
			c = tiny
		}
		d = 1 / d
		del := d * c
		h *= del
		if math.Abs(del-1) < 1e-15 {
			break
		}
	}
	return h
}
