package breaks_test

import (
	"context"
	"fmt"
	"math/rand/v2"

	"github.com/rootshift/rootshift/breaks"
	"github.com/rootshift/rootshift/core"
)

// Two mean shifts of 3 standard deviations, after observations 45 and 105.
func ExampleRunBP() {
	r := rand.New(rand.NewPCG(1, 2))
	y := make([]float64, 150)
	for i := range y {
		y[i] = r.NormFloat64()
		if i >= 45 && i < 105 {
			y[i] += 3
		}
	}
	res, err := breaks.RunBP(context.Background(), y, &core.Config{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("UDmax %.1f, reject %v\n", *res.Statistic, res.Reject)
	fmt.Printf("breaks: sequential %v, BIC %v, LWZ %v\n", res.Estimates["breaks_sequential"], res.Estimates["breaks_bic"], res.Estimates["breaks_lwz"])
	for _, b := range res.Breaks {
		fmt.Printf("TB=%d, %.0f%% interval [%d, %d]\n", b.Index, 100*b.CILevel, b.Lower, b.Upper)
	}
	// Output:
	// UDmax 237.5, reject true
	// breaks: sequential 2, BIC 2, LWZ 2
	// TB=45, 95% interval [44, 47]
	// TB=105, 95% interval [104, 106]
}

// A slope change in a trending series with I(1) noise.
func ExampleRunPY() {
	r := rand.New(rand.NewPCG(3, 4))
	y := make([]float64, 200)
	u := 0.0
	for i := range y {
		u += r.NormFloat64()
		y[i] = 0.1*float64(i) + u
		if i+1 > 120 {
			y[i] += 2 * float64(i+1-120)
		}
	}
	res, err := breaks.RunPY(context.Background(), y, &core.Config{Shift: core.ShiftSlope})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("reject %v at %v, break at %d\n", res.Reject, res.Level, res.Breaks[0].Index)
	// Output:
	// reject true at 0.05, break at 120
}
